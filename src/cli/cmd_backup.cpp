#include <fmt/ostream.h>

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
      "restore", "", "replace the database with a verified backup (the replaced content is saved beside it)",
      "plumb --db lab.db restore /mnt/safe/plumb-2026-11-30.db --force",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("file", po::value<std::string>()->required(), "backup file to restore (positional)")(
            "force", po::bool_switch(), "replace an existing database (its content is saved first)");
        p.add("file", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto out = app::restore_database(env.db_path, vm["file"].as<std::string>(), vm["force"].as<bool>());
        if (!out.source.ok) {
          fmt::print(env.err, "plumb: nothing restored: {}\n", out.source.failure);
          return 1;
        }
        fmt::print(env.out, "Restored {} from {}: {} audit records, last hash {}.\n", env.db_path.string(),
                   vm["file"].as<std::string>(), out.after.records, out.after.last_hash);
        if (out.replaced_existing)
          fmt::print(env.out, "The replaced database ({} audit records) was saved as {}.\n", out.previous_records,
                     out.previous_saved.string());
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
