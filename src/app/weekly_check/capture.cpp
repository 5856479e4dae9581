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

std::string outcome_key(CaptureStep::Outcome o) {
  switch (o) {
    case CaptureStep::Outcome::counted:
      return "counted";
    case CaptureStep::Outcome::unstable:
      return "unstable";
    case CaptureStep::Outcome::not_a_reading:
      return "not a reading";
    case CaptureStep::Outcome::refused:
      return "refused";
  }
  return "refused";
}

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

WeeklyCapture::WeeklyCapture(store::Database& db, const CaptureInput& in) : db_(db), in_(in) {
  CheckLookups lookups(db);
  setup_ = prepare_weekly_check(lookups, in.check);
  port_ = store::current_balance_port(db.sql(), setup_.balance.id);
  unit_ = port_ ? port_->unit : in.unit;
  if (port_ && port_->line_pattern) pattern_ = LinePattern::parse(*port_->line_pattern, "the balance's line pattern");
  const auto least = static_cast<int>(checks::required_readings(setup_.balance.policy));
  if (in.count != 0 && in.count < least)
    throw InputError(fmt::format("--count {}: {}.", in.count, setup_.balance.policy.readings_basis()));
  if (in.count > 100) throw InputError(fmt::format("--count {} is more than 100 readings.", in.count));
  wanted_ = in.count != 0 ? in.count : least;
}

CaptureStep WeeklyCapture::judge(const BalanceLineReading& line, const std::string& where) {
  CaptureStep step;
  if (!line.stable) {
    step.outcome = CaptureStep::Outcome::unstable;
    step.message = fmt::format(
        "{}: reading \"{}\" {} is marked unstable; it is not counted (wait for the stable "
        "reading).",
        where, line.text, line.unit_text);
    return step;
  }
  step.outcome = CaptureStep::Outcome::refused;
  if (!line.unit) {
    step.message = fmt::format(
        "{}: reading \"{}\" has the unit \"{}\", which is not a mass unit plumb reads (ug, mg, "
        "g, kg); set the balance to show {}.",
        where, line.text, escaped_line(line.unit_text), to_string(unit_));
    return step;
  }
  if (*line.unit != unit_) {
    step.message = fmt::format("{}: reading \"{}\" {} is not in {}, the unit {} is set to show; it is not counted.",
                               where, line.text, to_string(*line.unit), to_string(unit_), setup_.balance.id);
    return step;
  }
  const MassReading reading{line.text, *line.unit, line.value};
  try {
    check_weekly_reading(reading, where, setup_.balance);
  } catch (const InputError& e) {
    step.message = e.what();
    return step;
  }
  if (reading.mass() > setup_.balance.capacity) {
    step.message = fmt::format("{}: reading \"{}\" {} is above the capacity {} of {}.", where, reading.text,
                               to_string(reading.unit), setup_.balance.capacity.to_string(), setup_.balance.id);
    return step;
  }
  step.outcome = CaptureStep::Outcome::counted;
  step.far_warning = far_from_others(reading.mass(), masses_of(readings_), setup_.balance.readability);
  readings_.push_back({reading, static_cast<int>(lines_.size()) + 1});
  return step;
}

void WeeklyCapture::keep(const std::string& shown, const std::string& source, const std::string& received_at,
                         const CaptureStep& step) {
  store::RawLine l;
  l.seq = static_cast<int>(lines_.size()) + 1;
  l.received_at = received_at;
  l.source = source;
  l.line = shown;
  l.outcome = outcome_key(step.outcome);
  if (step.outcome == CaptureStep::Outcome::counted) l.reading_seq = counted();
  l.note = step.far_warning ? "far from the others: " + *step.far_warning : step.message;
  lines_.push_back(std::move(l));
}

CaptureStep WeeklyCapture::take_port_line(const std::string& bytes, const std::string& received_at) {
  const std::string where = fmt::format("{} line {}", in_.source, lines_.size() + 1);
  CaptureStep step;
  if (complete()) {
    step.outcome = CaptureStep::Outcome::not_a_reading;
    step.message = fmt::format("{}: the check has all its readings; this line is not counted.", where);
  } else if (const auto line = read_balance_line(bytes, pattern_ ? &*pattern_ : nullptr)) {
    step = judge(*line, where);
  } else {
    step.outcome = CaptureStep::Outcome::not_a_reading;
    step.message = fmt::format("{}: \"{}\" is not a reading{}; it is not counted.", where, escaped_line(bytes),
                               pattern_ ? " in the balance's line pattern" : " in any line shape plumb knows");
  }
  keep(escaped_line(bytes), "port", received_at, step);
  return step;
}

CaptureStep WeeklyCapture::take_typed(const std::string& text, const std::string& received_at) {
  const std::string where = fmt::format("typed line {}", lines_.size() + 1);
  CaptureStep step;
  std::optional<BalanceLineReading> line = read_balance_line(text);
  if (!line) {
    // A bare number is in the unit the balance shows, as a readings file without a unit column is in --unit.
    try {
      const auto first = text.find_first_not_of(" \t");
      const auto last = text.find_last_not_of(" \t\r\n");
      const std::string number = first == std::string::npos ? std::string() : text.substr(first, last - first + 1);
      line = BalanceLineReading{number, Decimal::parse(escaped_line(number), where + ": reading"),
                                std::string(to_string(unit_)), unit_, true};
    } catch (const InputError& e) {
      std::string said = e.what();
      if (!said.empty() && said.back() == '.') said.pop_back();
      step.outcome = CaptureStep::Outcome::not_a_reading;
      step.message = said + "; type the reading as the balance displays it (e.g. 100.0012), or stop.";
    }
  }
  if (line) step = judge(*line, where);
  keep(escaped_line(text), "typed", received_at, step);
  return step;
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
                            store::add_raw_lines(group, run_id, lines_);
                          }).run_id;
  rec.commit(tx);
  return *store::find_run(db_.sql(), id);
}

}  // namespace plumb::app
