// `plumb report --html FILE`: the self-contained HTML history report. Read-only on the database.
#include <fmt/ostream.h>

#include "app/history/html_report.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {

std::vector<Command> report_commands() {
  Command report{"report",
                 "",
                 "write an HTML history report (status, due list, charts, history): one page, or for the whole lab an "
                 "overview and one page per instrument",
                 "plumb report --html lab-history.html [--instrument AB-01] [--on 2026-12-01]",
                 [](po::options_description& d, po::positional_options_description&) {
                   d.add_options()("html", po::value<std::string>()->required(), "the report file, FILE.html")(
                       "instrument", po::value<std::string>(), "one instrument only (default: the whole lab)")(
                       "on", po::value<std::string>(), "date of the status and due list (default today)");
                 },
                 [](const po::variables_map& vm, Env& env) {
                   app::HistoryReportRequest request;
                   request.output = vm["html"].as<std::string>();
                   request.instrument = optional_string(vm, "instrument");
                   request.on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_local();
                   auto db = env.open();
                   const auto written = app::write_history_report(db, request);
                   if (written.folder)
                     fmt::print(env.out, "Report on {} instrument(s) written to {}, one page per instrument in {}.\n",
                                written.instruments, request.output.string(), written.folder->string());
                   else
                     fmt::print(env.out, "Report on {} instrument(s) written to {}.\n", written.instruments,
                                request.output.string());
                   return 0;
                 }};
  return {report};
}

}  // namespace plumb::cli
