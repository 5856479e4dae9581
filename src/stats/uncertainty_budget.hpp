#pragma once
// An uncertainty budget per GUM (JCGM 100:2008): each input contributes c_i * u(x_i) to the combined
// standard uncertainty u_c (root sum of squares, inputs uncorrelated); the effective degrees of freedom
// follow from the Welch-Satterthwaite formula (GUM G.4.1); k from Student's t at the chosen coverage
// probability (GUM G.3, Table G.2); U = k u_c.
//
// Every number a certificate's budget table prints is in the result: source, value as given,
// distribution, divisor, standard uncertainty, sensitivity coefficient, contribution, dof and share.
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "stats/coverage.hpp"

namespace plumb::stats {

enum class Distribution {
  normal,       ///< value = expanded uncertainty U from a certificate, divisor = its k (1 for a standard uncertainty)
  rectangular,  ///< value = half-width a, divisor sqrt(3)
  triangular,   ///< value = half-width a, divisor sqrt(6)
  u_shaped,     ///< value = half-width a (arcsine), divisor sqrt(2)
  rounding,     ///< value = scale interval d of a digital indication, divisor 2 sqrt(3) (rectangular of half-width d/2)
};
std::string_view to_string(Distribution d);
/// The divisor GUM gives for a distribution (normal: 1, meaning the value is already a standard uncertainty).
double standard_divisor(Distribution d);

/// One input quantity of the budget.
struct Contribution {
  std::string source;
  double value = 0.0;  ///< as stated: U, half-width, scale interval or standard uncertainty (units of the input)
  Distribution distribution = Distribution::normal;
  double divisor = 1.0;
  double sensitivity = 1.0;      ///< c_i = d(measurand) / d(input)
  double dof = infinite_dof;     ///< infinity for Type B
  std::string note;              ///< where the value comes from, for the certificate

  [[nodiscard]] double standard_uncertainty() const { return value / divisor; }    ///< u(x_i)
  [[nodiscard]] double contribution() const;                                        ///< |c_i| u(x_i)

  /// A Type A standard uncertainty (e.g. s / sqrt(n)) with its degrees of freedom.
  static Contribution type_a(std::string source, double standard_u, double dof, double sensitivity = 1.0);
  /// A certificate's expanded uncertainty U with coverage factor k (Type B, normal).
  static Contribution expanded(std::string source, double expanded_u, double k, double sensitivity = 1.0);
  /// A standard uncertainty known without error (Type B, normal, divisor 1).
  static Contribution standard(std::string source, double standard_u, double sensitivity = 1.0);
  static Contribution rectangular(std::string source, double half_width, double sensitivity = 1.0);
  static Contribution triangular(std::string source, double half_width, double sensitivity = 1.0);
  /// Rounding of a digital indication with scale interval d: u = d / (2 sqrt 3).
  static Contribution rounding(std::string source, double scale_interval, double sensitivity = 1.0);
};

struct BudgetOptions {
  double coverage_probability = p_95_45();
  /// GUM G.4.1 note 1: truncate nu_eff to the next lower integer before looking k up (conservative).
  bool truncate_dof = true;
  /// A fixed coverage factor (e.g. k = 2 by a lab's policy) instead of Student's t.
  std::optional<double> fixed_k;
};

struct BudgetLine {
  Contribution input;
  double standard_uncertainty = 0.0;  ///< u(x_i)
  double contribution = 0.0;          ///< |c_i| u(x_i), in the unit of the measurand
  double share = 0.0;                 ///< contribution^2 / u_c^2 (0..1), for "dominant source" remarks
};

struct BudgetResult {
  std::string measurand;
  std::string unit;
  std::vector<BudgetLine> lines;
  double combined = 0.0;        ///< u_c
  double nu_eff = infinite_dof; ///< Welch-Satterthwaite, possibly fractional or infinite
  double dof_used = infinite_dof;  ///< the dof k was looked up with (truncated when asked)
  double coverage_probability = 0.0;
  double k = 0.0;
  double expanded = 0.0;        ///< U = k u_c
  bool k_fixed = false;

  /// "U = 0.12 mg (k = 2.00, coverage probability about 95 %)": the uncertainty statement's core.
  [[nodiscard]] std::string statement(int significant = 2) const;
};

/// Combines `inputs`. Throws InputError naming the source when a value is negative or not finite, a
/// divisor is not positive, or a Type A dof is not positive.
BudgetResult combine(std::string measurand, std::string unit, std::vector<Contribution> inputs,
                     const BudgetOptions& options = {});

/// Welch-Satterthwaite: u_c^4 / sum(u_i^4 / nu_i); infinite when every dof is infinite or u_c = 0.
double welch_satterthwaite(const std::vector<BudgetLine>& lines, double combined);

}  // namespace plumb::stats
