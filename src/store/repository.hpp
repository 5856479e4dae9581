#pragma once
// Reading and appending plumb's records. Writes go through a Recorder (audited); reads are plain queries.
// Nothing here updates or deletes: a change is always a new row.
#include <SQLiteCpp/Database.h>

#include <functional>
#include <optional>
#include <string>
#include <vector>

#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::store {

// Lab
std::optional<LabRecord> find_lab(SQLite::Database& db);
void add_lab(Recorder& rec, const std::string& name);

// Reference weights
std::optional<WeightRecord> find_weight(SQLite::Database& db, const std::string& id);
std::optional<WeightCalibration> find_weight_calibration(SQLite::Database& db, std::int64_t id);
std::vector<WeightRecord> list_weights(SQLite::Database& db);
/// Appends the weight and its first certificate; returns the certificate's id.
std::int64_t add_weight(Recorder& rec, const WeightRecord& w);
/// Appends a new certificate for an existing weight (a recalibration); returns its id.
std::int64_t add_weight_calibration(Recorder& rec, const std::string& weight_id, const WeightCalibration& c);

// Instruments
bool instrument_exists(SQLite::Database& db, const std::string& id);
/// The balance with its attributes in force now (after every change recorded) ...
std::optional<BalanceRecord> find_balance(SQLite::Database& db, const std::string& id);
/// ... or on a date (a check dated `on` is judged by the policy in force then).
std::optional<BalanceRecord> find_balance_on(SQLite::Database& db, const std::string& id, Date on);
std::vector<BalanceRecord> list_balances(SQLite::Database& db);
void add_balance(Recorder& rec, const BalanceRecord& b);

// Check runs
/// Rows a procedure stores beside the run (calibration loads, pipette conditions), given the new run's id;
/// they join the run's one audit record.
using RunDetails = std::function<void(RowGroup& group, std::int64_t run_id)>;
/// Appends the run with its weights, readings and `details` under one audit record; returns the new run id.
std::int64_t add_run(Recorder& rec, const RunRecord& run, const RunDetails& details = {});
/// add_run's rows and audit record, computed but not written (a batch import writes them on another
/// thread with Recorder::write); `id` receives the run id they will have. `run`'s texts are moved into the rows.
PreparedGroup prepare_run(Recorder& rec, RunRecord&& run, std::int64_t& id, const RunDetails& details = {});
std::optional<RunRecord> find_run(SQLite::Database& db, std::int64_t id);
/// The id of the most recently recorded run, if any.
std::optional<std::int64_t> last_run_id(SQLite::Database& db);
/// Runs of one instrument in date order (oldest first).
std::vector<RunRecord> runs_of(SQLite::Database& db, const std::string& instrument_id, bool with_readings = false);
/// The latest run (by date, then id) of an instrument that has not been superseded.
std::optional<RunRecord> latest_run(SQLite::Database& db, const std::string& instrument_id);

// Certificates
std::int64_t add_certificate(Recorder& rec, const CertificateRecord& c);
std::optional<CertificateRecord> find_certificate(SQLite::Database& db, const std::string& number);
std::optional<CertificateRecord> find_certificate_by_id(SQLite::Database& db, std::int64_t id);
std::optional<CertificateRecord> certificate_for_run(SQLite::Database& db, std::int64_t run_id);
/// Next free number in the series PREFIX-YEAR-NNNN.
std::string next_certificate_number(SQLite::Database& db, const std::string& prefix, int year);

}  // namespace plumb::store
