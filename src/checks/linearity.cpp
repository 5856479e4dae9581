#include "checks/linearity.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <map>
#include <set>

#include "core/errors.hpp"
#include "metrology/buoyancy.hpp"

namespace plumb::checks {

namespace {

std::string trim(std::string_view s) {
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.front()))) s.remove_prefix(1);
  while (!s.empty() && std::isspace(static_cast<unsigned char>(s.back()))) s.remove_suffix(1);
  return std::string(s);
}

Mass mean_of(const std::vector<ExactMass>& v) {
  // Exact sum, one rounding.
  ExactMass s;
  for (const auto& m : v) s = s + m;
  return Mass::grams(s.in_grams().to_double() / static_cast<double>(v.size()));
}

void check_readings(const std::vector<ExactMass>& v, int d_scale, std::size_t load, const char* direction,
                    const ExactMass& d) {
  for (std::size_t i = 0; i < v.size(); ++i)
    if (v[i].in_grams().significant_scale() > d_scale)
      throw InputError(fmt::format("load {} {} reading {} ({} g) has more decimals than the readability {} allows.",
                                   load, direction, i + 1, v[i].in_grams().to_string(), d.to_string()));
}

}  // namespace

Mass CalibrationWeight::standard_uncertainty() const {
  if (expanded_uncertainty) {
    if (!(coverage_factor > 0.0))
      throw InputError(fmt::format("weight {}: coverage factor {} is not positive.", id, coverage_factor));
    return expanded_uncertainty->approx() / coverage_factor;
  }
  if (weight_class) return weights::mpe_or_throw(*weight_class, nominal, id).approx() / std::sqrt(3.0);
  throw InputError(fmt::format("weight {}: neither a certificate uncertainty nor an OIML R 111 class is given.", id));
}

std::vector<std::string> parse_combination(std::string_view text, std::string_view field) {
  std::vector<std::string> ids;
  std::size_t start = 0;
  while (true) {
    const std::size_t plus = text.find('+', start);
    const std::string id = trim(text.substr(start, plus == std::string_view::npos ? std::string_view::npos : plus - start));
    if (id.empty())
      throw InputError(fmt::format("{}: \"{}\" has an empty weight id; write weights as W100+W50+W20.", field, text));
    ids.push_back(id);
    if (plus == std::string_view::npos) break;
    start = plus + 1;
  }
  return ids;
}

LinearityResult evaluate_linearity(const LinearityInput& in) {
  if (in.loads.size() < min_loads)
    throw InputError(fmt::format("loads: {} load(s) given; the error of indication needs at least {} (5 to 11).",
                                 in.loads.size(), min_loads));
  if (in.readability.in_grams().units() <= 0)
    throw InputError(fmt::format("readability: {} is not positive.", in.readability.to_string()));
  std::map<std::string, const CalibrationWeight*> by_id;
  for (const auto& w : in.weights) {
    if (w.id.empty()) throw InputError("weight id: a reference weight has no id.");
    if (!by_id.emplace(w.id, &w).second) throw InputError(fmt::format("weight {}: the id is listed twice.", w.id));
    (void)w.standard_uncertainty();  // validates certificate or class now, naming the weight
  }
  const int d_scale = in.readability.in_grams().significant_scale();
  const bool air_measured = in.air.has_value();
  const double rho_a = air_measured ? in.air->rho_a : buoyancy::rho_0;
  const double u_rho_a = air_measured ? in.air->u_rho_a : buoyancy::unmeasured_air_half_width / std::sqrt(3.0);
  const bool apply = air_measured && in.air->apply_correction;

  LinearityResult r;
  for (std::size_t i = 0; i < in.loads.size(); ++i) {
    const auto& lp = in.loads[i];
    const std::string field = fmt::format("load {} ({})", i + 1, lp.combination);
    LoadResult L;
    L.index = i + 1;
    L.combination = lp.combination;
    L.weight_ids = parse_combination(lp.combination, field);
    std::set<std::string> seen;
    double corr = 0.0, u_b = 0.0;
    for (const auto& id : L.weight_ids) {
      if (!seen.insert(id).second) throw InputError(fmt::format("{}: weight {} is named twice.", field, id));
      const auto it = by_id.find(id);
      if (it == by_id.end()) throw InputError(fmt::format("{}: weight {} is not among the reference weights.", field, id));
      const CalibrationWeight& w = *it->second;
      L.nominal = L.nominal + w.nominal;
      L.conventional = L.conventional + w.reference_mass();
      L.u_weights += w.standard_uncertainty();
      if (w.drift) L.u_drift += abs(w.drift->approx()) / std::sqrt(3.0);
      L.class_only = L.class_only || w.class_only();
      const auto b =
          buoyancy::correction({w.reference_mass().approx().g(), w.density_kg_m3, w.u_density_kg_m3, rho_a, u_rho_a});
      corr += b.correction;
      // Correlated through the one air density: summed linearly (conservative).
      u_b += apply ? b.u : std::hypot(b.u, std::abs(b.correction) / std::sqrt(3.0));
    }
    if (L.nominal > in.capacity)
      throw InputError(fmt::format("{}: the load {} is above the capacity {}.", field, L.nominal.to_string(),
                                   in.capacity.to_string()));
    if (lp.up.empty()) throw InputError(fmt::format("{}: no reading going up.", field));
    check_readings(lp.up, d_scale, i + 1, "up", in.readability);
    check_readings(lp.down, d_scale, i + 1, "down", in.readability);
    L.buoyancy_correction = Mass::grams(apply ? corr : 0.0);
    L.u_buoyancy = Mass::grams(u_b);
    L.reference = L.conventional.approx() + L.buoyancy_correction;
    L.up = lp.up;
    L.down = lp.down;
    L.indication = mean_of(lp.up);
    if (lp.up.size() == 1 && L.buoyancy_correction == Mass()) {
      L.error_exact = lp.up.front() - L.conventional;
      L.error = L.error_exact->approx();
    } else {
      L.error = L.indication - L.reference;
    }
    if (!lp.down.empty()) {
      L.indication_down = mean_of(lp.down);
      L.hysteresis = *L.indication_down - L.indication;
    }
    r.loads.push_back(std::move(L));
  }

  std::set<double> distinct;
  for (const auto& L : r.loads) distinct.insert(L.reference.g());
  if (in.model == stats::Model::quadratic && distinct.size() < 3)
    throw InputError(fmt::format("model: a quadratic needs at least 3 distinct loads; {} given.", distinct.size()));
  if (in.model == stats::Model::line && distinct.size() < 2)
    throw InputError(fmt::format("model: a straight line needs at least 2 distinct loads; {} given.", distinct.size()));
  if (in.loads.size() > recommended_max_loads)
    r.notes.push_back(fmt::format("{} loads were read; EURAMET cg-18 practice is 5 to 11.", in.loads.size()));

  std::vector<double> x, y;
  for (const auto& L : r.loads) {
    x.push_back(L.reference.g());
    y.push_back(L.indication.g());
  }
  r.fit = stats::fit(in.model, x, y);
  for (std::size_t i = 0; i < r.loads.size(); ++i) r.loads[i].residual = Mass::grams(r.fit.residuals[i]);
  r.equation = r.fit.equation(8, "m", "I");
  // E = I - m: the same coefficients with 1 subtracted from the slope.
  stats::Fit e = r.fit;
  const std::size_t slope = in.model == stats::Model::through_origin ? 0 : 1;
  e.coef[slope] -= 1.0;
  r.error_equation = e.equation(6, "m", "E");

  for (const auto& L : r.loads) {
    if (abs(L.error) > r.max_abs_error || r.max_error_load == 0) {
      r.max_abs_error = abs(L.error);
      r.max_error_load = L.index;
    }
    if (L.hysteresis) r.max_abs_hysteresis = std::max(r.max_abs_hysteresis.value_or(Mass()), abs(*L.hysteresis));
  }
  if (!air_measured)
    r.notes.push_back("The air density was not measured: no buoyancy correction is applied, and its uncertainty "
                      "assumes 1.2 kg/m3 +/- 10 %.");
  return r;
}

InterpolatedError error_at(const LinearityResult& r, Mass load, Extrapolation policy) {
  const double load_g = load.g();  // the fit is in grams
  if (!std::isfinite(load_g) || load_g < 0.0)
    throw InputError(fmt::format("load: {} g is not a non-negative number.", load_g));
  InterpolatedError out;
  out.load = load;
  out.extrapolated = !r.fit.interpolates(load_g);
  if (out.extrapolated && policy == Extrapolation::refuse)
    throw InputError(fmt::format("load: {} g is outside the calibrated range {} g to {} g; the error there would be "
                                 "an extrapolation.",
                                 load_g, r.fit.x_min, r.fit.x_max));
  out.indication = Mass::grams(r.fit.predict(load_g));
  out.error = out.indication - load;
  out.se = Mass::grams(r.fit.se_mean(load_g));
  return out;
}

}  // namespace plumb::checks
