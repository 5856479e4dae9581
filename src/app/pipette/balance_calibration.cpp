#include "app/pipette/balance_calibration.hpp"

#include <fmt/format.h>

#include "store/repository.hpp"

namespace plumb::app {

BalanceCalibrationLookup balance_calibration_on(store::Database& db, const std::string& balance_id, Date on) {
  BalanceCalibrationLookup out;
  const auto runs = store::runs_of(db.sql(), balance_id);
  const store::RunRecord* latest = nullptr;
  for (const auto& r : runs)
    if (r.procedure == checks::Procedure::calibration && r.current() && !(on < r.performed_on) &&
        (!latest || latest->performed_on < r.performed_on ||
         (latest->performed_on == r.performed_on && latest->id < r.id)))
      latest = &r;
  if (!latest) {
    out.absent_reason = fmt::format("no calibration of balance {} recorded on or before {}", balance_id, to_string(on));
    return out;
  }
  if (latest->verdict != Verdict::pass || !latest->next_due || *latest->next_due < on) {
    out.absent_reason = latest->verdict != Verdict::pass
                            ? fmt::format("the latest calibration of balance {} (run {} of {}) did not pass",
                                          balance_id, latest->id, to_string(latest->performed_on))
                            : fmt::format("the latest calibration of balance {} (run {} of {}) was due again on {}",
                                          balance_id, latest->id, to_string(latest->performed_on),
                                          latest->next_due ? to_string(*latest->next_due) : "-");
    return out;
  }
  const nlohmann::json& results = latest->results;
  const bool left = results.value("final_stage", "") == "as-left" && results.contains("as_left");
  const nlohmann::json& set = left ? results["as_left"] : results["as_found"];
  checks::BalanceCalibrationUse use;
  use.balance_id = balance_id;
  use.run_id = latest->id;
  use.performed_on = latest->performed_on;
  if (const auto cert = store::certificate_for_run(db.sql(), latest->id)) use.certificate = cert->number;
  for (const auto& l : set.value("loads", nlohmann::json::array()))
    use.loads.push_back(
        {Mass::grams(l.value("reference_g", 0.0)), Mass::grams(l.value("U_g", 0.0)), l.value("k", 0.0)});
  if (use.loads.empty()) {
    out.absent_reason = fmt::format("the calibration run {} of balance {} states no loads", latest->id, balance_id);
    return out;
  }
  out.calibration = std::move(use);
  return out;
}

}  // namespace plumb::app
