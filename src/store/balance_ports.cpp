#include "store/balance_ports.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {
namespace {

constexpr const char* port_select =
    "SELECT id, balance_id, device, baud, parity, data_bits, stop_bits, handshake, send_command, line_pattern, "
    "unit, reason, created_at, created_by FROM balance_ports WHERE balance_id = ? ORDER BY id";

BalancePort port_from(SQLite::Statement& q) {
  BalancePort p;
  p.id = q.getColumn(0).getInt64();
  p.balance_id = q.getColumn(1).getString();
  p.device = q.getColumn(2).getString();
  p.baud = q.getColumn(3).getInt();
  p.parity = q.getColumn(4).getString();
  p.data_bits = q.getColumn(5).getInt();
  p.stop_bits = q.getColumn(6).getInt();
  p.handshake = q.getColumn(7).getString();
  if (!q.getColumn(8).isNull()) p.send_command = q.getColumn(8).getString();
  if (!q.getColumn(9).isNull()) p.line_pattern = q.getColumn(9).getString();
  p.unit = parse_mass_unit(q.getColumn(10).getString());
  p.reason = q.getColumn(11).getString();
  p.created_at = q.getColumn(12).getString();
  p.created_by = q.getColumn(13).getString();
  return p;
}

}  // namespace

std::int64_t add_balance_port(Recorder& rec, const BalancePort& port) {
  return rec.insert("balance_ports",
                    {{"balance_id", port.balance_id},
                     {"device", port.device},
                     {"baud", port.baud},
                     {"parity", port.parity},
                     {"data_bits", port.data_bits},
                     {"stop_bits", port.stop_bits},
                     {"handshake", port.handshake},
                     {"send_command", port.send_command},
                     {"line_pattern", port.line_pattern},
                     {"unit", std::string(to_string(port.unit))},
                     {"reason", port.reason.empty() ? Value() : Value(port.reason)},
                     {"created_at", rec.now()},
                     {"created_by", rec.actor().name}},
                    {"id"}, port.reason);
}

std::vector<BalancePort> balance_port_history(SQLite::Database& db, const std::string& balance_id) {
  SQLite::Statement q(db, port_select);
  q.bind(1, balance_id);
  std::vector<BalancePort> out;
  while (q.executeStep()) out.push_back(port_from(q));
  return out;
}

std::optional<BalancePort> current_balance_port(SQLite::Database& db, const std::string& balance_id) {
  auto all = balance_port_history(db, balance_id);
  if (all.empty()) return std::nullopt;
  return all.back();
}

}  // namespace plumb::store
