#include "app/records/audit.hpp"

#include <fmt/format.h>

#include <nlohmann/json.hpp>
#include <set>

#include "app/certificates/resolve.hpp"
#include "core/dates.hpp"
#include "core/errors.hpp"
#include "store/audit_trail.hpp"
#include "store/checkpoints.hpp"
#include "store/file_output.hpp"
#include "store/item_trail.hpp"
#include "store/lab_key.hpp"
#include "store/repository.hpp"
#include "store/signature_check.hpp"
#include "store/users.hpp"

namespace plumb::app {
namespace {

using nlohmann::json;

bool in(const json& row, const char* column, const std::set<std::int64_t>& ids) {
  return row.contains(column) && row[column].is_number_integer() && ids.count(row[column].get<std::int64_t>()) > 0;
}

bool is_id(const json& row, const char* column, std::int64_t id) {
  return in(row, column, {id});
}

std::vector<store::AuditRecord> of_certificate(const std::vector<store::AuditRecord>& all,
                                               const store::CertificateRecord& c) {
  std::vector<store::AuditRecord> out;
  for (const auto& r : all) {
    bool related = false;
    for (const auto& [table, row] : store::recorded_rows(r))
      related = related ||
                (table == "certificates" ? is_id(row, "id", c.id) || is_id(row, "supersedes", c.id)
                                         : (table == "check_runs" && is_id(row, "id", c.run_id)) ||
                                               is_id(row, "run_id", c.run_id) || is_id(row, "certificate_id", c.id));
    if (related) out.push_back(r);
  }
  return out;
}

/// The sequence number a page of records goes back from: digits only, at least 1.
std::int64_t record_number(const std::string& text) {
  const bool digits = !text.empty() && text.size() <= 18 && text.find_first_not_of("0123456789") == std::string::npos;
  if (!digits || std::stoll(text) < 1)
    throw InputError(
        fmt::format("the audit record \"{}\" to page back from is not a record number (a whole number from 1).", text));
  return std::stoll(text);
}

/// Applies --from, --to and --author, and says so in the scope.
void narrow(store::Database& db, AuditLog& log, const AuditLogFilter& f) {
  std::optional<Date> from, to;
  if (f.from) from = parse_date(*f.from, "--from");
  if (f.to) to = parse_date(*f.to, "--to");
  if (from && to && *from > *to) throw InputError(fmt::format("--from {} is after --to {}.", *f.from, *f.to));
  std::optional<store::UserRecord> author;
  if (f.author) {
    author = store::find_user_by_login(db.sql(), *f.author);
    if (!author)
      throw InputError(
          fmt::format("--author \"{}\" is not the login of any user account (see `plumb user list`).", *f.author));
  }
  if (!from && !to && !author) return;
  std::erase_if(log.records, [&](const store::AuditRecord& r) {
    // Recorded times are UTC, ISO 8601: the first ten characters are the date.
    const std::string day = r.at.substr(0, 10);
    return (from && day < to_string(*from)) || (to && day > to_string(*to)) || (author && r.user_id != author->id);
  });
  if (from && to)
    log.scope += fmt::format(", {} to {} (UTC)", to_string(*from), to_string(*to));
  else if (from)
    log.scope += fmt::format(", from {} on (UTC)", to_string(*from));
  else if (to)
    log.scope += fmt::format(", up to {} (UTC)", to_string(*to));
  if (author) log.scope += fmt::format(", written by {} ({})", author->full_name, author->login);
}

}  // namespace

AuditLog audit_log(store::Database& db, const AuditLogFilter& filter) {
  if (filter.instrument && filter.certificate)
    throw InputError(
        "--instrument and --certificate cannot be combined; give one of them (or neither for the whole lab).");
  AuditLog log;
  if (filter.instrument) {
    if (!store::instrument_exists(db.sql(), *filter.instrument))
      throw InputError(fmt::format("--instrument \"{}\" is not registered.", *filter.instrument));
    log.scope = "instrument " + *filter.instrument;
    auto seqs = store::instrument_record_seqs(db.sql(), *filter.instrument);
    if (!filter.from && !filter.to && !filter.author) log.total = static_cast<std::int64_t>(seqs.size());
    // Without a date or author filter a page reads only the records it shows.
    if (filter.before) {
      const std::int64_t before = record_number(*filter.before);
      std::erase_if(seqs, [&](std::int64_t s) { return s >= before; });
    }
    if (filter.newest && !filter.from && !filter.to && !filter.author &&
        static_cast<std::int64_t>(seqs.size()) > *filter.newest) {
      log.older = true;
      seqs.erase(seqs.begin(), seqs.end() - *filter.newest);
    }
    log.records = store::audit_records_by_seq(db.sql(), seqs);
  } else if (filter.certificate) {
    const auto cert = resolve_certificate(db, *filter.certificate);
    log.scope = "certificate " + cert.number;
    log.records = of_certificate(store::audit_records(db.sql()), cert);
  } else {
    log.scope = "the whole lab";
    if (filter.newest && !filter.from && !filter.to && !filter.author) {
      // A page of the newest records reads only those: the whole trail may hold millions.
      log.records = store::latest_audit_records(db.sql(), *filter.newest);
      log.total = store::audit_record_count(db.sql());
      log.older = log.total > static_cast<std::int64_t>(log.records.size());
    } else {
      log.records = store::audit_records(db.sql());
    }
  }
  narrow(db, log, filter);
  if (log.total == 0) log.total = static_cast<std::int64_t>(log.records.size());
  if (filter.newest && static_cast<std::int64_t>(log.records.size()) > *filter.newest) {
    log.older = true;
    log.records.erase(log.records.begin(), log.records.end() - *filter.newest);
  }
  for (const auto& u : store::all_users(db.sql())) log.authors.logins.emplace(u.id, u.login);
  log.authors.first_account_seq = store::first_account_record(db.sql());
  return log;
}

Verification verify_audit(store::Database& db, const VerifyRequest& request) {
  store::VerifyOptions options;
  Verification out;
  if (request.public_key) {
    options.public_key = store::read_public_key_file(*request.public_key, "--public-key");
    options.public_key_source = fmt::format("the public key {}", *request.public_key);
    out.independent_key = true;
  } else if (const auto key_file = store::key_path_for(db.path()); std::filesystem::exists(key_file)) {
    options.public_key = store::LabKey::load(key_file).public_hex();
    options.public_key_source = fmt::format("the lab's key file {}", key_file.string());
    out.independent_key = true;
  }
  out.key_source = out.independent_key ? options.public_key_source
                                       : std::string(
                                             "the key recorded in the database (give --public-key for a proof "
                                             "independent of it)");
  if (request.since) {
    options.since = store::read_checkpoint_file(*request.since, "--since");
    options.since_source = *request.since;
  }
  out.audit = store::verify_audit_trail(db.sql(), options);
  for (auto& p : store::signature_problems(db.sql())) out.audit.problems.push_back(std::move(p));
  return out;
}

store::Checkpoint export_checkpoint(store::Database& db, const std::filesystem::path& file) {
  if (file.empty()) throw InputError("--out must name the file to write the checkpoint to.");
  const auto last = store::latest_checkpoint(db.sql());
  if (!last)
    throw InputError(
        fmt::format("database \"{}\" has no signed checkpoint yet; create the lab's key with `plumb key "
                    "create`.",
                    db.path().string()));
  store::write_whole_file(file, store::checkpoint_json(*last).dump(2) + "\n", "checkpoint");
  std::filesystem::permissions(file, std::filesystem::perms::owner_read | std::filesystem::perms::owner_write);
  return *last;
}

}  // namespace plumb::app
