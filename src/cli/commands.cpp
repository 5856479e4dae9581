#include "cli/command.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {

const std::vector<Command>& commands() {
  static const std::vector<Command> all = [] {
    std::vector<Command> v;
    for (auto group :
         {lab_commands,     weight_commands,  balance_commands, balance_port_commands, balance_calibration_commands,
          pipette_commands, check_commands,   capture_commands, import_commands,       certificate_commands,
          due_commands,     summary_commands, history_commands, report_commands,       instrument_commands,
          service_commands, audit_commands,   key_commands,     backup_commands,       login_commands,
          user_commands,    serve_commands,   demo_commands}) {
      auto g = group();
      v.insert(v.end(), g.begin(), g.end());
    }
    return v;
  }();
  return all;
}

}  // namespace plumb::cli
