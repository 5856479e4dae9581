#include "report/status/due_list.hpp"

#include <fmt/format.h>

#include <sstream>

#include "report/format/csv.hpp"

namespace plumb::report {

using nlohmann::json;

std::string due_text(const std::vector<DueItem>& items, Date on, int within_days) {
  std::string out = fmt::format("Due on or before {} ({} days from {}):\n", to_string(add_days(on, within_days)),
                                within_days, to_string(on));
  if (items.empty()) out += "  nothing is due.\n";
  for (const auto& i : items)
    out += fmt::format("  {:<12}{:<10}{:<16}{:<12}{:>10}  {}\n", i.kind, i.id, i.status,
                       i.due_on ? to_string(*i.due_on) : "-", i.days_left ? fmt::format("{} d", *i.days_left) : "",
                       i.detail);
  return out;
}

std::string due_csv(const std::vector<DueItem>& items) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"kind", "id", "status", "due_on", "days_left", "location", "detail"});
  for (const auto& i : items) {
    csv.value(i.kind).value(i.id).value(i.status);
    i.due_on ? csv.value(to_string(*i.due_on)) : csv.empty();
    i.days_left ? csv.integer(*i.days_left) : csv.empty();
    csv.text(i.location).text(i.detail);
    csv.end_row();
  }
  return out.str();
}

json due_json(const std::vector<DueItem>& items, Date on, int within_days) {
  json list = json::array();
  for (const auto& i : items)
    list.push_back({{"kind", i.kind},
                    {"id", i.id},
                    {"location", i.location},
                    {"status", i.status},
                    {"due_on", i.due_on ? json(to_string(*i.due_on)) : json()},
                    {"days_left", i.days_left ? json(*i.days_left) : json()},
                    {"detail", i.detail}});
  return {{"on", to_string(on)}, {"within_days", within_days}, {"items", list}};
}

}  // namespace plumb::report
