#include "app/certificates/issue.hpp"

#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/calibration/certificate_content.hpp"
#include "app/certificates/history_section.hpp"
#include "app/pipette/certificate_content.hpp"
#include "app/registry/in_use.hpp"
#include "app/registry/lab.hpp"
#include "app/runs/resolve.hpp"
#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "report/certificates/document.hpp"
#include "report/certificates/renderings.hpp"
#include "report/document/layout.hpp"
#include "report/document/pdf.hpp"
#include "report/runs/json.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

/// What a procedure adds to the content every certificate has.
void add_procedure_content(store::Database& db, const store::RunRecord& run, json& content) {
  switch (run.procedure) {
    case checks::Procedure::repeatability:
      return;  // the run's results and its weights say it all
    case checks::Procedure::calibration:
      add_calibration_content(run, content);
      // Normal use as declared when the certificate is issued: a certificate, once stored, never changes.
      content["in_use"] = certificate_in_use(db, run, today_utc());
      return;
    case checks::Procedure::gravimetric:
      return add_pipette_certificate_parts(db, run, content);
  }
}

/// A certificate, once stored, never changes: so it is drawn as text and as PDF before it is stored, and one that
/// cannot be drawn (from a layout that passed validation but still breaks a renderer) is refused, not kept.
void require_drawable(const store::CertificateRecord& cert) {
  try {
    json shown = cert.content;
    shown["content_sha256"] = cert.content_sha256;
    (void)report::certificate_text(shown);
    (void)report::certificate_html(shown);
    (void)report::render_pdf(report::certificate_document(shown));
  } catch (const InputError&) {
    throw;
  } catch (const std::exception& e) {
    throw InputError(fmt::format("certificate {} cannot be drawn with the layout given ({}); nothing was stored.",
                                 cert.number, e.what()));
  }
}

}  // namespace

nlohmann::json weight_traceability_json(const store::WeightRecord& w, const store::WeightCalibration& c) {
  return {{"id", w.id},
          {"nominal", w.nominal_text},
          {"class", w.weight_class},
          {"conventional_mass_g", (w.nominal + c.correction).in_grams().to_string()},
          {"correction_g", c.correction.in_grams().to_string()},
          {"uncertainty_g", c.uncertainty.in_grams().to_string()},
          {"k", c.k.to_string()},
          {"certificate", c.certificate_no},
          {"calibrated_on", to_string(c.calibrated_on)},
          {"due_on", to_string(c.due_on)}};
}

IssueOutcome issue_certificate(store::Database& db, const store::Actor& actor, const std::string& selector,
                               const std::optional<std::string>& layout_path) {
  const json layout = report::load_layout(layout_path);
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  const std::int64_t run_id = resolve_run(db, selector);
  if (auto existing = store::certificate_for_run(db.sql(), run_id)) return {*existing, true};
  if (auto newer = superseding_run(db, run_id))
    throw InputError(fmt::format("run {} was corrected by run {} ({}); issue the certificate of run {} instead.",
                                 run_id, newer->id, newer->reason, newer->id));
  store::Recorder rec(db.sql(), actor);
  const auto cert = issue_certificate_in(db, rec, run_id, layout, std::nullopt);
  rec.commit(tx);
  return {cert, false};
}

std::optional<store::RunRecord> superseding_run(store::Database& db, std::int64_t run_id) {
  SQLite::Statement q(db.sql(), "SELECT id FROM check_runs WHERE supersedes = ? ORDER BY id LIMIT 1");
  q.bind(1, run_id);
  if (!q.executeStep()) return std::nullopt;
  return store::find_run(db.sql(), q.getColumn(0).getInt64());
}

store::CertificateRecord issue_certificate_in(store::Database& db, store::Recorder& rec, std::int64_t run_id,
                                              const json& layout,
                                              const std::optional<store::CertificateRecord>& replaces) {
  const store::LabRecord lab = require_lab(db);
  const store::RunRecord run = *store::find_run(db.sql(), run_id);

  json instrument = {{"id", run.instrument_id}};
  // The attributes in force on the check date: a balance moved or re-tagged since is certified as it was.
  if (auto b = store::find_balance_on(db.sql(), run.instrument_id, run.performed_on)) {
    instrument = {{"id", b->id},
                  {"kind", "balance"},
                  {"maker", b->identity.maker},
                  {"model", b->identity.model},
                  {"serial", b->identity.serial_no},
                  {"asset_tag", b->identity.asset_tag},
                  {"location", b->location},
                  {"capacity_g", b->capacity.in_grams().to_string()},
                  {"readability_g", b->readability.in_grams().to_string()},
                  {"smallest_net_g", b->smallest_net ? json(b->smallest_net->in_grams().to_string()) : json()},
                  {"check_every", b->every.to_string()}};
  }
  json weights = json::array();
  for (const auto& rw : run.weights) {
    const auto w = store::find_weight(db.sql(), rw.weight_id);
    const auto c = store::find_weight_calibration(db.sql(), rw.weight_calibration_id);
    if (w && c) weights.push_back(weight_traceability_json(*w, *c));
  }

  const auto year = static_cast<int>(today_utc().year());
  store::CertificateRecord cert;
  const checks::ProcedureSpec& procedure = checks::spec(run.procedure);
  cert.number = store::next_certificate_number(db.sql(), std::string(procedure.certificate_prefix), year);
  cert.run_id = run.id;
  cert.kind = procedure.certificate_kind;
  cert.issued_by = rec.actor().name;
  cert.issued_at = rec.now();
  json signatories = layout.value("signatories", json::array());
  for (auto& s : signatories)
    if (s.value("name", "") == "{operator}") s["name"] = run.operator_name;
  cert.content = {{"number", cert.number},
                  {"kind", cert.kind},
                  {"title", procedure.certificate_title},
                  {"issued_at", cert.issued_at},
                  {"issued_by", cert.issued_by},
                  {"lab",
                   {{"name", lab.name},
                    {"address_lines", layout.value("address_lines", json::array())},
                    {"accreditation", layout.value("accreditation", "")},
                    {"logo_png", layout.value("logo_png", "")}}},
                  // ISO/IEC 17025 7.8.2.1 e): whom the certificate is for; the lab's own instrument by default.
                  {"customer", layout.value("customer", "").empty() ? lab.name + " (the laboratory's own instrument)"
                                                                    : layout.value("customer", "")},
                  {"instrument", instrument},
                  {"weights", weights},
                  {"check", report::run_json(run)},
                  {"verdict", std::string(to_string(run.verdict))},
                  {"next_due", run.next_due ? json(to_string(*run.next_due)) : json()},
                  {"decision_rule", "simple acceptance (ILAC G8: guard band w = 0)"},
                  {"signatories", signatories},
                  {"caution", layout.value("caution", "")}};
  // The recent history travels inside the certificate, so its PDF chart is part of the hashed record.
  if (auto history = certificate_history(db, run); !history.is_null()) cert.content["history"] = history;
  add_procedure_content(db, run, cert.content);
  // A replacement names the certificate it replaces and why, inside its own (unchangeable) content.
  if (replaces) {
    cert.supersedes = replaces->id;
    cert.content["replaces"] = {{"number", replaces->number}, {"run_id", replaces->run_id}, {"reason", run.reason}};
  }
  cert.content_sha256 = store::sha256_hex(cert.content.dump());
  require_drawable(cert);
  cert.id = store::add_certificate(rec, cert);
  return cert;
}

}  // namespace plumb::app
