#include <fmt/ostream.h>

#include "app/registry/balance_port.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {
namespace {

std::string port_line(const store::BalancePort& p) {
  std::string out = fmt::format("{} {} baud, {} data bits, parity {}, {} stop bit(s), handshake {}, unit {}", p.device,
                                p.baud, p.data_bits, p.parity, p.stop_bits, p.handshake, to_string(p.unit));
  out += p.send_command ? fmt::format(", send command \"{}\"", *p.send_command) : ", no send command";
  out += p.line_pattern ? fmt::format(", line pattern \"{}\"", *p.line_pattern) : ", the common line shapes";
  return out;
}

}  // namespace

std::vector<Command> balance_port_commands() {
  Command port{
      "balance",
      "port",
      "set (or, with the id alone, show) the balance's data-output port settings, kept with their history",
      "plumb balance port BAL-A --device /dev/ttyUSB0 --baud 9600 --parity none --data-bits 8 --stop-bits 1 "
      "--handshake none --unit g",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("id", po::value<std::string>()->required(), "balance id (positional)")(
            "device", po::value<std::string>(), "the port, e.g. /dev/ttyUSB0")("baud", po::value<std::string>(),
                                                                               "baud rate (default 9600)")(
            "parity", po::value<std::string>(), "none | even | odd | mark | space (default none)")(
            "data-bits", po::value<std::string>(), "5 to 8 (default 8)")("stop-bits", po::value<std::string>(),
                                                                         "1 or 2 (default 1)")(
            "handshake", po::value<std::string>(), "none | rts-cts | dtr-dsr | xon-xoff (default none)")(
            "send-command", po::value<std::string>(),
            "text sent (with CR LF) to ask the balance for a reading; \\r \\n \\t written out are sent as such")(
            "no-send-command", po::bool_switch(), "the balance sends readings by itself (its print key)")(
            "line-pattern", po::value<std::string>(),
            "the shape of the balance's lines, e.g. \"{mark:ST|US} {value} {unit}\" (doc/capture.md)")(
            "no-line-pattern", po::bool_switch(), "read the common line shapes")(
            "unit", po::value<std::string>(), "the unit the balance is set to show (default g)")(
            "reason", po::value<std::string>()->default_value(""), "why the settings change (kept in the trail)")(
            "format", po::value<std::string>()->default_value("text"), "output format when showing: text");
        p.add("id", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        app::BalancePortInput in;
        in.balance_id = vm["id"].as<std::string>();
        in.device = optional_string(vm, "device");
        in.baud = optional_string(vm, "baud");
        in.parity = optional_string(vm, "parity");
        in.data_bits = optional_string(vm, "data-bits");
        in.stop_bits = optional_string(vm, "stop-bits");
        in.handshake = optional_string(vm, "handshake");
        in.send_command = optional_string(vm, "send-command");
        in.line_pattern = optional_string(vm, "line-pattern");
        in.unit = optional_string(vm, "unit");
        in.clear_send_command = vm["no-send-command"].as<bool>();
        in.clear_line_pattern = vm["no-line-pattern"].as<bool>();
        in.reason = vm["reason"].as<std::string>();
        format_of(vm, {"text"});
        auto db = env.open();
        const bool setting = in.device || in.baud || in.parity || in.data_bits || in.stop_bits || in.handshake ||
                             in.send_command || in.line_pattern || in.unit || in.clear_send_command ||
                             in.clear_line_pattern;
        if (setting) {
          const auto p = app::set_balance_port(db, env.actor(db), in);
          fmt::print(env.out, "Port of {} set: {}.\n", p.balance_id, port_line(p));
          return 0;
        }
        const auto history = app::balance_port_settings(db, in.balance_id);
        if (history.empty()) {
          fmt::print(env.out, "Balance {} has no port settings (readings are typed at the prompt).\n", in.balance_id);
          return 0;
        }
        fmt::print(env.out, "Port of {} in force: {}.\n", in.balance_id, port_line(history.back()));
        fmt::print(env.out, "History (oldest first):\n");
        for (const auto& p : history)
          fmt::print(env.out, "  {}  by {}{}: {}\n", p.created_at, p.created_by,
                     p.reason.empty() ? "" : " (" + p.reason + ")", port_line(p));
        return 0;
      }};
  return {port};
}

}  // namespace plumb::cli
