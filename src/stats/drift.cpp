#include "stats/drift.hpp"
#include "stats/value_text.hpp"

#include <fmt/format.h>
#include <boost/math/distributions/students_t.hpp>

#include <cmath>
#include <functional>

#include "core/errors.hpp"

namespace plumb::stats {
namespace {

// First whole day in [0, last_day] on which `value(day)` is at or beyond the limit. Whole days because
// checks are dated by day; a daily scan over at most a few thousand days costs nothing and, unlike a
// root finder, cannot miss a bound that dips in and out.
std::optional<int> first_day_reaching(const std::function<double(double)>& value, double limit, bool upper,
                                      int last_day) {
  for (int d = 0; d <= last_day; ++d) {
    const double v = value(d);
    if (upper ? v >= limit : v <= limit) return d;
  }
  return std::nullopt;
}

std::optional<LimitReached> earliest(const std::function<double(double)>& high,
                                     const std::function<double(double)>& low, const ToleranceLimits& tol,
                                     const DriftResult& r, int last_day) {
  std::optional<LimitReached> best;
  const auto consider = [&](std::optional<int> day, bool upper, double limit) {
    if (!day || (best && best->day <= *day)) return;
    best = LimitReached{upper, limit, add_days(r.origin, *day), *day,
                        *day <= r.span_days ? Extent::interpolation : Extent::extrapolation};
  };
  if (tol.upper) consider(first_day_reaching(high, *tol.upper, true, last_day), true, *tol.upper);
  if (tol.lower) consider(first_day_reaching(low, *tol.lower, false, last_day), false, *tol.lower);
  return best;
}

}  // namespace

std::string_view to_string(Extent e) {
  return e == Extent::interpolation ? "interpolation" : "extrapolation";
}

DriftResult::Band DriftResult::band(double day) const {
  const double y = fit->predict(day);
  const double half = t_quantile * fit->se_prediction(day);
  return {y, y - half, y + half};
}

std::string DriftResult::equation(int digits) const {
  return fit->equation(digits, "d", "y");
}

DriftResult analyse_drift(std::span<const Observation> h, const DriftOptions& o) {
  require_well_formed(h, "drift");
  if (!(o.confidence > 0 && o.confidence < 1))
    throw InputError(fmt::format("drift confidence {} must lie strictly between 0 and 1.", o.confidence));
  if (!(o.horizon_factor >= 0))
    throw InputError(fmt::format("drift horizon factor {} must be 0 or more.", o.horizon_factor));
  if (o.tolerance.lower && o.tolerance.upper && *o.tolerance.lower >= *o.tolerance.upper)
    throw InputError(fmt::format("tolerance lower limit {} is not below the upper limit {}.", *o.tolerance.lower,
                                 *o.tolerance.upper));
  DriftResult r;
  if (h.size() < 3) {
    r.message = fmt::format(
        "Drift needs at least 3 results to fit a line and estimate its scatter; this history has {}.", h.size());
    return r;
  }
  r.origin = h.front().date;
  r.last = h.back().date;
  r.span_days = days_between(r.origin, r.last);
  if (r.span_days == 0) {
    r.message = fmt::format("All {} results are dated {}; a drift over time needs results on different days.", h.size(),
                            plumb::to_string(r.origin));
    return r;
  }
  std::vector<double> x, y;
  for (const auto& ob : h) {
    x.push_back(days_between(r.origin, ob.date));
    y.push_back(ob.value);
  }
  r.fit = fit(Model::line, x, y);
  const Fit& f = *r.fit;
  const boost::math::students_t t_dist(f.dof);
  r.t_quantile = boost::math::quantile(t_dist, (1 + o.confidence) / 2);
  r.slope_per_day = f.coef[1];
  if (f.coef_se[1] > 0) {
    r.slope_p_value = 2 * boost::math::cdf(boost::math::complement(t_dist, std::abs(f.coef[1] / f.coef_se[1])));
  } else {
    r.slope_p_value = f.coef[1] == 0 ? 1.0 : 0.0;  // a perfect line: no scatter to doubt the slope
  }
  r.slope_significant = r.slope_p_value < 0.05;
  r.uncertainty_used = h.back().expanded_uncertainty;
  const int horizon_day = r.span_days + static_cast<int>(std::floor(o.horizon_factor * r.span_days));
  r.horizon = add_days(r.origin, horizon_day);

  const std::string& u = o.unit;
  const double pct = 100 * o.confidence;
  auto& ex = r.explanation;
  ex.push_back(fmt::format(
      "Least-squares line of {} against d, the days since {}: {} ({} results over {} days; R^2 = {:.4f}, "
      "RMSE = {}).",
      o.quantity, plumb::to_string(r.origin), r.equation(), f.n, r.span_days, f.r_squared, value_text(f.rmse, u)));
  ex.push_back(fmt::format("The slope is {} per year; {} (p = {:.3g}, Student t with {} degrees of freedom).",
                           value_text(r.slope_per_day * 365.25, u),
                           r.slope_significant ? "it differs significantly from zero at the 5 % level"
                                               : "it does not differ significantly from zero at the 5 % level, so "
                                                 "the data show no clear trend",
                           r.slope_p_value, f.dof));
  const DriftResult::Band at_last = r.band(r.span_days);
  ex.push_back(fmt::format("At the last check ({}) the line gives {} with a {:g} % prediction interval {} to {}.",
                           plumb::to_string(r.last), value_text(at_last.fitted, u), pct, value_text(at_last.lower, u),
                           value_text(at_last.upper, u)));
  ex.push_back(fmt::format(
      "plumb projects no further than {} ({} days after the last check, as long as the history itself): a line "
      "fitted over {} days carries no evidence of how the instrument behaves much beyond that.",
      plumb::to_string(r.horizon), horizon_day - r.span_days, r.span_days));

  if (!o.tolerance.lower && !o.tolerance.upper) {
    r.status = DriftStatus::no_tolerance;
    ex.push_back("No tolerance limit was given, so no date of reaching one is projected.");
    return r;
  }

  const std::function<double(double)> line = [&f](double d) { return f.predict(d); };
  std::function<double(double)> high, low;
  std::string criterion_words;
  if (o.criterion == DriftCriterion::prediction_bound) {
    high = [&r](double d) { return r.band(d).upper; };
    low = [&r](double d) { return r.band(d).lower; };
    criterion_words =
        fmt::format("the {:g} % prediction bound of the {} trend (where a new result may lie)", pct, o.quantity);
  } else {
    const double U = r.uncertainty_used;
    high = [line, U](double d) { return line(d) + U; };
    low = [line, U](double d) { return line(d) - U; };
    criterion_words =
        fmt::format("the {} trend plus or minus the latest expanded uncertainty U = {}", o.quantity, value_text(U, u));
  }
  r.reached = earliest(high, low, o.tolerance, r, horizon_day);
  r.trend_reaches = earliest(line, line, o.tolerance, r, horizon_day);

  if (r.reached) {
    r.status = DriftStatus::reaches_limit;
    const LimitReached& lr = *r.reached;
    ex.push_back(
        fmt::format("{} reaches the {} tolerance limit {} on {} ({}{}).", criterion_words, lr.upper ? "upper" : "lower",
                    value_text(lr.limit, u), plumb::to_string(lr.date), to_string(lr.extent),
                    lr.extent == Extent::interpolation
                        ? ": within the observed history"
                        : fmt::format(": {} days after the last check, beyond the data", lr.day - r.span_days)));
    ex.back()[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(ex.back()[0])));
  } else {
    r.status = DriftStatus::not_reached_within_horizon;
    const bool heading_up = r.slope_per_day > 0, heading_down = r.slope_per_day < 0;
    const bool towards = (heading_up && o.tolerance.upper) || (heading_down && o.tolerance.lower);
    ex.push_back(fmt::format(
        "{} stays inside the tolerance up to the horizon {}; {}", criterion_words, plumb::to_string(r.horizon),
        towards ? "the trend heads towards a limit, but plumb will not project a date beyond the horizon."
                : "the trend does not head towards a limit."));
    ex.back()[0] = static_cast<char>(std::toupper(static_cast<unsigned char>(ex.back()[0])));
  }
  if (r.trend_reaches)
    ex.push_back(fmt::format("The fitted line of {} itself reaches the {} limit {} on {} ({}).", o.quantity,
                             r.trend_reaches->upper ? "upper" : "lower", value_text(r.trend_reaches->limit, u),
                             plumb::to_string(r.trend_reaches->date), to_string(r.trend_reaches->extent)));
  return r;
}

}  // namespace plumb::stats
