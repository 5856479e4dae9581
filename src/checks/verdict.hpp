#pragma once
// Verdicts and the tolerance policy a balance is judged by.
#include <optional>
#include <string>
#include <vector>

#include "core/units.hpp"
#include "metrology/usp41.hpp"

namespace plumb {

enum class Verdict { pass, fail };
inline std::string_view to_string(Verdict v) { return v == Verdict::pass ? "pass" : "fail"; }

/// One tolerance test of a check: what was measured, the limit, and whether it passed.
struct Criterion {
  std::string name;    ///< e.g. "accuracy", "repeatability"
  std::string quantity;///< what is compared, e.g. "|bias|", "minimum weight"
  Mass measured;
  Mass limit;
  std::string basis;   ///< where the limit comes from, e.g. "0.10 % of the reference value (USP <41>)"
  bool pass = true;
};

/// Which tolerances a weekly check is judged against.
struct TolerancePolicy {
  enum class Kind { usp41, lab };
  Kind kind = Kind::usp41;
  std::optional<ExactMass> max_bias;  ///< lab policy: |bias| limit
  std::optional<ExactMass> max_sd;    ///< lab policy: repeatability SD limit
  std::optional<int> min_readings;    ///< lab policy: its own minimum of replicate weighings (default 10)

  /// Replicate weighings a weekly check needs: USP <41> asks for not less than 10; a lab policy may set its own
  /// (10 when it does not).
  [[nodiscard]] int required_readings() const {
    return kind == Kind::usp41 ? usp41::min_replicate_weighings : min_readings.value_or(usp41::min_replicate_weighings);
  }
  /// Where that number comes from, for messages and certificates.
  [[nodiscard]] std::string readings_basis() const {
    if (kind == Kind::usp41)
      return "USP General Chapter <41> Balances (2013 onwards) asks for not less than 10 replicate weighings";
    if (min_readings)
      return "the lab's policy for this balance asks for at least " + std::to_string(*min_readings) +
             " replicate weighings";
    return "the lab's policy for this balance sets no minimum of its own, so plumb asks for 10 replicate weighings, "
           "as USP <41> does";
  }

  [[nodiscard]] std::string name() const { return kind == Kind::usp41 ? "USP <41>" : "lab limits"; }
  [[nodiscard]] std::string key() const { return kind == Kind::usp41 ? "usp41" : "lab"; }
};

}  // namespace plumb
