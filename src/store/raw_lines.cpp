#include "store/raw_lines.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {

void add_raw_lines(RowGroup& group, std::int64_t run_id, const std::vector<RawLine>& lines) {
  if (lines.empty()) return;
  std::vector<Row> rows;
  rows.reserve(lines.size());
  for (const auto& l : lines)
    rows.push_back({{"run_id", run_id},
                    {"seq", l.seq},
                    {"received_at", l.received_at},
                    {"source", l.source},
                    {"line", l.line},
                    {"outcome", l.outcome},
                    {"reading_seq", l.reading_seq ? Value(*l.reading_seq) : Value()},
                    {"note", l.note.empty() ? Value() : Value(l.note)}});
  group.insert_rows("run_raw_lines", std::move(rows));
}

std::vector<RawLine> raw_lines_of(SQLite::Database& db, std::int64_t run_id) {
  SQLite::Statement q(db,
                      "SELECT seq, received_at, source, line, outcome, reading_seq, note FROM run_raw_lines "
                      "WHERE run_id = ? ORDER BY seq");
  q.bind(1, run_id);
  std::vector<RawLine> out;
  while (q.executeStep()) {
    RawLine l;
    l.seq = q.getColumn(0).getInt();
    l.received_at = q.getColumn(1).getString();
    l.source = q.getColumn(2).getString();
    l.line = q.getColumn(3).getString();
    l.outcome = q.getColumn(4).getString();
    if (!q.getColumn(5).isNull()) l.reading_seq = q.getColumn(5).getInt();
    if (!q.getColumn(6).isNull()) l.note = q.getColumn(6).getString();
    out.push_back(std::move(l));
  }
  return out;
}

}  // namespace plumb::store
