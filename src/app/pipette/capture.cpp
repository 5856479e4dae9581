#include "app/pipette/capture.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/pipette/edition.hpp"
#include "core/errors.hpp"
#include "stats/exact_summary.hpp"
#include "store/balance_ports.hpp"
#include "store/raw_lines.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

store::BalanceRecord pipette_balance(store::Database& db, const PipetteCaptureInput& in) {
  if (in.evaporation_blank && in.check.evaporation)
    throw InputError("--evaporation-blank and --evaporation both give the evaporation loss; give one of them.");
  check_pipette_setup(db, in.check);  // the balance is registered, in service and in date on the run date
  return *store::find_balance(db.sql(), in.check.balance_id);
}

/// Decimals a typed water temperature may show: a thermometer is read to 0.1 or 0.01 degC, and the mean of two
/// keeps one decimal more.
constexpr int max_temperature_decimals = 3;

}  // namespace

PipetteCapture::PipetteCapture(store::Database& db, const PipetteCaptureInput& in)
    : db_(db),
      in_(in),
      lines_(pipette_balance(db, in), store::current_balance_port(db.sql(), in.check.balance_id), in.unit, in.source) {
  pipette_ = *store::find_pipette(db.sql(), in.check.pipette_id);  // check_pipette_setup found it
  edition_ = pipette_edition(db, pipette_.id());
  const auto least = static_cast<int>(checks::required_replicates(edition_));
  if (in.replicates != 0 && in.replicates < least)
    throw InputError(
        fmt::format("--replicates {}: pipette {} is checked to ISO 8655:{}, which needs at least {} "
                    "replicates at each test volume and channel.",
                    in.replicates, pipette_.id(), checks::key(edition_), least));
  if (in.replicates > 100) throw InputError(fmt::format("--replicates {} is more than 100 replicates.", in.replicates));
  replicates_ = in.replicates != 0 ? in.replicates : least;
  // Each test volume in turn (largest first), each channel at that volume, its replicates one after the other.
  for (const auto& v : checks::default_test_volumes(pipette_.definition))
    for (int c = 1; c <= pipette_.definition.channels; ++c)
      for (int k = 1; k <= replicates_; ++k) slots_.push_back({v, c, k});
}

PipetteCapture::Phase PipetteCapture::phase() const {
  if (!start_c_) return Phase::start_temperature;
  if (in_.evaporation_blank && !evaporation_) return Phase::blank;
  if (weighings_.size() < slots_.size()) return Phase::weighing;
  if (!end_c_) return Phase::end_temperature;
  return Phase::done;
}

bool PipetteCapture::wants_typed() const {
  const Phase p = phase();
  return p == Phase::start_temperature || p == Phase::end_temperature;
}

ReadingRule PipetteCapture::rule() const {
  return [this](const MassReading& r, const std::string& where) { check_pipette_weighing(r, where, balance()); };
}

CaptureStep PipetteCapture::take_weighing(const JudgedLine& line) {
  std::optional<int> seq;
  if (line.reading) {
    const PipetteSlot& slot = next_slot();
    weighings_.push_back({static_cast<int>(lines_.lines().size()) + 1, slot.volume, slot.channel, *line.reading});
    seq = weighings_taken();
  }
  lines_.keep(line, seq);
  return line.step;
}

CaptureStep PipetteCapture::take_blank(const JudgedLine& line) {
  // The blank is read on the tared vessel: it shows minus the mass lost, so zero and negative readings are what it
  // is expected to show. Its decimals are held to the readability like every weighing.
  JudgedLine judged = line;
  if (judged.reading) {
    const MassReading& r = *judged.reading;
    if (r.value > Decimal{}) {
      judged.step.outcome = CaptureStep::Outcome::refused;
      judged.step.message = fmt::format(
          "{}: evaporation blank \"{}\" {} shows a gain in mass; tare the balance with the vessel on it and read "
          "it again after a weighing cycle's time with nothing dispensed.",
          lines_.where_next(line.source), r.text, to_string(r.unit));
      judged.reading.reset();
    } else {
      const std::string lost = r.text.front() == '-' ? r.text.substr(1) : r.text;
      evaporation_ = lost + std::string(to_string(r.unit));
    }
  }
  lines_.keep(judged, std::nullopt);
  return judged.step;
}

CaptureStep PipetteCapture::take_temperature(const std::string& text, const std::string& received_at) {
  const bool start = phase() == Phase::start_temperature;
  const std::string where = lines_.where_next("typed");
  CaptureStep step;
  std::string typed = trimmed_typed(text);
  // A bare number is in degrees Celsius, as the prompt says.
  if (!typed.empty() && std::isdigit(static_cast<unsigned char>(typed.back())) != 0) typed += "C";
  try {
    const Decimal t =
        parse_water_temperature(typed, fmt::format("{}: water temperature at the {}", where, start ? "start" : "end"));
    if (t.scale() > max_temperature_decimals)
      throw InputError(
          fmt::format("{}: water temperature \"{}\" shows more than {} decimals; type it as the "
                      "thermometer displays it.",
                      where, escaped_line(trimmed_typed(text)), max_temperature_decimals));
    (start ? start_c_ : end_c_) = t;
    step.outcome = CaptureStep::Outcome::counted;
    step.message =
        fmt::format("water temperature at the {} of the weighings: {} degC", start ? "start" : "end", t.to_string());
    lines_.keep_typed_value(text, received_at, step.message);
  } catch (const InputError& e) {
    step.outcome = CaptureStep::Outcome::refused;
    step.message = e.what();
    lines_.keep({step, std::nullopt, escaped_line(text), "typed", received_at}, std::nullopt);
  }
  return step;
}

CaptureStep PipetteCapture::take_port_line(const std::string& bytes, const std::string& received_at) {
  switch (phase()) {
    case Phase::start_temperature:
    case Phase::end_temperature: {
      auto line = lines_.not_now(bytes, "port", received_at, "the water temperature is asked for now (type it)");
      lines_.keep(line, std::nullopt);
      return line.step;
    }
    case Phase::blank:
      return take_blank(lines_.port_line(bytes, received_at, {}));
    case Phase::weighing:
      return take_weighing(lines_.port_line(bytes, received_at, rule()));
    case Phase::done:
      break;
  }
  auto line = lines_.not_now(bytes, "port", received_at, "the check has all its weighings");
  lines_.keep(line, std::nullopt);
  return line.step;
}

CaptureStep PipetteCapture::take_typed(const std::string& text, const std::string& received_at) {
  switch (phase()) {
    case Phase::start_temperature:
    case Phase::end_temperature:
      return take_temperature(text, received_at);
    case Phase::blank:
      return take_blank(lines_.typed(text, received_at, {}));
    case Phase::weighing:
      return take_weighing(lines_.typed(text, received_at, rule()));
    case Phase::done:
      break;
  }
  auto line = lines_.not_now(text, "typed", received_at, "the check has all its weighings");
  lines_.keep(line, std::nullopt);
  return line.step;
}

std::string PipetteCapture::series_summary() const {
  const PipetteWeighing& last = weighings_.back();
  std::vector<Decimal> grams;
  for (const auto& w : weighings_)
    if (w.volume == last.volume && w.channel == last.channel) grams.push_back(w.reading.mass().in_grams());
  const auto s = stats::summarize_exact(grams);
  const int decimals = balance().readability.in_grams().significant_scale() + 1;
  std::string out = fmt::format("n = {}, mean = {:.{}f} g", s.n, s.mean(), decimals);
  if (s.n >= 2) out += fmt::format(", s = {:.{}f} g", s.sd(), decimals);
  return out;
}

Decimal PipetteCapture::mean_temperature() const {
  if (!start_c_ || !end_c_) throw InputError("the water temperature at the start and at the end are both needed.");
  const Decimal sum = *start_c_ + *end_c_;
  return {sum.units() * 5, sum.scale() + 1};  // (a + b) / 2 exactly: times 5, one decimal more
}

store::RunRecord PipetteCapture::record(const store::Actor& actor) {
  if (!complete())
    throw InputError(fmt::format("the capture has {} of its {} weighings; nothing was written.", weighings_taken(),
                                 weighings_wanted()));
  PipetteCheckInput in = in_.check;
  in.water_temperature = mean_temperature().to_string() + "C";
  if (evaporation_) in.evaporation = evaporation_;
  in.readings_source = in_.source == "typed" ? "typed readings" : in_.source;
  in.parsed_weighings = weighings_;
  SQLite::Transaction tx(db_.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db_.sql(), actor);
  const std::int64_t id = record_pipette_check_in(db_, rec, in, [&](store::RowGroup& group, std::int64_t run_id) {
    store::add_raw_lines(group, run_id, lines_.lines());
  });
  rec.commit(tx);
  return *store::find_run(db_.sql(), id);
}

}  // namespace plumb::app
