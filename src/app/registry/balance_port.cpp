#include "app/registry/balance_port.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <algorithm>
#include <array>

#include "app/registry/fields.hpp"
#include "core/balance_line.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

int whole_number_in(const std::string& text, std::string_view field, int low, int high) {
  const bool digits = !text.empty() && text.size() <= 8 &&
                      std::all_of(text.begin(), text.end(), [](char c) { return c >= '0' && c <= '9'; });
  const int n = digits ? std::stoi(text) : -1;
  if (n < low || n > high)
    throw InputError(fmt::format("{} \"{}\" is not a whole number from {} to {}.", field, text, low, high));
  return n;
}

std::string one_of(const std::string& text, std::string_view field, std::initializer_list<std::string_view> allowed) {
  if (std::find(allowed.begin(), allowed.end(), text) == allowed.end()) {
    std::string list;
    for (const auto a : allowed) list += (list.empty() ? "" : ", ") + std::string(a);
    throw InputError(fmt::format("{} \"{}\" is not one of: {}.", field, text, list));
  }
  return text;
}

const store::BalanceRecord& require_balance(store::Database& db, const std::string& id,
                                            std::optional<store::BalanceRecord>& held) {
  held = store::find_balance(db.sql(), id);
  if (!held) throw InputError(fmt::format("balance \"{}\" is not registered.", id));
  return *held;
}

}  // namespace

store::BalancePort set_balance_port(store::Database& db, const store::Actor& actor, const BalancePortInput& in) {
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  std::optional<store::BalanceRecord> balance;
  require_balance(db, in.balance_id, balance);
  const auto before = store::current_balance_port(db.sql(), in.balance_id);
  store::BalancePort p = before.value_or(store::BalancePort{});
  p.balance_id = in.balance_id;
  if (in.device) {
    validate_free_text(*in.device, "--device");
    p.device = *in.device;
  }
  if (p.device.empty())
    throw InputError("--device must name the port the balance's readings come from, e.g. /dev/ttyUSB0.");
  if (in.baud) p.baud = whole_number_in(*in.baud, "--baud", 50, 4000000);
  if (in.parity) p.parity = one_of(*in.parity, "--parity", {"none", "even", "odd", "mark", "space"});
  if (in.data_bits) p.data_bits = whole_number_in(*in.data_bits, "--data-bits", 5, 8);
  if (in.stop_bits) p.stop_bits = whole_number_in(*in.stop_bits, "--stop-bits", 1, 2);
  if (in.handshake) p.handshake = one_of(*in.handshake, "--handshake", {"none", "rts-cts", "dtr-dsr", "xon-xoff"});
  if (in.send_command) {
    validate_free_text(*in.send_command, "--send-command");
    if (in.send_command->size() > 32)
      throw InputError(fmt::format("--send-command \"{}\" is longer than 32 characters.", *in.send_command));
    p.send_command = *in.send_command;
  }
  if (in.clear_send_command) p.send_command.reset();
  if (in.line_pattern) {
    LinePattern::parse(*in.line_pattern, "--line-pattern");
    p.line_pattern = *in.line_pattern;
  }
  if (in.clear_line_pattern) p.line_pattern.reset();
  if (in.unit) p.unit = parse_mass_unit(*in.unit, "--unit");
  validate_free_text(in.reason, "--reason", false);
  p.reason = in.reason;
  store::Recorder rec(db.sql(), actor);
  p.id = store::add_balance_port(rec, p);
  rec.commit(tx);
  return *store::current_balance_port(db.sql(), in.balance_id);
}

std::vector<store::BalancePort> balance_port_settings(store::Database& db, const std::string& balance_id) {
  std::optional<store::BalanceRecord> balance;
  require_balance(db, balance_id, balance);
  return store::balance_port_history(db.sql(), balance_id);
}

std::string command_bytes(const std::string& stored) {
  std::string out;
  for (std::size_t i = 0; i < stored.size(); ++i) {
    if (stored[i] == '\\' && i + 1 < stored.size()) {
      const char e = stored[i + 1];
      const std::array<std::pair<char, char>, 4> escapes{{{'r', '\r'}, {'n', '\n'}, {'t', '\t'}, {'\\', '\\'}}};
      const auto* hit = std::find_if(escapes.begin(), escapes.end(), [&](const auto& p) { return p.first == e; });
      if (hit != escapes.end()) {
        out += hit->second;
        ++i;
        continue;
      }
    }
    out += stored[i];
  }
  if (out.empty() || (out.back() != '\n' && out.back() != '\r')) out += "\r\n";
  return out;
}

}  // namespace plumb::app
