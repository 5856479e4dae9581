#include "store/in_use_terms.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {
namespace {

constexpr const char* in_use_select =
    "SELECT id, balance_id, rounding_zero_g, rounding_load_g, repeatability_g, temperature_change_k, "
    "sensitivity_ppm_per_k, sample_density_kg_m3, sample_density_u_kg_m3, air_density_u_kg_m3, drift_ppm, "
    "error_corrected, form, required_accuracy_pct, safety_factor, reason, created_at, created_by "
    "FROM balance_in_use_terms WHERE balance_id = ? ORDER BY id";

InUseTermsRecord in_use_from(SQLite::Statement& q) {
  const auto dec = [&](int i) { return Decimal::parse(q.getColumn(i).getString()); };
  const auto grams = [&](int i) { return ExactMass::grams(dec(i)); };
  InUseTermsRecord t;
  t.id = q.getColumn(0).getInt64();
  t.balance_id = q.getColumn(1).getString();
  t.rounding_zero = grams(2);
  t.rounding_load = grams(3);
  t.repeatability = grams(4);
  t.temperature_change_k = dec(5);
  t.sensitivity_ppm_per_k = dec(6);
  t.sample_density_kg_m3 = dec(7);
  t.sample_density_u_kg_m3 = dec(8);
  t.air_density_u_kg_m3 = dec(9);
  t.drift_ppm = dec(10);
  t.error_corrected = q.getColumn(11).getInt() != 0;
  t.form = q.getColumn(12).getString();
  t.required_accuracy_pct = dec(13);
  t.safety_factor = dec(14);
  if (!q.getColumn(15).isNull()) t.reason = q.getColumn(15).getString();
  t.created_at = q.getColumn(16).getString();
  t.created_by = q.getColumn(17).getString();
  return t;
}

}  // namespace

std::int64_t add_in_use_terms(Recorder& rec, const InUseTermsRecord& t) {
  return rec.insert("balance_in_use_terms",
                    {{"balance_id", t.balance_id},
                     {"rounding_zero_g", t.rounding_zero.in_grams().to_string()},
                     {"rounding_load_g", t.rounding_load.in_grams().to_string()},
                     {"repeatability_g", t.repeatability.in_grams().to_string()},
                     {"temperature_change_k", t.temperature_change_k.to_string()},
                     {"sensitivity_ppm_per_k", t.sensitivity_ppm_per_k.to_string()},
                     {"sample_density_kg_m3", t.sample_density_kg_m3.to_string()},
                     {"sample_density_u_kg_m3", t.sample_density_u_kg_m3.to_string()},
                     {"air_density_u_kg_m3", t.air_density_u_kg_m3.to_string()},
                     {"drift_ppm", t.drift_ppm.to_string()},
                     {"error_corrected", t.error_corrected ? 1 : 0},
                     {"form", t.form},
                     {"required_accuracy_pct", t.required_accuracy_pct.to_string()},
                     {"safety_factor", t.safety_factor.to_string()},
                     {"reason", t.reason.empty() ? Value() : Value(t.reason)},
                     {"created_at", rec.now()},
                     {"created_by", rec.actor().name}},
                    {"id"}, t.reason);
}

std::vector<InUseTermsRecord> in_use_terms_history(SQLite::Database& db, const std::string& balance_id) {
  SQLite::Statement q(db, in_use_select);
  q.bind(1, balance_id);
  std::vector<InUseTermsRecord> out;
  while (q.executeStep()) out.push_back(in_use_from(q));
  return out;
}

std::optional<InUseTermsRecord> current_in_use_terms(SQLite::Database& db, const std::string& balance_id) {
  auto all = in_use_terms_history(db, balance_id);
  if (all.empty()) return std::nullopt;
  return all.back();
}

}  // namespace plumb::store
