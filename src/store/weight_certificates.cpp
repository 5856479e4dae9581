#include "store/weight_certificates.hpp"

#include <SQLiteCpp/Statement.h>

#include "store/columns.hpp"
#include "store/repository.hpp"

namespace plumb::store {

std::vector<WeightCalibration> weight_certificates(SQLite::Database& db, const std::string& weight_id) {
  SQLite::Statement q(db, "SELECT id FROM weight_calibrations WHERE weight_id = ? ORDER BY calibrated_on, id");
  q.bind(1, weight_id);
  std::vector<WeightCalibration> out;
  while (q.executeStep())
    if (auto c = find_weight_calibration(db, q.getColumn(0).getInt64())) out.push_back(*c);
  return out;
}

std::map<std::int64_t, WeightClassOverride> weight_class_overrides(SQLite::Database& db, const std::string& weight_id) {
  SQLite::Statement q(db,
                      "SELECT o.weight_calibration_id, o.weight_class, o.mpe_g, o.beyond, o.reason, o.by_name, "
                      "o.recorded_at FROM weight_class_overrides o JOIN weight_calibrations c ON c.id = "
                      "o.weight_calibration_id WHERE c.weight_id = ? ORDER BY o.weight_calibration_id");
  q.bind(1, weight_id);
  std::map<std::int64_t, WeightClassOverride> out;
  while (q.executeStep()) {
    WeightClassOverride o;
    o.weight_calibration_id = q.getColumn(0).getInt64();
    o.weight_class = q.getColumn(1).getString();
    o.mpe = stored_grams_or_none(q.getColumn(2));
    o.beyond = q.getColumn(3).getString();
    o.reason = q.getColumn(4).getString();
    o.by_name = q.getColumn(5).getString();
    o.recorded_at = q.getColumn(6).getString();
    out.emplace(o.weight_calibration_id, std::move(o));
  }
  return out;
}

void add_weight_class_override(Recorder& rec, const WeightClassOverride& o) {
  rec.insert("weight_class_overrides",
             {{"weight_calibration_id", o.weight_calibration_id},
              {"weight_class", o.weight_class},
              {"mpe_g", grams_value(o.mpe)},
              {"beyond", o.beyond},
              {"reason", o.reason},
              {"by_name", rec.actor().name},
              {"recorded_at", rec.now()},
              {"os_user", rec.actor().os_user}},
             {"weight_calibration_id"}, o.reason);
}

}  // namespace plumb::store
