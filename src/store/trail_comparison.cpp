#include "store/trail_comparison.hpp"

#include <SQLiteCpp/Statement.h>

#include <algorithm>

namespace plumb::store {
namespace {

std::int64_t last_seq(SQLite::Database& db) {
  return db.execAndGet("SELECT coalesce(max(seq), 0) FROM audit_log").getInt64();
}

std::string hash_at(SQLite::Statement& q, std::int64_t seq) {
  q.reset();
  q.bind(1, seq);
  return q.executeStep() ? q.getColumn(0).getString() : std::string();
}

}  // namespace

TrailComparison compare_trails(SQLite::Database& first, SQLite::Database& second) {
  TrailComparison c;
  c.first_records = first.execAndGet("SELECT count(*) FROM audit_log").getInt64();
  c.second_records = second.execAndGet("SELECT count(*) FROM audit_log").getInt64();
  const std::int64_t first_last = last_seq(first), second_last = last_seq(second);
  SQLite::Statement a(first, "SELECT hash FROM audit_log WHERE seq = ?");
  SQLite::Statement b(second, "SELECT hash FROM audit_log WHERE seq = ?");
  c.first_last_hash = first_last ? hash_at(a, first_last) : std::string();
  c.second_last_hash = second_last ? hash_at(b, second_last) : std::string();
  // Largest n with equal hashes at n (0 when even the first records differ).
  std::int64_t lo = 0, hi = std::min(first_last, second_last);
  while (lo < hi) {
    const std::int64_t mid = lo + (hi - lo + 1) / 2;
    const std::string h = hash_at(a, mid);
    if (!h.empty() && h == hash_at(b, mid))
      lo = mid;
    else
      hi = mid - 1;
  }
  c.common = lo;
  SQLite::Statement after(first,
                          "SELECT table_name, count(*), min(at), max(at) FROM audit_log WHERE seq > ? "
                          "GROUP BY table_name ORDER BY table_name");
  after.bind(1, c.common);
  while (after.executeStep()) {
    c.first_only_by_table[after.getColumn(0).getString()] = after.getColumn(1).getInt64();
    const std::string from = after.getColumn(2).getString(), to = after.getColumn(3).getString();
    if (c.first_only_from.empty() || from < c.first_only_from) c.first_only_from = from;
    if (to > c.first_only_to) c.first_only_to = to;
  }
  return c;
}

std::optional<LabIdentity> lab_identity(SQLite::Database& db) {
  if (!db.tableExists("lab")) return std::nullopt;
  SQLite::Statement q(db, "SELECT name, created_at FROM lab WHERE id = 1");
  if (!q.executeStep()) return std::nullopt;
  return LabIdentity{q.getColumn(0).getString(), q.getColumn(1).getString()};
}

}  // namespace plumb::store
