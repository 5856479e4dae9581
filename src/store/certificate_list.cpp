#include "store/certificate_list.hpp"

#include <SQLiteCpp/Statement.h>

#include "store/columns.hpp"
#include "store/repository.hpp"

namespace plumb::store {
namespace {

std::optional<std::string> nullable_text(const SQLite::Column& c) {
  if (c.isNull()) return std::nullopt;
  return c.getString();
}

}  // namespace

std::vector<CertificateListRow> list_certificates(SQLite::Database& db, const CertificateListQuery& query) {
  // The events are unique per certificate and kind (schema/002_audit.sql, schema/006_lifecycle.sql), so each
  // join adds at most one row.
  std::string sql =
      "SELECT c.id, c.number, c.run_id, r.instrument_id, r.procedure, r.performed_on, r.operator, c.issued_at, "
      "c.issued_by, a.by_name, a.recorded_at, s.recorded_at, n.number, w.recorded_at, w.reason "
      "FROM certificates c JOIN check_runs r ON r.id = c.run_id "
      "LEFT JOIN certificate_events a ON a.certificate_id = c.id AND a.event = 'approved' "
      "LEFT JOIN certificate_events s ON s.certificate_id = c.id AND s.event = 'superseded' "
      "LEFT JOIN certificates n ON n.id = s.replaced_by "
      "LEFT JOIN certificate_withdrawals w ON w.certificate_id = c.id WHERE 1 = 1";
  if (query.instrument_id) sql += " AND r.instrument_id = :instrument";
  if (query.issued_from) sql += " AND substr(c.issued_at, 1, 10) >= :from";
  if (query.issued_to) sql += " AND substr(c.issued_at, 1, 10) <= :to";
  sql += " ORDER BY c.issued_at, c.id";
  SQLite::Statement q(db, sql);
  if (query.instrument_id) q.bind(":instrument", *query.instrument_id);
  if (query.issued_from) q.bind(":from", to_string(*query.issued_from));
  if (query.issued_to) q.bind(":to", to_string(*query.issued_to));
  std::vector<CertificateListRow> out;
  while (q.executeStep()) {
    CertificateListRow row;
    row.id = q.getColumn(0).getInt64();
    row.number = q.getColumn(1).getString();
    row.run_id = q.getColumn(2).getInt64();
    row.instrument_id = q.getColumn(3).getString();
    row.procedure = stored_procedure(q.getColumn(4));
    row.performed_on = stored_date(q.getColumn(5));
    row.operator_name = q.getColumn(6).getString();
    row.issued_at = q.getColumn(7).getString();
    row.issued_by = q.getColumn(8).getString();
    row.approved_by = nullable_text(q.getColumn(9));
    row.approved_at = nullable_text(q.getColumn(10));
    row.superseded_at = nullable_text(q.getColumn(11));
    row.replaced_by = nullable_text(q.getColumn(12));
    row.withdrawn_at = nullable_text(q.getColumn(13));
    row.withdrawn_reason = nullable_text(q.getColumn(14));
    out.push_back(std::move(row));
  }
  return out;
}

std::optional<CertificateRecord> last_certificate(SQLite::Database& db) {
  SQLite::Statement q(db, "SELECT max(id) FROM certificates");
  if (!q.executeStep() || q.getColumn(0).isNull()) return std::nullopt;
  return find_certificate_by_id(db, q.getColumn(0).getInt64());
}

}  // namespace plumb::store
