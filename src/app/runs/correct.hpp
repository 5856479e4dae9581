#pragma once
// Correcting a check run without hiding the mistake: a new run supersedes the old one with a required
// reason, its results and verdict are computed again by the same path as `check record`, the original
// stays in history, and a certificate issued from the old run is marked superseded and replaced by a new
// one that names it. Every procedure the registry marks correctable can be corrected, its run conditions
// included; what is not given is taken from the original run.
#include <map>
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct CorrectionInput {
  std::string run;  ///< run number or LAST
  std::string reason;
  std::optional<std::string> readings_csv;  ///< corrected readings or run file; absent: the original readings
  std::string readings_source;
  MassUnit default_unit = MassUnit::g;
  std::optional<std::string> on;                        ///< corrected date performed
  std::optional<std::string> operator_name;             ///< corrected operator
  std::optional<std::vector<std::string>> weight_ids;   ///< corrected reference weight(s) (repeatability)
  /// Corrected run conditions, by `check record` option name ("temperature", "water-temp", "model" ...); each
  /// must be one the run's procedure takes (checks::ProcedureSpec::options).
  std::map<std::string, std::string> conditions;
  std::optional<std::string> layout_path;               ///< layout of a replacement certificate
};

struct CorrectionOutcome {
  store::RunRecord original;
  store::RunRecord correction;
  std::optional<store::CertificateRecord> superseded_certificate;
  std::optional<store::CertificateRecord> new_certificate;
};

/// Records the correction in one transaction; InputError (nothing written) for a missing reason, an unknown,
/// void or already corrected run, an option the run's procedure does not take, a correction that changes
/// nothing, or any input `check record` would refuse.
CorrectionOutcome correct_check(store::Database& db, const store::Actor& actor, const CorrectionInput& in);

}  // namespace plumb::app
