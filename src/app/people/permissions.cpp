#include "app/people/permissions.hpp"

#include <fmt/format.h>

#include <vector>

#include "core/errors.hpp"

namespace plumb::app {
namespace {

// Technicians record checks; reviewers approve, correct and void; quality managers also manage the registry
// (instruments, weights, their policies, balance ports), restore backups and create the lab's signing key (it
// vouches for the records, which is the quality manager's charge); administrators manage accounts and nothing else.
const std::vector<Permission>& table() {
  using enum Role;
  static const std::vector<Permission> all = {
      {"check record", {technician, reviewer, quality_manager}},
      {"check capture", {technician, reviewer, quality_manager}},
      {"check import", {quality_manager}},
      {"certificate issue", {technician, reviewer, quality_manager}},
      {"certificate approve", {reviewer, quality_manager}, true},
      {"check correct", {reviewer, quality_manager}, true},
      {"check void", {reviewer, quality_manager}, true},
      {"weight add", {quality_manager}},
      {"weight recalibrate", {quality_manager}},
      {"weight retire", {quality_manager}},
      {"weight reinstate", {quality_manager}},
      {"weight set-properties", {quality_manager}},
      {"balance add", {quality_manager}},
      {"balance set-calibration", {quality_manager}},
      {"balance set-in-use", {quality_manager}},
      {"balance port", {quality_manager}},
      {"pipette add", {quality_manager}},
      {"pipette set-edition", {quality_manager}},
      {"pipette default-edition", {quality_manager}},
      {"instrument update", {quality_manager}},
      {"instrument retire", {quality_manager}},
      {"instrument reinstate", {quality_manager}},
      {"restore", {quality_manager}},
      {"key create", {quality_manager}},
      {"user add", {administrator}},
      {"user grant", {administrator}},
      {"user revoke", {administrator}},
      {"user deactivate", {administrator}},
      {"user reactivate", {administrator}},
      {"user reset-password", {administrator}},
      {"user unlock", {administrator}},
      {"user policy", {administrator}},
      {"user password", {}},
      {"login", {}},
      // plumb serve: reading any page of the web application (every logged-in user); its forms are the commands
      // above ("check record", "certificate approve", ...), checked against their own rows.
      {"web view", {}},
      {"logout", {}},
  };
  return all;
}

}  // namespace

const Permission* permission_of(const std::string& command) {
  for (const auto& p : table())
    if (command == p.command) return &p;
  return nullptr;
}

void require_permission(const std::string& command, const Roles& held, const std::string& login) {
  const Permission* p = permission_of(command);
  if (!p) throw AccessError(fmt::format("`plumb {}` is not in the table of permissions; nobody may run it.", command));
  if (p->roles.empty()) return;
  for (Role r : held)
    if (p->roles.count(r)) return;
  std::vector<std::string> names;
  for (Role r : p->roles) names.emplace_back(role_name(r));
  throw AccessError(
      fmt::format("user {} may not run `plumb {}`: it needs the role {}.", login, command, fmt::join(names, " or ")));
}

}  // namespace plumb::app
