#include "report/pipette/json.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

json channel_json(const checks::ChannelResult& c) {
  json volumes = json::array();
  for (const Volume& v : c.volumes) volumes.push_back(v.ul());
  const auto& l = c.limits;
  const auto& u = c.uncertainty;
  json budget = json::array();
  for (const auto& line : u.budget.lines)
    budget.push_back({{"source", line.input.source}, {"u_ul", line.contribution}, {"share", line.share}, {"note", line.input.note}});
  return {{"channel", c.channel},
          {"n", c.n},
          {"mean_mass_g", c.mean_mass.g()},
          {"sd_mass_g", c.sd_mass.g()},
          {"volumes_ul", volumes},
          {"mean_ul", c.mean.ul()},
          {"systematic_error_ul", c.systematic_error.ul()},
          {"systematic_error_pct", c.systematic_error_pct},
          {"random_error_ul", c.random_error.ul()},
          {"cv_pct", c.cv_pct},
          {"uncertainty",
           {{"systematic_u_ul", u.systematic_expanded.ul()},
            {"systematic_u_pct", u.systematic_expanded_pct},
            {"random_u_ul", u.random_expanded.ul()},
            {"cv_u_pct", u.cv_expanded_pct},
            {"k", u.k},
            {"budget", budget}}},
          {"limits",
           {{"systematic_ul", l.systematic.ul()},
            {"systematic_pct", l.systematic_pct},
            {"random_ul", l.random.ul()},
            {"random_pct", l.random_pct},
            {"compare_in_pct", l.compare_in_pct},
            {"doubled", l.doubled},
            {"basis", l.basis}}},
          {"verdict", std::string(to_string(c.verdict))},
          {"reasons", c.reasons}};
}

}  // namespace

nlohmann::json to_json(const checks::PipetteRunResult& r) {
  json volumes = json::array();
  for (const auto& tv : r.volumes) {
    json channels = json::array();
    for (const auto& c : tv.channels) channels.push_back(channel_json(c));
    const auto& req = tv.balance.requirement;
    volumes.push_back({{"selected_ul", tv.selected.approx().ul()},
                       {"selected", tv.selected.ul_text()},
                       {"balance_requirement",
                        {{"readability_g", req.readability_mg.to_double() / 1e3},
                         {"repeatability_g", req.repeatability_mg.to_double() / 1e3},
                         {"standard_uncertainty_g", req.standard_uncertainty_mg.to_double() / 1e3},
                         {"source", "ISO 8655-6:2002 Table 1"},
                         {"suitable", tv.balance.suitable}}},
                       {"channels", channels},
                       {"verdict", std::string(to_string(tv.verdict))}});
  }
  return {{"pipette", r.pipette_id},
          {"z",
           {{"water_density_kg_m3", r.z.water_density_kg_m3},
            {"air_density_kg_m3", r.z.air_density_kg_m3},
            {"weight_density_kg_m3", r.z.weight_density_kg_m3},
            {"z_ul_per_mg", r.z.z_ul_per_mg},
            {"source",
             "ISO 8655-6 Z = (1 - rho_a / rho_b) / (rho_w - rho_a); water Tanaka et al. (2001), "
             "air OIML R 111-1 Annex E, weights 8000 kg/m3"}}},
          {"evaporation_g", r.evaporation_per_weighing ? json(r.evaporation_per_weighing->approx().g()) : json()},
          {"volumes", volumes},
          {"complete", r.complete},
          {"verdict", std::string(to_string(r.verdict))},
          {"reasons", r.reasons},
          {"notes", r.notes}};
}

}  // namespace plumb::report
