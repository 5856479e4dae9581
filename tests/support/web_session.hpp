#pragma once
// plumb serve for the HTTP tests: the built binary on a free port of a scratch lab, and a browser that keeps its
// cookies, reads a page's CSRF token and logs in with the form. Included only by the tests that include httplib.h
// (tests/CMakeLists.txt gives them the library's build options).
#include <httplib.h>
#include <catch2/catch.hpp>

#include <csignal>
#include <filesystem>
#include <map>
#include <regex>
#include <string>
#include <vector>

#include "support/run_plumb.hpp"

namespace plumb::test::web {

using plumb::test::run_plumb;
using plumb::test::ScratchDir;

/// plumb serve on a free port, stopped with SIGTERM when the test ends.
class Served {
 public:
  Served(const std::string& db, const ScratchDir& dir, const std::vector<std::string>& more = {})
      : cwd_(make_cwd(dir)), process_(args(db, more), cwd_) {
    process_.wait_for_output("plumb serves", 20);
    const std::string out = process_.output_so_far();
    std::smatch m;
    REQUIRE(std::regex_search(out, m, std::regex(R"(https?://127\.0\.0\.1:(\d+)/)")));
    port_ = std::stoi(m[1].str());
  }
  ~Served() {
    process_.signal(SIGTERM);
    process_.wait(20);
  }
  Served(const Served&) = delete;
  Served& operator=(const Served&) = delete;
  [[nodiscard]] int port() const { return port_; }

 private:
  static std::filesystem::path make_cwd(const ScratchDir& dir) {
    const auto cwd = dir.path() / "server";
    std::filesystem::create_directories(cwd);
    return cwd;
  }
  static std::vector<std::string> args(const std::string& db, const std::vector<std::string>& more) {
    std::vector<std::string> a = {"--db", db, "serve", "--port", "0"};
    a.insert(a.end(), more.begin(), more.end());
    return a;
  }
  std::filesystem::path cwd_;
  plumb::test::PlumbProcess process_;
  int port_ = 0;
};

/// One browser: its cookies, kept from every response.
class Browser {
 public:
  explicit Browser(int port, const std::string& scheme = "http")
      : client_(scheme + "://127.0.0.1:" + std::to_string(port)) {
    client_.set_read_timeout(30, 0);
    client_.enable_server_certificate_verification(false);  // the test's own self-signed certificate
  }

  httplib::Result get(const std::string& path) { return keep(client_.Get(path.c_str(), cookie_headers())); }
  httplib::Result post(const std::string& path, const httplib::Params& form) {
    return keep(client_.Post(path.c_str(), cookie_headers(), form));
  }
  /// A multipart form (a file input), as a browser sends it.
  httplib::Result post_multipart(const std::string& path, const httplib::MultipartFormDataItems& parts) {
    return keep(client_.Post(path.c_str(), cookie_headers(), parts));
  }
  httplib::Result post_body(const std::string& path, const std::string& body) {
    return keep(client_.Post(path.c_str(), cookie_headers(), body, "application/x-www-form-urlencoded"));
  }
  /// The CSRF token of the form on the page at `path`.
  std::string csrf_of(const std::string& path) {
    const auto r = get(path);
    REQUIRE(r);
    std::smatch m;
    REQUIRE(std::regex_search(r->body, m, std::regex(R"re(name="csrf" value="([0-9a-f]{64})")re")));
    return m[1].str();
  }
  /// Logs in with the form; the response to the form.
  httplib::Result log_in(const std::string& login, const std::string& password) {
    const std::string csrf = csrf_of("/login");
    return post("/login", {{"login", login}, {"password", password}, {"csrf", csrf}});
  }
  std::map<std::string, std::string> cookies;
  std::vector<std::string> set_cookies;  ///< every Set-Cookie header seen, as sent

 private:
  httplib::Headers cookie_headers() const {
    std::string all;
    for (const auto& [name, value] : cookies) all += (all.empty() ? "" : "; ") + name + "=" + value;
    return all.empty() ? httplib::Headers{} : httplib::Headers{{"Cookie", all}};
  }
  httplib::Result keep(httplib::Result r) {
    if (!r) return r;
    const auto range = r->headers.equal_range("Set-Cookie");
    for (auto it = range.first; it != range.second; ++it) {
      set_cookies.push_back(it->second);
      const auto eq = it->second.find('='), semi = it->second.find(';');
      const std::string name = it->second.substr(0, eq), value = it->second.substr(eq + 1, semi - eq - 1);
      if (it->second.find("Max-Age=0") != std::string::npos || value.empty())
        cookies.erase(name);
      else
        cookies[name] = value;
    }
    return r;
  }
  httplib::Client client_;
};

inline void write_private(const ScratchDir& dir, const std::string& name, const std::string& text) {
  dir.write(name, text);
  std::filesystem::permissions(dir.file(name),
                               std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
}

/// A user with one role, its first password changed as plumb requires; its password is "<login>-password-long".
inline std::string add_user(const std::string& db, const ScratchDir& dir, const std::string& login,
                            const std::string& name, const std::string& role) {
  write_private(dir, login + "-first.pw", login + "-first-password\n");
  write_private(dir, login + ".pw", login + "-password-long\n");
  auto r = run_plumb({"--db", db, "--as", "Test Administrator", "user", "add", login, "--name", name, "--role", role,
                      "--new-password-file", login + "-first.pw"},
                     dir.path());
  REQUIRE(r.status == 0);
  r = run_plumb({"--db", db, "--user", login, "--password-file", login + "-first.pw", "user", "password",
                 "--new-password-file", login + ".pw"},
                dir.path());
  REQUIRE(r.status == 0);
  return login + "-password-long";
}

}  // namespace plumb::test::web
