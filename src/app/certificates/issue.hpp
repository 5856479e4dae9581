#pragma once
// Issuing certificates. The whole certificate is assembled once as JSON and stored with its SHA-256;
// text, JSON and PDF are renderings of that stored document, so a certificate never changes.
#include <nlohmann/json.hpp>
#include <optional>
#include <string>

#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/records.hpp"

namespace plumb::app {

struct IssueOutcome {
  store::CertificateRecord certificate;
  bool already_issued = false;  ///< the run had a certificate; it is returned unchanged
};

/// A reference weight and the certificate it was used under, as certificates print it (traceability).
nlohmann::json weight_traceability_json(const store::WeightRecord& w, const store::WeightCalibration& c);

/// Issues the certificate of run `selector` ("LAST" or a number) with the given layout file (or default).
IssueOutcome issue_certificate(store::Database& db, const store::Actor& actor, const std::string& selector,
                               const std::optional<std::string>& layout_path);

/// Issues the certificate of `run_id` inside the caller's transaction; `replaces` is the certificate it
/// supersedes after a correction (the caller records the superseded event).
store::CertificateRecord issue_certificate_in(store::Database& db, store::Recorder& rec, std::int64_t run_id,
                                              const nlohmann::json& layout,
                                              const std::optional<store::CertificateRecord>& replaces);

/// The run that corrected (superseded) `run_id`, if any.
std::optional<store::RunRecord> superseding_run(store::Database& db, std::int64_t run_id);

}  // namespace plumb::app
