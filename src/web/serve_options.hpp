#pragma once
// What `plumb serve` is started with (doc/web.md).
#include <cstddef>
#include <filesystem>
#include <optional>
#include <string>

namespace plumb::web {

/// The port plumb serve listens on unless told otherwise (the README names it).
inline constexpr int default_port = 8417;

struct ServeOptions {
  std::filesystem::path db;
  std::string listen = "127.0.0.1";                        ///< only this machine; 0.0.0.0 for the lab's network
  int port = default_port;                                 ///< 0: any free port (printed on start)
  std::optional<std::filesystem::path> tls_cert, tls_key;  ///< PEM files; both or neither
  std::size_t body_limit = std::size_t{1024} * 1024;       ///< bytes; a larger request is refused with 413
  int threads = 8;                                         ///< requests served at once
  int read_timeout_s = 10, write_timeout_s = 30;
  int due_window_days = 14;            ///< "due within N days" on the overview
  int login_attempts_per_minute = 10;  ///< per client address, on top of the account lock-out
  std::string software_release;        ///< plumb's version, for the DCC's dcc:dccSoftware
};

}  // namespace plumb::web
