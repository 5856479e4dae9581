#include "checks/calibration.hpp"

#include <fmt/format.h>

#include <cmath>

#include "core/errors.hpp"
#include "metrology/usp41.hpp"
#include "stats/exact_summary.hpp"

namespace plumb::checks {

namespace {

int rank(Conformity c) {
  switch (c) {
    case Conformity::pass: return 0;
    case Conformity::pass_not_proven: return 1;
    case Conformity::fail_not_proven: return 2;
    case Conformity::fail: return 3;
  }
  return 3;
}

std::vector<RepeatabilitySummary> summarize_series(const std::vector<RepeatabilitySeries>& series,
                                                   const ExactMass& d, const std::string& set_name) {
  if (series.empty())
    throw InputError(fmt::format("{} repeatability: no repeatability series; at least one (n >= {}) is needed.",
                                 set_name, min_repeatability_readings));
  const int d_scale = d.in_grams().significant_scale();
  std::vector<RepeatabilitySummary> out;
  for (std::size_t i = 0; i < series.size(); ++i) {
    const auto& s = series[i];
    if (s.readings.size() < min_repeatability_readings)
      throw InputError(fmt::format("{} repeatability series {} (load {}): {} reading(s); at least {} are needed.",
                                   set_name, i + 1, s.load.to_string(), s.readings.size(), min_repeatability_readings));
    const std::vector<Decimal> readings_g = in_grams(s.readings);
    for (std::size_t j = 0; j < readings_g.size(); ++j)
      if (readings_g[j].significant_scale() > d_scale)
        throw InputError(
            fmt::format("{} repeatability series {} reading {} ({} g) has more decimals than the "
                        "readability {} allows.",
                        set_name, i + 1, j + 1, readings_g[j].to_string(), d.to_string()));
    const auto sum = stats::summarize_exact(readings_g);
    out.push_back({s.load, sum.n, Mass::grams(sum.mean()), Mass::grams(sum.sd())});
  }
  return out;
}

std::size_t nearest_series(const std::vector<RepeatabilitySummary>& reps, Mass load) {
  std::size_t best = 0;
  for (std::size_t i = 1; i < reps.size(); ++i) {
    const Mass a = abs(reps[i].load.approx() - load), b = abs(reps[best].load.approx() - load);
    if (a < b || (a == b && reps[i].load > reps[best].load)) best = i;
  }
  return best;
}

Mass weight_expanded_sum(const std::vector<CalibrationWeight>& weights, const LoadResult& load) {
  Mass sum;
  for (const auto& id : load.weight_ids)
    for (const auto& w : weights)
      if (w.id == id)
        sum += w.expanded_uncertainty ? w.expanded_uncertainty->approx()
                                      : weights::mpe_or_throw(*w.weight_class, w.nominal, w.id).approx();
  return sum;
}

/// Where each weight's values in a buoyancy or drift row came from: "W100: ...; W50: ...".
std::string weight_sources(const std::vector<CalibrationWeight>& weights, const LoadResult& load, bool density) {
  std::string out;
  for (const auto& id : load.weight_ids)
    for (const auto& w : weights) {
      if (w.id != id) continue;
      std::string what;
      if (density)
        what = fmt::format("rho {:.0f} kg/m3, u {:.3g} kg/m3{}", w.density_kg_m3, w.u_density_kg_m3,
                           w.density_source.empty() ? "" : " (" + w.density_source + ")");
      else
        what = w.drift ? fmt::format("D = {}{}", w.drift->to_string(),
                                     w.drift_source.empty() ? "" : " (" + w.drift_source + ")")
                       : "no D" + (w.drift_source.empty() ? std::string() : " (" + w.drift_source + ")");
      out += fmt::format("{}{}: {}", out.empty() ? "" : "; ", id, what);
    }
  return out;
}

CalibrationSetResult evaluate_set(const CalibrationInput& in, const CalibrationSet& set, const std::string& set_name,
                                  const CalibrationSetResult* inherit, const std::optional<AirDensityUse>& air) {
  CalibrationSetResult r;
  const ExactMass& d = in.balance.readability;
  if (set.repeatability.empty() && inherit) {
    r.repeatability = inherit->repeatability;
    r.notes.push_back(fmt::format("{}: no repeatability series of its own; the as-found repeatability is used.",
                                  set_name));
  } else {
    r.repeatability = summarize_series(set.repeatability, d, set_name);
  }
  if (set.eccentricity) {
    r.eccentricity = evaluate_eccentricity(*set.eccentricity);
  } else if (inherit && inherit->eccentricity) {
    r.eccentricity = inherit->eccentricity;
    r.notes.push_back(fmt::format("{}: no eccentricity test of its own; the as-found one is used.", set_name));
  } else {
    r.notes.push_back(fmt::format("{}: no eccentricity test: the budget has no eccentricity contribution.", set_name));
  }

  LinearityInput lin;
  lin.capacity = in.balance.capacity;
  lin.readability = d;
  lin.weights = in.weights;
  lin.loads = set.loads;
  lin.model = in.model;
  lin.air = air;
  r.linearity = evaluate_linearity(lin);
  for (const auto& n : r.linearity.notes) r.notes.push_back(fmt::format("{}: {}", set_name, n));

  // The budget is built in grams: stats works on plain numbers, so each mass is read in g here.
  const double dg = d.approx().g();
  for (const auto& L : r.linearity.loads) {
    LoadCalibration lc;
    lc.load = L;
    const std::size_t si = nearest_series(r.repeatability, L.reference);
    lc.repeatability_series = si + 1;
    const auto& rep = r.repeatability[si];
    const double n_at_load = static_cast<double>(L.up.size());

    std::vector<stats::Contribution> c;
    auto r0 = stats::Contribution::rounding("rounding at zero", dg);
    r0.note =
        fmt::format("EURAMET cg-18 v4.0: the no-load indication rounded to d = {}, d / (2 sqrt 3)", d.to_string());
    c.push_back(r0);
    auto rl = stats::Contribution::rounding("rounding at load", dg);
    rl.note = fmt::format("EURAMET cg-18 v4.0: the loaded indication rounded to d = {}, d / (2 sqrt 3)", d.to_string());
    c.push_back(rl);
    auto repc =
        stats::Contribution::type_a("repeatability", rep.sd.g() / std::sqrt(n_at_load), static_cast<double>(rep.n - 1));
    // cg-18: the indication at the load is a single reading (u = s) or the mean of n readings (u = s / sqrt n).
    repc.note = fmt::format(
        "EURAMET cg-18 v4.0, Type A: s = {:.3g} g from the {} readings of the repeatability test at {}; {}", rep.sd.g(),
        rep.n, rep.load.to_string(),
        L.up.size() == 1 ? std::string("the indication at this load is a single reading, so u = s")
                         : fmt::format("the indication at this load is the mean of {} readings, so u = s / sqrt({})",
                                       L.up.size(), L.up.size()));
    c.push_back(repc);
    if (r.eccentricity) {
      auto ecc = stats::Contribution::rectangular("eccentricity", r.eccentricity->half_width_at(L.reference).g());
      ecc.note =
          fmt::format("EURAMET cg-18 v4.0, rectangular: |dI|max = {} g at {} with L_ecc = {}; |dI|max / (2 L_ecc) x L",
                      r.eccentricity->max_abs_deviation.in_grams().to_string(), r.eccentricity->max_position,
                      r.eccentricity->load.to_string());
      c.push_back(ecc);
    }
    auto wc = stats::Contribution::standard("reference weights", L.u_weights.g(), -1.0);
    wc.note = L.class_only ? "EURAMET cg-18 v4.0: certificate U/k, or OIML R 111-1:2004 class MPE/sqrt 3 where only "
                             "the class is known; summed (fully correlated)"
                           : "EURAMET cg-18 v4.0: certificate U/k of each weight, summed (fully correlated)";
    c.push_back(wc);
    auto bc = stats::Contribution::standard("air buoyancy", L.u_buoyancy.g(), -1.0);
    bc.note = fmt::format(
        "EURAMET cg-18 v4.0, against the conventional adjustment (rho_0 = 1.2 kg/m3, "
        "rho_c = 8000 kg/m3); {}; {}",
        air ? fmt::format("air density {:.4f} kg/m3, u {:.2g} kg/m3, measured", air->rho_a, air->u_rho_a)
            : std::string("air density not measured: 1.2 kg/m3 +/- 10 %"),
        weight_sources(in.weights, L, true));
    c.push_back(bc);
    auto dc = stats::Contribution::rectangular("weight drift", L.u_drift.g() * std::sqrt(3.0), -1.0);
    dc.note = "EURAMET cg-18 v4.0, rectangular, u = D / sqrt 3; " + weight_sources(in.weights, L, false);
    c.push_back(dc);
    lc.budget = stats::combine(fmt::format("error of indication at {}", L.nominal.to_string()), "g", std::move(c),
                               in.budget_options);

    auto [tol, basis] = tolerance_for(in.tolerance, in.balance, L);
    lc.tolerance = tol;
    lc.tolerance_basis = std::move(basis);
    lc.decision = decide(L.error, Mass::grams(lc.budget.expanded), Limits::symmetric(tol), in.rule);
    lc.weight_uncertainty = weight_expanded_sum(in.weights, L);
    lc.weight_suitable = lc.weight_uncertainty <= tol / 3.0;
    if (!lc.weight_suitable) {
      r.weights_suitable = false;
      r.notes.push_back(fmt::format(
          "{}: load {} ({}): the weights' uncertainty {:.3g} g exceeds a third of the tolerance ({:.3g} g); "
          "they are not suitable to check it.",
          set_name, L.index, L.combination, lc.weight_uncertainty.g(), (tol / 3.0).g()));
    }
    r.overall = worst(r.overall, lc.decision.state);
    r.loads.push_back(std::move(lc));
  }
  return r;
}

}  // namespace

Conformity worst(Conformity a, Conformity b) { return rank(a) >= rank(b) ? a : b; }

std::string CalibrationTolerance::name() const {
  switch (kind) {
    case Kind::oiml_r76: return fmt::format("OIML R 76 ({})", r76::to_string(verification));
    case Kind::usp41: return "USP <41> accuracy (0.10 % of the load)";
    case Kind::lab: return "lab limits";
  }
  return "?";
}

std::pair<Mass, std::string> tolerance_for(const CalibrationTolerance& t, const CalibratedBalance& b,
                                           const LoadResult& load) {
  switch (t.kind) {
    case CalibrationTolerance::Kind::oiml_r76: {
      if (!b.accuracy_class)
        throw InputError("accuracy class: the OIML R 76 tolerance policy needs the balance's accuracy class.");
      const ExactMass e = b.verification_interval.value_or(b.readability);
      const ExactMass mpe = r76::mpe(*b.accuracy_class, e, load.nominal, t.verification);
      return {mpe.approx(), fmt::format("OIML R 76 class {}, e = {}, {}: MPE {}", r76::to_string(*b.accuracy_class),
                                        e.to_string(), r76::to_string(t.verification), mpe.to_string())};
    }
    case CalibrationTolerance::Kind::usp41: {
      const Mass lim = usp41::accuracy_limit(load.reference);
      return {lim, fmt::format("USP <41>: 0.10 % of {} = {:.3g} g", load.nominal.to_string(), lim.g())};
    }
    case CalibrationTolerance::Kind::lab: {
      if (!t.lab_limit && !t.lab_percent)
        throw InputError("lab limits: neither an absolute limit nor a percentage of the load is given.");
      const Mass abs_lim = t.lab_limit ? t.lab_limit->approx() : Mass();
      const Mass pct_lim = t.lab_percent ? *t.lab_percent / 100.0 * abs(load.reference) : Mass();
      if (abs_lim < Mass() || pct_lim < Mass()) throw InputError("lab limits: a limit is negative.");
      const Mass lim = std::max(abs_lim, pct_lim);
      return {lim, fmt::format("lab limit: +/- {:.6g} g", lim.g())};
    }
  }
  return {Mass(), ""};
}

CalibrationResult evaluate_calibration(const CalibrationInput& in) {
  CalibrationResult r;
  r.rule = in.rule;
  r.rule_statement = rule_statement(in.rule);
  r.tolerance_name = in.tolerance.name();
  if (in.tolerance.kind == CalibrationTolerance::Kind::oiml_r76 && !in.balance.accuracy_class)
    throw InputError("accuracy class: the OIML R 76 tolerance policy needs the balance's accuracy class.");
  if (in.tolerance.kind == CalibrationTolerance::Kind::oiml_r76 && !in.balance.verification_interval)
    r.notes.push_back("No verification scale interval e is given: e = d is used for the OIML R 76 MPE.");

  std::optional<AirDensityUse> air;
  if (in.environment) {
    r.air = density::air_density(*in.environment, in.air_formula);
    air = AirDensityUse{r.air->rho, r.air->u, in.apply_buoyancy_correction};
    for (const auto& n : r.air->notes) r.notes.push_back(n);
  }
  r.as_found = evaluate_set(in, in.as_found, "as found", nullptr, air);
  if (in.as_left) r.as_left = evaluate_set(in, *in.as_left, "as left", &r.as_found, air);
  if (in.tolerance.kind == CalibrationTolerance::Kind::usp41) {
    const double cap = in.balance.capacity.approx().g();
    for (const auto& L : r.as_found.loads)
      if (L.load.reference.g() < usp41::test_load_min_fraction * cap) {
        r.notes.push_back("USP <41> states its accuracy test for loads of 5 % to 100 % of capacity; smaller loads "
                          "are judged against 0.10 % all the same.");
        break;
      }
  }
  return r;
}

}  // namespace plumb::checks
