#pragma once
// Conventional mass and the air buoyancy correction of weighing.
//
// Conventional mass (OIML D 28:2004): the mass m_c of a reference of density rho_c = 8000 kg/m3 that
// balances the body in air of density rho_0 = 1.2 kg/m3 at 20 degC:
//   m_c = m (1 - rho_0 / rho) / (1 - rho_0 / rho_c).
//
// A balance adjusted with weights of density rho_c (conventional mass) and used in air of density rho_a
// indicates for a weight of conventional mass m_c and density rho (exact, from the force balance):
//   I = m_c (1 - rho_0/rho_c)(1 - rho_a/rho) / ((1 - rho_0/rho)(1 - rho_a/rho_c)),
// and to first order in (rho_a - rho_0) the correction to the reference value is the one of
// EURAMET cg-18 (v4.0, 7.1.2.2):
//   delta_m_B = -m_c (rho_a - rho_0) (1/rho - 1/rho_c).
// Its standard uncertainty follows from GUM propagation of that formula (rho_c, rho_0 are defined):
//   u^2(delta_m_B) = m_c^2 [ (1/rho - 1/rho_c)^2 u^2(rho_a) + (rho_a - rho_0)^2 u^2(rho) / rho^4
//                           + u^2(rho_a) u^2(rho) / rho^4 ].
// The last term is the second-order term of GUM (JCGM 100:2008) 5.1.2 note for a product of two independent
// uncertain factors, (rho_a - rho_0) and (1/rho - 1/rho_c): at rho = 8000 kg/m3 and rho_a = rho_0 both
// first-order terms vanish, but a weight of uncertain density in air of uncertain density still carries it.
// When the air density was not measured, rho_a is taken as rho_0 with a rectangular half-width of 10 %
// (0.12 kg/m3): plumb's stated assumption for a laboratory near sea level, so the correction is zero and
// only its uncertainty enters.
namespace plumb::buoyancy {

inline constexpr double rho_0 = 1.2;     ///< kg/m3, OIML D 28 reference air density
inline constexpr double rho_c = 8000.0;  ///< kg/m3, OIML D 28 reference weight density
/// Half-width of the assumed air density when none was measured (plumb's assumption, see above).
inline constexpr double unmeasured_air_half_width = 0.12;

/// Conventional mass from true mass (same unit in and out). Throws InputError for an implausible density.
double conventional_from_true(double true_mass, double rho);
double true_from_conventional(double conventional_mass, double rho);

/// What a balance adjusted with rho_c weights reads for a weight of conventional mass m_c and density
/// rho in air of density rho_a (exact force balance, no first-order approximation).
double indication_for(double conventional_mass, double rho, double rho_a);

struct BuoyancyInput {
  double conventional_mass = 0.0;  ///< any mass unit; results come back in it
  double rho = rho_c;              ///< density of the weight, kg/m3
  double u_rho = 0.0;              ///< its standard uncertainty, kg/m3
  double rho_a = rho_0;            ///< air density at the weighing, kg/m3
  double u_rho_a = 0.0;            ///< its standard uncertainty, kg/m3
};

struct BuoyancyCorrection {
  double correction = 0.0;    ///< delta_m_B, first order (EURAMET cg-18); add to the conventional mass
  double exact_correction = 0.0;  ///< indication_for(...) - m_c, for comparison
  double u = 0.0;             ///< standard uncertainty of delta_m_B
  double u_from_air = 0.0;    ///< part from u(rho_a)
  double u_from_weight = 0.0; ///< part from u(rho)
  double u_second_order = 0.0;  ///< m_c u(rho_a) u(rho) / rho^2
};

/// Throws InputError naming the field for a non-positive or non-finite density or mass, or a negative uncertainty.
BuoyancyCorrection correction(const BuoyancyInput& in);

}  // namespace plumb::buoyancy
