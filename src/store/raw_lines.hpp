#pragma once
// The original record of a captured run (migration 010): each line received or typed, when it arrived and
// what became of it. Written in the run's own row group, so the run's one audit record covers them.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <string>
#include <vector>

#include "store/recorder.hpp"

namespace plumb::store {

struct RawLine {
  int seq = 0;
  std::string received_at;  ///< UTC, ISO 8601 with milliseconds
  std::string source;       ///< "port" or "typed"
  std::string line;         ///< escaped as core/balance_line's escaped_line
  std::string outcome;      ///< "counted", "unstable", "not a reading", "refused"
  std::optional<int> reading_seq;
  std::string note;
};

/// Inserts the lines of run `run_id` into `group` (inside add_run's details).
void add_raw_lines(RowGroup& group, std::int64_t run_id, const std::vector<RawLine>& lines);
std::vector<RawLine> raw_lines_of(SQLite::Database& db, std::int64_t run_id);

}  // namespace plumb::store
