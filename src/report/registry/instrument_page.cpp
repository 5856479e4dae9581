#include "report/registry/instrument_page.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string text_of(const json& j, const char* key) {
  if (!j.contains(key) || j[key].is_null()) return "-";
  if (j[key].is_string()) return j[key].get<std::string>().empty() ? "-" : j[key].get<std::string>();
  return j[key].dump();
}

void field(std::string& out, const std::string& label, const std::string& value) {
  for (const auto& l : wrap(value, 78, fmt::format("  {:<20}", label), std::string(22, ' '))) add_line(out, l);
}

}  // namespace

std::string instrument_page_text(const json& p) {
  std::string out;
  const bool balance = p.value("kind", "") == "balance";
  add_line(out, fmt::format("{} {}", balance ? "Balance" : "Pipette", p.value("id", "")));
  const json& id = p["identity"];
  field(out, "maker / model", fmt::format("{} / {}", text_of(id, "maker"), text_of(id, "model")));
  field(out, "serial number", text_of(id, "serial"));
  field(out, "asset tag", text_of(id, "asset_tag"));
  field(out, "location", text_of(p, "location"));
  field(out, "checked every", text_of(p, "check_every"));
  field(out, "in use since", text_of(p, "in_use_since"));
  if (balance) {
    field(out, "capacity", text_of(p, "capacity"));
    field(out, "readability d", text_of(p, "readability"));
    const json& w = p["weekly_check"];
    if (w.is_object()) {
      std::string policy = text_of(w, "policy_name");
      if (!w["smallest_net"].is_null()) policy += ", smallest net weight " + text_of(w, "smallest_net");
      if (!w["max_bias"].is_null()) policy += ", |bias| <= " + text_of(w, "max_bias");
      if (!w["max_sd"].is_null()) policy += ", s <= " + text_of(w, "max_sd");
      field(out, "weekly check", policy);
      field(out, "readings per check",
            fmt::format("at least {} ({})", w.value("min_readings", 0), w.value("min_readings_basis", "")));
    }
  } else {
    field(out, "volume", fmt::format("{} {}{}", text_of(p, "volume_kind"), text_of(p, "nominal"),
                                     p["lower_limit"].is_null() ? "" : " (from " + text_of(p, "lower_limit") + ")"));
    field(out, "channels", text_of(p, "channels"));
    field(out, "limits", text_of(p, "limits"));
  }
  const json& s = p["standing"];
  field(out, "status", fmt::format("{}{} (on {})", s.value("status", ""),
                                   s["due_on"].is_null() ? "" : ", due " + text_of(s, "due_on"), text_of(p, "on")));
  for (const auto& l : s.value("lines", json::array()))
    field(out, "", fmt::format("{}: {} ({})", l.value("kind", ""), l.value("status", ""), l.value("detail", "")));

  add_line(out, "");
  add_line(out, "Attributes over time");
  for (const auto& v : p.value("attribute_history", json::array())) {
    const bool registered = v.value("change", "") == "registered";
    const std::string why = registered ? "" : v.value("reason", "") + "; ";
    for (const auto& l : wrap(fmt::format("from {}: {} ({}by {} at {})", v.value("from", ""), v.value("change", ""), why,
                                          v.value("recorded_by", ""), v.value("recorded_at", "")),
                              78, "  ", "    "))
      add_line(out, l);
  }

  add_line(out, "");
  const json& runs = p["runs"];
  add_line(out, fmt::format("Check runs ({})", runs.size()));
  if (!runs.empty())
    add_line(out, fmt::format("  {:>5}  {:<10}  {:<13}  {:<20}  {:<7}  {:<16}  {}", "run", "date", "procedure",
                              "operator", "verdict", "certificate", "standing"));
  for (const auto& r : runs) {
    const json& c = r["certificate"];
    const std::string cert = c.is_object() ? fmt::format("{} ({})", text_of(c, "number"), text_of(c, "state")) : "-";
    add_line(out, fmt::format("  {:>5}  {:<10}  {:<13}  {:<20}  {:<7}  {:<16}  {}", r.value("run_id", 0),
                              r.value("date", ""), r.value("procedure", ""), r.value("operator", "").substr(0, 20),
                              r.value("verdict", ""), cert, r.value("standing", "")));
  }
  return out;
}

}  // namespace plumb::report
