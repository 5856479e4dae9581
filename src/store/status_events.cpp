#include "store/status_events.hpp"

#include <SQLiteCpp/Statement.h>

namespace plumb::store {
namespace {

using nlohmann::json;

Value text_or_null(const std::string& s) { return s.empty() ? Value() : Value(s); }

std::string text(const SQLite::Column& c) { return c.isNull() ? std::string() : c.getString(); }

constexpr const char* certificate_event_select =
    "SELECT id, certificate_id, event, by_name, meaning, replaced_by, reason, recorded_at, os_user "
    "FROM certificate_events";

CertificateEvent certificate_event_from(SQLite::Statement& q) {
  CertificateEvent e;
  e.id = q.getColumn(0).getInt64();
  e.certificate_id = q.getColumn(1).getInt64();
  e.event = q.getColumn(2).getString();
  e.by_name = q.getColumn(3).getString();
  e.meaning = text(q.getColumn(4));
  if (!q.getColumn(5).isNull()) e.replaced_by = q.getColumn(5).getInt64();
  e.reason = text(q.getColumn(6));
  e.recorded_at = q.getColumn(7).getString();
  e.os_user = q.getColumn(8).getString();
  return e;
}

constexpr const char* service_event_select =
    "SELECT id, item_kind, item_id, event, reason, by_name, recorded_at, os_user FROM service_events";

ServiceEvent service_event_from(SQLite::Statement& q) {
  ServiceEvent e;
  e.id = q.getColumn(0).getInt64();
  e.item_kind = q.getColumn(1).getString();
  e.item_id = q.getColumn(2).getString();
  e.event = q.getColumn(3).getString();
  e.reason = q.getColumn(4).getString();
  e.by_name = q.getColumn(5).getString();
  e.recorded_at = q.getColumn(6).getString();
  e.os_user = q.getColumn(7).getString();
  return e;
}

}  // namespace

std::vector<CertificateEvent> certificate_events(SQLite::Database& db, std::int64_t certificate_id) {
  SQLite::Statement q(db, std::string(certificate_event_select) + " WHERE certificate_id = ? ORDER BY id");
  q.bind(1, certificate_id);
  std::vector<CertificateEvent> out;
  while (q.executeStep()) out.push_back(certificate_event_from(q));
  return out;
}

std::optional<CertificateEvent> certificate_event(SQLite::Database& db, std::int64_t certificate_id,
                                                  const std::string& event) {
  SQLite::Statement q(db, std::string(certificate_event_select) + " WHERE certificate_id = ? AND event = ?");
  q.bind(1, certificate_id);
  q.bind(2, event);
  if (!q.executeStep()) return std::nullopt;
  return certificate_event_from(q);
}

void add_certificate_event(Recorder& rec, const CertificateEvent& e) {
  rec.insert("certificate_events",
             {{"certificate_id", e.certificate_id},
              {"event", e.event},
              {"by_name", e.by_name},
              {"meaning", text_or_null(e.meaning)},
              {"replaced_by", e.replaced_by ? Value(*e.replaced_by) : Value()},
              {"reason", text_or_null(e.reason)},
              {"recorded_at", rec.now()},
              {"os_user", rec.actor().os_user}},
             {"id"}, e.reason);
}

std::optional<ServiceEvent> latest_service_event(SQLite::Database& db, const std::string& item_kind,
                                                 const std::string& item_id) {
  SQLite::Statement q(db, std::string(service_event_select) +
                              " WHERE item_kind = ? AND item_id = ? ORDER BY id DESC LIMIT 1");
  q.bind(1, item_kind);
  q.bind(2, item_id);
  if (!q.executeStep()) return std::nullopt;
  return service_event_from(q);
}

std::optional<ServiceEvent> retirement(SQLite::Database& db, const std::string& item_kind, const std::string& item_id) {
  auto e = latest_service_event(db, item_kind, item_id);
  if (e && e->event == "retired") return e;
  return std::nullopt;
}

std::set<std::string> retired_ids(SQLite::Database& db, const std::string& item_kind) {
  SQLite::Statement q(db,
                      "SELECT item_id FROM service_events e WHERE item_kind = ?1 AND event = 'retired' AND id = "
                      "(SELECT max(id) FROM service_events WHERE item_kind = ?1 AND item_id = e.item_id)");
  q.bind(1, item_kind);
  std::set<std::string> out;
  while (q.executeStep()) out.insert(q.getColumn(0).getString());
  return out;
}

void add_service_event(Recorder& rec, const ServiceEvent& e) {
  rec.insert("service_events",
             {{"item_kind", e.item_kind},
              {"item_id", e.item_id},
              {"event", e.event},
              {"reason", e.reason},
              {"by_name", e.by_name},
              {"recorded_at", rec.now()},
              {"os_user", rec.actor().os_user}},
             {"id"}, e.reason);
}

void add_run_void(Recorder& rec, std::int64_t run_id, const std::string& reason) {
  rec.insert("run_voids",
             {{"run_id", run_id},
              {"reason", reason},
              {"by_name", rec.actor().name},
              {"recorded_at", rec.now()},
              {"os_user", rec.actor().os_user}},
             {"run_id"}, reason);
}

void add_certificate_withdrawal(Recorder& rec, std::int64_t certificate_id, const std::string& reason) {
  rec.insert("certificate_withdrawals",
             {{"certificate_id", certificate_id},
              {"reason", reason},
              {"by_name", rec.actor().name},
              {"recorded_at", rec.now()},
              {"os_user", rec.actor().os_user}},
             {"certificate_id"}, reason);
}

std::optional<CertificateWithdrawal> certificate_withdrawal(SQLite::Database& db, std::int64_t certificate_id) {
  SQLite::Statement q(db, "SELECT reason, by_name, recorded_at FROM certificate_withdrawals WHERE certificate_id = ?");
  q.bind(1, certificate_id);
  if (!q.executeStep()) return std::nullopt;
  return CertificateWithdrawal{certificate_id, q.getColumn(0).getString(), q.getColumn(1).getString(),
                               q.getColumn(2).getString()};
}

}  // namespace plumb::store
