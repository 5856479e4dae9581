#pragma once
// Recording a weekly check (procedure repeatability): validate everything (instrument, weights and their
// traceability, readings), compute the results, judge them, schedule the next check, and write it all in one
// transaction.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "app/runs/lookups.hpp"
#include "core/readings_csv.hpp"
#include "core/units.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"
#include "store/repository.hpp"

namespace plumb::app {

struct CheckInput {
  std::string instrument_id;
  std::vector<std::string> weight_ids;  ///< e.g. {"W100"}
  std::string readings_csv;             ///< the CSV text
  std::string readings_source;          ///< file name for messages
  MassUnit default_unit = MassUnit::g;
  std::string on;  ///< date performed, YYYY-MM-DD
  std::string operator_name;
  std::optional<std::int64_t> supersedes;  ///< a correction: the run this one replaces
  std::string reason;                      ///< why it replaces it (required with supersedes)
  /// For a batch import: the readings already parsed, each with its line in the import file (readings_csv
  /// is then not used).
  std::optional<std::vector<CsvReading>> parsed_readings;
};

/// Validates, computes and records one check in its own transaction; nothing is written on error.
store::RunRecord record_check(store::Database& db, const store::Actor& actor, const CheckInput& in);
struct RecordedCheck {
  std::int64_t run_id = 0;
  Verdict verdict = Verdict::pass;
};
/// The same inside a transaction the caller holds (batch import, correction); `details` adds rows of other tables
/// to the run's record (a captured run's raw lines).
RecordedCheck record_check_in(store::Recorder& rec, CheckLookups& lookups, const CheckInput& in,
                              const store::RunDetails& details = {});
/// What a check needs before its readings, validated: the date, the balance and the weight in force then.
struct WeeklyCheckSetup {
  Date on;
  store::BalanceRecord balance;
  store::WeightRecord weight;
};
/// Validates everything of `in` but its readings (date, operator, weight, lab, balance, service, capacity).
WeeklyCheckSetup prepare_weekly_check(CheckLookups& lookups, const CheckInput& in);
/// Refuses a reading the balance cannot have shown (more decimals than its readability, negative); `where` is
/// "FILE line N".
void check_weekly_reading(const MassReading& reading, std::string_view where, const store::BalanceRecord& balance);
/// Validates and computes the check without writing it: the run as it will be recorded (no id yet).
store::RunRecord build_check_run(CheckLookups& lookups, const CheckInput& in);
}  // namespace plumb::app
