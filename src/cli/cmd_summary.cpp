#include <fmt/ostream.h>

#include <nlohmann/json.hpp>

#include "app/status/summary.hpp"
#include "cli/command_groups.hpp"

namespace plumb::cli {
namespace {

std::string opt_date(const std::optional<Date>& d) { return d ? to_string(*d) : ""; }
std::string opt_number(const std::optional<double>& v) { return v ? fmt::format("{:.6g}", *v) : ""; }
std::string opt_int(const std::optional<int>& v) { return v ? std::to_string(*v) : ""; }

std::string csv_field(const std::string& s) {
  if (s.find_first_of(",\"\n") == std::string::npos) return s;
  std::string q = "\"";
  for (char c : s) q += c == '"' ? std::string("\"\"") : std::string(1, c);
  return q + "\"";
}

nlohmann::json row_json(const app::SummaryRow& r) {
  const auto& i = r.instrument;
  const auto opt = [](const auto& v) { return v ? nlohmann::json(*v) : nlohmann::json(); };
  nlohmann::json latest;
  if (i.latest)
    latest = {{"run_id", i.latest->run_id},
              {"procedure", std::string(checks::to_string(i.latest->procedure))},
              {"date", to_string(i.latest->performed_on)},
              {"operator", i.latest->operator_name},
              {"verdict", std::string(to_string(i.latest->verdict))},
              {"bias_g", opt(i.latest->bias_g)},
              {"sd_g", opt(i.latest->sd_g)}};
  return {{"id", i.id},
          {"kind", i.kind},
          {"location", i.location},
          {"check_every", i.check_every},
          {"status", r.status},
          {"next_due", r.next_due ? nlohmann::json(to_string(*r.next_due)) : nlohmann::json()},
          {"days_left", opt(r.days_left)},
          {"latest", latest}};
}

}  // namespace

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
        const Date on = vm.count("on") ? parse_date(vm["on"].as<std::string>(), "--on") : today_utc();
        auto db = env.open();
        // Rows are printed as they come from the database: memory stays flat however large the lab.
        long long count = 0;
        if (format == "json") fmt::print(env.out, "{{\n  \"on\": \"{}\",\n  \"instruments\": [", to_string(on));
        if (format == "csv")
          env.out << "id,kind,location,status,next_due,days_left,last_run,last_date,procedure,verdict,bias_g,sd_g\n";
        if (format == "text")
          fmt::print(env.out, "Lab summary on {}:\n{:<16}{:<9}{:<16}{:<12}{:>6}  {:<11}{:<8}{:>13}{:>13}\n",
                     to_string(on), "instrument", "kind", "status", "next due", "days", "last check", "verdict",
                     "bias (g)", "s (g)");
        app::lab_summary(db, on, [&](const app::SummaryRow& r) {
          const auto& i = r.instrument;
          const auto& l = i.latest;
          if (format == "json") {
            env.out << (count ? ",\n    " : "\n    ") << row_json(r).dump();
          } else if (format == "csv") {
            fmt::print(env.out, "{},{},{},{},{},{},{},{},{},{},{},{}\n", csv_field(i.id), i.kind, csv_field(i.location),
                       r.status, opt_date(r.next_due), opt_int(r.days_left), l ? std::to_string(l->run_id) : "",
                       l ? to_string(l->performed_on) : "", l ? std::string(checks::to_string(l->procedure)) : "",
                       l ? std::string(to_string(l->verdict)) : "", l ? opt_number(l->bias_g) : "",
                       l ? opt_number(l->sd_g) : "");
          } else {
            fmt::print(env.out, "{:<16}{:<9}{:<16}{:<12}{:>6}  {:<11}{:<8}{:>13}{:>13}\n", i.id, i.kind, r.status,
                       r.next_due ? to_string(*r.next_due) : "-", opt_int(r.days_left),
                       l ? to_string(l->performed_on) : "never", l ? std::string(to_string(l->verdict)) : "-",
                       l ? opt_number(l->bias_g) : "", l ? opt_number(l->sd_g) : "");
          }
          ++count;
        });
        if (format == "json") env.out << (count ? "\n  ]\n}\n" : "]\n}\n");
        if (format == "text") fmt::print(env.out, "{} instrument(s).\n", count);
        return 0;
      }};
  return {summary};
}

}  // namespace plumb::cli
