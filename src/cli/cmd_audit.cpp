#include <fmt/ostream.h>

#include "app/records/audit.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/records/audit_log.hpp"

namespace plumb::cli {

std::vector<Command> audit_commands() {
  Command log{"audit",
              "log",
              "who did what, when and why: the trail of the lab, one instrument or one certificate",
              "plumb audit log --instrument BAL-A --from 2026-11-01 --to 2026-11-30 --author priya",
              [](po::options_description& d, po::positional_options_description&) {
                d.add_options()("instrument", po::value<std::string>(), "only the records of this instrument")(
                    "certificate", po::value<std::string>(), "only the records of this certificate (number)")(
                    "from", po::value<std::string>(), "only records from this UTC date on, YYYY-MM-DD")(
                    "to", po::value<std::string>(), "only records up to this UTC date, YYYY-MM-DD")(
                    "author", po::value<std::string>(), "only the records written by this user account (its login)");
                add_format_option(d, "text|csv|json");
              },
              [](const po::variables_map& vm, Env& env) {
                const auto format = format_of(vm, {"text", "csv", "json"});
                auto db = env.open();
                const auto trail =
                    app::audit_log(db, {optional_string(vm, "instrument"), optional_string(vm, "certificate"),
                                        optional_string(vm, "from"), optional_string(vm, "to"),
                                        optional_string(vm, "author"), std::nullopt, std::nullopt});
                if (format == "json")
                  env.out << report::audit_log_json(trail.scope, trail.records, trail.authors).dump(2) << "\n";
                else if (format == "csv")
                  env.out << report::audit_log_csv(trail.records, trail.authors);
                else
                  env.out << report::audit_log_text(trail.scope, trail.records, trail.authors);
                return 0;
              }};
  Command verify{
      "audit",
      "verify",
      "prove the trail: the schema, the hash chain, every signed checkpoint and every table row (exit 1 on any "
      "mismatch)",
      "plumb audit verify --public-key lab.db.pub --since checkpoint-2026-11-30.json",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("all", po::bool_switch(), "on failure, also list every problem found on standard output")(
            "public-key", po::value<std::string>(),
            "the lab's public key (PEM): prove every checkpoint with it alone, as an inspector does offline")(
            "since", po::value<std::string>(),
            "a checkpoint exported earlier (audit checkpoint export): prove the history it covers is still there");
      },
      [](const po::variables_map& vm, Env& env) {
        auto db = env.open();
        const auto result = app::verify_audit(db, {optional_string(vm, "public-key"), optional_string(vm, "since")});
        const auto& v = result.audit;
        if (v.ok()) {
          fmt::print(env.out,
                     "Audit trail verified: {} records chained by SHA-256, {} rows in {} tables match the trail, "
                     "the schema ({} tables, indexes and triggers) is what plumb's migrations create.\n",
                     v.records, v.rows, v.tables, v.schema_objects);
          if (v.last_checkpoint)
            fmt::print(env.out,
                       "{} signed checkpoints proved with Ed25519 key {} ({}); the last, checkpoint {}, "
                       "signed {}, covers all {} records.\n",
                       v.checkpoints, v.key_fingerprint, result.key_source, v.last_checkpoint->number,
                       v.last_checkpoint->signed_at, v.last_checkpoint->records);
          if (vm.count("since"))
            fmt::print(env.out, "The history covered by {} is unchanged.\n", vm["since"].as<std::string>());
          fmt::print(env.out, "Last hash: {}\n", v.last_hash);
          return 0;
        }
        if (vm["all"].as<bool>())
          for (const auto& p : v.problems) fmt::print(env.out, "{}\n", p.message);
        fmt::print(
            env.err, "plumb: audit verification failed: {}{}\n", v.problems.front().message,
            v.problems.size() > 1 ? fmt::format(" ({} problems in all; --all lists them.)", v.problems.size()) : "");
        return 1;
      }};
  Command checkpoint{
      "audit",
      "checkpoint",
      "export the latest signed checkpoint (count, head hash, time, signature) to keep outside the database",
      "plumb audit checkpoint export --out /mnt/safe/checkpoint-2026-11-30.json",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("action", po::value<std::string>()->required(), "export (positional)")(
            "out", po::value<std::string>()->required(), "the file to write (JSON)");
        p.add("action", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        if (vm["action"].as<std::string>() != "export")
          throw InputError(fmt::format("audit checkpoint \"{}\" is not an action; the one action is export.",
                                       vm["action"].as<std::string>()));
        auto db = env.open();
        const auto c = app::export_checkpoint(db, vm["out"].as<std::string>());
        fmt::print(env.out, "Checkpoint {} (signed {}, {} records, head {}) written to {}.\n", c.number, c.signed_at,
                   c.records, c.head_hash, vm["out"].as<std::string>());
        return 0;
      }};
  return {log, verify, checkpoint};
}

}  // namespace plumb::cli
