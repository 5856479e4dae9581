// The certificate a reference weight is traced to on a date, worked by hand from the rule: the latest
// certificate dated on or before the date (the later entry on a tie), overdue once its due date has passed.
#include <catch2/catch.hpp>

#include "app/registry/weight_in_force.hpp"

using namespace plumb;

namespace {

store::WeightCalibration certificate(std::int64_t id, const char* calibrated, const char* due) {
  store::WeightCalibration c;
  c.id = id;
  c.certificate_no = "C-" + std::to_string(id);
  c.calibrated_on = parse_date(calibrated);
  c.due_on = parse_date(due);
  return c;
}

std::int64_t in_force_on(const std::vector<store::WeightCalibration>& history, const char* on) {
  const auto* c = app::certificate_in_force(history, parse_date(on));
  return c ? c->id : 0;
}

}  // namespace

TEST_CASE("the certificate in force is the latest dated on or before the day, the later entry on a tie",
          "[weights]") {
  // Oldest first, as store::weight_calibrations_until gives them; 3 and 4 carry the same date (a certificate
  // re-entered with a corrected value).
  const std::vector<store::WeightCalibration> history = {
      certificate(1, "2024-01-10", "2025-01-10"), certificate(2, "2025-02-03", "2026-02-03"),
      certificate(3, "2025-06-01", "2026-06-01"), certificate(4, "2025-06-01", "2026-06-01")};
  CHECK(in_force_on(history, "2024-01-09") == 0);  // before the first certificate: none
  CHECK(in_force_on(history, "2024-01-10") == 1);  // its own date counts
  CHECK(in_force_on(history, "2025-01-20") == 1);  // after it ran out and before the next: still the first ...
  CHECK(app::overdue_on(history[0], parse_date("2025-01-20")));        // ... and overdue
  CHECK_FALSE(app::overdue_on(history[0], parse_date("2025-01-10")));  // the due day itself is not overdue
  CHECK(in_force_on(history, "2025-02-03") == 2);
  CHECK(in_force_on(history, "2025-06-01") == 4);
  CHECK(in_force_on(history, "2027-01-01") == 4);
  CHECK(app::overdue_on(history[3], parse_date("2027-01-01")));
  CHECK(in_force_on({}, "2025-06-01") == 0);
}
