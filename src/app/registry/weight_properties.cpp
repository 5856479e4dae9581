#include "app/registry/weight_properties.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <cctype>

#include "app/registry/lab.hpp"
#include "core/condition_units.hpp"
#include "core/errors.hpp"
#include "metrology/weight_density_limits.hpp"
#include "store/repository.hpp"

namespace plumb::app {

namespace {

// Weight materials run from aluminium (2700 kg/m3) to tungsten alloys (about 19000 kg/m3); 1000 to 25000 kg/m3
// keeps every real weight and refuses a slip of a digit.
constexpr double min_density = 1000.0, max_density = 25000.0;

Decimal density_option(const std::string& text, const char* option) {
  const Decimal d = parse_kg_per_cubic_metre(text, option);
  if (d.to_double() < min_density || d.to_double() > max_density)
    throw InputError(fmt::format("{} \"{}\" ({} kg/m3) is outside the range of weight materials ({} to {} kg/m3).",
                                 option, text, d.to_string(), min_density, max_density));
  return d;
}

std::string class_cell(const weights::WeightClass c, const store::WeightRecord& w) {
  if (!weights::density_from_class(c, w.nominal))
    throw InputError(
        fmt::format("--density-class {}: OIML R 111-1:2004 Table 5 sets no density limit for class {} "
                    "at {} (weight {}); enter the density with --density and --density-u.",
                    weights::to_string(c), weights::to_string(c), w.nominal.to_string(), w.id));
  return std::string(weights::to_string(c));
}

}  // namespace

store::WeightProperties parse_weight_properties(const WeightPropertiesInput& in, const store::WeightRecord& w,
                                                const std::optional<store::WeightProperties>& previous) {
  store::WeightProperties p;
  p.weight_id = w.id;
  if (in.density_class && (in.density || in.density_u))
    throw InputError(
        fmt::format("--density-class {} and --density / --density-u are alternatives: give the "
                    "weight's measured density with its uncertainty, or the class whose limits stand "
                    "for it.",
                    *in.density_class));
  std::optional<Decimal> rho, u;
  if (in.density) rho = density_option(*in.density, "--density");
  if (in.density_u) {
    u = parse_kg_per_cubic_metre(*in.density_u, "--density-u");
    if (u->units() < 0)
      throw InputError(
          fmt::format("--density-u \"{}\" is negative; give the standard uncertainty of the density.", *in.density_u));
  }
  if (rho && !u)
    throw InputError(
        fmt::format("--density {} needs --density-u, its standard uncertainty (e.g. 5kg/m3), for the "
                    "buoyancy term of a calibration.",
                    *in.density));
  if (u && !rho)
    throw InputError(fmt::format("--density-u {} needs --density, the density it belongs to.", *in.density_u));
  if (rho && u && u->to_double() >= rho->to_double() / 2)
    throw InputError(fmt::format("--density-u \"{}\" is not below half the density {} kg/m3; check the value.",
                                 *in.density_u, rho->to_string()));
  if (rho) {
    p.density_kg_m3 = rho;
    p.u_density_kg_m3 = u;
  } else if (in.density_class) {
    p.density_class = class_cell(weights::parse_weight_class(*in.density_class, "--density-class"), w);
  } else if (previous) {
    p.density_kg_m3 = previous->density_kg_m3;
    p.u_density_kg_m3 = previous->u_density_kg_m3;
    p.density_class = previous->density_class;
  } else {
    p.density_class = w.weight_class;  // the weight's own class: what R 111 requires of it
  }
  if (in.drift) {
    const std::string& d = *in.drift;
    if (d.empty() || !std::isalpha(static_cast<unsigned char>(d.back())))
      throw InputError(fmt::format("--drift \"{}\" needs a unit of mass, e.g. 0.02mg.", d));
    p.drift = ExactMass::parse(d, "--drift");
    if (*p.drift < ExactMass{})
      throw InputError(
          fmt::format("--drift \"{}\" is negative; give the largest change D expected between two "
                      "calibrations.",
                      d));
    if (!(*p.drift < w.nominal))
      throw InputError(fmt::format("--drift \"{}\" is not smaller than the nominal value {} of weight {}.", d,
                                   w.nominal.to_string(), w.id));
  } else if (previous) {
    p.drift = previous->drift;
  }
  return p;
}

store::WeightProperties set_weight_properties(store::Database& db, const store::Actor& actor, const std::string& id,
                                              const WeightPropertiesInput& in) {
  if (in.empty())
    throw InputError("weight set-properties: give --density with --density-u, --density-class, or --drift.");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  const auto w = store::find_weight(db.sql(), id);
  if (!w) throw InputError(fmt::format("weight \"{}\" is not a known reference weight.", id));
  store::WeightProperties p = parse_weight_properties(in, *w, store::weight_properties_in_force(db.sql(), id));
  store::Recorder rec(db.sql(), actor);
  p.id = store::add_weight_properties(rec, p);
  rec.commit(tx);
  return *store::weight_properties_in_force(db.sql(), id);
}

WeightDensity density_for_budget(const store::WeightRecord& w, const std::optional<store::WeightProperties>& p) {
  WeightDensity out;
  if (p && p->density_kg_m3) {
    out.rho_kg_m3 = p->density_kg_m3->to_double();
    out.u_kg_m3 = p->u_density_kg_m3 ? p->u_density_kg_m3->to_double() : 0.0;
    out.source = fmt::format("entered {} by {}", p->recorded_at.substr(0, 10), p->by_name);
    return out;
  }
  if (!p && w.density_kg_m3) {
    out.rho_kg_m3 = w.density_kg_m3->to_double();
    out.source = "entered at registration without an uncertainty: u(rho) = 0";
    return out;
  }
  const std::string cls = p && p->density_class ? *p->density_class : w.weight_class;
  const auto c = weights::density_from_class(weights::parse_weight_class(cls, "density class"), w.nominal);
  if (!c)
    throw InputError(
        fmt::format("weight {}: no density is entered and OIML R 111-1:2004 Table 5 sets no density "
                    "limit for class {} at {}; enter it with `plumb weight set-properties {} --density "
                    "... --density-u ...`.",
                    w.id, cls, w.nominal.to_string(), w.id));
  out.rho_kg_m3 = c->rho_kg_m3;
  out.u_kg_m3 = c->u_kg_m3;
  out.source = p ? c->basis : c->basis + " (no density entered)";
  return out;
}

}  // namespace plumb::app
