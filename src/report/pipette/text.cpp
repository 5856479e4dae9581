#include "report/pipette/text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "report/format/text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

}  // namespace

int pipette_volume_decimals(double selected_ul) {
  if (selected_ul <= 0) return 3;
  return std::clamp(5 - static_cast<int>(std::floor(std::log10(selected_ul))), 1, 6);
}

std::vector<std::string> pipette_results_table(const json& r) {
  std::vector<std::string> rows;
  rows.push_back(fmt::format("  {:>9} {:>3} {:>3} {:>11} {:>10} {:>8} {:>9} {:>7}  {}", "volume", "ch", "n",
                             "mean uL", "e_s uL", "e_s %", "s_r uL", "CV %", "verdict"));
  for (const auto& tv : r.value("volumes", json::array())) {
    const double v = number_field(tv, "selected_ul");
    const int dp = pipette_volume_decimals(v);
    const json channels = tv.value("channels", json::array());
    for (const auto& c : channels) {
      rows.push_back(fmt::format("  {:>6} uL {:>3} {:>3} {:>11.{}f} {:>+10.{}f} {:>+8.3f} {:>9.{}f} {:>7.3f}  {}",
                                 tv.value("selected", ""), c.value("channel", 0), c.value("n", 0), number_field(c, "mean_ul"),
                                 dp, number_field(c, "systematic_error_ul"), dp, number_field(c, "systematic_error_pct"),
                                 number_field(c, "random_error_ul"), dp, number_field(c, "cv_pct"),
                                 c.value("verdict", "") == "pass" ? "pass" : "FAIL"));
      // The ISO 8655-6 budget's result; runs recorded before it was stored go without.
      if (c.contains("uncertainty")) {
        const json& u = c["uncertainty"];
        rows.push_back(fmt::format("      U(e_s) = {:.{}f} uL ({:.4f} %), U(s_r) = {:.{}f} uL (k = {:g}, about 95 %)",
                                   number_field(u, "systematic_u_ul"), dp + 1, number_field(u, "systematic_u_pct"),
                                   number_field(u, "random_u_ul"), dp + 1, number_field(u, "k")));
      }
    }
    if (channels.empty()) continue;
    // One limits line per test volume: every channel of a volume is judged by the same limits.
    const json& l = channels[0]["limits"];
    if (l.value("compare_in_pct", false))
      rows.push_back(fmt::format("    limits: |e_s| <= {:.3f} % of the selected volume; CV <= {:.3f} %",
                                 number_field(l, "systematic_pct"), number_field(l, "random_pct")));
    else
      rows.push_back(fmt::format("    limits: |e_s| <= {:.{}f} uL = {:.3f} %; s_r <= {:.{}f} uL = CV {:.3f} %{}",
                                 number_field(l, "systematic_ul"), dp, number_field(l, "systematic_pct"), number_field(l, "random_ul"), dp,
                                 number_field(l, "random_pct"), l.value("doubled", false) ? " (x2)" : ""));
  }
  return rows;
}

std::string pipette_run_text(const json& r) {
  std::string out;
  const auto line = [&](const std::string& s) { out += s + "\n"; };
  const json& p = r.value("pipette", json::object());
  const json& b = r.value("balance", json::object());
  const json& e = r.value("environment", json::object());
  const json& z = r.value("z", json::object());
  line(fmt::format("Run {}: gravimetric check of {} on {} by {}", r.value("run_id", 0), r.value("instrument", ""),
                   r.value("date", ""), r.value("operator", "")));
  std::string range = p.value("kind", "") == "variable"
                          ? fmt::format("variable {:g}-{:g} uL", number_field(p, "lower_limit_ul"), number_field(p, "nominal_ul"))
                          : fmt::format("fixed {:g} uL", number_field(p, "nominal_ul"));
  line(fmt::format("  pipette            {}, {} channel(s); limits {}", range, p.value("channels", 1),
                   p.value("limits", "")));
  line(fmt::format("  balance            {}, d = {}, s = {:.5f} mg (run {})", b.value("id", ""),
                   mass_text(b["readability_g"]), number_field(b, "repeatability_g") * 1e3,
                   b.contains("repeatability_run") ? b["repeatability_run"].dump() : "-"));
  line(fmt::format("                     latest check run {} on {}, due {}", b.value("latest_check_run", 0),
                   b.value("latest_check_on", ""),
                   b.contains("due_on") && b["due_on"].is_string() ? b["due_on"].get<std::string>() : "-"));
  line(fmt::format("  environment        water {:g} degC, {:g} hPa, {:g} %RH; evaporation {}",
                   number_field(e, "water_temperature_c"), number_field(e, "air_pressure_hpa"), number_field(e, "humidity_pct"),
                   e.contains("evaporation_g") && e["evaporation_g"].is_number() ? mass_text(e["evaporation_g"])
                                                                                 : "none"));
  line(fmt::format("  Z                  {:.7f} uL/mg (water {:.5f}, air {:.5f} kg/m3)", number_field(z, "z_ul_per_mg"),
                   number_field(z, "water_density_kg_m3"), number_field(z, "air_density_kg_m3")));
  for (const auto& row : pipette_results_table(r)) line(row);
  const std::string verdict = r.value("verdict", "");
  if (verdict == "pass")
    line(fmt::format("  verdict            PASS, next check due {}", r.value("next_due", "")));
  else
    line("  verdict            FAIL: out of service until a passing check");
  for (const auto& why : r.value("reasons", json::array()))
    for (const auto& l : wrap(why.get<std::string>(), 78, "    - ", "      ")) line(l);
  for (const auto& n : r.value("notes", json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "    note: ", "      ")) line(l);
  return out;
}

}  // namespace plumb::report
