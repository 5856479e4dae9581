#include "checks/pipette.hpp"

#include "checks/decision_rule.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cmath>
#include <set>

#include "core/errors.hpp"
#include "stats/exact_summary.hpp"

namespace plumb::checks {
namespace {

const Decimal zero{0, 0};
const ExactVolume no_volume;

/// Shortest exact text: 10 % of 100 uL is "10", not "10.0".
Decimal trimmed(Decimal v) {
  return v.rescaled(v.significant_scale());
}
std::string ul(ExactVolume v) {
  return v.to_string();
}
/// Balance readabilities are stated in mg in ISO 8655-6, so messages state them in mg too.
std::string in_mg(const ExactMass& m) {
  return trimmed(m.in_grams().shifted(3)).to_string() + " mg";
}

/// Decimals for printing a volume error next to a selected volume: 5 at 1 uL, 3 at 100 uL, 1 at 10 mL.
int volume_decimals(ExactVolume selected) {
  const double v = selected.approx().ul();
  const int d = 5 - static_cast<int>(std::floor(std::log10(v)));
  return std::clamp(d, 1, 6);
}

ExactVolume half_of(ExactVolume v) {
  const Decimal ul = v.in_microlitres();
  return ExactVolume::microlitres({ul.units() * 5, ul.scale() + 1});
}

void check_channel_input(const PipetteRunInput& in, const TestVolumeWeighings& tv, const ChannelWeighings& ch) {
  const std::string where = fmt::format("test volume {}, channel {}", ul(tv.volume), ch.channel);
  if (ch.weighings.size() < min_replicates)
    throw InputError(
        fmt::format("{}: {} weighing(s) given; the gravimetric check needs at least {} replicates "
                    "({} recommended).",
                    where, ch.weighings.size(), min_replicates, recommended_replicates));
  const ExactMass& d = in.balance.readability;
  const int d_scale = d.in_grams().significant_scale();
  for (std::size_t i = 0; i < ch.weighings.size(); ++i) {
    const MassReading& r = ch.weighings[i];
    const Decimal g = r.mass().in_grams();
    if (g <= zero)
      throw InputError(
          fmt::format("{}: weighing {} ({} {}) is not a positive mass.", where, i + 1, r.text, to_string(r.unit)));
    if (g.significant_scale() > d_scale)
      throw InputError(
          fmt::format("{}: weighing {} ({} {}) has more decimals than the readability {} of balance "
                      "{} allows.",
                      where, i + 1, r.text, to_string(r.unit), in_mg(d), in.balance.id));
  }
}

ChannelResult evaluate_channel(const PipetteRunInput& in, const gravimetric::ZFactor& z, ExactVolume selected,
                               const ChannelWeighings& ch) {
  ChannelResult r;
  r.selected = selected;
  r.channel = ch.channel;
  std::vector<Decimal> net_mg;
  net_mg.reserve(ch.weighings.size());
  for (const MassReading& w : ch.weighings) {
    ExactMass m = w.mass();
    if (in.evaporation_per_weighing) m = m + *in.evaporation_per_weighing;
    net_mg.push_back(m.in_grams().shifted(3));
  }
  const stats::ExactSummary s = stats::summarize_exact(net_mg);
  const double zf = z.z_ul_per_mg;
  r.n = s.n;
  r.mean_mass = Mass::milligrams(s.mean());
  r.sd_mass = Mass::milligrams(s.sd());
  for (const Decimal& m : net_mg) r.volumes.push_back(Volume::microlitres(m.to_double() * zf));
  r.mean = Volume::microlitres(zf * s.mean());
  r.systematic_error = r.mean - selected.approx();
  r.systematic_error_pct = 100.0 * r.systematic_error.ul() / selected.approx().ul();
  r.random_error = Volume::microlitres(zf * s.sd());
  r.cv_pct = 100.0 * s.sd() / s.mean();  // Z cancels
  PipetteMeanInputs u_in;
  u_in.mean_mass = r.mean_mass;
  u_in.random_error = r.random_error;
  u_in.n = r.n;
  u_in.selected = selected.approx();
  u_in.readability = in.balance.readability.approx();
  if (in.balance_calibration) {
    const WeighingUncertainty w = weighing_uncertainty_at(*in.balance_calibration, r.mean_mass);
    u_in.balance_u = w.u;
    u_in.balance_u_basis = w.basis;
    u_in.balance_u_includes_rounding = true;
  } else {
    u_in.balance_u = in.balance.standard_uncertainty;
    if (u_in.balance_u) u_in.balance_u_basis = "the balance's standard uncertainty of a weighing, as given";
    u_in.no_balance_u_reason = in.no_balance_calibration;
  }
  if (in.evaporation_per_weighing) u_in.evaporation = in.evaporation_per_weighing->approx();
  u_in.environment = in.environment;
  u_in.z = z;
  r.uncertainty = pipette_uncertainty(u_in, in.uncertainty);
  r.limits = pipette_limits::limits_at(in.pipette.limits, in.pipette.nominal, selected, in.pipette.channels);

  const int dp = volume_decimals(selected);
  const std::string where = fmt::format("{}, channel {}", ul(selected), ch.channel);
  const auto fail = [&](std::string why) {
    r.verdict = Verdict::fail;
    r.reasons.push_back(std::move(why));
  };
  const std::string policy = in.pipette.limits.name();
  if (r.limits.compare_in_pct) {
    if (beyond_limit(std::abs(r.systematic_error_pct), r.limits.systematic_pct))
      fail(fmt::format("{}: systematic error {:+.3f} % exceeds the limit +/-{} % ({})", where, r.systematic_error_pct,
                       in.pipette.limits.systematic->to_string(), policy));
    if (beyond_limit(r.cv_pct, r.limits.random_pct))
      fail(fmt::format("{}: random error CV {:.3f} % exceeds the limit {} % ({})", where, r.cv_pct,
                       in.pipette.limits.random->to_string(), policy));
  } else {
    if (beyond_limit(abs(r.systematic_error).ul(), r.limits.systematic.ul()))
      fail(fmt::format("{}: systematic error {:+.{}f} uL exceeds the limit +/-{:.{}f} uL ({})", where,
                       r.systematic_error.ul(), dp, r.limits.systematic.ul(), dp, policy));
    if (beyond_limit(r.random_error.ul(), r.limits.random.ul()))
      fail(fmt::format("{}: random error s = {:.{}f} uL exceeds the limit {:.{}f} uL ({})", where, r.random_error.ul(),
                       dp, r.limits.random.ul(), dp, policy));
  }
  return r;
}

}  // namespace

std::string_view to_string(PipetteKind k) {
  return k == PipetteKind::fixed ? "fixed" : "variable";
}

void validate(const PipetteDefinition& p) {
  const std::string who = p.id.empty() ? std::string("pipette") : fmt::format("pipette {}", p.id);
  if (p.nominal <= no_volume)
    throw InputError(fmt::format("{}: nominal volume {} must be positive.", who, ul(p.nominal)));
  if (p.channels < 1 || p.channels > max_channels)
    throw InputError(fmt::format("{}: channel count {} is outside 1 to {}.", who, p.channels, max_channels));
  if (p.kind == PipetteKind::variable) {
    if (!p.lower_limit)
      throw InputError(fmt::format("{}: a variable-volume pipette needs the lower limit of its range.", who));
    if (*p.lower_limit <= no_volume || *p.lower_limit >= p.nominal)
      throw InputError(fmt::format("{}: lower limit {} must be positive and below the nominal volume {}.", who,
                                   ul(*p.lower_limit), ul(p.nominal)));
  } else if (p.lower_limit && *p.lower_limit != p.nominal) {
    throw InputError(
        fmt::format("{}: a fixed-volume pipette has no range, but a lower limit {} was given for "
                    "nominal volume {}.",
                    who, ul(*p.lower_limit), ul(p.nominal)));
  }
  pipette_limits::validate_policy(p.limits, p.nominal);
}

std::vector<ExactVolume> default_test_volumes(const PipetteDefinition& p) {
  std::vector<ExactVolume> v{p.nominal.trimmed()};
  if (p.kind == PipetteKind::fixed) return v;
  const ExactVolume lower = p.lower_limit.value_or(no_volume);
  const ExactVolume half = std::max(half_of(p.nominal), lower).trimmed();
  const ExactVolume tenth = std::max(ExactVolume::microlitres(p.nominal.in_microlitres().shifted(-1)), lower).trimmed();
  for (ExactVolume x : {half, tenth})
    if (x != v.back()) v.push_back(x);
  return v;
}

PipetteRunResult evaluate_pipette_run(const PipetteRunInput& in) {
  const PipetteDefinition& p = in.pipette;
  validate(p);
  PipetteRunResult out;
  out.pipette_id = p.id;
  out.z = gravimetric::z_factor(in.environment);  // refuses a water temperature outside 15-30 degC
  if (in.run_date) pipette_balance::require_usable(in.balance, *in.run_date);
  if (in.balance.readability.in_grams() <= zero)
    throw InputError(
        fmt::format("balance {}: readability {} must be positive.", in.balance.id, in_mg(in.balance.readability)));
  if (in.evaporation_per_weighing && in.evaporation_per_weighing->in_grams() < zero)
    throw InputError(fmt::format("evaporation loss {} is negative; give the mass lost per weighing.",
                                 in_mg(*in.evaporation_per_weighing)));
  out.evaporation_per_weighing = in.evaporation_per_weighing;
  if (in.volumes.empty()) throw InputError("the run has no test volumes; give weighings for at least one volume.");

  const ExactVolume lower = p.kind == PipetteKind::variable ? *p.lower_limit : p.nominal;
  std::set<ExactVolume, std::less<>> seen_volumes;
  for (const TestVolumeWeighings& tv : in.volumes) {
    if (tv.volume < lower || tv.volume > p.nominal)
      throw InputError(fmt::format("test volume {} is outside the range of pipette {} ({}).", ul(tv.volume), p.id,
                                   p.kind == PipetteKind::fixed ? fmt::format("fixed at {}", ul(p.nominal))
                                                                : fmt::format("{} to {}", ul(lower), ul(p.nominal))));
    if (!seen_volumes.insert(tv.volume).second)
      throw InputError(fmt::format("test volume {} is given twice in the run.", ul(tv.volume)));
    // An unsuitable balance is the first thing to say: its readings would fail the decimals check anyway.
    const pipette_balance::Suitability suit = pipette_balance::assess(in.balance, tv.volume);
    if (!suit.suitable) {
      std::string why;
      for (const auto& r : suit.reasons) why += (why.empty() ? "" : "; ") + r;
      throw InputError(fmt::format("the balance is not suitable for this run: {}.", why));
    }
    if (tv.channels.empty()) throw InputError(fmt::format("test volume {} has no weighings.", ul(tv.volume)));
    std::set<int> seen_channels;
    for (const ChannelWeighings& ch : tv.channels) {
      if (ch.channel < 1 || ch.channel > p.channels)
        throw InputError(
            fmt::format("test volume {}: channel {} does not exist on pipette {}, which has {} "
                        "channel(s).",
                        ul(tv.volume), ch.channel, p.id, p.channels));
      if (!seen_channels.insert(ch.channel).second)
        throw InputError(fmt::format("test volume {}: channel {} is given twice.", ul(tv.volume), ch.channel));
      check_channel_input(in, tv, ch);
    }
  }

  // Evaluate, largest volume first and channels ascending, so results read the same whatever the input order.
  std::vector<const TestVolumeWeighings*> order;
  for (const auto& tv : in.volumes) order.push_back(&tv);
  std::sort(order.begin(), order.end(), [](auto* a, auto* b) { return a->volume > b->volume; });
  std::set<std::string> balance_notes;
  bool few = false;
  for (const TestVolumeWeighings* tv : order) {
    TestVolumeResult tr;
    tr.selected = tv->volume;
    tr.balance = pipette_balance::assess(in.balance, tv->volume);
    balance_notes.insert(tr.balance.notes.begin(), tr.balance.notes.end());
    std::vector<const ChannelWeighings*> chans;
    for (const auto& ch : tv->channels) chans.push_back(&ch);
    std::sort(chans.begin(), chans.end(), [](auto* a, auto* b) { return a->channel < b->channel; });
    for (const ChannelWeighings* ch : chans) {
      if (ch->weighings.size() < recommended_replicates) few = true;
      ChannelResult cr = evaluate_channel(in, out.z, tv->volume, *ch);
      if (cr.verdict == Verdict::fail) {
        tr.verdict = Verdict::fail;
        out.verdict = Verdict::fail;
        out.reasons.insert(out.reasons.end(), cr.reasons.begin(), cr.reasons.end());
      }
      tr.channels.push_back(std::move(cr));
    }
    if (static_cast<int>(tr.channels.size()) < p.channels) {
      std::string missing;
      std::size_t k = 0;
      for (int c = 1; c <= p.channels; ++c) {
        if (k < tr.channels.size() && tr.channels[k].channel == c) {
          ++k;
          continue;
        }
        missing += (missing.empty() ? "" : ", ") + std::to_string(c);
      }
      out.complete = false;
      out.verdict = Verdict::fail;
      out.reasons.push_back(fmt::format("incomplete: channel(s) {} not tested at {} (ISO 8655-6 tests every channel)",
                                        missing, ul(tv->volume)));
    }
    out.volumes.push_back(std::move(tr));
  }
  for (const ExactVolume& v : default_test_volumes(p)) {
    if (!seen_volumes.count(v)) {
      out.complete = false;
      out.verdict = Verdict::fail;
      out.reasons.push_back(fmt::format("incomplete: the ISO 8655-6 test volume {} was not tested", ul(v)));
    }
  }
  if (few)
    out.notes.push_back(fmt::format("Fewer than {} replicates at some volume or channel; ISO 8655-6 asks for {}.",
                                    recommended_replicates, recommended_replicates));
  for (auto& n : gravimetric::environment_notes(in.environment)) out.notes.push_back(std::move(n));
  out.notes.insert(out.notes.end(), balance_notes.begin(), balance_notes.end());
  out.notes.push_back("Decision rule: simple acceptance (ILAC G8, no guard band); a result equal to a limit passes.");
  return out;
}

}  // namespace plumb::checks
