#pragma once
// A balance's data-output settings (migration 010): how plumb reaches the port and reads its lines. A change
// is a new row; the latest is in force.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "store/recorder.hpp"

namespace plumb::store {

struct BalancePort {
  std::int64_t id = 0;
  std::string balance_id;
  std::string device;
  int baud = 9600;
  std::string parity = "none";  ///< none | even | odd | mark | space
  int data_bits = 8;
  int stop_bits = 1;
  std::string handshake = "none";  ///< none | rts-cts | dtr-dsr | xon-xoff
  std::optional<std::string> send_command;
  std::optional<std::string> line_pattern;
  MassUnit unit = MassUnit::g;
  std::string reason;
  std::string created_at, created_by;
};

std::int64_t add_balance_port(Recorder& rec, const BalancePort& port);
/// The settings in force: the latest row.
std::optional<BalancePort> current_balance_port(SQLite::Database& db, const std::string& balance_id);
/// Every row, oldest first.
std::vector<BalancePort> balance_port_history(SQLite::Database& db, const std::string& balance_id);

}  // namespace plumb::store
