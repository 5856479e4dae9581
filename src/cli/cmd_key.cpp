#include <fmt/ostream.h>

#include "app/records/lab_key.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {

std::vector<Command> key_commands() {
  Command create{
      "key",
      "create",
      "create the lab's signing key for a database from before signed checkpoints, and sign its records so far",
      "PLUMB_KEY=/etc/plumb/lab.key plumb --db lab.db key create",
      [](po::options_description& d, po::positional_options_description&) { add_by_option(d); },
      [](const po::variables_map& vm, Env& env) {
        auto db = env.open();
        const auto made = app::create_lab_key(db, Env::actor(vm));
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
