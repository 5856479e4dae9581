#include "app/runs/lookups.hpp"

#include <fmt/format.h>

#include "app/registry/lab.hpp"
#include "app/registry/service_status.hpp"
#include "app/registry/weight_in_force.hpp"
#include "core/errors.hpp"
#include "store/calibration.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

/// Later than any certificate date: asks for a weight's whole certificate history.
constexpr Date end_of_history{date::year{9999}, date::December, date::day{31}};

}  // namespace

void CheckLookups::require_lab() {
  if (lab_checked_) return;
  app::require_lab(db_);
  lab_checked_ = true;
}

void CheckLookups::load_all() {
  require_lab();
  for (auto& b : store::list_balances(db_.sql())) {
    std::string id = b.id;
    balances_.insert_or_assign(std::move(id), std::move(b));
  }
  for (const auto& [id, b] : balances_) attribute_histories_[id] = store::attribute_history(db_.sql(), id);
  for (auto& w : store::list_weights(db_.sql())) {
    std::string id = w.id;
    auto calibrations = store::weight_calibrations_until(db_.sql(), id, end_of_history);
    weights_.insert_or_assign(std::move(id), WeightHistory{std::move(w), std::move(calibrations)});
  }
  for (const char* kind : {"instrument", "weight"})
    for (const auto& id : store::retired_ids(db_.sql(), kind))
      retirements_[std::string(kind) + '/' + id] = store::retirement(db_.sql(), kind, id);
  all_loaded_ = true;
}

const store::BalanceRecord& CheckLookups::balance(const std::string& id) {
  auto it = balances_.find(id);
  if (it == balances_.end()) {
    auto b = all_loaded_ ? std::nullopt : store::find_balance(db_.sql(), id);
    if (!b) throw InputError(fmt::format("balance \"{}\" is not registered.", id));
    it = balances_.emplace(id, std::move(*b)).first;
  }
  return it->second;
}

store::BalanceRecord CheckLookups::balance_on(const std::string& id, Date on) {
  store::BalanceRecord b = balance(id);
  auto it = attribute_histories_.find(id);
  if (it == attribute_histories_.end()) {
    if (all_loaded_) return b;
    it = attribute_histories_.emplace(id, store::attribute_history(db_.sql(), id)).first;
  }
  const auto& history = it->second;
  if (history.size() < 2) return b;  // never changed: the registration set is the current one
  std::size_t in_force = 0;
  for (std::size_t i = 1; i < history.size(); ++i)
    if (history[i].effective_on <= on) in_force = i;
  const store::InstrumentAttributes& a = history[in_force];
  b.identity = a.identity;
  b.location = a.location;
  b.every = a.every;
  if (a.balance_policy) {
    b.policy = a.balance_policy->tolerance;
    b.smallest_net = a.balance_policy->smallest_net;
  }
  return b;
}

store::WeightRecord CheckLookups::traceable_weight(const std::string& id, Date on) {
  auto it = weights_.find(id);
  if (it == weights_.end()) {
    auto w = all_loaded_ ? std::nullopt : store::find_weight(db_.sql(), id);
    if (!w) throw InputError(fmt::format("--weight \"{}\" is not a known reference weight.", id));
    auto calibrations = store::weight_calibrations_until(db_.sql(), id, end_of_history);
    it = weights_.emplace(id, WeightHistory{std::move(*w), std::move(calibrations)}).first;
  }
  const WeightHistory& h = it->second;
  const store::WeightCalibration* in_force = certificate_in_force(h.calibrations, on);
  if (!in_force)
    throw InputError(fmt::format("--weight {} has no calibration certificate dated on or before the check date {}.",
                                 id, to_string(on)));
  // A reference weight whose own calibration is overdue may not be used to verify an instrument.
  if (overdue_on(*in_force, on))
    throw InputError(fmt::format("--weight {} was due for calibration on {} (certificate {}), before the check date "
                                 "{}; an overdue weight cannot give a traceable check.",
                                 id, to_string(in_force->due_on), in_force->certificate_no, to_string(on)));
  store::WeightRecord w = h.weight;
  w.current = *in_force;
  return w;
}

void CheckLookups::require_in_service(const std::string& item_kind, const std::string& id) {
  const std::string key = item_kind + '/' + id;
  auto it = retirements_.find(key);
  if (it == retirements_.end()) {
    // Loaded: only retired items are listed, so a missing one is in service.
    it = retirements_.emplace(key, all_loaded_ ? std::nullopt : store::retirement(db_.sql(), item_kind, id)).first;
  }
  app::require_in_service(item_kind, id, it->second);  // throws when retired
}

}  // namespace plumb::app
