#include <fmt/ostream.h>

#include "app/people/password_hash.hpp"
#include "app/registry/lab.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "store/lab_key.hpp"
#include "store/users.hpp"

namespace plumb::cli {

std::vector<Command> lab_commands() {
  Command init{"init",
               "",
               "create the database with its first administrator and record the laboratory's name (on a database "
               "from before user accounts: add its first administrator)",
               "plumb --db lab.db --password-file admin.pw init --lab \"Example Analytical Lab\" --admin ada "
               "--admin-name \"Ada Quill\"",
               [](po::options_description& d, po::positional_options_description&) {
                 d.add_options()("lab", po::value<std::string>(), "the laboratory's name")(
                     "admin", po::value<std::string>()->required(), "user id of the first administrator")(
                     "admin-name", po::value<std::string>()->required(), "the administrator's full (printed) name");
               },
               [](const po::variables_map& vm, Env& env) {
                 app::NewUser admin;
                 admin.login = vm["admin"].as<std::string>();
                 admin.full_name = vm["admin-name"].as<std::string>();
                 const auto password = read_password(env.password, "plumb: the administrator's new password: ");
                 if (!password)
                   throw InputError(
                       "the first administrator needs a password: give --password-file FILE or "
                       "--password-stdin, or run at a terminal.");
                 admin.password = *password;
                 const std::string lab = vm.count("lab") ? vm["lab"].as<std::string>() : "";
                 if (!app::create_lab(env.db_path, admin, lab)) {
                   fmt::print(env.out, "Added the first administrator {} ({}) to {}.\n", admin.login, admin.full_name,
                              env.db_path.string());
                   return 0;
                 }
                 fmt::print(env.out, "Initialised {} for {}; administrator {} ({}).\n", env.db_path.string(), lab,
                            admin.login, admin.full_name);
                 const auto key = store::key_path_for(env.db_path);
                 fmt::print(env.out,
                            "Every command's records are signed with the lab's key {}; give inspectors "
                            "its public key {}.\n",
                            key.string(), store::public_key_path_for(key).string());
                 store::Database db(env.db_path, store::Database::Open::existing);
                 if (store::security_settings(db.sql()).password_hashing == "test-only-fast")
                   fmt::print(env.out,
                              "This database hashes passwords with test-only fast limits: never keep records "
                              "in it.\n");
                 return 0;
               }};
  return {init};
}

}  // namespace plumb::cli
