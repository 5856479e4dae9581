#include <fmt/ostream.h>

#include "app/records/audit.hpp"
#include "cli/command_groups.hpp"
#include "report/records/audit_log.hpp"

namespace plumb::cli {

std::vector<Command> audit_commands() {
  Command log{"audit",
              "log",
              "who did what, when and why: the trail of the lab, one instrument or one certificate",
              "plumb audit log --instrument BAL-A --from 2026-11-01 --to 2026-11-30 --by \"A. Technician\"",
              [](po::options_description& d, po::positional_options_description&) {
                d.add_options()("instrument", po::value<std::string>(), "only the records of this instrument")(
                    "certificate", po::value<std::string>(), "only the records of this certificate (number)")(
                    "from", po::value<std::string>(), "only records from this UTC date on, YYYY-MM-DD")(
                    "to", po::value<std::string>(), "only records up to this UTC date, YYYY-MM-DD")(
                    "by", po::value<std::string>(), "only the records of this person (the name as recorded)");
                add_format_option(d, "text|csv|json");
              },
              [](const po::variables_map& vm, Env& env) {
                const auto format = format_of(vm, {"text", "csv", "json"});
                auto db = env.open();
                const auto trail = app::audit_log(
                    db, {optional_string(vm, "instrument"), optional_string(vm, "certificate"),
                         optional_string(vm, "from"), optional_string(vm, "to"), optional_string(vm, "by")});
                if (format == "json")
                  env.out << report::audit_log_json(trail.scope, trail.records).dump(2) << "\n";
                else if (format == "csv")
                  env.out << report::audit_log_csv(trail.records);
                else
                  env.out << report::audit_log_text(trail.scope, trail.records);
                return 0;
              }};
  Command verify{
      "audit", "verify",
      "prove the trail: walk the hash chain and compare every table row with it (exit 1 on any mismatch)",
      "plumb audit verify",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("all", po::bool_switch(), "on failure, also list every problem found on standard output");
      },
      [](const po::variables_map& vm, Env& env) {
        auto db = env.open();
        const auto v = app::verify_audit(db);
        if (v.ok()) {
          fmt::print(env.out,
                     "Audit trail verified: {} records chained by SHA-256, {} rows in {} tables match the trail.\n"
                     "Last hash: {}\n",
                     v.records, v.rows, v.tables, v.last_hash);
          return 0;
        }
        if (vm["all"].as<bool>())
          for (const auto& p : v.problems) fmt::print(env.out, "{}\n", p.message);
        fmt::print(env.err, "plumb: audit verification failed: {}{}\n", v.problems.front().message,
                   v.problems.size() > 1 ? fmt::format(" ({} problems in all; --all lists them.)", v.problems.size())
                                         : "");
        return 1;
      }};
  return {log, verify};
}

}  // namespace plumb::cli
