// A pipette's chartable results, read from the stored run (report/pipette/json.cpp): per test volume and
// channel, the systematic error e_s (uL and % of the selected volume) and the random error as CV. A run
// has several test volumes and channels but a history is one number per run, so each quantity is read at
// one point: the test volume the user names (--quantity cv@10uL) or the largest test volume of the run (the
// nominal volume), and the channel named (cv@10uL/ch3) or, on a multichannel pipette, the worst channel of
// the run, the one a reviewer must watch.
#include <fmt/format.h>

#include <algorithm>
#include <cctype>
#include <cmath>
#include <optional>

#include "app/history/quantities.hpp"
#include "core/decimal.hpp"
#include "core/errors.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;


enum class PipetteMeasure { systematic_ul, systematic_pct, cv_pct };

struct Point {
  std::optional<double> volume_ul;  ///< the test volume; none: the largest of each run
  std::optional<int> channel;       ///< none: the worst channel of each run
};

double num(const json& j, const char* key) { return j.contains(key) && j[key].is_number() ? j[key].get<double>() : 0; }

const char* value_key(PipetteMeasure m) {
  switch (m) {
    case PipetteMeasure::systematic_ul: return "systematic_error_ul";
    case PipetteMeasure::systematic_pct: return "systematic_error_pct";
    case PipetteMeasure::cv_pct: return "cv_pct";
  }
  return "";
}

bool same_volume(double a, double b) { return std::abs(a - b) <= 1e-9 * std::max(1.0, std::abs(b)); }

// The test volume entry of a run at the point: the named volume, or the largest one tested.
const json* volume_entry(const json& results, const Point& p) {
  const json* best = nullptr;
  // Pointers into the stored results themselves: json::value() would return a copy.
  if (!results.contains("volumes") || !results["volumes"].is_array()) return nullptr;
  for (const auto& tv : results["volumes"]) {
    const double v = num(tv, "selected_ul");
    if (p.volume_ul ? same_volume(v, *p.volume_ul) : (!best || v > num(*best, "selected_ul"))) best = &tv;
  }
  return best;
}

// The channel at the point: the named one, the only one, or the one farthest from zero (worst).
const json* channel_entry(const json& tv, const Point& p, PipetteMeasure m) {
  const json* best = nullptr;
  if (!tv.contains("channels") || !tv["channels"].is_array()) return nullptr;
  for (const auto& ch : tv["channels"]) {
    if (p.channel) {
      if (ch.value("channel", 0) == *p.channel) return &ch;
      continue;
    }
    if (!best || std::abs(num(ch, value_key(m))) > std::abs(num(*best, value_key(m)))) best = &ch;
  }
  return best;
}

// U (k = 2) as the run stored it from its full budget (checks/pipette_uncertainty.hpp). Runs recorded before
// the budget was stored fall back to the scatter of the n deliveries only, a lower bound:
//   e_s = mean V - V_s, so u(e_s) = s_r / sqrt(n);                           U = 2 s_r / sqrt(n);
//   in % of the selected volume V_s:                                          U = 2 s_r / sqrt(n) / V_s x 100;
//   CV = s_r / mean V; a sample SD of n normal values has relative u 1 / sqrt(2 (n - 1)) (GUM E.4.3), so
//   U(CV) = 2 CV / sqrt(2 (n - 1)).
std::optional<QuantityValue> read_at(const RunContext& c, const Point& p, PipetteMeasure m) {
  const json* tv = volume_entry(c.run.results, p);
  if (!tv) return std::nullopt;
  const json* ch = channel_entry(*tv, p, m);
  if (!ch || !(*ch).contains(value_key(m)) || !(*ch)[value_key(m)].is_number()) return std::nullopt;
  const double n = num(*ch, "n"), s_r = num(*ch, "random_error_ul"), v_s = num(*tv, "selected_ul");
  const double value = num(*ch, value_key(m));
  double u = 0;
  // Runs recorded with their ISO 8655-6 budget carry U; older runs get the lower bound below.
  if (const json& st = ch->value("uncertainty", json::object()); st.is_object() && st.contains("systematic_u_ul")) {
    switch (m) {
      case PipetteMeasure::systematic_ul: u = num(st, "systematic_u_ul"); break;
      case PipetteMeasure::systematic_pct: u = num(st, "systematic_u_pct"); break;
      case PipetteMeasure::cv_pct: u = num(st, "cv_u_pct"); break;
    }
    return QuantityValue{value, u};
  }
  switch (m) {
    case PipetteMeasure::systematic_ul: u = n > 0 ? coverage_k * s_r / std::sqrt(n) : 0; break;
    case PipetteMeasure::systematic_pct: u = n > 0 && v_s > 0 ? coverage_k * s_r / std::sqrt(n) / v_s * 100 : 0; break;
    case PipetteMeasure::cv_pct: u = n > 1 ? coverage_k * value / std::sqrt(2 * (n - 1)) : 0; break;
  }
  return QuantityValue{value, u};
}

std::string point_text(const RunContext& c, const Point& p, PipetteMeasure m) {
  const json* tv = volume_entry(c.run.results, p);
  const std::string volume = tv ? fmt::format("{} uL", tv->value("selected", fmt::format("{:g}", num(*tv, "selected_ul"))))
                                : p.volume_ul ? fmt::format("{:g} uL", *p.volume_ul) : std::string("the nominal volume");
  const int channels = c.run.results.value("pipette", json::object()).value("channels", 1);
  if (p.channel) return fmt::format("{}, channel {}", volume, *p.channel);
  return channels > 1 ? volume + (m == PipetteMeasure::cv_pct ? ", channel with the largest CV" : ", worst channel")
                      : volume;
}

QuantityTolerance tolerance_at(const RunContext& latest, const Point& p, PipetteMeasure m) {
  const json* tv = volume_entry(latest.run.results, p);
  const json* ch = tv ? channel_entry(*tv, p, m) : nullptr;
  if (!ch || !ch->contains("limits")) return {{}, "no limits are stored with the latest check at this volume"};
  const json& l = (*ch)["limits"];
  std::string stored = l.value("basis", "the pipette's limits");
  while (!stored.empty() && (stored.back() == '.' || stored.back() == ' ')) stored.pop_back();  // callers end the sentence
  const std::string basis = fmt::format("stored with run {}: {}", latest.run.id, stored);
  switch (m) {
    case PipetteMeasure::systematic_ul: {
      const double lim = num(l, "systematic_ul");
      return {{-lim, lim}, fmt::format("|e_s| <= {:.4g} uL, {}", lim, basis)};
    }
    case PipetteMeasure::systematic_pct: {
      const double lim = num(l, "systematic_pct");
      return {{-lim, lim}, fmt::format("|e_s| <= {:.4g} % of the selected volume, {}", lim, basis)};
    }
    case PipetteMeasure::cv_pct: {
      const double lim = num(l, "random_pct");
      return {{std::nullopt, lim}, fmt::format("CV <= {:.4g} %, {}", lim, basis)};
    }
  }
  return {};
}

// "10", "10uL", "10 uL", "10uL/ch3", "10/3": the test volume in uL and optionally the channel.
Point parse_selector(const std::string& selector, const std::string& key) {
  const auto bad = [&](const std::string& why) {
    return InputError(fmt::format("--quantity \"{}@{}\": {}; write {}@VOLUME or {}@VOLUME/chN, e.g. {}@10uL/ch2.", key,
                                  selector, why, key, key, key));
  };
  Point p;
  const auto slash = selector.find('/');
  std::string volume = selector.substr(0, slash);
  volume.erase(std::remove(volume.begin(), volume.end(), ' '), volume.end());
  // The volume with its unit, like every quantity typed: 10uL or 0.01mL (a bare 10 is refused).
  try {
    p.volume_ul = ExactVolume::parse(volume, "the test volume").in_microlitres().to_double();
  } catch (const InputError&) {
    throw bad(fmt::format("the test volume \"{}\" is not a volume with its unit (uL or mL)", volume));
  }
  if (!(*p.volume_ul > 0)) throw bad(fmt::format("the test volume {} is not above zero", volume));
  if (slash != std::string::npos) {
    std::string ch = selector.substr(slash + 1);
    if (ch.rfind("ch", 0) == 0) ch = ch.substr(2);
    if (ch.empty() || ch.size() > 3 || !std::all_of(ch.begin(), ch.end(), [](unsigned char c) { return std::isdigit(c); }) ||
        std::stoi(ch) < 1)
      throw bad(fmt::format("the channel \"{}\" is not a channel number 1, 2, ...", selector.substr(slash + 1)));
    p.channel = std::stoi(ch);
  }
  return p;
}

struct MeasureInfo {
  PipetteMeasure measure;
  const char* key;
  const char* label;
  const char* unit;
  const char* uncertainty_basis;
};

constexpr MeasureInfo measures[] = {
    {PipetteMeasure::systematic_pct, "relative-systematic-error", "Systematic error", "%",
     "U (k = 2) of e_s in % of the selected volume from the run's ISO 8655-6 budget (repeatability of the mean, "
     "balance, water temperature, air density, evaporation, Z; GUM); runs recorded before it: 2 s_r / sqrt(n), "
     "a lower bound"},
    {PipetteMeasure::systematic_ul, "systematic-error", "Systematic error", "uL",
     "U (k = 2) of e_s from the run's ISO 8655-6 budget (repeatability of the mean, balance, water temperature, "
     "air density, evaporation, Z; GUM); runs recorded before it: 2 s_r / sqrt(n), a lower bound"},
    {PipetteMeasure::cv_pct, "cv", "Random error (CV)", "%",
     "U (k = 2) of the CV is 2 CV / sqrt(2 (n - 1)), the spread of a sample SD of n normal deliveries (GUM E.4.3)"},
};

HistoryQuantity make(const MeasureInfo& mi, const Point& p) {
  HistoryQuantity q;
  q.key = mi.key;
  q.instrument_kind = "pipette";
  q.procedure = checks::Procedure::gravimetric;
  q.label = mi.label;
  q.unit = mi.unit;
  q.uncertainty_basis = mi.uncertainty_basis;
  const PipetteMeasure m = mi.measure;
  q.read = [p, m](const RunContext& c) { return read_at(c, p, m); };
  q.axis_label = [p, m, label = std::string(mi.label)](const RunContext& c) {
    return fmt::format("{} at {}", label, point_text(c, p, m));
  };
  q.tolerance = [p, m](const RunContext& c, const InstrumentInfo&) { return tolerance_at(c, p, m); };
  q.select = [&mi](const std::string& selector) { return make(mi, parse_selector(selector, mi.key)); };
  q.points_tested = [](const store::RunRecord& run) {
    std::vector<std::string> out;
    for (const auto& tv : run.results.value("volumes", json::array())) {
      const std::string volume = tv.value("selected", fmt::format("{:g}", num(tv, "selected_ul")));
      std::vector<int> channels;
      for (const auto& ch : tv.value("channels", json::array())) channels.push_back(ch.value("channel", 0));
      out.push_back(channels.size() > 1 ? fmt::format("{} uL/ch{}-{}", volume, channels.front(), channels.back())
                                        : fmt::format("{} uL", volume));
    }
    return out;
  };
  q.non_negative = m == PipetteMeasure::cv_pct;
  q.watched = m != PipetteMeasure::systematic_ul;  // % and CV compare across volumes; the uL view is on request
  return q;
}

}  // namespace

std::vector<HistoryQuantity> pipette_quantities() {
  std::vector<HistoryQuantity> out;
  for (const auto& mi : measures) out.push_back(make(mi, {}));
  return out;
}

}  // namespace plumb::app
