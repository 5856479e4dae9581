#include "app/weekly_check/capture.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <algorithm>
#include <cmath>

#include "app/runs/lookups.hpp"
#include "checks/repeatability.hpp"
#include "core/errors.hpp"
#include "stats/exact_summary.hpp"

namespace plumb::app {
namespace {

stats::ExactSummary spread_summary(const std::vector<ExactMass>& masses) {
  return stats::summarize_exact(in_grams(masses));
}

std::vector<ExactMass> masses_of(const std::vector<CsvReading>& readings) {
  std::vector<ExactMass> out;
  out.reserve(readings.size());
  for (const auto& r : readings) out.push_back(r.reading.mass());
  return out;
}

}  // namespace

std::optional<std::string> far_from_others(const ExactMass& reading, const std::vector<ExactMass>& others,
                                           const ExactMass& readability) {
  if (others.size() < 3) return std::nullopt;
  const auto s = spread_summary(others);
  const double spread = std::max(s.sd(), readability.in_grams().to_double());
  const double distance = std::abs(reading.in_grams().to_double() - s.mean());
  if (distance <= 4 * spread) return std::nullopt;
  return fmt::format(
      "it lies {} from the mean of the others, more than 4 times their spread (s or d, whichever is "
      "larger); it is counted: look at the pan, the weight and the draught shield, and stop the "
      "check if the reading was a mistake",
      format_mass(Mass::grams(distance), 3));
}

namespace {

WeeklyCheckSetup weekly_setup(store::Database& db, const CheckInput& in) {
  CheckLookups lookups(db);
  return prepare_weekly_check(lookups, in);
}

}  // namespace

WeeklyCapture::WeeklyCapture(store::Database& db, const CaptureInput& in)
    : db_(db),
      in_(in),
      setup_(weekly_setup(db, in.check)),
      lines_(setup_.balance, store::current_balance_port(db.sql(), setup_.balance.id), in.unit, in.source) {
  const auto least = static_cast<int>(checks::required_readings(setup_.balance.policy));
  if (in.count != 0 && in.count < least)
    throw InputError(fmt::format("--count {}: {}.", in.count, setup_.balance.policy.readings_basis()));
  if (in.count > 100) throw InputError(fmt::format("--count {} is more than 100 readings.", in.count));
  wanted_ = in.count != 0 ? in.count : least;
}

CaptureStep WeeklyCapture::take(JudgedLine line) {
  if (line.reading) {
    line.step.far_warning = far_from_others(line.reading->mass(), masses_of(readings_), setup_.balance.readability);
    readings_.push_back({*line.reading, static_cast<int>(lines_.lines().size()) + 1});
  }
  lines_.keep(line, line.reading ? std::optional<int>(counted()) : std::nullopt);
  return line.step;
}

CaptureStep WeeklyCapture::take_port_line(const std::string& bytes, const std::string& received_at) {
  if (complete()) return take(lines_.not_now(bytes, "port", received_at, "the check has all its readings"));
  const auto rule = [&](const MassReading& r, const std::string& where) {
    check_weekly_reading(r, where, setup_.balance);
  };
  return take(lines_.port_line(bytes, received_at, rule));
}

CaptureStep WeeklyCapture::take_typed(const std::string& text, const std::string& received_at) {
  const auto rule = [&](const MassReading& r, const std::string& where) {
    check_weekly_reading(r, where, setup_.balance);
  };
  return take(lines_.typed(text, received_at, rule));
}

CaptureSummary WeeklyCapture::summary() const {
  CaptureSummary out;
  out.n = counted();
  if (readings_.empty()) return out;
  const auto s = spread_summary(masses_of(readings_));
  const int decimals = setup_.balance.readability.in_grams().significant_scale() + 1;
  out.mean = fmt::format("{:.{}f} g", s.mean(), decimals);
  if (s.n >= 2) out.sd = fmt::format("{:.{}f} g", s.sd(), decimals);
  return out;
}

store::RunRecord WeeklyCapture::record(const store::Actor& actor) {
  if (!complete())
    throw InputError(fmt::format("the capture has {} of its {} readings; nothing was written.", counted(), wanted_));
  CheckInput in = in_.check;
  in.readings_source = in_.source == "typed" ? "typed readings" : in_.source;
  in.parsed_readings = readings_;
  SQLite::Transaction tx(db_.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db_.sql(), actor);
  CheckLookups lookups(db_);
  const std::int64_t id = record_check_in(rec, lookups, in, [&](store::RowGroup& group, std::int64_t run_id) {
                            store::add_raw_lines(group, run_id, lines_.lines());
                          }).run_id;
  rec.commit(tx);
  return *store::find_run(db_.sql(), id);
}

}  // namespace plumb::app
