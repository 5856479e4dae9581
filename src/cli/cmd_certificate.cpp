#include <fmt/ostream.h>

#include "app/certificate_pdf.hpp"
#include "app/certificates.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "report/certificate_text.hpp"

namespace plumb::cli {
namespace {

// --format pdf needs --output FILE.pdf; checked before anything is issued, so bad input writes nothing.
std::optional<std::string> pdf_output(const po::variables_map& vm, const std::string& format) {
  const auto output = optional_string(vm, "output");
  if (format == "pdf" && !output) throw InputError("--format pdf needs --output FILE.pdf.");
  if (format != "pdf" && output) throw InputError(fmt::format("--output is for --format pdf, not {}.", format));
  if (output) app::require_pdf_path(*output);
  return output;
}

void print_certificate(const store::CertificateRecord& c, const std::string& format,
                       const std::optional<std::string>& output, Env& env) {
  if (format == "pdf") {
    const auto outcome = app::write_certificate_pdf(c, *output);
    for (const auto& w : outcome.warnings) fmt::print(env.err, "plumb: {}\n", w);
    fmt::print(env.out, "Certificate {} written to {} ({} page(s)).\n", c.number, *output, outcome.pages);
  } else if (format == "json") {
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
                  add_format_option(d, "text|json|pdf");
                  d.add_options()("output", po::value<std::string>(), "FILE.pdf for --format pdf");
                  add_by_option(d, "the person issuing the certificate");
                  p.add("run", 1);
                },
                [](const po::variables_map& vm, Env& env) {
                  const auto format = format_of(vm, {"text", "json", "pdf"});
                  const auto output = pdf_output(vm, format);
                  auto db = env.open();
                  const auto outcome = app::issue_certificate(db, Env::actor(vm), vm["run"].as<std::string>(),
                                                              optional_string(vm, "layout"));
                  if (outcome.already_issued)
                    fmt::print(env.err, "plumb: run {} already has certificate {}; shown unchanged.\n",
                               outcome.certificate.run_id, outcome.certificate.number);
                  print_certificate(outcome.certificate, format, output, env);
                  return 0;
                }};
  Command show{"certificate", "show", "show a stored certificate by number (or by run)",
               "plumb certificate show BC-2026-0001",
               [](po::options_description& d, po::positional_options_description& p) {
                 d.add_options()("number", po::value<std::string>()->required(), "certificate number, run number or LAST");
                 add_format_option(d, "text|json|pdf");
                 d.add_options()("output", po::value<std::string>(), "FILE.pdf for --format pdf");
                 p.add("number", 1);
               },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json", "pdf"});
                 const auto output = pdf_output(vm, format);
                 auto db = env.open();
                 print_certificate(app::find_certificate(db, vm["number"].as<std::string>()), format, output, env);
                 return 0;
               }};
  return {issue, show};
}

}  // namespace plumb::cli
