#include <fmt/ostream.h>

#include "app/certificates.hpp"
#include "cli/command_groups.hpp"
#include "report/certificate_text.hpp"

namespace plumb::cli {
namespace {

void print_certificate(const store::CertificateRecord& c, const std::string& format, Env& env) {
  if (format == "json") {
    nlohmann::json j = c.content;
    j["content_sha256"] = c.content_sha256;
    env.out << j.dump(2) << "\n";
  } else {
    env.out << report::certificate_text(c.content, c.content_sha256);
  }
}

}  // namespace

std::vector<Command> certificate_commands() {
  Command issue{"certificate", "issue", "issue the certificate of a check run (stored; never changes)",
                "plumb certificate issue LAST --format text",
                [](po::options_description& d, po::positional_options_description& p) {
                  d.add_options()("run", po::value<std::string>()->default_value("LAST"), "run number or LAST")(
                      "layout", po::value<std::string>(), "certificate layout JSON (default: $PLUMB_LAYOUT or built-in)");
                  add_format_option(d);
                  add_by_option(d, "the person issuing the certificate");
                  p.add("run", 1);
                },
                [](const po::variables_map& vm, Env& env) {
                  const auto format = format_of(vm, {"text", "json"});
                  auto db = env.open();
                  const auto outcome = app::issue_certificate(db, Env::actor(vm), vm["run"].as<std::string>(),
                                                              optional_string(vm, "layout"));
                  if (outcome.already_issued)
                    fmt::print(env.err, "plumb: run {} already has certificate {}; shown unchanged.\n",
                               outcome.certificate.run_id, outcome.certificate.number);
                  print_certificate(outcome.certificate, format, env);
                  return 0;
                }};
  Command show{"certificate", "show", "show a stored certificate by number (or by run)",
               "plumb certificate show BC-2026-0001",
               [](po::options_description& d, po::positional_options_description& p) {
                 d.add_options()("number", po::value<std::string>()->required(), "certificate number, run number or LAST");
                 add_format_option(d);
                 p.add("number", 1);
               },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json"});
                 auto db = env.open();
                 print_certificate(app::find_certificate(db, vm["number"].as<std::string>()), format, env);
                 return 0;
               }};
  return {issue, show};
}

}  // namespace plumb::cli
