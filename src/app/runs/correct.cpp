#include "app/runs/correct.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>
#include <fmt/ranges.h>

#include "app/certificates/issue.hpp"
#include "app/registry/fields.hpp"
#include "app/runs/resolve.hpp"
#include "app/weekly_check/record.hpp"
#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "report/document/layout.hpp"
#include "store/repository.hpp"
#include "store/status_events.hpp"

namespace plumb::app {
namespace {

/// The stored readings as a readings CSV, so that an unchanged set goes through the same parser again.
std::string readings_as_csv(const store::RunRecord& run) {
  std::string csv = "reading,unit\n";
  for (const auto& r : run.readings) csv += fmt::format("{},{}\n", r.reading.text, to_string(r.reading.unit));
  return csv;
}

std::vector<std::string> weight_ids_of(const store::RunRecord& run) {
  std::vector<std::string> ids;
  for (const auto& w : run.weights) ids.push_back(w.weight_id);
  return ids;
}

bool same_record(const store::RunRecord& a, const store::RunRecord& b) {
  if (a.performed_on != b.performed_on || a.operator_name != b.operator_name || weight_ids_of(a) != weight_ids_of(b) ||
      a.readings.size() != b.readings.size())
    return false;
  for (std::size_t i = 0; i < a.readings.size(); ++i)
    if (a.readings[i].reading.text != b.readings[i].reading.text || a.readings[i].reading.unit != b.readings[i].reading.unit ||
        a.readings[i].series != b.readings[i].series)
      return false;
  return true;
}

/// Which procedures can be corrected is the registry's to say (checks/procedure.hpp).
void require_correctable(const store::RunRecord& run) {
  if (checks::spec(run.procedure).correctable) return;
  std::vector<std::string_view> correctable;
  for (const auto p : checks::all_procedures)
    if (checks::spec(p).correctable) correctable.push_back(checks::to_string(p));
  throw InputError(fmt::format("run {} is a {} run, which `check correct` cannot correct yet (it corrects runs of: "
                               "{}).",
                               run.id, checks::to_string(run.procedure), fmt::join(correctable, ", ")));
}

}  // namespace

CorrectionOutcome correct_check(store::Database& db, const store::Actor& actor, const CorrectionInput& in) {
  validate_free_text(in.reason, "--reason", false);
  if (in.reason.find_first_not_of(" \t") == std::string::npos)
    throw InputError("--reason must say why the run is corrected (it is kept with the correction).");
  if (actor.name.find_first_not_of(" \t") == std::string::npos)
    throw InputError("--by must name the person making the correction.");
  if (!in.readings_csv && !in.on && !in.operator_name && !in.weight_ids)
    throw InputError("nothing to correct: give --readings, --on, --operator or --weight.");
  const auto layout = report::load_layout(in.layout_path);

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  CorrectionOutcome out;
  out.original = *store::find_run(db.sql(), resolve_run(db, in.run));
  if (auto newer = superseding_run(db, out.original.id))
    throw InputError(fmt::format("run {} was already corrected by run {}; correct run {} instead.", out.original.id,
                                 newer->id, newer->id));
  require_correctable(out.original);

  CheckInput check;
  check.instrument_id = out.original.instrument_id;
  check.weight_ids = in.weight_ids ? *in.weight_ids : weight_ids_of(out.original);
  check.readings_csv = in.readings_csv ? *in.readings_csv : readings_as_csv(out.original);
  check.readings_source = in.readings_csv ? in.readings_source : fmt::format("readings of run {}", out.original.id);
  check.default_unit = in.default_unit;
  check.on = in.on ? *in.on : to_string(out.original.performed_on);
  check.operator_name = in.operator_name ? *in.operator_name : out.original.operator_name;
  check.supersedes = out.original.id;
  check.reason = in.reason;

  store::Recorder rec(db.sql(), actor);
  CheckLookups lookups(db);
  const std::int64_t id = record_check_in(rec, lookups, check).run_id;
  out.correction = *store::find_run(db.sql(), id);
  // Throwing here still writes nothing: the transaction is rolled back.
  if (same_record(out.original, out.correction))
    throw InputError(fmt::format("the correction of run {} changes nothing: the readings, date, operator and "
                                 "weights are those of the original.",
                                 out.original.id));

  if (auto old = store::certificate_for_run(db.sql(), out.original.id)) {
    out.new_certificate = issue_certificate_in(db, rec, id, layout, old);
    store::CertificateEvent e;
    e.certificate_id = old->id;
    e.event = "superseded";
    e.by_name = actor.name;
    e.replaced_by = out.new_certificate->id;
    e.reason = in.reason;
    store::add_certificate_event(rec, e);
    out.superseded_certificate = old;
  }
  tx.commit();
  return out;
}

}  // namespace plumb::app
