#pragma once
// Plain records read from and written to the database.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <vector>

#include "checks/procedure.hpp"
#include "checks/verdict.hpp"
#include "core/dates.hpp"
#include "core/units.hpp"

namespace plumb::store {

struct LabRecord {
  std::string name;
  std::string created_at;
};

struct WeightCalibration {
  std::int64_t id = 0;
  std::string certificate_no;
  ExactMass correction;
  ExactMass uncertainty;  ///< expanded, U
  Decimal k{2, 0};
  Date calibrated_on;
  Date due_on;
};

struct WeightRecord {
  std::string id;
  std::string nominal_text;
  ExactMass nominal;
  std::string weight_class;
  std::optional<Decimal> density_kg_m3;
  WeightCalibration current;  ///< the latest certificate

  [[nodiscard]] ExactMass conventional_mass() const { return nominal + current.correction; }
};

/// Who made an instrument and how the lab tells it apart from its siblings.
struct InstrumentIdentity {
  std::string maker, model, serial_no, asset_tag;
  [[nodiscard]] bool empty() const {
    return maker.empty() && model.empty() && serial_no.empty() && asset_tag.empty();
  }
  friend bool operator==(const InstrumentIdentity&, const InstrumentIdentity&) = default;
};

/// A balance with the attributes in force (today, or on the date it was read for).
struct BalanceRecord {
  std::string id;
  InstrumentIdentity identity;
  std::string location;
  Interval every;
  Date created_on;
  ExactMass capacity;
  ExactMass readability;
  std::optional<ExactMass> smallest_net;
  TolerancePolicy policy;
};

struct StoredReading {
  int seq = 0;
  std::string series;
  MassReading reading;
};

struct RunWeight {
  std::string weight_id;
  std::int64_t weight_calibration_id = 0;
};

/// Why and by whom a run entered in error was voided.
struct RunVoid {
  std::string reason, by_name, recorded_at;
};

struct RunRecord {
  std::int64_t id = 0;
  std::string instrument_id;
  checks::Procedure procedure = checks::Procedure::repeatability;
  Date performed_on;
  std::string operator_name;
  nlohmann::json results;
  /// Writing only: the results already as JSON text (a procedure that writes its results straight to text,
  /// see report::repeatability_results_text); when empty, results.dump() is stored.
  std::string results_text;
  Verdict verdict = Verdict::pass;
  std::optional<Date> next_due;
  std::optional<std::int64_t> supersedes;
  std::string reason;
  std::optional<std::int64_t> superseded_by;  ///< read only: the run that corrected this one
  std::optional<RunVoid> voided;              ///< read only: set when the run was voided
  /// A current run counts in due dates, trends and summaries: neither corrected away nor void.
  [[nodiscard]] bool current() const { return !superseded_by && !voided; }
  std::string recorded_at;
  std::string os_user;
  std::vector<RunWeight> weights;
  std::vector<StoredReading> readings;
};

struct CertificateRecord {
  std::int64_t id = 0;
  std::string number;
  std::int64_t run_id = 0;
  std::string kind;
  std::string issued_at;
  std::string issued_by;
  nlohmann::json content;
  std::string content_sha256;
  std::optional<std::int64_t> supersedes;  ///< the certificate this one replaces (after a correction)
};

}  // namespace plumb::store
