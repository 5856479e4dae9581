#include "store/signature_check.hpp"

#include <fmt/format.h>

#include "store/signatures.hpp"

namespace plumb::store {

std::vector<AuditProblem> signature_problems(SQLite::Database& db) {
  std::vector<AuditProblem> out;
  // A database from before user accounts has no signatures table.
  if (!db.tableExists("signatures")) return out;
  for (const auto& s : all_signatures(db)) {
    const auto content = signed_content(db, s.table_name, s.row_key);
    const std::string who = fmt::format("signature {} ({}, {}, \"{}\")", s.id, s.printed_name, s.signed_at, s.meaning);
    if (!content) {
      out.push_back({AuditProblem::Kind::signature_mismatch, 0, "signatures", fmt::format("id={}", s.id), "",
                     s.signed_at,
                     fmt::format("{} names {} {}, which no audit record describes: the signature was moved or its "
                                 "record removed.",
                                 who, s.table_name, s.row_key)});
    } else if (sha256_hex(*content) != s.signed_sha256) {
      out.push_back({AuditProblem::Kind::signature_mismatch, 0, "signatures", fmt::format("id={}", s.id), "",
                     s.signed_at,
                     fmt::format("{} no longer matches {} {}: its signed SHA-256 is {}... but that record's content "
                                 "hashes to {}...; the signature was moved or what was signed was changed.",
                                 who, s.table_name, s.row_key, s.signed_sha256.substr(0, 16),
                                 sha256_hex(*content).substr(0, 16))});
    }
  }
  return out;
}

}  // namespace plumb::store
