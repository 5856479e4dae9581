#include "app/pipette/registry.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <cctype>
#include <charconv>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "core/units.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using pipette_limits::LimitsPolicy;

Decimal trimmed(Decimal v) { return v.rescaled(v.significant_scale()); }

std::pair<std::string_view, std::string_view> split_number(std::string_view text) {
  std::size_t end = 0;
  while (end < text.size() && (std::isdigit(static_cast<unsigned char>(text[end])) || text[end] == '.' ||
                               text[end] == '-' || text[end] == '+'))
    ++end;
  std::string_view unit = text.substr(end);
  while (!unit.empty() && unit.front() == ' ') unit.remove_prefix(1);
  return {text.substr(0, end), unit};
}

/// "0.8uL" -> (0.8, lab_ul); "0.8%" -> (0.8, lab_pct); mL converts to uL.
std::pair<Decimal, LimitsPolicy::Kind> parse_limit(const std::string& text, std::string_view field) {
  const auto [number, unit] = split_number(text);
  if (number.empty() || unit.empty())
    throw InputError(fmt::format("{} \"{}\" is not a limit; give a number with uL or %, e.g. 0.8uL or 0.8%.", field,
                                 text));
  const Decimal value = Decimal::parse(number, field);
  if (value <= Decimal{0, 0}) throw InputError(fmt::format("{} \"{}\" must be greater than zero.", field, text));
  if (unit == "%") return {trimmed(value), LimitsPolicy::Kind::lab_pct};
  VolumeUnit u{};
  try {
    u = parse_volume_unit(unit, field);
  } catch (const InputError&) {
    throw InputError(fmt::format("{} \"{}\" does not end in uL, mL or %.", field, text));
  }
  return {trimmed(value.shifted(exponent_to_microlitre(u))), LimitsPolicy::Kind::lab_ul};
}

int parse_channels(const std::string& text) {
  int n = 0;
  const auto [p, ec] = std::from_chars(text.data(), text.data() + text.size(), n);
  if (ec != std::errc() || p != text.data() + text.size() || n < 1 || n > checks::max_channels)
    throw InputError(fmt::format("--channels \"{}\" is not a channel count (a whole number from 1 to {}).", text,
                                 checks::max_channels));
  return n;
}

}  // namespace

ExactVolume parse_volume(std::string_view text, std::string_view field, std::optional<VolumeUnit> bare_number_unit) {
  const ExactVolume v = ExactVolume::parse(text, field, bare_number_unit);
  if (v <= ExactVolume()) throw InputError(fmt::format("{} \"{}\" must be greater than zero.", field, text));
  return v.trimmed();
}

std::string limits_summary(const LimitsPolicy& p) {
  switch (p.kind) {
    case LimitsPolicy::Kind::iso8655_2: return "ISO 8655-2:2002";
    case LimitsPolicy::Kind::lab_ul:
      return fmt::format("lab: systematic {} uL, random {} uL (SD)", p.systematic->to_string(), p.random->to_string());
    case LimitsPolicy::Kind::lab_pct:
      return fmt::format("lab: systematic {} %, random {} % (CV)", p.systematic->to_string(), p.random->to_string());
  }
  return "";
}

store::PipetteRecord add_pipette(store::Database& db, const store::Actor& actor, const PipetteInput& in) {
  validate_id(in.id, "pipette id");
  store::PipetteRecord p;
  checks::PipetteDefinition& d = p.definition;
  d.id = in.id;
  d.nominal = parse_volume(in.nominal, "--nominal");
  if (in.range == "fixed") {
    d.kind = checks::PipetteKind::fixed;
  } else {
    const auto dash = in.range.find('-', 1);
    if (dash == std::string::npos)
      throw InputError(fmt::format("--range \"{}\" is not a range; give LOWER-UPPER (e.g. 10uL-100uL) or fixed.",
                                   in.range));
    std::string lower = in.range.substr(0, dash), upper = in.range.substr(dash + 1);
    // "10-100uL": the lower end takes the upper end's unit.
    const auto upper_unit = split_number(upper).second;
    if (split_number(lower).second.empty() && !upper_unit.empty()) lower += std::string(upper_unit);
    d.kind = checks::PipetteKind::variable;
    d.lower_limit = parse_volume(lower, "--range");
    const ExactVolume top = parse_volume(upper, "--range");
    if (top != d.nominal)
      throw InputError(
          fmt::format("--range \"{}\" ends at {} uL, but the nominal volume (--nominal) is {} uL; a "
                      "variable pipette's range ends at its nominal volume.",
                      in.range, top.in_microlitres().to_string(), d.nominal.in_microlitres().to_string()));
  }
  d.channels = parse_channels(in.channels);
  if (in.max_systematic.has_value() != in.max_random.has_value())
    throw InputError(fmt::format("{} was given without {}; the lab's own limits need both.",
                                 in.max_systematic ? "--max-systematic" : "--max-random",
                                 in.max_systematic ? "--max-random" : "--max-systematic"));
  if (in.max_systematic) {
    const auto [sys, sys_kind] = parse_limit(*in.max_systematic, "--max-systematic");
    const auto [ran, ran_kind] = parse_limit(*in.max_random, "--max-random");
    if (sys_kind != ran_kind)
      throw InputError(fmt::format("--max-systematic \"{}\" and --max-random \"{}\" must both be in uL or both in %.",
                                   *in.max_systematic, *in.max_random));
    d.limits.kind = sys_kind;
    d.limits.systematic = sys;
    d.limits.random = ran;
  } else if (!pipette_limits::iso8655_2_row(d.nominal)) {
    std::string rows;
    for (const auto& r : pipette_limits::iso8655_2_table())
      rows += (rows.empty() ? "" : ", ") + r.nominal.in_microlitres().to_string();
    throw InputError(
        fmt::format("--nominal {} uL is not a row of the ISO 8655-2:2002 table ({} uL); give the lab's "
                    "own limits with --max-systematic and --max-random (e.g. from the manufacturer's "
                    "specification).",
                    d.nominal.in_microlitres().to_string(), rows));
  }
  checks::validate(d);
  p.every = Interval::parse(in.every, "--every");
  validate_free_text(in.location, "--location", false);
  p.location = in.location;
  p.identity = read_identity(in.identity);
  p.created_on = in.since ? parse_date(*in.since, "--since") : today_local();

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (store::instrument_exists(db.sql(), d.id))
    throw InputError(fmt::format("instrument id \"{}\" already exists.", d.id));
  store::Recorder rec(db.sql(), actor);
  store::add_pipette(rec, p);
  rec.commit(tx);
  return *store::find_pipette(db.sql(), d.id);
}

}  // namespace plumb::app
