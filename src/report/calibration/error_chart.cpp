#include "report/calibration/error_chart.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <optional>
#include <vector>

#include "core/decimal.hpp"
#include "core/errors.hpp"
#include "core/units.hpp"
#include "metrology/accuracy_classes.hpp"
#include "report/certificates/document.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

double json_number(const json& j, const char* key) {
  return j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0;
}

std::optional<ExactMass> stored_grams(const json& j, const char* key) {
  if (!j.contains(key) || !j[key].is_string()) return std::nullopt;
  return ExactMass::grams(Decimal::parse(j[key].get<std::string>(), key));
}

// The in-service MPE of OIML R 76-1 Table 6 as a step polyline from zero to the capacity, in mg: the MPE is
// constant within a band and jumps at its end (a band holds a < m <= b). Nothing when the calibration was
// not against R 76 or the stored settings do not name the class, or the capacity lies beyond the class's bands.
std::optional<std::vector<std::pair<double, double>>> r76_steps(const json& cal) {
  const json& set = cal.value("settings", json::object());
  if (set.value("tolerance", "") != "r76" || !set.contains("accuracy_class") || !set["accuracy_class"].is_string())
    return std::nullopt;
  const auto capacity = stored_grams(cal, "capacity_g");
  auto e = stored_grams(set, "e_g");
  if (!e) e = stored_grams(cal, "readability_g");
  if (!capacity || !e) return std::nullopt;
  try {
    const auto cls = r76::parse_accuracy_class(set["accuracy_class"].get<std::string>());
    const double cap_g = capacity->approx().g();
    std::vector<std::pair<double, double>> steps;
    double from_g = 0;
    for (const auto& b : r76::bands()) {
      if (b.cls != cls || from_g >= cap_g) continue;
      ExactMass end = *capacity;
      if (b.load_to_e) {
        const Decimal d = e->in_grams();
        const ExactMass band_end = ExactMass::grams(Decimal(d.units() * *b.load_to_e, d.scale()));
        if (band_end.approx().g() < cap_g) end = band_end;
      }
      const double mpe_mg = r76::mpe(cls, *e, end).approx().g() * 1e3;
      if (steps.empty())
        steps.emplace_back(0.0, mpe_mg);
      else
        steps.emplace_back(from_g, mpe_mg);  // the jump at the previous band's end
      from_g = end.approx().g();
      steps.emplace_back(from_g, mpe_mg);
    }
    if (steps.empty() || from_g < cap_g) return std::nullopt;
    return steps;
  } catch (const InputError&) {
    return std::nullopt;  // a capacity beyond the table: the MPE is shown at the tested loads instead
  }
}

std::string stage_phrase(const json& stage) {
  std::string name = stage.value("title", "final stage");
  if (!name.empty()) name[0] = static_cast<char>(std::tolower(static_cast<unsigned char>(name[0])));
  return name;
}

}  // namespace

double calibration_model_error(const json& fit, double m) {
  const auto coef = fit.value("coef", std::vector<double>{});
  const std::string model = fit.value("model", "line");
  if (model == "through-origin") return coef.empty() ? 0 : (coef[0] - 1) * m;
  if (coef.size() < 2) return 0;
  double e = coef[0] + (coef[1] - 1) * m;
  if (model == "quadratic" && coef.size() > 2) e += coef[2] * m * m;
  return e;
}

ChartSpec calibration_error_chart(const json& c) {
  const json& cal = c.value("calibration", json::object());
  const json& stages = cal.value("stages", json::array());
  const std::string final_key = cal.value("final_stage", "");
  const json* final_stage = stages.empty() ? nullptr : &stages.back();
  for (const auto& st : stages)
    if (st.value("stage", "") == final_key) final_stage = &st;

  ChartSpec s;
  std::vector<std::string> names;
  for (const auto& st : stages) names.push_back(stage_phrase(st));
  const std::string stages_text = names.size() == 2 ? names[0] + " and " + names[1] : (names.empty() ? "" : names[0]);
  s.title = fmt::format("Balance {}: error of indication against load, {}", c["instrument"].value("id", ""),
                        stages.size() > 1 ? "as found and as left" : stages_text);
  const std::size_t loads = final_stage ? final_stage->value("error_of_indication", json::array()).size() : 0;
  s.subtitle = fmt::format("Calibration run {} on {}, {} load(s); E = I - m_ref", cell(c["check"], "run_id"),
                           cell(c["check"], "date"), loads);
  s.x = {"Load m_ref", "g", AxisScale::number};
  s.y = {"Error of indication E", "mg", AxisScale::number};
  for (const auto& st : stages) {
    ChartSeries series{fmt::format("E at each load, {}", stage_phrase(st)), {}};
    for (const auto& l : st.value("error_of_indication", json::array()))
      series.points.push_back(
          {json_number(l, "reference_g"), json_number(l, "error_g") * 1e3, json_number(l, "U_g") * 1e3, false});
    s.series.push_back(std::move(series));
  }
  if (const auto capacity = stored_grams(cal, "capacity_g"); capacity && capacity->approx().g() > 0)
    s.x_range = std::pair{0.0, capacity->approx().g()};

  std::vector<std::string> notes = {
      "Error bars: expanded uncertainty U of E at each load (EURAMET cg-18 budget, k from Welch-Satterthwaite)."};
  if (const auto steps = r76_steps(cal)) {
    ChartCurve upper{"\u00b1MPE in service (OIML R 76-1 Table 6)", ChartCurve::Style::step_limit, *steps};
    ChartCurve lower = upper;
    for (auto& p : lower.points) p.second = -p.second;
    s.curves = {std::move(upper), std::move(lower)};
    notes.emplace_back(
        "The MPE is constant within each load band of OIML R 76-1 and steps up at the band's end; "
        "it is drawn from zero to the capacity.");
  } else if (final_stage) {
    ChartCurve upper{"\u00b1MPE at each tested load", ChartCurve::Style::limit, {}};
    ChartCurve lower = upper;
    for (const auto& l : final_stage->value("error_of_indication", json::array())) {
      upper.points.emplace_back(json_number(l, "reference_g"), json_number(l, "tolerance_g") * 1e3);
      lower.points.emplace_back(json_number(l, "reference_g"), -json_number(l, "tolerance_g") * 1e3);
    }
    s.curves = {std::move(upper), std::move(lower)};
    notes.emplace_back(
        "The MPE is known at the tested loads only: each is marked there; the dotted line joining "
        "them is a guide, not a limit between loads.");
  }
  if (final_stage) {
    const json& fit = final_stage->value("fit", json::object());
    ChartCurve model{fmt::format("fitted model as error ({}): {}", stage_phrase(*final_stage), cell(fit, "model")),
                     ChartCurve::Style::model,
                     {}};
    const double x0 = json_number(fit, "x_min_g"), x1 = json_number(fit, "x_max_g");
    constexpr int steps = 40;
    for (int i = 0; i <= steps; ++i) {
      const double m = x0 + (x1 - x0) * i / steps;
      model.points.emplace_back(m, calibration_model_error(fit, m) * 1e3);
    }
    s.curves.push_back(std::move(model));
  }
  s.notes = std::move(notes);
  s.width = 720;
  s.height = 400;
  return s;
}

}  // namespace plumb::report
