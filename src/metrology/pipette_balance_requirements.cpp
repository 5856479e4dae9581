#include "metrology/pipette_balance_requirements.hpp"

#include <fmt/format.h>

#include <array>

#include "core/errors.hpp"

namespace plumb::pipette_balance {
namespace {

// Source: ISO 8655-6:2002 "Gravimetric methods for the determination of measurement error", Table 1,
// transcribed from memory (compared with reference-data/metrology/iso8655-6-balance-requirements.csv in
// tests/unit/pipette_limits_test.cpp). Columns: from uL, to uL, readability mg, repeatability mg, u mg.
constexpr std::array<std::array<const char*, 5>, 5> table_text{{
    {"1", "10", "0.001", "0.002", "0.002"},
    {"10", "100", "0.01", "0.02", "0.02"},
    {"100", "1000", "0.1", "0.2", "0.2"},
    {"1000", "10000", "0.1", "0.2", "0.2"},
    {"10000", "200000", "1", "2", "2"},
}};

std::string mg(Decimal v) { return v.rescaled(v.significant_scale()).to_string() + " mg"; }
std::string mg(const ExactMass& m) { return mg(m.in_grams().shifted(3)); }
std::string ul(ExactVolume v) {
  return v.to_string();
}

// s and u are computed values in binary floating point (a Mass in grams); one equal to the limit as
// printed (0.02 mg held as 0.00002 g) must count as within it, so the comparison allows a relative 1e-9.
bool exceeds(Mass value, Decimal limit_mg) { return value.mg() > limit_mg.to_double() * (1.0 + 1e-9); }

}  // namespace

const std::vector<Requirement>& iso8655_6_table() {
  static const std::vector<Requirement> table = [] {
    std::vector<Requirement> rows;
    rows.reserve(std::size(table_text));
    for (const auto& t : table_text)
      rows.push_back({ExactVolume::microlitres(Decimal::parse(t[0])), ExactVolume::microlitres(Decimal::parse(t[1])),
                      Decimal::parse(t[2]), Decimal::parse(t[3]), Decimal::parse(t[4])});
    return rows;
  }();
  return table;
}

Requirement requirement_for(ExactVolume test_volume) {
  const auto& table = iso8655_6_table();
  if (test_volume >= table.front().volume_from && test_volume <= table.front().volume_to) return table.front();
  for (const auto& row : table)
    if (test_volume > row.volume_from && test_volume <= row.volume_to) return row;
  throw InputError(
      fmt::format("test volume {} is outside the balance requirements of ISO 8655-6 Table 1 "
                  "({} to {}).",
                  ul(test_volume), ul(table.front().volume_from), ul(table.back().volume_to)));
}

Suitability assess(const BalanceForPipette& balance, ExactVolume test_volume) {
  Suitability s;
  s.requirement = requirement_for(test_volume);
  const Requirement& req = s.requirement;
  const std::string where = fmt::format("for a test volume of {} (ISO 8655-6:2002 Table 1)", ul(test_volume));
  const ExactMass d_needed = ExactMass::from(req.readability_mg, MassUnit::mg);
  if (balance.readability > d_needed) {
    s.suitable = false;
    s.reasons.push_back(fmt::format("balance {}: readability {} is coarser than the {} needed {}", balance.id,
                                    mg(balance.readability), mg(req.readability_mg), where));
  }
  if (!balance.repeatability) {
    s.suitable = false;
    s.reasons.push_back(
        fmt::format("balance {}: no repeatability on record from a check that counts and met its "
                    "own minimum of readings; a standard deviation of at most {} is needed {}",
                    balance.id, mg(req.repeatability_mg), where));
  } else if (exceeds(*balance.repeatability, req.repeatability_mg)) {
    s.suitable = false;
    s.reasons.push_back(fmt::format("balance {}: repeatability {} exceeds the {} allowed {}", balance.id,
                                    format_mass(*balance.repeatability), mg(req.repeatability_mg), where));
  }
  if (!balance.standard_uncertainty) {
    s.notes.push_back(fmt::format("The balance's standard uncertainty was not given, so the {} of ISO 8655-6 "
                                  "Table 1 was not checked.",
                                  mg(req.standard_uncertainty_mg)));
  } else if (exceeds(*balance.standard_uncertainty, req.standard_uncertainty_mg)) {
    s.suitable = false;
    s.reasons.push_back(fmt::format("balance {}: standard uncertainty {} exceeds the {} allowed {}", balance.id,
                                    format_mass(*balance.standard_uncertainty), mg(req.standard_uncertainty_mg),
                                    where));
  }
  return s;
}

void require_usable(const BalanceForPipette& balance, Date run_date) {
  if (!balance.in_service)
    throw InputError(fmt::format("balance {} is out of service and cannot be used for a pipette check.", balance.id));
  if (balance.due && *balance.due < run_date)
    throw InputError(fmt::format("balance {} was due on {} and is out of date on the run date {}; check or "
                                 "calibrate it first.",
                                 balance.id, to_string(*balance.due), to_string(run_date)));
}

}  // namespace plumb::pipette_balance
