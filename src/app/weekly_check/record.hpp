#pragma once
// Recording a check run: validate everything (instrument, weights and their traceability, readings),
// compute the results, judge them, schedule the next check, and write it all in one transaction.
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/readings_csv.hpp"
#include "core/units.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"
#include "store/status_events.hpp"

namespace plumb::app {

struct CheckInput {
  std::string instrument_id;
  std::string procedure;                ///< "repeatability"
  std::vector<std::string> weight_ids;  ///< e.g. {"W100"}
  std::string readings_csv;             ///< the CSV text
  std::string readings_source;          ///< file name for messages
  MassUnit default_unit = MassUnit::g;
  std::string on;                       ///< date performed, YYYY-MM-DD
  std::string operator_name;
  std::optional<std::int64_t> supersedes;  ///< a correction: the run this one replaces
  std::string reason;                      ///< why it replaces it (required with supersedes)
  /// For a batch import: the readings already parsed, each with its line in the import file (readings_csv
  /// is then not used).
  std::optional<std::vector<CsvReading>> parsed_readings;
};

/// The registry look-ups that recording a check needs: the lab, the balance, the reference weight with the
/// certificate valid on the check date, and whether both are in service. A batch import keeps one for the
/// whole file: its transaction holds the registry still, so each balance and weight is read once, not once
/// per run.
class CheckLookups {
public:
  explicit CheckLookups(store::Database& db) : db_(db) {}

  /// Reads the whole registry a check can need (lab, balances, weights with their certificates,
  /// retirements) at once and from then on never touches the database: a batch import validates its runs on
  /// one thread while another writes, and one query per table beats thousands of look-ups.
  void load_all();
  void require_lab();
  /// The balance; InputError when it is not registered.
  const store::BalanceRecord& balance(const std::string& id);
  /// The weight with the certificate in force on `on`; InputError when it is unknown, has no certificate
  /// dated on or before `on`, or that certificate was overdue on `on`.
  store::WeightRecord traceable_weight(const std::string& id, Date on);
  /// InputError when the instrument or weight is retired.
  void require_in_service(const std::string& item_kind, const std::string& id);

private:
  struct WeightHistory {
    store::WeightRecord weight;
    std::vector<store::WeightCalibration> calibrations;  ///< oldest first
  };
  store::Database& db_;
  bool all_loaded_ = false;  ///< load_all was called: a miss is an unknown item, not a query
  bool lab_checked_ = false;
  std::map<std::string, store::BalanceRecord> balances_;
  std::map<std::string, WeightHistory> weights_;
  std::map<std::string, std::optional<store::ServiceEvent>> retirements_;  ///< key: kind + '/' + id
};

/// Validates, computes and records one check in its own transaction; nothing is written on error.
store::RunRecord record_check(store::Database& db, const store::Actor& actor, const CheckInput& in);
struct RecordedCheck {
  std::int64_t run_id = 0;
  Verdict verdict = Verdict::pass;
};
/// The same inside a transaction the caller holds (batch import, correction).
RecordedCheck record_check_in(store::Recorder& rec, CheckLookups& lookups, const CheckInput& in);
/// Validates and computes the check without writing it: the run as it will be recorded (no id yet).
store::RunRecord build_check_run(CheckLookups& lookups, const CheckInput& in);

/// "LAST" or a run number; InputError when there is no such run.
std::int64_t resolve_run(store::Database& db, const std::string& selector);

/// The procedures `check record` knows.
std::vector<std::string> known_procedures();

}  // namespace plumb::app
