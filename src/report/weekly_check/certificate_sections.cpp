// Sections of the balance check certificate (kind "balance_check"): traceability, readings, results,
// tolerances and the recent bias history.
#include <fmt/format.h>

#include "core/units.hpp"
#include "report/certificates/document.hpp"
#include "report/format/text.hpp"
#include "report/weekly_check/uncertainty_text.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

Table weights_table(const json& weights) {
  Table t{{"Weight", "Nominal", "Class", "Conventional mass", "U (k)", "Certificate", "Calibrated", "Due"},
          {0.8, 0.8, 0.6, 1.3, 1.1, 1.1, 1.0, 1.0},
          {false, true, false, true, true, false, false, false},
          {}};
  for (const auto& w : weights)
    t.rows.push_back({cell(w, "id"), cell(w, "nominal"), cell(w, "class"), grams_field(w, "conventional_mass_g"),
                      fmt::format("{} ({})", grams_field(w, "uncertainty_g"), cell(w, "k")), cell(w, "certificate"),
                      cell(w, "calibrated_on"), cell(w, "due_on")});
  return t;
}

// Readings five to a row, so that a long series stays compact; the table splits between rows.
Table readings_table(const json& readings) {
  constexpr std::size_t per_row = 5;
  Table t;
  for (std::size_t i = 0; i < per_row; ++i) {
    t.headers.insert(t.headers.end(), {"No.", "Reading"});
    t.widths.insert(t.widths.end(), {0.45, 1.0});
    t.right.insert(t.right.end(), {true, true});
  }
  for (std::size_t i = 0; i < readings.size(); i += per_row) {
    std::vector<std::string> row;
    for (std::size_t j = i; j < i + per_row; ++j) {
      if (j < readings.size())
        row.insert(row.end(), {cell(readings[j], "seq"), cell(readings[j], "text") + " " + cell(readings[j], "unit")});
      else
        row.insert(row.end(), {"", ""});
    }
    t.rows.push_back(std::move(row));
  }
  return t;
}

}  // namespace

void balance_check_sections(const json& c, Document& doc) {
  const json& run = c.value("check", json::object());
  const json& inst = c.value("instrument", json::object());
  doc.blocks.push_back(Heading{"Check"});
  doc.blocks.push_back(
      KeyValues{{{"Run", cell(run, "run_id")},
                 {"Procedure", cell(run, "procedure") + " (replicate weighings of one reference weight)"},
                 {"Performed", fmt::format("{} by {}", cell(run, "date"), cell(run, "operator"))},
                 {"Tolerance policy", cell(run, "policy_name")}}});

  doc.blocks.push_back(Heading{"Reference weights (traceability)"});
  doc.blocks.push_back(weights_table(c.value("weights", json::array())));

  const json& readings = run.value("readings", json::array());
  doc.blocks.push_back(Heading{fmt::format("Readings as displayed ({} readings)", readings.size())});
  doc.blocks.push_back(readings_table(readings));

  const int decimals = inst.contains("readability_g") && inst["readability_g"].is_string()
                           ? Decimal::parse(inst["readability_g"].get<std::string>()).significant_scale() + 2
                           : 6;
  const json& weights = c.value("weights", json::array());
  doc.blocks.push_back(Heading{"Results"});
  KeyValues results{
      {{"Number of readings n", cell(run, "n")},
       {"Mean indication", fixed_grams_field(run, "mean_g", decimals)},
       {"Reference value (conventional mass)", weights.empty() ? "-" : grams_field(weights[0], "conventional_mass_g")},
       {"Bias (accuracy)", fmt::format("{}  ({:+.5f} %)", grams_field(run, "bias_g"), run.value("bias_pct", 0.0))},
       {"Repeatability SD s (n - 1)", grams_field(run, "sd_g")},
       {"s / d", fmt::format("{:.2f}", run.value("sd_over_d", 0.0))},
       {"Minimum weight (USP <41>)", grams_field(run, "min_weight_g") + "  = 2000 x max(s, 0.41 d)"},
       {"Readability", cell(run, "readability_statement")}}};
  // U of each result where the run stored it (runs recorded before go without), and the model behind it.
  if (const std::string u = weekly_expanded_u_text(run, "sd_expanded_u_g"); !u.empty())
    results.rows.insert(results.rows.begin() + 5, {"Uncertainty of s", u});
  if (const std::string u = weekly_expanded_u_text(run, "bias_expanded_u_g"); !u.empty())
    results.rows.insert(results.rows.begin() + 4, {"Uncertainty of the bias", u});
  // Which minimum applied and why; certificates of runs recorded before it was stored go without.
  if (run.contains("required_readings"))
    results.rows.insert(results.rows.begin() + 1,
                        {"Minimum number of readings",
                         fmt::format("{}: {}", cell(run, "required_readings"), cell(run, "readings_basis"))});
  doc.blocks.push_back(std::move(results));
  if (run.contains("bias_expanded_u_g")) doc.blocks.push_back(Paragraph{weekly_uncertainty_model_text(), true});

  doc.blocks.push_back(Heading{fmt::format("Tolerances ({})", cell(run, "policy_name"))});
  Table tol{{"Criterion", "Quantity", "Measured", "Limit", "Basis", "Result"},
            {1.0, 1.1, 0.9, 0.9, 2.4, 0.6},
            {false, false, true, true, false, false},
            {}};
  for (const auto& cr : run.value("criteria", json::array()))
    tol.rows.push_back({cell(cr, "name"), cell(cr, "quantity"), mass_text(cr["measured_g"]), mass_text(cr["limit_g"]),
                        cell(cr, "basis"), cr.value("pass", false) ? "pass" : "FAIL"});
  doc.blocks.push_back(std::move(tol));
  for (const auto& r : run.value("reasons", json::array()))
    doc.blocks.push_back(Paragraph{"Fail: " + r.get<std::string>()});
  for (const auto& n : run.value("notes", json::array()))
    doc.blocks.push_back(Paragraph{"Note: " + n.get<std::string>(), true});

  history_chart_section(c, doc);
}

}  // namespace plumb::report
