#include "web/server.hpp"

#include <fmt/format.h>
#include <httplib.h>

#include <csignal>
#include <cstdint>
#include <filesystem>
#include <memory>

#include "core/errors.hpp"
#include "store/database.hpp"
#include "web/routes.hpp"

namespace plumb::web {
namespace {

std::map<std::string, std::string> parse_cookies(const std::string& header) {
  std::map<std::string, std::string> out;
  std::size_t at = 0;
  while (at < header.size()) {
    auto end = header.find(';', at);
    if (end == std::string::npos) end = header.size();
    std::string part = header.substr(at, end - at);
    at = end + 1;
    const auto first = part.find_first_not_of(' ');
    if (first == std::string::npos) continue;
    part.erase(0, first);
    const auto eq = part.find('=');
    if (eq == std::string::npos) continue;
    out.emplace(part.substr(0, eq), part.substr(eq + 1));  // the first cookie of a name wins
  }
  return out;
}

void send_page(const WebResponse& page, const Site& site, httplib::Response& res) {
  res.status = page.status;
  for (const auto& [name, value] : security_headers(page.csp.empty() ? site_csp : page.csp, site.tls))
    res.set_header(name, value);
  for (const auto& [name, value] : page.headers) res.set_header(name, value);
  res.set_content(page.body, page.content_type.c_str());
}

WebRequest request_of(const httplib::Request& req, const std::string& body,
                      const httplib::MultipartFormDataItems& parts = {}) {
  WebRequest r;
  r.method = req.method;
  r.path = req.path;
  r.remote_addr = req.remote_addr;
  for (const auto& [name, value] : req.params) r.params.emplace(name, value);
  if (!body.empty() && req.get_header_value("Content-Type").starts_with("application/x-www-form-urlencoded"))
    httplib::detail::parse_query_text(body, r.params);
  // A multipart form: its fields are fields like any other, its files go to `files` (a field sent as a file part
  // without a file name is a field too, as browsers send them).
  for (const auto& part : parts) {
    if (part.filename.empty())
      r.params.emplace(part.name, part.content);
    else
      r.files.emplace(part.name, UploadedFile{part.filename, part.content});
  }
  r.cookies = parse_cookies(req.get_header_value("Cookie"));
  return r;
}

WebResponse too_large(const Site& site) {
  WebResponse page;
  page.status = 413;
  page.content_type = "text/plain; charset=utf-8";
  page.body = fmt::format("The request is larger than the server's limit of {} bytes.\n", site.options.body_limit);
  page.headers.emplace_back("Connection", "close");  // the unread rest of the body must not be read as a request
  return page;
}

WebResponse bad_request() {
  WebResponse page;
  page.status = 400;
  page.content_type = "text/plain; charset=utf-8";
  page.body = "The request's body could not be read whole.\n";
  return page;
}

httplib::Server* running_server = nullptr;

extern "C" void stop_serving(int) {
  if (running_server) running_server->stop();
}

}  // namespace

void serve(const ServeOptions& options, const std::function<void(const std::string& address)>& started) {
  { store::Database check(options.db, store::Database::Open::existing); }  // a missing database: said now, not per page
  if (options.tls_cert.has_value() != options.tls_key.has_value())
    throw InputError("--tls-cert and --tls-key go together: give both (PEM files) or neither.");
  for (const auto& f : {options.tls_cert, options.tls_key})
    if (f && !std::filesystem::is_regular_file(*f))
      throw InputError(
          fmt::format("--tls-{} \"{}\" is not a readable file.", f == options.tls_cert ? "cert" : "key", f->string()));
  Site site{options, random_hex_token(), options.tls_cert.has_value()};
  LoginLimiter limiter(options.login_attempts_per_minute);

  std::unique_ptr<httplib::Server> server;
  if (site.tls) {
    auto tls = std::make_unique<httplib::SSLServer>(options.tls_cert->c_str(), options.tls_key->c_str());
    if (!tls->is_valid())
      throw InputError(fmt::format("--tls-cert \"{}\" and --tls-key \"{}\" are not a PEM certificate and its key.",
                                   options.tls_cert->string(), options.tls_key->string()));
    server = std::move(tls);
  } else {
    server = std::make_unique<httplib::Server>();
  }
  server->set_payload_max_length(options.body_limit);
  server->set_read_timeout(options.read_timeout_s, 0);
  server->set_write_timeout(options.write_timeout_s, 0);
  server->set_keep_alive_max_count(100);
  // A response is written in more than one piece (headers, then body): with Nagle's algorithm on, the last piece
  // waits for the client's delayed acknowledgement of the first, about 40 ms on Linux, on every request.
  server->set_tcp_nodelay(true);
  const auto threads = static_cast<std::size_t>(std::max(1, options.threads));
  server->new_task_queue = [threads] { return new httplib::ThreadPool(threads); };

  const auto handle = [&site, &limiter](const httplib::Request& req, httplib::Response& res, const std::string& body,
                                        const httplib::MultipartFormDataItems& parts) {
    send_page(respond(site, limiter, request_of(req, body, parts)), site, res);
  };
  server->Get(".*", [&handle](const httplib::Request& req, httplib::Response& res) { handle(req, res, "", {}); });
  // The body is read here, within the server's limit (413 beyond it), and parsed by plumb: the library's own form
  // parsing has a fixed limit of its own.
  server->Post(".*", [&handle, &site](const httplib::Request& req, httplib::Response& res,
                                      const httplib::ContentReader& reader) {
    const std::size_t limit = site.options.body_limit;
    std::uint64_t declared = 0;
    try {
      if (req.has_header("Content-Length")) declared = std::stoull(req.get_header_value("Content-Length"));
    } catch (const std::exception&) {
      declared = 0;  // chunked or unreadable: the limit is kept while reading
    }
    std::string body;
    httplib::MultipartFormDataItems parts;
    std::size_t received = 0;  // every byte of every part counts against the limit
    bool complete = declared <= limit;
    if (complete && req.is_multipart_form_data())
      complete = reader(
          [&parts](const httplib::MultipartFormData& header) {
            parts.push_back(header);
            return true;
          },
          [&parts, &received, limit](const char* data, std::size_t length) {
            received += length;
            parts.back().content.append(data, length);
            return received <= limit;
          });
    else if (complete)
      complete = reader([&body, &received, limit](const char* data, std::size_t length) {
        body.append(data, length);
        received += length;
        return received <= limit;
      });
    if (!complete) {
      send_page(received > limit || declared > limit ? too_large(site) : bad_request(), site, res);
      return;
    }
    handle(req, res, body, parts);
  });
  // The library's own refusals (413 before a handler runs, 400 for a malformed request) get a body and the headers;
  // a page's own refusal keeps the page.
  const httplib::Server::HandlerWithResponse library_refusal = [&site](const httplib::Request&,
                                                                       httplib::Response& res) {
    if (!res.body.empty()) return httplib::Server::HandlerResponse::Unhandled;
    WebResponse page = res.status == 413 ? too_large(site) : bad_request();
    page.status = res.status;
    if (res.status != 413) page.body = fmt::format("HTTP status {}\n", res.status);
    send_page(page, site, res);
    return httplib::Server::HandlerResponse::Handled;
  };
  server->set_error_handler(library_refusal);
  server->set_exception_handler([&site](const httplib::Request&, httplib::Response& res, std::exception_ptr) {
    WebResponse page;
    page.status = 500;
    page.content_type = "text/plain; charset=utf-8";
    page.body = "plumb could not answer this request (an internal error); the server keeps running.\n";
    send_page(page, site, res);
  });

  int port = options.port;
  if (port == 0) {
    port = server->bind_to_any_port(options.listen);
    if (port < 0) throw InputError(fmt::format("--listen {}: cannot listen on any port there.", options.listen));
  } else if (!server->bind_to_port(options.listen, port)) {
    throw InputError(
        fmt::format("--listen {} --port {}: cannot listen there (in use, or not an address of this "
                    "machine).",
                    options.listen, port));
  }
  running_server = server.get();
  std::signal(SIGINT, stop_serving);
  std::signal(SIGTERM, stop_serving);
  started(fmt::format("{}://{}:{}/", site.tls ? "https" : "http", options.listen, port));
  server->listen_after_bind();
  running_server = nullptr;
}

}  // namespace plumb::web
