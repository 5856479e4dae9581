#include "report/registry/instrument_page.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string page_text(const json& j, const char* key) {
  if (!j.contains(key) || j[key].is_null()) return "-";
  if (j[key].is_string()) return j[key].get<std::string>().empty() ? "-" : j[key].get<std::string>();
  return j[key].dump();
}

void field(std::string& out, const std::string& label, const std::string& value) {
  for (const auto& l : wrap(value, 78, fmt::format("  {:<20}", label), std::string(22, ' '))) add_line(out, l);
}

std::string page_grams(const json& j, const char* key) {
  return j.contains(key) && j[key].is_number() ? fmt::format("{:.6g} g", j[key].get<double>()) : "-";
}

// U(W) in its form and the two minimum weights with the one that binds (app::balance_in_use).
void in_use_fields(std::string& out, const json& u) {
  if (!u.is_object()) return;
  if (u.contains("absent")) field(out, "in use U(W)", page_text(u, "absent"));
  if (u.contains("formula")) field(out, "in use U(W)", page_text(u, "formula") + "; EURAMET cg-18 v4.0");
  field(out, "minimum weight",
        fmt::format("from calibration {}; USP <41> {}; binding: {}", page_grams(u, "calibration_minimum_weight_g"),
                    page_grams(u, "usp41_minimum_weight_g"),
                    u.value("binding", json()) == "calibration" ? "from calibration"
                    : u.value("binding", json()) == "usp41"     ? "USP <41>"
                                                                : "none"));
  field(out, "", page_text(u, "statement"));
  field(out, "", page_text(u, "caution"));
}

}  // namespace

std::string instrument_page_text(const json& p) {
  std::string out;
  const bool balance = p.value("kind", "") == "balance";
  add_line(out, fmt::format("{} {}", balance ? "Balance" : "Pipette", p.value("id", "")));
  const json& id = p["identity"];
  field(out, "maker / model", fmt::format("{} / {}", page_text(id, "maker"), page_text(id, "model")));
  field(out, "serial number", page_text(id, "serial"));
  field(out, "asset tag", page_text(id, "asset_tag"));
  field(out, "location", page_text(p, "location"));
  field(out, "checked every", page_text(p, "check_every"));
  field(out, "in use since", page_text(p, "in_use_since"));
  if (balance) {
    field(out, "capacity", page_text(p, "capacity"));
    field(out, "readability d", page_text(p, "readability"));
    const json& w = p["weekly_check"];
    if (w.is_object()) {
      std::string policy = page_text(w, "policy_name");
      if (!w["smallest_net"].is_null()) policy += ", smallest net weight " + page_text(w, "smallest_net");
      if (!w["max_bias"].is_null()) policy += ", |bias| <= " + page_text(w, "max_bias");
      if (!w["max_sd"].is_null()) policy += ", s <= " + page_text(w, "max_sd");
      field(out, "weekly check", policy);
      field(out, "readings per check",
            fmt::format("at least {} ({})", w.value("min_readings", 0), w.value("min_readings_basis", "")));
    }
    in_use_fields(out, p.value("in_use", json()));
  } else {
    field(out, "volume",
          fmt::format("{} {}{}", page_text(p, "volume_kind"), page_text(p, "nominal"),
                      p["lower_limit"].is_null() ? "" : " (from " + page_text(p, "lower_limit") + ")"));
    field(out, "channels", page_text(p, "channels"));
    field(out, "limits", page_text(p, "limits"));
  }
  const json& s = p["standing"];
  field(out, "status",
        fmt::format("{}{} (on {})", s.value("status", ""),
                    s["due_on"].is_null() ? "" : ", due " + page_text(s, "due_on"), page_text(p, "on")));
  for (const auto& l : s.value("lines", json::array()))
    field(out, "", fmt::format("{}: {} ({})", l.value("kind", ""), l.value("status", ""), l.value("detail", "")));

  add_line(out, "");
  add_line(out, "Attributes over time");
  for (const auto& v : p.value("attribute_history", json::array())) {
    const bool registered = v.value("change", "") == "registered";
    const std::string why = registered ? "" : v.value("reason", "") + "; ";
    for (const auto& l : wrap(fmt::format("from {}: {} ({}by {} at {})", v.value("from", ""), v.value("change", ""),
                                          why, v.value("recorded_by", ""), v.value("recorded_at", "")),
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
    const std::string cert =
        c.is_object() ? fmt::format("{} ({})", page_text(c, "number"), page_text(c, "state")) : "-";
    add_line(out, fmt::format("  {:>5}  {:<10}  {:<13}  {:<20}  {:<7}  {:<16}  {}", r.value("run_id", 0),
                              r.value("date", ""), r.value("procedure", ""), r.value("operator", "").substr(0, 20),
                              r.value("verdict", ""), cert, r.value("standing", "")));
  }
  return out;
}

}  // namespace plumb::report
