#pragma once
// `plumb serve`: the lab's web application over HTTP (or HTTPS with the lab's certificate), one process owning the
// database, every page a call into app/ (doc/web.md).
#include <functional>
#include <string>

#include "web/serve_options.hpp"

namespace plumb::web {

/// Serves until the process is stopped (SIGINT / SIGTERM end it cleanly). `started` is told the address it listens
/// on ("http://127.0.0.1:8417/") once it accepts connections. InputError for options that cannot work (a missing
/// database, a TLS certificate without its key, a port in use).
void serve(const ServeOptions& options, const std::function<void(const std::string& address)>& started);

}  // namespace plumb::web
