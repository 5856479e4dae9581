#pragma once
// A balance in normal use: the terms the lab declares for it (`balance set-in-use`, quality manager; migration
// 015, history kept) and what follows from them with the balance's latest counting calibration (EURAMET cg-18
// v4.0, uncertainty of a weighing result; checks/weighing_in_use): the global uncertainty U(W) over the range in
// the declared form, the minimum weight from calibration with the lab's required accuracy and safety factor
// (USP <1251> usage), beside the USP <41> minimum weight of the latest weekly repeatability check, and which of
// the two a weighing procedure must respect (the larger). The derived figures are computed from the records in
// force when shown; the declared terms are the stored record.
#include <nlohmann/json.hpp>

#include <optional>
#include <string>

#include "checks/weighing_in_use.hpp"
#include "core/dates.hpp"
#include "store/database.hpp"
#include "store/in_use_terms.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

/// The options of `balance set-in-use`, as typed (each quantity with its unit).
struct InUseTermsInput {
  std::string balance_id;
  std::optional<std::string> rounding_zero;  ///< --rounding-zero 0.1mg (default: the balance's d)
  std::optional<std::string> rounding_load;  ///< --rounding-load 0.1mg (default: the balance's d)
  std::string repeatability;                 ///< --repeatability 0.12mg
  std::string temperature_change;            ///< --temperature-change 5K
  std::string sensitivity;                   ///< --tk 1.5ppm/K
  std::string sample_density = "8000kg/m3";  ///< --sample-density
  std::string sample_density_u = "0kg/m3";   ///< --sample-density-u
  std::string air_density_u;                 ///< --air-density-u 0.05kg/m3
  std::string drift;                         ///< --drift 10ppm
  bool error_corrected = false;              ///< --corrected
  std::string form = "linear";               ///< --form linear | quadratic-sum
  std::string required_accuracy;             ///< --required-accuracy 0.1%
  std::string safety_factor;                 ///< --safety-factor 2
  std::string reason;                        ///< --reason
};

/// Validates every option (InputError naming it and its value) and appends the terms in one transaction.
store::InUseTermsRecord set_in_use_terms(store::Database& db, const store::Actor& actor, const InUseTermsInput& in);

/// The stored terms in the pure layer's form.
checks::InUseTerms in_use_terms_of(const store::InUseTermsRecord& r);

/// The balance in use on `on`: declared terms and their history, the calibration drawn on, U(W), both minimum
/// weights and which binds. InputError when the balance is not registered.
nlohmann::json balance_in_use(store::Database& db, const std::string& balance_id, Date on);

/// What a balance calibration certificate states about normal use: with the run's own final stage and the terms
/// declared when it is issued, U(W) in its form, the minimum weight from calibration beside the USP <41> one of the
/// latest weekly check on or before `on`, which binds, and the sources; where no terms are declared, one
/// "statement" saying so. Null for a run that is not of a registered balance.
nlohmann::json certificate_in_use(store::Database& db, const store::RunRecord& run, Date on);

}  // namespace plumb::app
