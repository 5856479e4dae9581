#include "metrology/pipette_limits.hpp"

#include <fmt/format.h>

#include <array>

#include "core/errors.hpp"

namespace plumb::pipette_limits {
namespace {

// Source: ISO 8655-2:2002 "Piston-operated volumetric apparatus - Part 2: Piston pipettes", Table 1,
// transcribed from memory (compared row by row with reference-data/metrology/iso8655-2-pipette-mpe.csv in
// tests/unit/pipette_limits_test.cpp). Columns: nominal uL, systematic %, systematic uL, random %, random uL.
constexpr std::array<std::array<const char*, 5>, 13> table_text{{
    {"1", "5.0", "0.05", "5.0", "0.05"},
    {"2", "4.0", "0.08", "2.0", "0.04"},
    {"5", "2.5", "0.125", "1.5", "0.075"},
    {"10", "1.2", "0.12", "0.8", "0.08"},
    {"20", "1.0", "0.2", "0.5", "0.1"},
    {"50", "1.0", "0.5", "0.4", "0.2"},
    {"100", "0.8", "0.8", "0.3", "0.3"},
    {"200", "0.8", "1.6", "0.3", "0.6"},
    {"500", "0.8", "4.0", "0.3", "1.5"},
    {"1000", "0.8", "8.0", "0.3", "3.0"},
    {"2000", "0.8", "16", "0.3", "6.0"},
    {"5000", "0.8", "40", "0.3", "15"},
    {"10000", "0.6", "60", "0.3", "30"},
}};

std::string listed_nominals() {
  std::string out;
  for (const auto& row : iso8655_2_table()) {
    if (!out.empty()) out += ", ";
    out += row.nominal.in_microlitres().to_string();
  }
  return out + " uL";
}

}  // namespace

const std::vector<Iso8655Row>& iso8655_2_table() {
  static const std::vector<Iso8655Row> table = [] {
    std::vector<Iso8655Row> rows;
    rows.reserve(std::size(table_text));
    for (const auto& t : table_text)
      rows.push_back({ExactVolume::microlitres(Decimal::parse(t[0])), Decimal::parse(t[1]),
                      ExactVolume::microlitres(Decimal::parse(t[2])), Decimal::parse(t[3]),
                      ExactVolume::microlitres(Decimal::parse(t[4]))});
    return rows;
  }();
  return table;
}

std::optional<Iso8655Row> iso8655_2_row(ExactVolume nominal) {
  for (const auto& row : iso8655_2_table())
    if (row.nominal == nominal) return row;
  return std::nullopt;
}

std::string LimitsPolicy::name() const {
  switch (kind) {
    case Kind::iso8655_2: return "ISO 8655-2:2002";
    case Kind::lab_ul: return "lab limits (uL)";
    case Kind::lab_pct: return "lab limits (%)";
  }
  return "";
}

std::string LimitsPolicy::key() const {
  switch (kind) {
    case Kind::iso8655_2: return "iso8655-2";
    case Kind::lab_ul: return "lab-ul";
    case Kind::lab_pct: return "lab-pct";
  }
  return "";
}

void validate_policy(const LimitsPolicy& policy, ExactVolume nominal) {
  if (policy.kind == LimitsPolicy::Kind::iso8655_2) {
    if (!iso8655_2_row(nominal))
      throw InputError(
          fmt::format("limits: nominal volume {} uL is not a row of ISO 8655-2:2002 Table 1 ({}); enter the lab's own "
                      "limits in uL or % (for example from the manufacturer's specification).",
                      nominal.in_microlitres().to_string(), listed_nominals()));
    return;
  }
  const char* unit = policy.kind == LimitsPolicy::Kind::lab_ul ? "uL" : "%";
  const Decimal zero{0, 0};
  if (!policy.systematic || *policy.systematic <= zero)
    throw InputError(fmt::format("limits: the lab's systematic error limit (in {}) is {}; it must be a positive "
                                 "number.",
                                 unit, policy.systematic ? policy.systematic->to_string() : "missing"));
  if (!policy.random || *policy.random <= zero)
    throw InputError(fmt::format("limits: the lab's random error limit (in {}) is {}; it must be a positive number.",
                                 unit, policy.random ? policy.random->to_string() : "missing"));
}

AppliedLimits limits_at(const LimitsPolicy& policy, ExactVolume nominal, ExactVolume selected, int channels) {
  validate_policy(policy, nominal);
  const double v = selected.in_microlitres().to_double();
  AppliedLimits a;
  a.kind = policy.kind;
  switch (policy.kind) {
    case LimitsPolicy::Kind::iso8655_2: {
      const Iso8655Row row = *iso8655_2_row(nominal);
      a.doubled = channels > 1;
      const double k = a.doubled ? 2.0 : 1.0;
      a.systematic = k * row.systematic.approx();
      a.random = k * row.random.approx();
      a.systematic_pct = 100.0 * a.systematic.ul() / v;
      a.random_pct = 100.0 * a.random.ul() / v;
      const bool at_nominal = selected == nominal;
      a.basis = fmt::format(
          "ISO 8655-2:2002 Table 1, nominal {} uL: systematic {} uL, "
          "random {} uL{}{}.",
          nominal.in_microlitres().to_string(), row.systematic.in_microlitres().to_string(),
          row.random.in_microlitres().to_string(),
          at_nominal ? "" : ", the absolute limits at the nominal volume applied at this volume",
          a.doubled ? ", doubled for a multichannel pipette" : "");
      break;
    }
    case LimitsPolicy::Kind::lab_ul:
      a.systematic = Volume::microlitres(policy.systematic->to_double());
      a.random = Volume::microlitres(policy.random->to_double());
      a.systematic_pct = 100.0 * a.systematic.ul() / v;
      a.random_pct = 100.0 * a.random.ul() / v;
      a.basis = fmt::format("Lab limits: systematic {} uL, random {} uL at every volume.",
                            policy.systematic->to_string(), policy.random->to_string());
      break;
    case LimitsPolicy::Kind::lab_pct:
      a.compare_in_pct = true;
      a.systematic_pct = policy.systematic->to_double();
      a.random_pct = policy.random->to_double();
      a.systematic = Volume::microlitres(a.systematic_pct * v / 100.0);
      a.random = Volume::microlitres(a.random_pct * v / 100.0);
      a.basis = fmt::format("Lab limits: systematic {} % of the selected volume, random {} % (CV).",
                            policy.systematic->to_string(), policy.random->to_string());
      break;
  }
  return a;
}

}  // namespace plumb::pipette_limits
