#include "app/bench/balance_lines.hpp"

#include <fmt/format.h>

#include "core/errors.hpp"

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

}  // namespace

std::string trimmed_typed(const std::string& text) {
  const auto first = text.find_first_not_of(" \t");
  const auto last = text.find_last_not_of(" \t\r\n");
  return first == std::string::npos ? std::string() : text.substr(first, last - first + 1);
}

BenchLines::BenchLines(store::BalanceRecord balance, std::optional<store::BalancePort> port, MassUnit unit_without_port,
                       std::string source)
    : balance_(std::move(balance)), port_(std::move(port)), source_(std::move(source)) {
  unit_ = port_ ? port_->unit : unit_without_port;
  if (port_ && port_->line_pattern) pattern_ = LinePattern::parse(*port_->line_pattern, "the balance's line pattern");
}

std::string BenchLines::where_next(const std::string& source) const {
  return fmt::format("{} line {}", source == "typed" ? std::string("typed") : source_, lines_.size() + 1);
}

CaptureStep BenchLines::judge(const BalanceLineReading& line, const std::string& where, const ReadingRule& rule,
                              std::optional<MassReading>& counted) const {
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
                               where, line.text, to_string(*line.unit), to_string(unit_), balance_.id);
    return step;
  }
  const MassReading reading{line.text, *line.unit, line.value};
  try {
    if (rule) rule(reading, where);
  } catch (const InputError& e) {
    step.message = e.what();
    return step;
  }
  if (refuse_above_capacity_ && reading.mass() > balance_.capacity) {
    step.message = fmt::format("{}: reading \"{}\" {} is above the capacity {} of {}.", where, reading.text,
                               to_string(reading.unit), balance_.capacity.to_string(), balance_.id);
    return step;
  }
  step.outcome = CaptureStep::Outcome::counted;
  counted = reading;
  return step;
}

JudgedLine BenchLines::port_line(const std::string& bytes, const std::string& received_at,
                                 const ReadingRule& rule) const {
  const std::string where = where_next("port");
  JudgedLine out{{}, std::nullopt, escaped_line(bytes), "port", received_at};
  if (const auto line = read_balance_line(bytes, pattern_ ? &*pattern_ : nullptr)) {
    out.step = judge(*line, where, rule, out.reading);
  } else {
    out.step.outcome = CaptureStep::Outcome::not_a_reading;
    out.step.message = fmt::format("{}: \"{}\" is not a reading{}; it is not counted.", where, escaped_line(bytes),
                                   pattern_ ? " in the balance's line pattern" : " in any line shape plumb knows");
  }
  return out;
}

JudgedLine BenchLines::typed(const std::string& text, const std::string& received_at, const ReadingRule& rule) const {
  const std::string where = where_next("typed");
  JudgedLine out{{}, std::nullopt, escaped_line(text), "typed", received_at};
  std::optional<BalanceLineReading> line = read_balance_line(text);
  if (!line) {
    // A bare number is in the unit the balance shows, as a readings file without a unit column is in --unit.
    try {
      const std::string number = trimmed_typed(text);
      line = BalanceLineReading{number, Decimal::parse(escaped_line(number), where + ": reading"),
                                std::string(to_string(unit_)), unit_, true};
    } catch (const InputError& e) {
      std::string said = e.what();
      if (!said.empty() && said.back() == '.') said.pop_back();
      out.step.outcome = CaptureStep::Outcome::not_a_reading;
      out.step.message = said + "; type the reading as the balance displays it (e.g. 100.0012), or stop.";
    }
  }
  if (line) out.step = judge(*line, where, rule, out.reading);
  return out;
}

JudgedLine BenchLines::not_now(const std::string& bytes, const std::string& source, const std::string& received_at,
                               const std::string& why) const {
  JudgedLine out{{}, std::nullopt, escaped_line(bytes), source, received_at};
  out.step.outcome = CaptureStep::Outcome::not_a_reading;
  out.step.message = fmt::format("{}: {}; this line is not counted.", where_next(source), why);
  return out;
}

void BenchLines::keep(const JudgedLine& line, std::optional<int> reading_seq) {
  store::RawLine l;
  l.seq = static_cast<int>(lines_.size()) + 1;
  l.received_at = line.received_at;
  l.source = line.source;
  l.line = line.shown;
  l.outcome = outcome_key(line.step.outcome);
  if (line.step.outcome == CaptureStep::Outcome::counted) l.reading_seq = reading_seq;
  l.note = line.step.far_warning ? "far from the others: " + *line.step.far_warning : line.step.message;
  lines_.push_back(std::move(l));
}

void BenchLines::keep_typed_value(const std::string& text, const std::string& received_at, const std::string& note) {
  store::RawLine l;
  l.seq = static_cast<int>(lines_.size()) + 1;
  l.received_at = received_at;
  l.source = "typed";
  l.line = escaped_line(text);
  l.outcome = "counted";
  l.note = note;
  lines_.push_back(std::move(l));
}

}  // namespace plumb::app
