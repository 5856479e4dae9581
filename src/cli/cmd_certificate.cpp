#include <fmt/ostream.h>

#include "app/certificates/dcc_export.hpp"
#include "app/certificates/issue.hpp"
#include "app/certificates/list.hpp"
#include "app/certificates/pdf.hpp"
#include "app/certificates/resolve.hpp"
#include "app/certificates/review.hpp"
#include "cli/command_groups.hpp"
#include "core/errors.hpp"
#include "plumb/version.hpp"
#include "report/certificates/list.hpp"
#include "report/certificates/renderings.hpp"

namespace plumb::cli {
namespace {

// --format pdf needs --output FILE.pdf; checked before anything is issued, so bad input writes nothing.
std::optional<std::string> pdf_output(const po::variables_map& vm, const std::string& format) {
  auto output = optional_string(vm, "output");
  if (format == "pdf" && !output) throw InputError("--format pdf needs --output FILE.pdf.");
  if (format != "pdf" && output) throw InputError(fmt::format("--output is for --format pdf, not {}.", format));
  if (output) app::require_pdf_path(*output);
  return output;
}

// The stored content with its standing today (draft / approved / superseded) beside it.
void print_certificate(store::Database& db, const store::CertificateRecord& c, const std::string& format,
                       const std::optional<std::string>& output, Env& env) {
  const nlohmann::json shown = app::certificate_document(db, c);
  if (format == "pdf") {
    const auto outcome = app::write_certificate_pdf(shown, *output);
    for (const auto& w : outcome.warnings) fmt::print(env.err, "plumb: {}\n", w);
    fmt::print(env.out, "Certificate {} written to {} ({} page(s)).\n", c.number, *output, outcome.pages);
  } else if (format == "json") {
    env.out << report::certificate_json(shown).dump(2) << "\n";
  } else if (format == "html") {
    env.out << report::certificate_html(shown);
  } else {
    env.out << report::certificate_text(shown);
  }
}

}  // namespace

std::vector<Command> certificate_commands() {
  Command issue{
      "certificate",
      "issue",
      "issue the certificate of a check run (stored; never changes)",
      "plumb certificate issue LAST --format text",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("run", po::value<std::string>()->default_value("LAST"),
                        "run number or LAST (the last run recorded)")(
            "layout", po::value<std::string>(), "certificate layout JSON (default: $PLUMB_LAYOUT or built-in)");
        add_format_option(d, "text|json|html|pdf");
        d.add_options()("output", po::value<std::string>(), "FILE.pdf for --format pdf");
        p.add("run", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json", "html", "pdf"});
        const auto output = pdf_output(vm, format);
        auto db = env.open();
        const auto outcome =
            app::issue_certificate(db, env.actor(db), vm["run"].as<std::string>(), optional_string(vm, "layout"));
        if (outcome.already_issued)
          fmt::print(env.err, "plumb: run {} already has certificate {}; shown unchanged.\n",
                     outcome.certificate.run_id, outcome.certificate.number);
        print_certificate(db, outcome.certificate, format, output, env);
        return 0;
      }};
  Command show{"certificate",
               "show",
               "show a stored certificate by number, LAST (the last issued) or run number; --format dcc writes it as "
               "a Digital Calibration Certificate (DCC 3.1.2 XML, D-SI 2.1.0 units; see doc/dcc.md)",
               "plumb certificate show CC-2026-0001 --format dcc --country DE > CC-2026-0001.xml",
               [](po::options_description& d, po::positional_options_description& p) {
                 d.add_options()("number", po::value<std::string>()->required(),
                                 "certificate number, LAST (the last certificate issued) or a run number (its "
                                 "certificate)");
                 add_format_option(d, "text|json|html|pdf|dcc");
                 d.add_options()("output", po::value<std::string>(), "FILE.pdf for --format pdf")(
                     "country", po::value<std::string>(),
                     "the laboratory's ISO 3166-1 two-letter country code, for --format dcc (e.g. DE)");
                 p.add("number", 1);
               },
               [](const po::variables_map& vm, Env& env) {
                 const auto format = format_of(vm, {"text", "json", "html", "pdf", "dcc"});
                 const auto output = pdf_output(vm, format);
                 const auto country = optional_string(vm, "country");
                 if (format == "dcc" && !country)
                   throw InputError(
                       "--format dcc needs --country, the laboratory's ISO 3166-1 two-letter country "
                       "code (e.g. --country DE).");
                 if (format != "dcc" && country)
                   throw InputError(fmt::format("--country is for --format dcc, not {}.", format));
                 auto db = env.open();
                 if (format == "dcc") {
                   env.out << app::certificate_dcc(db, vm["number"].as<std::string>(), {*country, plumb::version});
                   return 0;
                 }
                 print_certificate(db, app::resolve_certificate(db, vm["number"].as<std::string>()), format, output,
                                   env);
                 return 0;
               }};
  Command approve{
      "certificate",
      "approve",
      "approve a draft certificate as its reviewer (someone other than the run's operator)",
      "plumb certificate approve BC-2026-0001 --meaning \"reviewed and approved\"",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("number", po::value<std::string>()->required(),
                        "certificate number, LAST (the last certificate issued) or a run number")(
            "meaning", po::value<std::string>(), "what the signature means, e.g. \"reviewed and approved\" (required)");
        add_format_option(d);
        p.add("number", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        if (!vm.count("meaning"))
          throw InputError("--meaning must state what the signature means, e.g. \"reviewed and approved\".");
        auto db = env.open();
        const auto signer = env.actor(db);
        const auto c =
            app::approve_certificate(db, signer, vm["number"].as<std::string>(), vm["meaning"].as<std::string>());
        if (format == "text") fmt::print(env.out, "Certificate {} approved by {}.\n", c.number, signer.name);
        print_certificate(db, c, format, std::nullopt, env);
        return 0;
      }};
  Command list{
      "certificate",
      "list",
      "list certificates with their state (draft, approved, superseded, withdrawn), filtered by state, "
      "instrument or issue date",
      "plumb certificate list --state approved --instrument BAL-A --from 2026-01-01 --to 2026-12-31",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("state", po::value<std::string>(), "only this state: draft|approved|superseded|withdrawn")(
            "instrument", po::value<std::string>(), "only the certificates of this instrument")(
            "from", po::value<std::string>(), "issued on or after this date (UTC), e.g. 2026-01-01")(
            "to", po::value<std::string>(), "issued on or before this date (UTC)");
        add_format_option(d, "text|json|csv");
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json", "csv"});
        auto db = env.open();
        const auto found = app::list_certificates(db, {optional_string(vm, "state"), optional_string(vm, "instrument"),
                                                       optional_string(vm, "from"), optional_string(vm, "to")});
        if (format == "json")
          env.out << report::certificate_list_json(found.items).dump(2) << "\n";
        else if (format == "csv")
          env.out << report::certificate_list_csv(found.items);
        else
          env.out << report::certificate_list_text(found.items, found.scope);
        return 0;
      }};
  Command queue{"certificate",
                "queue",
                "the approval queue: draft certificates waiting for a reviewer, oldest first, with how long each "
                "has waited",
                "plumb certificate queue --instrument BAL-A",
                [](po::options_description& d, po::positional_options_description&) {
                  d.add_options()("instrument", po::value<std::string>(), "only the drafts of this instrument")(
                      "on", po::value<std::string>(), "count the wait up to this date (default today, UTC)");
                  add_format_option(d, "text|json|csv");
                },
                [](const po::variables_map& vm, Env& env) {
                  const auto format = format_of(vm, {"text", "json", "csv"});
                  auto db = env.open();
                  const auto q = app::approval_queue(db, optional_string(vm, "instrument"), optional_string(vm, "on"));
                  if (format == "json")
                    env.out << report::approval_queue_json(q.items, q.on).dump(2) << "\n";
                  else if (format == "csv")
                    env.out << report::approval_queue_csv(q.items);
                  else
                    env.out << report::approval_queue_text(q.items, q.on);
                  return 0;
                }};
  return {issue, show, approve, list, queue};
}

}  // namespace plumb::cli
