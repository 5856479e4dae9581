#pragma once
// One function per noun, each in its own cmd_*.cpp file.
#include <vector>

#include "cli/command.hpp"

namespace plumb::cli {

std::vector<Command> lab_commands();
std::vector<Command> weight_commands();
std::vector<Command> balance_commands();
std::vector<Command> balance_port_commands();  // cmd_balance_port.cpp
std::vector<Command> balance_calibration_commands();
std::vector<Command> pipette_commands();
std::vector<Command> check_commands();
std::vector<Command> capture_commands();  // cmd_capture.cpp: check capture
std::vector<Command> history_commands();
std::vector<Command> certificate_commands();
std::vector<Command> due_commands();
std::vector<Command> summary_commands();
std::vector<Command> demo_commands();
std::vector<Command> service_commands();
std::vector<Command> instrument_commands();
std::vector<Command> audit_commands();
std::vector<Command> key_commands();
std::vector<Command> backup_commands();
std::vector<Command> import_commands();
std::vector<Command> report_commands();
std::vector<Command> user_commands();
std::vector<Command> login_commands();
std::vector<Command> serve_commands();  // cmd_serve.cpp: the web application

}  // namespace plumb::cli
