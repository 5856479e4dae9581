#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include "app/runs/import.hpp"
#include "cli/command_groups.hpp"
#include "cli/progress.hpp"
#include "core/history_csv.hpp"

namespace plumb::cli {
namespace {

nlohmann::json report_json(const app::ImportReport& r, const std::string& file) {
  nlohmann::json instruments = nlohmann::json::object();
  for (const auto& [id, i] : r.instruments)
    instruments[id] = {{"runs", i.runs},
                       {"readings", i.readings},
                       {"failed", i.failed},
                       {"first_date", to_string(i.first_on)},
                       {"last_date", to_string(i.last_on)}};
  nlohmann::json failures = nlohmann::json::array();
  for (const auto& f : r.failures)
    failures.push_back({{"run_id", f.run_id}, {"instrument", f.instrument}, {"date", f.date}, {"line", f.first_line}});
  return {{"file", file},          {"file_sha256", r.file_sha256}, {"batch_id", r.batch_id},
          {"runs", r.runs},        {"readings", r.readings},       {"first_run_id", r.first_run_id},
          {"last_run_id", r.last_run_id}, {"instruments", instruments}, {"failures", failures}};
}

void print_report(std::ostream& out, const app::ImportReport& r, const std::string& file) {
  fmt::print(out, "Imported {} as batch {} (SHA-256 {}...): {} runs, {} readings, {} instrument(s); run numbers {}-{}.\n",
             file, r.batch_id, r.file_sha256.substr(0, 16), r.runs, r.readings, r.instruments.size(), r.first_run_id,
             r.last_run_id);
  fmt::print(out, "\n{:<16}{:>8}{:>10}{:>8}  {}\n", "instrument", "runs", "readings", "failed", "dates");
  for (const auto& [id, i] : r.instruments)
    fmt::print(out, "{:<16}{:>8}{:>10}{:>8}  {} to {}\n", id, i.runs, i.readings, i.failed, to_string(i.first_on),
               to_string(i.last_on));
  if (r.failures.empty()) {
    fmt::print(out, "\nNo run in this history failed its check.\n");
    return;
  }
  fmt::print(out, "\nRuns that failed their check in this history ({}): the instrument was out of service until its "
                  "next passing check.\n",
             r.failures.size());
  for (const auto& f : r.failures)
    fmt::print(out, "  run {:<8} {:<16} {}  (from line {})\n", f.run_id, f.instrument, f.date, f.first_line);
}

}  // namespace

std::vector<Command> import_commands() {
  Command import{
      "check", "import",
      fmt::format("import past checks from a CSV, one reading per row (header: {}[,run]); all or nothing",
                  HistoryCsvParser::header),
      "plumb check import history.csv\n"
      "  history.csv:\n"
      "    instrument,procedure,date,operator,weight,reading,unit\n"
      "    BAL-A,repeatability,2024-03-04,A. Technician,W100,100.0003,g\n"
      "    BAL-A,repeatability,2024-03-04,A. Technician,W100,100.0001,g\n"
      "  Consecutive rows with the same instrument, procedure, date, operator and weight form one run; an optional\n"
      "  `run` column labels runs explicitly. `weight` may join several ids with '+'. Each run is validated and\n"
      "  computed like `check record`; a bad row rejects the whole file with its line number, and the same file\n"
      "  (by SHA-256) is never imported twice.",
      [](po::options_description& d, po::positional_options_description& p) {
        d.add_options()("file", po::value<std::string>()->required(), "the history CSV (positional)");
        add_format_option(d);
        p.add("file", 1);
      },
      [](const po::variables_map& vm, Env& env) {
        const auto format = format_of(vm, {"text", "json"});
        const std::string file = vm["file"].as<std::string>();
        auto db = env.open();
        Progress bar(env.err, "importing", env.err_is_terminal);
        const auto report = app::import_history(db, env.actor(db), file, file,
                                                [&](long long done, long long total) { bar.update(done, total); });
        bar.finish();
        if (format == "json") env.out << report_json(report, file).dump(2) << "\n";
        else print_report(env.out, report, file);
        return 0;
      }};
  return {import};
}

}  // namespace plumb::cli
