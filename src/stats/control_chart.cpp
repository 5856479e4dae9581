#include "stats/control_chart.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/errors.hpp"
#include "stats/value_text.hpp"

namespace plumb::stats {
namespace {

std::string checks_text(std::span<const Observation> h, const std::vector<std::size_t>& idx) {
  std::string out;
  for (std::size_t k = 0; k < idx.size(); ++k) {
    if (k > 0) out += k + 1 == idx.size() ? " and " : ", ";
    out += fmt::format("check {} ({})", idx[k] + 1, plumb::to_string(h[idx[k]].date));
  }
  return out;
}

std::string_view side_word(Side s) { return s == Side::above ? "above" : "below"; }

// Signed distance from the centre in sigmas, so every rule reads as a comparison with 1, 2 or 3.
double sigmas_from_centre(double v, const ControlLimits& l) { return (v - l.centre) / l.sigma; }

bool beyond(double z, Side s, double k) { return s == Side::above ? z > k : z < -k; }

ControlLimits limits_from_baseline(std::span<const Observation> h, Baseline b) {
  if (b.count < 2)
    throw InputError(fmt::format("baseline count {} is too small; a moving range needs at least 2 points.", b.count));
  if (b.first >= h.size() || b.count > h.size() - b.first)
    throw InputError(fmt::format("baseline points {} to {} lie outside the history of {} result(s).", b.first + 1,
                                 b.first + b.count, h.size()));
  ControlLimits l;
  l.baseline_first = b.first;
  l.baseline_count = b.count;
  double sum = 0, mr_sum = 0;
  for (std::size_t i = b.first; i < b.first + b.count; ++i) {
    sum += h[i].value;
    if (i > b.first) mr_sum += std::abs(h[i].value - h[i - 1].value);
  }
  l.centre = sum / static_cast<double>(b.count);
  l.average_moving_range = mr_sum / static_cast<double>(b.count - 1);
  l.sigma = l.average_moving_range / d2_moving_range_of_two;
  if (!(l.sigma > 0))
    throw InputError(fmt::format("baseline points {} to {} all have the value {}; with no moving range no control "
                                 "limits can be set.",
                                 b.first + 1, b.first + b.count, h[b.first].value));
  return l;
}

Zone zone_of(double z) {
  const double a = std::abs(z);
  if (a > 3) return Zone::beyond;
  if (a > 2) return Zone::a;
  if (a > 1) return Zone::b;
  return Zone::c;
}

// Rules 2 and 3: `needed` of the last `window` points beyond `k` sigma on one side, counting only
// windows whose last point is itself beyond (the point that completes the signal). Triggering windows
// that share points with the previous signal of the same side are one episode: a sustained shift is
// reported once, with all its points, rather than once per completing point.
void window_rule(std::span<const Observation> h, const std::vector<double>& z, const ControlLimits& l,
                 WesternElectricRule rule, std::size_t window, std::size_t needed, double k, const std::string& unit,
                 std::vector<RuleFlag>& out) {
  std::vector<RuleFlag> found;
  std::optional<std::size_t> open[2];  // index into `found` of the episode still open, per side
  std::size_t open_end[2] = {0, 0};    // last point of that episode
  for (std::size_t i = window - 1; i < z.size(); ++i) {
    for (Side s : {Side::above, Side::below}) {
      if (!beyond(z[i], s, k)) continue;
      std::vector<std::size_t> idx;
      for (std::size_t j = i + 1 - window; j <= i; ++j)
        if (beyond(z[j], s, k)) idx.push_back(j);
      if (idx.size() < needed) continue;
      const int side = s == Side::above ? 0 : 1;
      if (open[side] && idx.front() <= open_end[side]) {
        auto& merged = found[*open[side]].indices;
        for (std::size_t j : idx)
          if (j > merged.back()) merged.push_back(j);
      } else {
        open[side] = found.size();
        found.push_back(RuleFlag{rule, s, idx, {}});
      }
      open_end[side] = i;
    }
  }
  for (auto& f : found) {
    const double line = l.line(f.side == Side::above ? static_cast<int>(k) : -static_cast<int>(k));
    f.explanation = fmt::format(
        "{} lie {} the {:g}-sigma line at {}, {} or more of {} consecutive checks at a time; a stable instrument does this "
        "rarely, so the result has probably shifted {} ({}).",
        checks_text(h, f.indices), side_word(f.side), k, value_text(line, unit), needed, window,
        f.side == Side::above ? "upwards" : "downwards", describe(rule));
    f.explanation[0] = 'C';
    out.push_back(std::move(f));
  }
}

}  // namespace

std::string_view to_string(Zone z) {
  switch (z) {
    case Zone::c: return "C";
    case Zone::b: return "B";
    case Zone::a: return "A";
    case Zone::beyond: return "beyond";
  }
  return "?";
}

std::string describe(WesternElectricRule r) {
  switch (r) {
    case WesternElectricRule::one_beyond_3_sigma: return "Western Electric rule 1: 1 point beyond 3 sigma";
    case WesternElectricRule::two_of_three_beyond_2_sigma:
      return "Western Electric rule 2: 2 of 3 beyond 2 sigma, same side";
    case WesternElectricRule::four_of_five_beyond_1_sigma:
      return "Western Electric rule 3: 4 of 5 beyond 1 sigma, same side";
    case WesternElectricRule::eight_on_one_side: return "Western Electric rule 4: 8 in a row on one side";
  }
  return "Western Electric rule ?";
}

std::vector<std::size_t> ControlChart::flagged_indices() const {
  std::vector<std::size_t> all;
  for (const auto& f : flags) all.insert(all.end(), f.indices.begin(), f.indices.end());
  std::sort(all.begin(), all.end());
  all.erase(std::unique(all.begin(), all.end()), all.end());
  return all;
}

ControlChart individuals_chart(std::span<const Observation> h, const ControlChartOptions& options) {
  require_well_formed(h, "control chart");
  ControlChart chart;
  Baseline b;
  if (options.baseline) {
    b = *options.baseline;
  } else {
    b.count = std::min(default_baseline_count, h.size());
    if (h.size() < default_baseline_count && h.size() >= 2)
      chart.notes.push_back(fmt::format("Only {} results exist, so all of them form the baseline; limits from fewer "
                                        "than {} points are themselves uncertain (common practice asks for 20 or more).",
                                        h.size(), default_baseline_count));
  }
  if (h.size() < 2)
    throw InputError(fmt::format("control chart: {} result(s) given; an individuals chart needs at least 2.", h.size()));
  const ControlLimits l = limits_from_baseline(h, b);
  chart.limits = l;
  const std::string& u = options.unit;
  chart.method = fmt::format(
      "Centre line {} is the mean of checks {} to {}; sigma {} is their average moving range {} divided by d2 = "
      "1.128 (individuals chart); control limits are centre +/- 3 sigma: {} to {}.",
      value_text(l.centre, u), l.baseline_first + 1, l.baseline_first + l.baseline_count, value_text(l.sigma, u),
      value_text(l.average_moving_range, u), value_text(l.lcl(), u), value_text(l.ucl(), u));

  std::vector<double> z;
  for (const auto& o : h) z.push_back(sigmas_from_centre(o.value, l));
  for (double zi : z) chart.zones.push_back(zone_of(zi));

  for (std::size_t i = 0; i < z.size(); ++i) {
    if (std::abs(z[i]) <= 3) continue;
    const Side s = z[i] > 0 ? Side::above : Side::below;
    RuleFlag f{WesternElectricRule::one_beyond_3_sigma, s, {i}, {}};
    f.explanation = fmt::format(
        "Check {} ({}) gave {}, {} the {} control limit {}; a stable instrument goes beyond 3 sigma about 3 times "
        "in 1000 checks, so look for a cause ({}).",
        i + 1, plumb::to_string(h[i].date), value_text(h[i].value, u), side_word(s), s == Side::above ? "upper" : "lower",
        value_text(s == Side::above ? l.ucl() : l.lcl(), u), describe(f.rule));
    chart.flags.push_back(std::move(f));
  }
  window_rule(h, z, l, WesternElectricRule::two_of_three_beyond_2_sigma, 3, 2, 2.0, u, chart.flags);
  window_rule(h, z, l, WesternElectricRule::four_of_five_beyond_1_sigma, 5, 4, 1.0, u, chart.flags);

  // Rule 4: maximal runs strictly on one side of the centre line.
  std::size_t i = 0;
  while (i < z.size()) {
    if (z[i] == 0) {
      ++i;
      continue;
    }
    const Side s = z[i] > 0 ? Side::above : Side::below;
    std::size_t j = i;
    while (j < z.size() && beyond(z[j], s, 0.0)) ++j;
    if (j - i >= 8) {
      RuleFlag f{WesternElectricRule::eight_on_one_side, s, {}, {}};
      for (std::size_t k = i; k < j; ++k) f.indices.push_back(k);
      f.explanation = fmt::format(
          "{} checks in a row, from check {} ({}) to check {} ({}), lie {} the centre line {}; a stable result "
          "would fall on either side like a coin toss, so the level has probably moved ({}).",
          j - i, i + 1, plumb::to_string(h[i].date), j, plumb::to_string(h[j - 1].date), side_word(s), value_text(l.centre, u),
          describe(f.rule));
      chart.flags.push_back(std::move(f));
    }
    i = j;
  }
  return chart;
}

}  // namespace plumb::stats
