#include <fmt/ostream.h>

#include <filesystem>
#include <fstream>

#include <nlohmann/json.hpp>

#include "app/certificates/issue.hpp"
#include "app/certificates/pdf.hpp"
#include "app/certificates/review.hpp"
#include "app/demo/demo_lab.hpp"
#include "app/history/html_report.hpp"
#include "app/status/due.hpp"
#include "cli/command_groups.hpp"
#include "cli/progress.hpp"
#include "report/certificates/renderings.hpp"
#include "report/document/demo_logo.hpp"
#include "store/embedded.hpp"
#include "store/users.hpp"
#include "web/serve_options.hpp"

namespace plumb::cli {

std::vector<Command> demo_commands() {
  Command demo{
      "demo",
      "",
      "build an invented demo laboratory with a year of weekly checks, then show what is due",
      "plumb demo            (writes ./plumb-demo.db; or plumb --db /tmp/demo.db demo)",
      [](po::options_description&, po::positional_options_description&) {},
      [](const po::variables_map&, Env& env) {
        // The demo never touches the lab's default database: without --db it writes ./plumb-demo.db.
        const std::filesystem::path path = env.db_given ? env.db_path : std::filesystem::path("plumb-demo.db");
        Progress bar(env.err, "demo: recording weekly checks", env.err_is_terminal);
        const auto summary = app::build_demo(path, [&](int done, int total) { bar.update(done, total); });
        bar.finish();
        fmt::print(env.out, "Demo laboratory \"{}\" written to {}: {} check runs, {} failed.\n\n", summary.lab,
                   path.string(), summary.runs, summary.failed_runs);

        store::Database db(path, store::Database::Open::existing);
        fmt::print(env.out, "What is due on {} (within 14 days):\n", to_string(summary.report_on));
        for (const auto& i : app::due_items(db, summary.report_on, 14))
          fmt::print(env.out, "  {:<8}{:<8}{:<16}{:<12}{:>8}  {}\n", i.kind, i.id, i.status,
                     i.due_on ? to_string(*i.due_on) : "-", i.days_left ? fmt::format("{} d", *i.days_left) : "",
                     i.detail);

        // The certificate uses the demo lab's own layout (address, reviewer), written beside the database.
        const auto scenario = nlohmann::json::parse(embedded::demo_scenario());
        const std::filesystem::path layout = path.string() + ".layout.json";
        const auto logo = std::filesystem::absolute(path.string() + ".logo.png");
        report::write_demo_logo(logo);
        auto demo_layout = scenario["layout"];
        demo_layout["logo_png"] = logo.string();
        std::ofstream(layout) << demo_layout.dump(2);
        const auto ines = store::find_user_by_login(db.sql(), "ines");
        const auto cert = app::issue_certificate(db, {ines->full_name, store::current_os_user(), ines->id},
                                                 std::to_string(summary.showcase_run), layout.string());
        const auto shown = app::certificate_document(db, cert.certificate);
        fmt::print(env.out, "\nCertificate of the latest check of AB-01:\n\n{}", report::certificate_text(shown));
        // The same certificate as PDF, and the lab's HTML history report, beside the database.
        const std::filesystem::path pdf = path.string() + ".certificate.pdf", html = path.string() + ".report.html";
        app::write_certificate_pdf(shown, pdf);
        const auto report = app::write_history_report(db, {html, std::nullopt, summary.report_on});
        fmt::print(env.out,
                   "\nAlso written: {} (the certificate as PDF) and {} (HTML history report; one page per "
                   "instrument in {}).\n",
                   pdf.string(), html.string(), report.folder ? report.folder->string() : html.string());
        fmt::print(env.out,
                   "\nTry: plumb --db {} due --on {} --within 14d\n     plumb --db {} check show LAST\n     plumb --db "
                   "{} drift AB-01 --chart ab01-drift.png\n",
                   path.string(), to_string(summary.report_on), path.string(), path.string());
        fmt::print(env.out, "     plumb --db {} certificate queue\n", path.string());
        fmt::print(env.out, "\nDemo accounts (DEMO ONLY: these passwords are printed here and must never protect "
                            "real records):\n");
        for (const auto& u : summary.users)
          fmt::print(env.out, "  {:<12}{:<20}{:<17}password {}\n", u.login, u.name, u.role, u.password);
        fmt::print(env.out, "Log in with: plumb --db {} login --user mira   (then sign: plumb --db {} certificate "
                            "approve LAST --meaning \"reviewed and approved\")\n",
                   path.string(), path.string());
        std::string technician = "a technician";
        for (const auto& u : summary.users)
          if (u.role == "technician") {
            technician = u.login + " (technician)";
            break;
          }
        fmt::print(env.out,
                   "In a browser: plumb --db {} serve, then open http://127.0.0.1:{}/ and log in as {} or "
                   "mira (reviewer) with the demo password above.\n",
                   path.string(), web::default_port, technician);
        return 0;
      }};
  return {demo};
}

}  // namespace plumb::cli
