#pragma once
// A balance's data-output settings: the device its readings come from, the serial line settings, the command
// that asks it for a reading and the shape of its lines. Kept with the balance's record, with their history.
#include <optional>
#include <string>
#include <vector>

#include "store/balance_ports.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

/// Settings as typed; an option left out keeps the value in force (or the default 9600 baud, 8 data bits, no
/// parity, 1 stop bit, no handshake, unit g for the first settings).
struct BalancePortInput {
  std::string balance_id;
  std::optional<std::string> device, baud, parity, data_bits, stop_bits, handshake, send_command, line_pattern, unit;
  bool clear_send_command = false, clear_line_pattern = false;
  std::string reason;
};

/// Validates and records new settings in one transaction; returns them as stored.
store::BalancePort set_balance_port(store::Database& db, const store::Actor& actor, const BalancePortInput& in);

/// The settings in force and every earlier one, oldest first; InputError when `balance_id` is no balance.
std::vector<store::BalancePort> balance_port_settings(store::Database& db, const std::string& balance_id);

/// The command text as it is sent: "\r", "\n", "\t" and "\\" written out in the stored text become the
/// bytes; CR LF is added unless the text ends with a line end of its own.
std::string command_bytes(const std::string& stored);

}  // namespace plumb::app
