#include "app/certificates/review.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <cctype>
#include <string>
#include <vector>

#include "app/certificates/resolve.hpp"
#include "app/certificates/state.hpp"
#include "app/people/account_state.hpp"
#include "app/people/permissions.hpp"
#include "core/errors.hpp"
#include "store/checkpoints.hpp"
#include "store/repository.hpp"
#include "store/signatures.hpp"
#include "store/status_events.hpp"
#include "store/users.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

std::string normalized(const std::string& name) {
  std::string out;
  bool space = false;
  for (unsigned char c : name) {
    if (std::isspace(c)) {
      space = !out.empty();
      continue;
    }
    if (space) out += ' ';
    space = false;
    out += static_cast<char>(std::tolower(c));
  }
  return out;
}

/// Separation of duties, by user id: nobody approves the certificate of a run they recorded, nor of a run that
/// corrects (or was corrected into) one they recorded or corrected. Each run of the correction chain was written by
/// one account; a run from before user accounts has none, and then its operator's name is compared as before.
void require_separation_of_duties(store::Database& db, std::int64_t signer, const std::string& signer_name,
                                  const store::RunRecord& run, const std::string& certificate) {
  std::optional<store::RunRecord> r = run;
  while (r) {
    const auto writer = store::writer_of(db.sql(), "check_runs", fmt::format("id={}", r->id));
    if (writer && *writer == signer)
      throw AccessError(
          fmt::format("{} (user {}) {} check run {} of certificate {}; a certificate must be approved by "
                      "someone who neither recorded nor corrected its run.",
                      signer_name, signer, r->supersedes ? "recorded the correction" : "recorded", r->id, certificate));
    if (!writer && same_person(signer_name, r->operator_name))
      throw AccessError(
          fmt::format("{} performed check run {} of certificate {}; a certificate must be approved by "
                      "someone other than its operator.",
                      signer_name, r->id, certificate));
    r = r->supersedes ? store::find_run(db.sql(), *r->supersedes) : std::nullopt;
  }
}

}  // namespace

bool same_person(const std::string& a, const std::string& b) {
  return normalized(a) == normalized(b);
}

/// The signer's function on the certificate: the roles, held when the signature was made, that allowed it.
std::string signer_function(store::Database& db, const store::SignatureRecord& sig) {
  std::vector<store::AccountEvent> then;
  for (auto& e : store::account_events(db.sql(), sig.user_id))
    if (e.at <= sig.signed_at) then.push_back(std::move(e));
  const AccountState state = account_state(then);
  std::vector<std::string> names;
  if (const Permission* p = permission_of("certificate approve"))
    for (Role r : state.roles)
      if (p->roles.count(r)) names.emplace_back(role_name(r));
  return names.empty() ? std::string("signer") : fmt::format("{}", fmt::join(names, " and "));
}

json certificate_status(store::Database& db, const store::CertificateRecord& c) {
  json status = {{"state", "draft"},
                 {"approval", nullptr},
                 {"superseded", nullptr},
                 {"withdrawn", nullptr},
                 {"replaces", nullptr}};
  for (const auto& e : store::certificate_events(db.sql(), c.id)) {
    if (e.event == "approved")
      status["approval"] = {{"by", e.by_name}, {"at", e.recorded_at}, {"meaning", e.meaning}, {"os_user", e.os_user}};
    if (e.event == "superseded") {
      const auto by = e.replaced_by ? store::find_certificate_by_id(db.sql(), *e.replaced_by) : std::nullopt;
      status["superseded"] = {{"by_certificate", by ? json(by->number) : json()},
                              {"at", e.recorded_at},
                              {"recorded_by", e.by_name},
                              {"reason", e.reason}};
    }
  }
  if (c.supersedes)
    if (auto old = store::find_certificate_by_id(db.sql(), *c.supersedes)) {
      status["replaces"] = old->number;
      // Why it replaces the old one: the reason of the correction that superseded it (ISO/IEC 17025 7.8.8).
      if (auto gone = store::certificate_event(db.sql(), old->id, "superseded"))
        status["replaces_reason"] = gone->reason;
    }
  status["signatures"] = json::array();
  for (const auto& sig : store::signatures_of(db.sql(), "certificates", fmt::format("id={}", c.id)))
    status["signatures"].push_back({{"name", sig.printed_name},
                                    {"function", signer_function(db, sig)},
                                    {"user_id", sig.user_id},
                                    {"at", sig.signed_at},
                                    {"meaning", sig.meaning},
                                    {"signed_sha256", sig.signed_sha256}});
  if (auto w = store::certificate_withdrawal(db.sql(), c.id))
    status["withdrawn"] = {{"at", w->recorded_at}, {"recorded_by", w->by_name}, {"reason", w->reason}};
  status["state"] = std::string(state_key(certificate_state(
      !status["approval"].is_null(), !status["superseded"].is_null(), !status["withdrawn"].is_null())));
  return status;
}

json certificate_document(store::Database& db, const store::CertificateRecord& c) {
  json doc = c.content;
  doc["content_sha256"] = c.content_sha256;
  doc["status"] = certificate_status(db, c);
  // The signed checkpoint that covers the certificate's audit record: with the lab's public key, anyone can prove
  // that the trail holding this certificate is the one the lab signed (doc/audit-trail.md).
  if (const auto cp = store::checkpoint_covering_row(db.sql(), "certificates", fmt::format("id={}", c.id)))
    doc["trail_checkpoint"] = {{"number", cp->number},
                               {"records", cp->records},
                               {"head_hash", cp->head_hash},
                               {"signed_at", cp->signed_at},
                               {"key", store::key_fingerprint(cp->public_key)}};
  return doc;
}

store::CertificateRecord approve_certificate(store::Database& db, const store::Actor& actor,
                                             const std::string& selector, const std::string& meaning) {
  if (normalized(meaning).empty())
    throw InputError("--meaning must state what the signature means, e.g. \"reviewed and approved\".");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::CertificateRecord cert = resolve_certificate(db, selector);
  const store::RunRecord run = *store::find_run(db.sql(), cert.run_id);
  if (auto done = store::certificate_event(db.sql(), cert.id, "approved"))
    throw InputError(
        fmt::format("certificate {} was already approved by {} on {}; an approved certificate cannot "
                    "change.",
                    cert.number, done->by_name, done->recorded_at));
  if (auto withdrawn = store::certificate_withdrawal(db.sql(), cert.id))
    throw InputError(
        fmt::format("certificate {} was withdrawn on {} ({}); a withdrawn certificate cannot be "
                    "approved.",
                    cert.number, withdrawn->recorded_at, withdrawn->reason));
  if (auto gone = store::certificate_event(db.sql(), cert.id, "superseded")) {
    const auto by = gone->replaced_by ? store::find_certificate_by_id(db.sql(), *gone->replaced_by) : std::nullopt;
    throw InputError(fmt::format("certificate {} was superseded by {} ({}); review that one instead.", cert.number,
                                 by ? by->number : "another certificate", gone->reason));
  }
  if (!actor.user_id) throw AccessError("approving a certificate is a signature: it needs an authenticated user.");
  require_separation_of_duties(db, *actor.user_id, actor.name, run, cert.number);
  store::Recorder rec(db.sql(), actor);
  store::CertificateEvent e;
  e.certificate_id = cert.id;
  e.event = "approved";
  e.by_name = actor.name;
  e.meaning = meaning;
  store::add_certificate_event(rec, e);
  store::add_signature(rec, db.sql(), "certificates", fmt::format("id={}", cert.id), meaning);
  rec.commit(tx);
  return cert;
}

}  // namespace plumb::app
