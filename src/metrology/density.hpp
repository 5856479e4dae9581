#pragma once
// Densities of water and air from published formulas (see reference-data/README.md), in kg/m3.
namespace plumb::density {

inline constexpr double conventional_air_kg_m3 = 1.2;         ///< OIML D 28 reference air density
inline constexpr double conventional_weight_kg_m3 = 8000.0;   ///< OIML D 28 reference weight density

/// Water density, Tanaka et al., Metrologia 38 (2001) 301-309, air-free water at 101.325 kPa; t in degC.
double water_tanaka(double t_c);

/// Air density, approximation formula of OIML R 111-1:2004 Annex E (E.3-1):
/// rho_a = (0.34848 p - 0.009 h exp(0.061 t)) / (273.15 + t); p in hPa, h in %RH, t in degC.
double air_oiml_r111(double t_c, double pressure_hpa, double rh_pct);

}  // namespace plumb::density
