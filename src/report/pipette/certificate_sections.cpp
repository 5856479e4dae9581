// Sections of the pipette check certificate (kind "pipette_check", content from app/pipette/certificate_content.cpp):
// the check, the balance used and its traceability, conditions and Z, the results per test volume and channel
// with their limits, a chart of the systematic error per volume, the limits applied, and the recent history.
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/decimal.hpp"
#include "core/units.hpp"
#include "report/certificates/document.hpp"
#include "report/format/text.hpp"
#include "report/pipette/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

std::string grams(const json& j, const char* key) {
  if (!j.is_object() || !j.contains(key) || j[key].is_null()) return "-";
  if (j[key].is_string()) return ExactMass::grams(Decimal::parse(j[key].get<std::string>())).to_string();
  return mass_text(j[key], 4);
}

void check_block(const json& c, Document& doc) {
  const json& run = c.value("check", json::object());
  doc.blocks.push_back(Heading{"Check"});
  doc.blocks.push_back(KeyValues{{{"Run", cell(run, "run_id")},
                                  {"Method", "gravimetric (ISO 8655-6): each delivery weighed, converted with Z"},
                                  {"Edition", cell(c, "edition_statement")},
                                  {"Performed", fmt::format("{} by {}", cell(run, "date"), cell(run, "operator"))}}});
}

void balance_block(const json& c, Document& doc) {
  const json& bal = c.value("balance_used", json::object());
  const json& rb = c.value("check", json::object()).value("balance", json::object());
  doc.blocks.push_back(Heading{"Balance used (traceability)"});
  doc.blocks.push_back(KeyValues{
      {{"Balance", fmt::format("{} ({}), readability d = {}, capacity {}", cell(bal, "id"), cell(bal, "location"),
                               grams(bal, "readability_g"), grams(bal, "capacity_g"))},
       {"Latest check",
        fmt::format("{} run {} on {}: {}; next due {}", cell(bal, "check_procedure"), cell(bal, "check_run"),
                    cell(bal, "checked_on"), cell(bal, "check_verdict"), cell(bal, "due_on"))},
       {"Check certificate", bal.contains("check_certificate") && bal["check_certificate"].is_string()
                                 ? bal["check_certificate"].get<std::string>()
                                 : "not issued"},
       {"Repeatability s", rb.contains("repeatability_g") && rb["repeatability_g"].is_number()
                               ? fmt::format("{:.5f} mg (run {}), suitable per ISO 8655-6 Table 1",
                                             rb["repeatability_g"].get<double>() * 1e3, cell(rb, "repeatability_run"))
                               : "-"}}});
  // The balance calibration whose U(E) stands for the balance in the uncertainty budget, or why none does.
  KeyValues cal;
  if (bal.contains("calibration_run") && !bal["calibration_run"].is_null())
    cal.rows.emplace_back(
        "Balance calibration in the budget",
        fmt::format("calibration run {}, certificate {}", cell(bal, "calibration_run"),
                    bal.contains("calibration_certificate") && bal["calibration_certificate"].is_string()
                        ? bal["calibration_certificate"].get<std::string>()
                        : "not issued"));
  else if (bal.contains("calibration_absent"))
    cal.rows.emplace_back("Balance calibration in the budget", cell(bal, "calibration_absent"));
  if (!cal.rows.empty()) doc.blocks.push_back(std::move(cal));
  Table t{{"Reference weight", "Nominal", "Class", "Conventional mass", "U (k)", "Certificate", "Calibrated", "Due"},
          {1.0, 0.7, 0.5, 1.3, 1.2, 1.1, 0.9, 0.9},
          {false, true, false, true, true, false, false, false},
          {}};
  for (const auto& w : c.value("weights", json::array()))
    t.rows.push_back({cell(w, "id"), cell(w, "nominal"), cell(w, "class"), grams(w, "conventional_mass_g"),
                      fmt::format("{} ({})", grams(w, "uncertainty_g"), cell(w, "k")), cell(w, "certificate"),
                      cell(w, "calibrated_on"), cell(w, "due_on")});
  if (!t.rows.empty()) {
    doc.blocks.push_back(Paragraph{"The weights behind the balance's latest check:", true});
    doc.blocks.push_back(std::move(t));
  }
}

void conditions_block(const json& run, Document& doc) {
  const json& env = run.value("environment", json::object());
  const json& z = run.value("z", json::object());
  doc.blocks.push_back(Heading{"Conditions and conversion factor Z"});
  doc.blocks.push_back(KeyValues{
      {{"Conditions", fmt::format("water {:g} degC, air pressure {:g} hPa, relative humidity {:g} %",
                                  number_field(env, "water_temperature_c"), number_field(env, "air_pressure_hpa"),
                                  number_field(env, "humidity_pct"))},
       {"Evaporation", env.contains("evaporation_g") && env["evaporation_g"].is_number()
                           ? mass_text(env["evaporation_g"]) + " per weighing, added to each"
                           : "not applied"},
       {"Z", fmt::format("{:.7f} uL/mg; V = (m + evaporation) x Z", number_field(z, "z_ul_per_mg"))},
       {"Densities", fmt::format("water {:.5f} kg/m3 (Tanaka et al. 2001), air {:.5f} kg/m3 (OIML R 111-1 Annex E), "
                                 "weights {:g} kg/m3",
                                 number_field(z, "water_density_kg_m3"), number_field(z, "air_density_kg_m3"),
                                 number_field(z, "weight_density_kg_m3"))}}});
}

std::string limit_text(const json& l, int dp) {
  if (l.value("compare_in_pct", false)) return fmt::format("\u00b1{:.3f} %", number_field(l, "systematic_pct"));
  return fmt::format("\u00b1{:.{}f} uL", number_field(l, "systematic_ul"), dp);
}

std::string random_limit_text(const json& l, int dp) {
  if (l.value("compare_in_pct", false)) return fmt::format("CV {:.3f} %", number_field(l, "random_pct"));
  return fmt::format("{:.{}f} uL", number_field(l, "random_ul"), dp);
}

// U of each result with k, and the largest term of its budget; runs recorded before the budget was stored go
// without this table.
void uncertainty_block(const json& run, Document& doc) {
  Table t{{"Volume", "Ch", "U(e_s) / uL", "U(e_s) / %", "U(s_r) / uL", "k", "Largest contribution"},
          {0.8, 0.35, 0.9, 0.8, 0.9, 0.4, 2.6},
          {true, true, true, true, true, true, false},
          {}};
  for (const auto& tv : run.value("volumes", json::array())) {
    const int dp = pipette_volume_decimals(number_field(tv, "selected_ul"));
    for (const auto& ch : tv.value("channels", json::array())) {
      if (!ch.contains("uncertainty")) continue;
      const json& u = ch["uncertainty"];
      std::string largest;
      double share = -1;
      for (const auto& line : u.value("budget", json::array()))
        if (number_field(line, "share") > share) {
          share = number_field(line, "share");
          largest = fmt::format("{} ({:.0f} %)", line.value("source", ""), 100 * share);
        }
      t.rows.push_back({tv.value("selected", "") + " uL", cell(ch, "channel"),
                        fmt::format("{:.{}f}", number_field(u, "systematic_u_ul"), dp + 1),
                        fmt::format("{:.4f}", number_field(u, "systematic_u_pct")),
                        fmt::format("{:.{}f}", number_field(u, "random_u_ul"), dp + 1),
                        fmt::format("{:g}", number_field(u, "k")), largest});
    }
  }
  if (t.rows.empty()) return;
  doc.blocks.push_back(Heading{"Uncertainty of the results"});
  doc.blocks.push_back(Paragraph{
      "GUM (JCGM 100:2008) budget of the mean volume per ISO 8655-6: repeatability of the mean s_r / sqrt(n), "
      "balance calibration (when known) and readability, water temperature through dZ/dt, air density, "
      "evaporation correction and the water density formula behind Z; U(e_s) = U(mean volume). "
      "U(s_r) = k s_r / sqrt(2 (n - 1)) (GUM E.4.3). k = 2, coverage probability about 95 %. The largest "
      "contribution is given with its share of u_c^2.",
      true});
  doc.blocks.push_back(std::move(t));
}

void results_block(const json& run, Document& doc) {
  doc.blocks.push_back(Heading{"Results per test volume and channel"});
  doc.blocks.push_back(
      Paragraph{"e_s = mean volume - selected volume (systematic error); s_r = SD of the delivered "
                "volumes (random error); CV = s_r / mean volume.",
                true});
  Table t{{"Volume", "Ch", "n", "Mean / uL", "e_s / uL", "e_s / %", "s_r / uL", "CV / %", "e_s limit", "s_r limit",
           "Verdict"},
          {0.8, 0.35, 0.35, 1.0, 0.85, 0.75, 0.8, 0.7, 0.95, 0.95, 0.7},
          {true, true, true, true, true, true, true, true, true, true, false},
          {}};
  for (const auto& tv : run.value("volumes", json::array())) {
    const int dp = pipette_volume_decimals(number_field(tv, "selected_ul"));
    for (const auto& ch : tv.value("channels", json::array())) {
      const json& l = ch.value("limits", json::object());
      t.rows.push_back({tv.value("selected", "") + " uL", cell(ch, "channel"), cell(ch, "n"),
                        fmt::format("{:.{}f}", number_field(ch, "mean_ul"), dp),
                        fmt::format("{:+.{}f}", number_field(ch, "systematic_error_ul"), dp),
                        fmt::format("{:+.3f}", number_field(ch, "systematic_error_pct")),
                        fmt::format("{:.{}f}", number_field(ch, "random_error_ul"), dp),
                        fmt::format("{:.3f}", number_field(ch, "cv_pct")), limit_text(l, dp), random_limit_text(l, dp),
                        ch.value("verdict", "") == "pass" ? "pass" : "FAIL"});
    }
  }
  doc.blocks.push_back(std::move(t));
  uncertainty_block(run, doc);
}

// e_s against the test volume in the unit the limits are stated in (uL for ISO 8655-2's absolute limits, which then
// form a constant band; % where the limits compare in %), one series per channel (up to four; more share one),
// with U = 2 s_r / sqrt(n) as error bars and the limit at each tested volume.
void chart_block(const json& c, const json& run, Document& doc) {
  const json& volumes = run.value("volumes", json::array());
  if (volumes.size() < 2) return;  // one volume: the table says it all
  const json first_limits = volumes[0].value("channels", json::array()).empty()
                                ? json::object()
                                : volumes[0]["channels"][0].value("limits", json::object());
  const bool in_pct = first_limits.value("compare_in_pct", false);
  ChartSpec s;
  s.title = fmt::format("Pipette {}: systematic error per test volume", c["instrument"].value("id", ""));
  s.subtitle =
      fmt::format("Check run {} on {}, {} test volume(s)", cell(run, "run_id"), cell(run, "date"), volumes.size());
  s.x = {"Test volume", "uL", AxisScale::number};
  s.y = {"Systematic error e_s", in_pct ? "%" : "uL", AxisScale::number};
  ChartCurve upper{"\u00b1e_s limit at each tested volume", ChartCurve::Style::limit, {}};
  ChartCurve lower = upper;
  int channels = 0;
  for (const auto& tv : volumes)
    channels = std::max(channels, static_cast<int>(tv.value("channels", json::array()).size()));
  const bool per_channel = channels > 1 && channels <= 4;
  s.series.resize(per_channel ? static_cast<std::size_t>(channels) : 1);
  for (std::size_t i = 0; i < s.series.size(); ++i)
    s.series[i].name = per_channel ? fmt::format("channel {}", i + 1) : channels > 1 ? "all channels" : "e_s";
  bool any_failed = false;
  for (const auto& tv : volumes) {
    const double v = number_field(tv, "selected_ul");
    const double scale = in_pct ? (v > 0 ? 100 / v : 0) : 1;  // uL -> % of the selected volume
    std::size_t i = 0;
    for (const auto& ch : tv.value("channels", json::array())) {
      const double n = number_field(ch, "n");
      // U from the run's budget; runs recorded before it carry only the scatter of the mean (a lower bound).
      const json& st = ch.value("uncertainty", json::object());
      const double u = st.is_object() && st.contains("systematic_u_ul") ? number_field(st, "systematic_u_ul") * scale
                       : n > 0 ? 2 * number_field(ch, "random_error_ul") / std::sqrt(n) * scale
                               : 0;
      const bool failed = ch.value("verdict", "") != "pass";
      any_failed = any_failed || failed;
      s.series[per_channel ? i : 0].points.push_back(
          {v, number_field(ch, in_pct ? "systematic_error_pct" : "systematic_error_ul"), u, failed});
      ++i;
    }
    const json& chs = tv.value("channels", json::array());
    if (!chs.empty()) {
      const double lim =
          number_field(chs[0].value("limits", json::object()), in_pct ? "systematic_pct" : "systematic_ul");
      upper.points.emplace_back(v, lim);
      lower.points.emplace_back(v, -lim);
    }
  }
  std::sort(upper.points.begin(), upper.points.end());
  std::sort(lower.points.begin(), lower.points.end());
  s.curves = {std::move(upper), std::move(lower)};
  const bool budgeted =
      volumes[0].value("channels", json::array()).empty() || volumes[0]["channels"][0].contains("uncertainty");
  s.notes = {budgeted ? fmt::format("Error bars: U (k = 2) of e_s{} from the ISO 8655-6 budget of each result.",
                                    in_pct ? " in % of the selected volume" : "")
                      : fmt::format("Error bars: U (k = 2) = 2 s_r / sqrt(n){}, the scatter of the mean only.",
                                    in_pct ? " in % of the selected volume" : ""),
             "The limits are known at the tested volumes only: each is marked there; the dotted line joining them "
             "is a guide."};
  if (any_failed) s.notes.push_back("Ringed: a channel that failed its limits at that volume (see the reasons below).");
  s.width = 720;
  s.height = 360;
  doc.blocks.push_back(Heading{"Systematic error per test volume"});
  doc.blocks.push_back(ChartBlock{std::move(s)});
}

void limits_block(const json& run, Document& doc) {
  doc.blocks.push_back(Heading{"Limits applied"});
  std::vector<std::string> bases;
  for (const auto& tv : run.value("volumes", json::array()))
    for (const auto& ch : tv.value("channels", json::array())) {
      const std::string b =
          fmt::format("{} uL: {}", tv.value("selected", ""), cell(ch.value("limits", json::object()), "basis"));
      if (std::find(bases.begin(), bases.end(), b) == bases.end()) bases.push_back(b);
    }
  for (const auto& b : bases) doc.blocks.push_back(Paragraph{b, true});
}

// The original record: every weighing as the balance displayed it, by test volume and channel.
void weighings_block(const json& run, Document& doc) {
  const json& readings = run.value("readings", json::array());
  if (readings.empty()) return;
  doc.blocks.push_back(Heading{"Weighings as displayed"});
  // Five to a row, so the table reads like the balance's print-out and stays inside the page in every rendering.
  Table t{{"Series", "Nos.", "Weighings"}, {1.2, 0.5, 3.0}, {false, true, false}, {}};
  std::string series, values;
  int first = 0, n = 0;
  const auto flush = [&] {
    if (!values.empty()) t.rows.push_back({series, fmt::format("{}-{}", first, n), values});
    values.clear();
  };
  for (const auto& r : readings) {
    const std::string s = cell(r, "series");
    if (s != series || n - first + 1 == 5) {
      flush();
      if (s != series) n = 0;
      series = s;
      first = n + 1;
    }
    ++n;
    values += (values.empty() ? "" : "  ") + cell(r, "text") + " " + cell(r, "unit");
  }
  flush();
  doc.blocks.push_back(std::move(t));
}

}  // namespace

void pipette_check_sections(const json& c, Document& doc) {
  const json& run = c.value("check", json::object());
  check_block(c, doc);
  balance_block(c, doc);
  conditions_block(run, doc);
  results_block(run, doc);
  chart_block(c, run, doc);
  limits_block(run, doc);
  weighings_block(run, doc);
  for (const auto& r : run.value("reasons", json::array()))
    doc.blocks.push_back(Paragraph{"Fail: " + r.get<std::string>()});
  for (const auto& n : run.value("notes", json::array()))
    doc.blocks.push_back(Paragraph{"Note: " + n.get<std::string>(), true});
  history_chart_section(c, doc);
}

}  // namespace plumb::report
