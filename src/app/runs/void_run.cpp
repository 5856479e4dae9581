#include "app/runs/void_run.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/lab.hpp"
#include "app/runs/resolve.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"
#include "store/signatures.hpp"
#include "store/status_events.hpp"

namespace plumb::app {

VoidOutcome void_run(store::Database& db, const store::Actor& actor, const std::string& selector,
                     const std::string& reason) {
  if (reason.find_first_not_of(" \t") == std::string::npos)
    throw InputError("--reason must say why the run is void (it is kept with the run).");
  if (!actor.user_id) throw AccessError("voiding a run is a signature: it needs an authenticated user.");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  VoidOutcome out;
  out.run = *store::find_run(db.sql(), resolve_run(db, selector));
  if (out.run.voided)
    throw InputError(fmt::format("run {} is void already (since {}: {}).", out.run.id, out.run.voided->recorded_at,
                                 out.run.voided->reason));
  if (out.run.superseded_by)
    throw InputError(fmt::format("run {} was corrected by run {}; if the check itself was entered in error, void run "
                                 "{}.",
                                 out.run.id, *out.run.superseded_by, *out.run.superseded_by));
  store::Recorder rec(db.sql(), actor);
  store::add_run_void(rec, out.run.id, reason);
  store::add_signature(rec, db.sql(), "run_voids", fmt::format("run_id={}", out.run.id), "voided as entered in error");
  if (auto cert = store::certificate_for_run(db.sql(), out.run.id);
      cert && !store::certificate_withdrawal(db.sql(), cert->id)) {
    store::add_certificate_withdrawal(rec, cert->id, reason);
    out.withdrawn_certificate = cert;
  }
  rec.commit(tx);
  out.run = *store::find_run(db.sql(), out.run.id);
  return out;
}

}  // namespace plumb::app
