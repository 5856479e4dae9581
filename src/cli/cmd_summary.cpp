#include "app/status/summary.hpp"
#include "cli/command_groups.hpp"
#include "report/status/summary.hpp"

namespace plumb::cli {

std::vector<Command> summary_commands() {
  Command summary{
      "summary", "", "every instrument with its latest result (verdict, bias, SD) and next due date",
      "plumb summary --on 2026-12-01 --format csv",
      [](po::options_description& d, po::positional_options_description&) {
        d.add_options()("on", po::value<std::string>(), "reference date, YYYY-MM-DD (default today)");
        add_format_option(d, "text|json|csv");
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json", "csv"});
        const Date on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_local();
        auto db = env.open();
        // Rows are printed as they come from the database: memory stays flat however large the lab.
        report::SummaryWriter writer(env.out,
                                     format == "json"  ? report::SummaryFormat::as_json
                                     : format == "csv" ? report::SummaryFormat::as_csv
                                                       : report::SummaryFormat::as_text,
                                     on);
        app::lab_summary(db, on, [&](const report::SummaryRow& r) { writer.row(r); });
        writer.finish();
        return 0;
      }};
  return {summary};
}

}  // namespace plumb::cli
