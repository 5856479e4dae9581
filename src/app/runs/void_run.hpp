#pragma once
// Voiding a run entered in error (the wrong instrument, a test entry, a duplicate): the run stays in the
// database and in its history, marked void with the reason; it no longer counts for due dates, trends or
// summaries, and a certificate issued from it is withdrawn with the same reason. A run that was measured
// but recorded wrongly is corrected instead (app/runs/correct.hpp).
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct VoidOutcome {
  store::RunRecord run;
  std::optional<store::CertificateRecord> withdrawn_certificate;
};

/// Voids run `selector` (number or LAST) in one transaction. InputError (nothing written) for a missing
/// reason or person, an unknown run, a run already void, or a run already corrected (void its correction).
VoidOutcome void_run(store::Database& db, const store::Actor& actor, const std::string& selector,
                     const std::string& reason);

}  // namespace plumb::app
