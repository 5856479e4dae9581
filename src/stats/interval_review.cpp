#include "stats/interval_review.hpp"
#include "stats/value_text.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "core/errors.hpp"
#include "stats/control_chart.hpp"
#include "stats/drift.hpp"

namespace plumb::stats {

const char* const interval_review_caution =
    "This is a recommendation from the history only: where the instrument serves medicine, clinical or food "
    "weighing, local regulations, accredited calibration and the lab's quality procedures decide the interval.";

namespace {

void require_sane(const IntervalSteps& s) {
  if (!(s.shorten > 0 && s.shorten < 1 && s.lengthen > 1))
    throw InputError(fmt::format("interval steps: shorten factor {} must lie between 0 and 1 and lengthen factor {} "
                                 "must exceed 1.",
                                 s.shorten, s.lengthen));
  if (s.min_days < 1 || s.min_days > s.max_days)
    throw InputError(fmt::format("interval steps: minimum {} days and maximum {} days are not 1 <= min <= max.",
                                 s.min_days, s.max_days));
}

int days_of(Interval i) { return static_cast<int>(std::lround(i.approx_days())); }

IntervalRecommendation start(std::string method, Interval current, const IntervalSteps& steps) {
  require_sane(steps);
  IntervalRecommendation r;
  r.method = std::move(method);
  r.current_days = days_of(current);
  r.recommended_days = r.current_days;
  return r;
}

void lengthen(IntervalRecommendation& r, const IntervalSteps& s, int cap, const std::string& why) {
  const int wanted = static_cast<int>(std::lround(r.current_days * s.lengthen));
  const int next = std::min({wanted, s.max_days, cap});
  if (next <= r.current_days) {
    r.action = IntervalAction::keep;
    r.reasoning.push_back(why + fmt::format(" The interval could be lengthened, but {} days is already at the limit "
                                            "({} days); keep it.",
                                            r.current_days, std::min(s.max_days, cap)));
    return;
  }
  r.action = IntervalAction::lengthen;
  r.recommended_days = next;
  r.reasoning.push_back(why + fmt::format(" Lengthen the interval from {} to {} days (factor {:g}{}).", r.current_days,
                                          next, s.lengthen, next < wanted ? ", capped" : ""));
}

void shorten_to(IntervalRecommendation& r, const IntervalSteps& s, int wanted, const std::string& why) {
  const int next = std::max(wanted, s.min_days);
  if (next >= r.current_days) {
    r.action = IntervalAction::keep;
    r.reasoning.push_back(why + fmt::format(" The interval ({} days) is already at the lab's minimum of {} days; keep "
                                            "it, and find and remove the cause before the next check.",
                                            r.current_days, s.min_days));
    return;
  }
  r.action = IntervalAction::shorten;
  r.recommended_days = next;
  r.reasoning.push_back(why + fmt::format(" Shorten the interval from {} to {} days.", r.current_days, next));
}

void shorten(IntervalRecommendation& r, const IntervalSteps& s, const std::string& why) {
  shorten_to(r, s, static_cast<int>(std::lround(r.current_days * s.shorten)),
             why + fmt::format(" (factor {:g}: a result in doubt puts the checks since the previous one in doubt "
                               "too, so the interval is cut hard).",
                               s.shorten));
}

bool outside(double v, const ToleranceLimits& t) { return (t.lower && v < *t.lower) || (t.upper && v > *t.upper); }

}  // namespace

std::string_view to_string(IntervalAction a) {
  switch (a) {
    case IntervalAction::lengthen: return "lengthen";
    case IntervalAction::keep: return "keep";
    case IntervalAction::shorten: return "shorten";
  }
  return "keep";
}

IntervalRecommendation staircase_review(Interval current, std::span<const CheckOutcome> outcomes,
                                        const IntervalSteps& steps) {
  IntervalRecommendation r =
      start("OIML D 10:2007 / ILAC G24 method 1 (automatic adjustment, staircase)", current, steps);
  if (outcomes.empty()) throw InputError("interval review: no check outcomes were given.");
  for (std::size_t i = 1; i < outcomes.size(); ++i)
    if (outcomes[i].date < outcomes[i - 1].date)
      throw InputError(fmt::format("interval review: outcome {} is dated {}, before the one ahead of it ({}).", i + 1,
                                   plumb::to_string(outcomes[i].date), plumb::to_string(outcomes[i - 1].date)));
  const CheckOutcome& last = outcomes.back();
  std::size_t run = 0;
  for (auto it = outcomes.rbegin(); it != outcomes.rend() && it->in_tolerance == last.in_tolerance; ++it) ++run;
  r.reasoning.push_back(fmt::format(
      "Method 1 adjusts the interval after every check from its outcome alone: lengthen by a factor {:g} after a "
      "result in tolerance, shorten by a factor {:g} after one out of tolerance, within {} to {} days (plumb's "
      "factors; D 10 leaves them to the laboratory).",
      steps.lengthen, steps.shorten, steps.min_days, steps.max_days));
  const std::string what = fmt::format("The last check ({}) was {} tolerance ({} such result(s) in a row).",
                                       plumb::to_string(last.date), last.in_tolerance ? "within" : "out of", run);
  if (last.in_tolerance)
    lengthen(r, steps, steps.max_days, what);
  else
    shorten(r, steps, what);
  r.reasoning.push_back(interval_review_caution);
  return r;
}

IntervalRecommendation control_chart_review(Interval current, std::span<const Observation> h,
                                            const ControlChartReviewOptions& o) {
  IntervalRecommendation r = start("OIML D 10:2007 / ILAC G24 control-chart method", current, o.steps);
  require_well_formed(h, "interval review");
  const auto& u = o.unit;
  const auto finish = [&]() -> IntervalRecommendation {
    r.reasoning.push_back(interval_review_caution);
    return r;
  };
  if (!o.tolerance.lower && !o.tolerance.upper) {
    r.reasoning.push_back("No tolerance was given, so the drift towards a limit cannot be judged; keep the interval.");
    return finish();
  }
  if (h.size() < 3) {
    r.reasoning.push_back(fmt::format("Only {} result(s) exist; the control-chart method needs at least 3 (and a "
                                      "chart is trustworthy from about 20); keep the interval.",
                                      h.size()));
    return finish();
  }
  const Observation& last = h.back();
  if (outside(last.value, o.tolerance)) {
    shorten(r, o.steps,
            fmt::format("The last result ({}, {}) is out of tolerance.", plumb::to_string(last.date),
                        value_text(last.value, u)));
    return finish();
  }

  try {
    const ControlChart chart = individuals_chart(h, {std::nullopt, u});
    const std::size_t recent_from = h.size() > o.recent_checks ? h.size() - o.recent_checks : 0;
    const RuleFlag* recent = nullptr;
    for (const auto& f : chart.flags)
      if (f.indices.back() >= recent_from) recent = &f;
    if (recent) {
      shorten(r, o.steps,
              fmt::format("The result is not stable: among the last {} checks, {}", o.recent_checks,
                          recent->explanation));
      return finish();
    }
    r.reasoning.push_back(
        chart.flags.empty()
            ? "The control chart shows the result stable: no Western Electric rule is broken."
            : fmt::format("The control chart shows no signal among the last {} checks (older signals: {}).",
                          o.recent_checks, chart.flags.size()));
  } catch (const InputError&) {
    r.reasoning.push_back("The baseline results are all equal, so no control limits can be set; stability is judged "
                          "from the drift alone.");
  }

  DriftOptions dopt;
  dopt.tolerance = o.tolerance;
  dopt.unit = u;
  const DriftResult d = analyse_drift(h, dopt);
  if (!d.fit) {
    r.reasoning.push_back(d.message + " Keep the interval.");
    return finish();
  }
  const int horizon_after_last = days_between(d.last, d.horizon);
  if (d.reached) {
    const int remaining = days_between(d.last, d.reached->date);
    const std::string where = fmt::format(
        "The 95 % prediction bound of the drift line reaches the {} limit on {} ({}), {} days after the last check.",
        d.reached->upper ? "upper" : "lower", plumb::to_string(d.reached->date), to_string(d.reached->extent),
        remaining);
    if (remaining < r.current_days) {
      shorten_to(r, o.steps, std::max(remaining, 0), where + " The next check must come before that date.");
      return finish();
    }
    const int lengthened = static_cast<int>(std::lround(r.current_days * o.steps.lengthen));
    if (remaining < lengthened) {
      r.action = IntervalAction::keep;
      r.reasoning.push_back(where + fmt::format(" The current {} days end before it, a lengthened {} days would not; "
                                                "keep the interval.",
                                                r.current_days, lengthened));
      return finish();
    }
    lengthen(r, o.steps, std::min(remaining, horizon_after_last), where);
    return finish();
  }
  lengthen(r, o.steps, horizon_after_last,
           fmt::format("The drift projection stays inside the tolerance up to the horizon {} ({} days after the last "
                       "check, beyond which plumb does not project).",
                       plumb::to_string(d.horizon), horizon_after_last));
  return finish();
}

}  // namespace plumb::stats
