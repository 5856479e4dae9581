#include "app/calibration/capture.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/weekly_check/record.hpp"
#include "core/errors.hpp"
#include "store/balance_ports.hpp"
#include "store/raw_lines.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

/// The plan's rows, checked with the balance, its settings and the weights before the first reading.
std::vector<CalibrationRow> checked_plan(store::Database& db, const CalibrationCaptureInput& in) {
  CalibrationRunInput run = in.run;
  run.parsed_rows = parse_calibration_plan(in.plan_text, in.plan_source);
  run.readings_source = in.plan_source;
  check_calibration_plan(db, run);
  return *run.parsed_rows;
}

store::BalanceRecord calibrated_balance(store::Database& db, const std::string& id) {
  return *store::find_balance(db.sql(), id);  // check_calibration_plan found it
}

}  // namespace

std::string weights_named(const std::string& load) {
  std::string out;
  for (const char c : load) out += c == '+' ? std::string(" + ") : std::string(1, c);
  return out;
}

CalibrationCapture::CalibrationCapture(store::Database& db, const CalibrationCaptureInput& in)
    : db_(db),
      in_(in),
      rows_(checked_plan(db, in)),
      lines_(calibrated_balance(db, in.run.instrument_id), store::current_balance_port(db.sql(), in.run.instrument_id),
             in.unit, in.source) {
  lines_.refuse_above_capacity(false);  // judged on the loads (check_calibration_plan), not on the readings
}

std::pair<int, int> CalibrationCapture::place_in_series(const CalibrationRow& row) const {
  int k = 0, n = 0;
  for (const auto& r : rows_) {
    if (r.stage != row.stage || r.part != row.part || r.load != row.load) continue;
    ++n;
    if (&r <= &row) k = n;
  }
  return {k, n};
}

CaptureStep CalibrationCapture::take(const JudgedLine& line) {
  std::optional<int> seq;
  if (line.reading) {
    auto& row = rows_.at(static_cast<std::size_t>(taken_));
    row.reading = *line.reading;
    seq = ++taken_;
  }
  lines_.keep(line, seq);
  return line.step;
}

CaptureStep CalibrationCapture::take_port_line(const std::string& bytes, const std::string& received_at) {
  if (complete()) {
    auto line = lines_.not_now(bytes, "port", received_at, "the calibration has all its readings");
    lines_.keep(line, std::nullopt);
    return line.step;
  }
  const auto rule = [&](const MassReading& r, const std::string& where) { check_weekly_reading(r, where, balance()); };
  return take(lines_.port_line(bytes, received_at, rule));
}

CaptureStep CalibrationCapture::take_typed(const std::string& text, const std::string& received_at) {
  const auto rule = [&](const MassReading& r, const std::string& where) { check_weekly_reading(r, where, balance()); };
  return take(lines_.typed(text, received_at, rule));
}

store::RunRecord CalibrationCapture::record(const store::Actor& actor) {
  if (!complete())
    throw InputError(fmt::format("the capture has {} of its {} readings; nothing was written.", taken_, wanted()));
  CalibrationRunInput in = in_.run;
  in.parsed_rows = rows_;
  in.readings_source = in_.plan_source;
  SQLite::Transaction tx(db_.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db_.sql(), actor);
  const std::int64_t id = record_calibration_in(db_, rec, in, [&](store::RowGroup& group, std::int64_t run_id) {
    store::add_raw_lines(group, run_id, lines_.lines());
  });
  rec.commit(tx);
  return *store::find_run(db_.sql(), id);
}

}  // namespace plumb::app
