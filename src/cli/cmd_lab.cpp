#include <fmt/ostream.h>

#include "app/registry/lab.hpp"
#include "cli/command_groups.hpp"
#include "store/lab_key.hpp"

namespace plumb::cli {

std::vector<Command> lab_commands() {
  Command init{"init",
               "",
               "create the database and record the laboratory's name",
               "plumb --db lab.db init --lab \"Example Analytical Lab\"",
               [](po::options_description& d, po::positional_options_description&) {
                 d.add_options()("lab", po::value<std::string>()->required(), "the laboratory's name");
                 add_by_option(d);
               },
               [](const po::variables_map& vm, Env& env) {
                 app::create_lab(env.db_path, Env::actor(vm), vm["lab"].as<std::string>());
                 fmt::print(env.out, "Initialised {} for {}.\n", env.db_path.string(), vm["lab"].as<std::string>());
                 const auto key = store::key_path_for(env.db_path);
                 fmt::print(env.out,
                            "Every command's records are signed with the lab's key {}; give inspectors "
                            "its public key {}.\n",
                            key.string(), store::public_key_path_for(key).string());
                 return 0;
               }};
  return {init};
}

}  // namespace plumb::cli
