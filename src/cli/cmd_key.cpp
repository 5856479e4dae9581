#include <fmt/ostream.h>

#include "app/records/lab_key.hpp"
#include "cli/command_groups.hpp"
#include "store/users.hpp"

namespace plumb::cli {

std::vector<Command> key_commands() {
  Command create{
      "key",
      "create",
      "create the lab's signing key for a database from before signed checkpoints, and sign its records so far",
      "PLUMB_KEY=/etc/plumb/lab.key plumb --db lab.db key create",
      [](po::options_description&, po::positional_options_description&) {},
      [](const po::variables_map&, Env& env) {
        auto db = env.open();
        // A database from before both signed checkpoints and user accounts gets its key first (every record after
        // it is signed, the first administrator's too), so then nobody can log in yet: the OS account is recorded.
        const auto made = app::create_lab_key(
            db, store::count_users(db.sql()) == 0
                    ? store::Actor{"before user accounts (OS account " + store::current_os_user() + ")",
                                   store::current_os_user(), std::nullopt}
                    : env.actor(db));
        fmt::print(env.out,
                   "Created the lab's signing key {} (Ed25519 key {}, readable by its owner only) and its "
                   "public key {}.\n",
                   made.files.key.string(), made.files.fingerprint, made.files.public_key.string());
        if (made.first)
          fmt::print(env.out, "Checkpoint {} signed: it covers the {} records written before checkpoints.\n",
                     made.first->number, made.first->records);
        return 0;
      }};
  return {create};
}

}  // namespace plumb::cli
