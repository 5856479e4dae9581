// plumb serve: the lab's web application (doc/web.md). The pages authenticate their users themselves (the session
// cookie, app/people); the command needs no --user.
#include <fmt/ostream.h>

#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "plumb/version.hpp"
#include "web/server.hpp"

namespace plumb::cli {

std::vector<Command> serve_commands() {
  Command serve{
      "serve",
      "",
      "serve the lab's web application (log-in, overview, lists, weekly checks, certificates, audit trail)",
      "plumb --db lab.db serve\n  plumb --db lab.db serve --listen 0.0.0.0 --port 8417 --tls-cert lab.crt --tls-key "
      "lab.key",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("listen", po::value<std::string>()->default_value("127.0.0.1"),
                        "address to listen on: 127.0.0.1 (this machine only) or 0.0.0.0 (the lab's network)")(
            "port", po::value<int>()->default_value(web::default_port), "TCP port (0: any free port)")(
            "tls-cert", po::value<std::string>(), "the lab's TLS certificate (PEM) to serve HTTPS with")(
            "tls-key", po::value<std::string>(), "its private key (PEM, readable by this account only)")(
            "threads", po::value<int>()->default_value(8), "requests served at once")(
            "body-limit", po::value<int>()->default_value(1024 * 1024), "largest request body in bytes (413 beyond)")(
            "due-within", po::value<int>()->default_value(14), "days ahead the overview counts as due");
      },
      [](const po::variables_map& vm, Env& env) {
        web::ServeOptions o;
        o.db = env.db_path;
        o.listen = vm["listen"].as<std::string>();
        o.port = vm["port"].as<int>();
        if (o.port < 0 || o.port > 65535)
          throw InputError(fmt::format("--port {} is not a TCP port (0 to 65535).", o.port));
        if (auto c = optional_string(vm, "tls-cert")) o.tls_cert = *c;
        if (auto k = optional_string(vm, "tls-key")) o.tls_key = *k;
        o.threads = vm["threads"].as<int>();
        if (o.threads < 1 || o.threads > 256)
          throw InputError(fmt::format("--threads {} must be between 1 and 256.", o.threads));
        const int limit = vm["body-limit"].as<int>();
        if (limit < 1024) throw InputError(fmt::format("--body-limit {} must be at least 1024 bytes.", limit));
        o.body_limit = static_cast<std::size_t>(limit);
        o.due_window_days = vm["due-within"].as<int>();
        if (o.due_window_days < 0 || o.due_window_days > 366)
          throw InputError(fmt::format("--due-within {} must be between 0 and 366 days.", o.due_window_days));
        o.software_release = plumb::version;
        web::serve(o, [&env](const std::string& address) {
          fmt::print(env.out, "plumb serves {} at {} (Ctrl-C stops it).\n", env.db_path.string(), address);
          env.out.flush();
        });
        return 0;
      }};
  return {serve};
}

}  // namespace plumb::cli
