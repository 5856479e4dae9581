#pragma once
// Two audit trails side by side (a database and a backup of it): how long a start they share, and what the
// first has after it. The trail is a hash chain, so two trails that agree on the hash of record n agree on every
// record up to n: the shared start is found by bisection in a few look-ups, even on millions of records.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <map>
#include <optional>
#include <string>

namespace plumb::store {

struct TrailComparison {
  std::int64_t first_records = 0;   ///< audit records of the first trail
  std::int64_t second_records = 0;  ///< ... and of the second
  std::int64_t common = 0;          ///< records 1..common are the same in both (equal hashes)
  std::string first_last_hash, second_last_hash;
  /// The first trail's records after the shared start, by the table they wrote to.
  std::map<std::string, std::int64_t> first_only_by_table;
  std::string first_only_from, first_only_to;  ///< when those were recorded (UTC); empty when none

  [[nodiscard]] std::int64_t first_only() const { return first_records - common; }
  [[nodiscard]] std::int64_t second_only() const { return second_records - common; }
};

TrailComparison compare_trails(SQLite::Database& first, SQLite::Database& second);

/// The lab a database belongs to: its name and when it was created (schema/001_core.sql, table lab); none for a
/// database without a lab.
struct LabIdentity {
  std::string name, created_at;
  friend bool operator==(const LabIdentity&, const LabIdentity&) = default;
};
std::optional<LabIdentity> lab_identity(SQLite::Database& db);

}  // namespace plumb::store
