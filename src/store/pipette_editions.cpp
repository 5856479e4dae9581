#include "store/pipette_editions.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {

std::int64_t add_pipette_edition(Recorder& rec, const PipetteEdition& e) {
  return rec.insert("pipette_editions",
                    {{"pipette_id", e.pipette_id},
                     {"edition", e.edition},
                     {"reason", e.reason.empty() ? Value() : Value(e.reason)},
                     {"created_at", rec.now()},
                     {"created_by", rec.actor().name}},
                    {"id"}, e.reason);
}

std::vector<PipetteEdition> pipette_edition_history(SQLite::Database& db, const std::string& pipette_id) {
  SQLite::Statement q(db,
                      "SELECT id, pipette_id, edition, reason, created_at, created_by FROM pipette_editions "
                      "WHERE pipette_id = ? ORDER BY id");
  q.bind(1, pipette_id);
  std::vector<PipetteEdition> out;
  while (q.executeStep()) {
    PipetteEdition e;
    e.id = q.getColumn(0).getInt64();
    e.pipette_id = q.getColumn(1).getString();
    e.edition = q.getColumn(2).getString();
    if (!q.getColumn(3).isNull()) e.reason = q.getColumn(3).getString();
    e.created_at = q.getColumn(4).getString();
    e.created_by = q.getColumn(5).getString();
    out.push_back(std::move(e));
  }
  return out;
}

std::string current_pipette_edition(SQLite::Database& db, const std::string& pipette_id) {
  const auto all = pipette_edition_history(db, pipette_id);
  return all.empty() ? lab_default_pipette_edition(db) : all.back().edition;
}

std::int64_t add_lab_pipette_edition(Recorder& rec, const PipetteEdition& e) {
  return rec.insert("lab_pipette_editions",
                    {{"edition", e.edition},
                     {"reason", e.reason.empty() ? Value() : Value(e.reason)},
                     {"created_at", rec.now()},
                     {"created_by", rec.actor().name}},
                    {"id"}, e.reason);
}

std::vector<PipetteEdition> lab_pipette_edition_history(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT id, edition, reason, created_at, created_by FROM lab_pipette_editions ORDER BY id");
  std::vector<PipetteEdition> out;
  while (q.executeStep()) {
    PipetteEdition e;
    e.id = q.getColumn(0).getInt64();
    e.edition = q.getColumn(1).getString();
    if (!q.getColumn(2).isNull()) e.reason = q.getColumn(2).getString();
    e.created_at = q.getColumn(3).getString();
    e.created_by = q.getColumn(4).getString();
    out.push_back(std::move(e));
  }
  return out;
}

std::string lab_default_pipette_edition(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT edition FROM lab_pipette_editions ORDER BY id DESC LIMIT 1");
  return q.executeStep() ? q.getColumn(0).getString() : std::string("2002");
}

}  // namespace plumb::store
