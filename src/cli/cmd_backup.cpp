#include <fmt/format.h>
#include <fmt/ostream.h>
#include <fmt/ranges.h>

#include "app/records/backup.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {

std::vector<Command> backup_commands() {
  Command backup{"backup", "",
                 "copy the database while it is in use (SQLite online backup) and verify the copy (exit 1 if it fails)",
                 "plumb backup /mnt/safe/plumb-2026-11-30.db",
                 [](po::options_description& d, po::positional_options_description& p) {
                   d.add_options()("file", po::value<std::string>()->required(), "backup file to write (positional)")(
                       "force", po::bool_switch(), "replace the file if it exists");
                   p.add("file", 1);
                 },
                 [](const po::variables_map& vm, Env& env) {
                   auto db = env.open();
                   const auto out = app::backup_database(db, vm["file"].as<std::string>(), vm["force"].as<bool>());
                   if (!out.check.ok) {
                     fmt::print(env.err, "plumb: backup not kept: {}\n", out.check.failure);
                     return 1;
                   }
                   fmt::print(env.out,
                              "Backed up {} to {}: integrity check ok, audit trail verified ({} records, {} rows).\n"
                              "Last hash: {}\n",
                              db.path().string(), out.file.string(), out.check.audit.records, out.check.audit.rows,
                              out.check.audit.last_hash);
                   return 0;
                 }};
  Command restore{
      "restore", "",
      "replace the database with a verified backup, recording the restore in its trail (the replaced content is "
      "saved beside it)",
      "plumb --db lab.db restore /mnt/safe/plumb-2026-11-30.db --force --reason \"disk failure on the lab PC\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("file", po::value<std::string>()->required(), "backup file to restore (positional)")(
            "reason", po::value<std::string>()->required(), "why the database is restored (recorded)")(
            "force", po::bool_switch(), "replace an existing database (its content is saved first)")(
            "other-lab", po::bool_switch(), "with --force: replace even a database of another lab");
        p.add("file", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        app::RestoreRequest request;
        request.db_path = env.db_path;
        request.file = vm["file"].as<std::string>();
        request.force = vm["force"].as<bool>();
        request.other_lab = vm["other-lab"].as<bool>();
        request.reason = vm["reason"].as<std::string>();
        const auto out = app::restore_database(request, [&env](store::Database& db) { return env.actor(db); });
        if (!out.source.ok) {
          fmt::print(env.err, "plumb: nothing restored: {}\n", out.source.failure);
          return 1;
        }
        fmt::print(env.out, "Restored {} from {}: {} audit records, last hash {}.\n", env.db_path.string(),
                   request.file.string(), out.after.records, out.after.last_hash);
        if (out.replaced_existing) {
          const auto& d = out.difference;
          if (d.first_only() == 0) {
            fmt::print(env.out,
                       "The restore removes no records: the replaced database had nothing after the backup.\n");
          } else {
            std::vector<std::string> tables;
            for (const auto& [table, n] : d.first_only_by_table) tables.push_back(fmt::format("{} in {}", n, table));
            fmt::print(env.out, "The restore removes {} {} recorded after the backup ({} to {}): {}.\n",
                       d.first_only(), d.first_only() == 1 ? "record" : "records", d.first_only_from,
                       d.first_only_to, fmt::join(tables, ", "));
          }
          if (d.second_only() > 0)
            fmt::print(env.out, "The backup holds {} {} that the replaced database did not.\n", d.second_only(),
                       d.second_only() == 1 ? "record" : "records");
          fmt::print(env.out, "The replaced database ({} audit records) was saved as {}.\n", out.previous_records,
                     out.previous_saved.string());
        }
        if (out.backup_checkpoint)
          fmt::print(env.out, "The backup's last signed checkpoint is {} (signed {}, {} records).\n",
                     out.backup_checkpoint->number, out.backup_checkpoint->signed_at, out.backup_checkpoint->records);
        fmt::print(env.out, "The restore is recorded and signed in the restored audit trail.\n");
        if (!out.after.ok()) {
          fmt::print(env.err, "plumb: the restored database fails audit verification: {}\n",
                     out.after.problems.front().message);
          return 1;
        }
        return 0;
      }};
  return {backup, restore};
}

}  // namespace plumb::cli
