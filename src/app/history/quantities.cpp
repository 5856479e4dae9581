#include "app/history/quantities.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <cmath>

#include "checks/repeatability_uncertainty.hpp"
#include "core/errors.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

constexpr double mg_per_g = 1000.0;

std::optional<double> number(const json& results, const char* key) {
  const auto it = results.find(key);  // one look-up: a report reads several members of hundreds of runs
  if (it == results.end() || !it->is_number()) return std::nullopt;
  return it->get<double>();
}

// U of the bias and of s, from what each run stores (runs recorded before the check stored its own U included):
// one model for every output, checks::repeatability_uncertainty (GUM, JCGM 100:2008; stated there).
std::optional<checks::RepeatabilityUncertainty> run_uncertainty(const RunContext& c) {
  const json& r = c.run.results;
  const auto sd = number(r, "sd_g"), n = number(r, "n"), d = number(r, "readability_g");
  if (!sd || !n || *n < 1) return std::nullopt;
  checks::RepeatabilityUncertaintyInput in{Mass::grams(*sd), static_cast<long long>(*n), Mass::grams(d.value_or(0.0)),
                                           std::nullopt, 2.0};
  if (c.weight && c.weight->k.to_double() > 0) {
    in.weight_expanded_u = c.weight->uncertainty.approx();
    in.weight_k = c.weight->k.to_double();
  }
  return checks::repeatability_uncertainty(in);
}

std::optional<QuantityValue> read_bias(const RunContext& c) {
  const auto bias = number(c.run.results, "bias_g");
  if (!bias) return std::nullopt;
  const auto u = run_uncertainty(c);
  return QuantityValue{*bias * mg_per_g, u ? u->bias_expanded.g() * mg_per_g : 0.0};
}

// A sample SD from n readings of a normal distribution has a relative standard uncertainty of about
// 1 / sqrt(2 (n - 1)) (GUM, JCGM 100:2008, E.4.3).
double sd_relative_u(double n) { return n > 1 ? 1.0 / std::sqrt(2.0 * (n - 1.0)) : 0.0; }

std::optional<QuantityValue> read_sd(const RunContext& c) {
  const auto sd = number(c.run.results, "sd_g");
  if (!sd) return std::nullopt;
  const auto u = run_uncertainty(c);
  return QuantityValue{*sd * mg_per_g, u ? u->sd_expanded.g() * mg_per_g : 0.0};
}

// Minimum weight 2000 max(s, 0.41 d) (USP <41>); U follows s when s sets it, and is 0 when the floor does.
std::optional<QuantityValue> read_min_weight(const RunContext& c) {
  const auto mw = number(c.run.results, "min_weight_g"), sd = number(c.run.results, "sd_g"),
             n = number(c.run.results, "n"), d = number(c.run.results, "readability_g");
  if (!mw) return std::nullopt;
  const bool s_sets_it = sd && d && *sd > 0.41 * *d;
  const double u = s_sets_it ? coverage_k * 2000.0 * *sd * sd_relative_u(n.value_or(0)) : 0.0;
  return QuantityValue{*mw * mg_per_g, u * mg_per_g};
}

std::string load_text(const RunContext& c) {
  if (const auto ref = number(c.run.results, "reference_g")) return fmt::format("{:.4g} g", *ref);
  return "the check load";
}

QuantityTolerance bias_tolerance(const RunContext& latest, const InstrumentInfo&) {
  const auto limit = number(latest.run.results, "bias_limit_g");
  if (!limit) return {{}, "no accuracy limit is stored with the latest check"};
  const double mg = *limit * mg_per_g;
  const std::string policy = latest.run.results.value("policy", "");
  return {{-mg, mg},
          fmt::format("|bias| <= {:.6g} mg, stored with run {} ({})", mg, latest.run.id,
                      policy == "usp41" ? "0.10 % of the reference value, USP <41>" : "the lab's limit")};
}

QuantityTolerance sd_tolerance(const RunContext&, const InstrumentInfo& inst) {
  if (!inst.balance) return {{}, "no repeatability limit is known"};
  const auto& b = *inst.balance;
  if (b.policy.kind == TolerancePolicy::Kind::lab) {
    if (!b.policy.max_sd) return {{}, "the lab policy of this balance sets no repeatability limit"};
    return {{std::nullopt, b.policy.max_sd->approx().g() * mg_per_g},
            fmt::format("s <= {}, the lab's limit", b.policy.max_sd->to_string())};
  }
  if (!b.smallest_net) return {{}, "no smallest net weight is declared, so USP <41> sets no limit on s"};
  // USP <41>: 2 s / m <= 0.10 %  <=>  s <= m / 2000 for the smallest net weight m.
  const double limit = b.smallest_net->approx().g() / 2000.0 * mg_per_g;
  return {{std::nullopt, limit},
          fmt::format("s <= {:.6g} mg = smallest net weight {} / 2000 (USP <41>: 2 s / m <= 0.10 %)", limit,
                      b.smallest_net->to_string())};
}

QuantityTolerance min_weight_tolerance(const RunContext&, const InstrumentInfo& inst) {
  if (!inst.balance || !inst.balance->smallest_net) return {{}, "no smallest net weight is declared"};
  return {{std::nullopt, inst.balance->smallest_net->approx().g() * mg_per_g},
          fmt::format("minimum weight <= the declared smallest net weight {} (USP <41>)",
                      inst.balance->smallest_net->to_string())};
}

// A calibration's error of indication at its largest load, from the final stage (as left after an adjustment,
// else as found): E = I - m_ref with the U and the MPE the calibration itself computed (EURAMET cg-18 budget).
const json* largest_load(const json& results) {
  const bool left = results.value("final_stage", "") == "as-left" && results.contains("as_left") &&
                    results["as_left"].is_object();
  if (!left && !(results.contains("as_found") && results["as_found"].is_object())) return nullptr;
  const json& set = left ? results["as_left"] : results["as_found"];
  // Pointers into the stored results themselves: json::value() would return a copy.
  if (!set.contains("loads") || !set["loads"].is_array()) return nullptr;
  const json* best = nullptr;
  for (const auto& l : set["loads"])
    if (l.contains("reference_g") && l["reference_g"].is_number() &&
        (!best || l["reference_g"].get<double>() > (*best)["reference_g"].get<double>()))
      best = &l;
  return best;
}

std::optional<QuantityValue> read_calibration_error(const RunContext& c) {
  const json* l = largest_load(c.run.results);
  if (!l) return std::nullopt;
  const auto e = number(*l, "error_g"), u = number(*l, "U_g");
  if (!e) return std::nullopt;
  return QuantityValue{*e * mg_per_g, u.value_or(0.0) * mg_per_g};
}

QuantityTolerance calibration_error_tolerance(const RunContext& latest, const InstrumentInfo&) {
  const json* l = largest_load(latest.run.results);
  const auto t = l ? number(*l, "tolerance_g") : std::nullopt;
  if (!t) return {{}, "no tolerance is stored with the latest calibration"};
  const double mg = *t * mg_per_g;
  return {{-mg, mg}, fmt::format("|E| <= {:.6g} mg at the largest load, stored with run {} ({})", mg, latest.run.id,
                                 l->value("tolerance_basis", latest.run.results.value("policy_name", "")))};
}

std::vector<HistoryQuantity> make_table() {
  std::vector<HistoryQuantity> t;
  t.push_back({"bias",
               "balance",
               checks::Procedure::repeatability,
               "Bias at the check load",
               "mg",
               "U (k = 2) of the bias combines s / sqrt(n), the reference weight's U / k and the rounding of the "
               "zero indication d / (2 sqrt 3) (GUM)",
               read_bias,
               [](const RunContext& c) { return "Bias at " + load_text(c); },
               bias_tolerance,
               {},
               true,
               {}});
  t.push_back({"sd",
               "balance",
               checks::Procedure::repeatability,
               "Repeatability SD",
               "mg",
               "U (k = 2) of the SD is 2 s / sqrt(2 (n - 1)), the spread of a sample SD of n normal readings "
               "(GUM E.4.3)",
               read_sd,
               [](const RunContext& c) { return "Repeatability SD at " + load_text(c); },
               sd_tolerance,
               {},
               true,
               {},
               true});
  t.push_back({"min-weight",
               "balance",
               checks::Procedure::repeatability,
               "Minimum weight (USP <41>)",
               "mg",
               "U (k = 2) of the minimum weight is 2000 U(s) when s > 0.41 d, else 0 (the 0.41 d floor sets it)",
               read_min_weight,
               [](const RunContext&) { return std::string("Minimum weight (USP <41>)"); },
               min_weight_tolerance,
               {},
               false,
               {},
               true});
  t.push_back({"cal-error",
               "balance",
               checks::Procedure::calibration,
               "Error of indication at the largest load",
               "mg",
               "U (k from Welch-Satterthwaite, about 95 %) is the calibration's own EURAMET cg-18 budget at that load",
               read_calibration_error,
               [](const RunContext& c) {
                 const json* l = largest_load(c.run.results);
                 const auto ref = l ? number(*l, "reference_g") : std::nullopt;
                 return ref ? fmt::format("Error of indication at {:.4g} g (final stage)", *ref)
                            : std::string("Error of indication at the largest load");
               },
               calibration_error_tolerance,
               {},
               false,
               {}});
  for (auto& q : t) {
    if (q.key == "bias") q.criterion = "|bias|";
    if (q.key == "sd") q.criterion = "SD s";
    if (q.key == "min-weight") q.criterion = "minimum weight";
  }
  for (auto& q : pipette_quantities()) t.push_back(std::move(q));
  return t;
}

}  // namespace

const std::vector<HistoryQuantity>& history_quantities() {
  static const std::vector<HistoryQuantity> table = make_table();
  return table;
}

std::vector<std::string> quantity_keys(const std::string& instrument_kind) {
  std::vector<std::string> keys;
  for (const auto& q : history_quantities())
    if (q.instrument_kind == instrument_kind) keys.push_back(q.key);
  return keys;
}

HistoryQuantity find_quantity(const std::string& key_and_selector, const InstrumentInfo& instrument) {
  const auto at = key_and_selector.find('@');
  std::string key = key_and_selector.substr(0, at);
  // No --quantity: the first quantity of the instrument's kind (bias for a balance, e_s % for a pipette).
  if (key.empty() && at == std::string::npos)
    if (const auto keys = quantity_keys(instrument.kind); !keys.empty()) key = keys.front();
  for (const auto& q : history_quantities()) {
    if (q.key != key || q.instrument_kind != instrument.kind) continue;
    if (at == std::string::npos) return q;
    if (!q.select)
      throw InputError(fmt::format("--quantity \"{}\": {} is read at one point of a run and takes no '@' selector.",
                                   key_and_selector, key));
    return q.select(key_and_selector.substr(at + 1));
  }
  const auto keys = quantity_keys(instrument.kind);
  if (keys.empty())
    throw InputError(fmt::format("--quantity \"{}\": plumb charts no quantity of a {} yet (instrument {}).", key,
                                 instrument.kind, instrument.id));
  throw InputError(fmt::format("--quantity \"{}\" is not known for {} {} (known: {}).", key, instrument.kind,
                               instrument.id, fmt::join(keys, ", ")));
}

}  // namespace plumb::app
