#include "report/weekly_check/text.hpp"

#include <fmt/format.h>

#include "report/format/text.hpp"
#include "report/weekly_check/uncertainty_text.hpp"

namespace plumb::report {

std::string repeatability_run_text(const nlohmann::json& r) {
  std::string out;
  const auto line = [&](const std::string& s) { out += s + "\n"; };
  line(fmt::format("Run {}: {} of {} on {} by {} ({})", r.value("run_id", 0), r.value("procedure", ""),
                   r.value("instrument", ""), r.value("date", ""), r.value("operator", ""),
                   r.value("policy_name", "")));
  std::string weights;
  for (const auto& w : r.value("weights", nlohmann::json::array()))
    weights += (weights.empty() ? "" : ", ") + w.get<std::string>();
  line(fmt::format("  reference weight   {}", weights));
  line(fmt::format("  n                  {}", r.value("n", 0)));
  // Runs recorded before the minimum was stored have no such member; they show n alone.
  if (r.contains("required_readings"))
    for (const auto& l :
         wrap(fmt::format("at least {}: {}", r.value("required_readings", 0), r.value("readings_basis", std::string())),
              78, "  minimum n          ", "                     "))
      line(l);
  line(fmt::format("  mean               {}", mass_text(r["mean_g"], 9)));
  line(fmt::format("  reference value    {}", mass_text(r["reference_g"], 9)));
  const auto with_u = [&](std::string text, const char* key) {
    const std::string u = weekly_expanded_u_text(r, key);
    return u.empty() ? text : text + "   " + u;
  };
  line(with_u(fmt::format("  bias               {} ({:+.5f} %)", mass_text(r["bias_g"]), r.value("bias_pct", 0.0)),
              "bias_expanded_u_g"));
  line(with_u(fmt::format("  repeatability s    {}   s/d = {:.2f}", mass_text(r["sd_g"]), r.value("sd_over_d", 0.0)),
              "sd_expanded_u_g"));
  line(fmt::format("  minimum weight     {} (USP <41>: 2000 x max(s, 0.41 d))", mass_text(r["min_weight_g"])));
  for (const auto& l : wrap(r.value("readability_statement", ""), 78, "  ", "  ")) line(l);
  for (const auto& c : r.value("criteria", nlohmann::json::array()))
    line(fmt::format("  {:<14} {} = {}, limit {}: {}", c.value("name", ""), c.value("quantity", ""),
                     mass_text(c["measured_g"]), mass_text(c["limit_g"]), c.value("pass", false) ? "pass" : "FAIL"));
  const std::string verdict = r.value("verdict", "");
  if (verdict == "pass")
    line(fmt::format("  verdict            PASS, next check due {}", r.value("next_due", "")));
  else
    line("  verdict            FAIL: out of service until a passing check");
  for (const auto& why : r.value("reasons", nlohmann::json::array()))
    for (const auto& l : wrap(why.get<std::string>(), 78, "    - ", "      ")) line(l);
  for (const auto& n : r.value("notes", nlohmann::json::array()))
    for (const auto& l : wrap(n.get<std::string>(), 78, "    note: ", "      ")) line(l);
  return out;
}

}  // namespace plumb::report
