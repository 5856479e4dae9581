#pragma once
// Events that change a record's standing without changing the record: a certificate approved or
// superseded, an instrument or weight retired or reinstated. Appended through the Recorder like any row.
#include <SQLiteCpp/Database.h>

#include <cstdint>
#include <optional>
#include <set>
#include <string>
#include <vector>

#include "store/recorder.hpp"

namespace plumb::store {

struct CertificateEvent {
  std::int64_t id = 0;
  std::int64_t certificate_id = 0;
  std::string event;  ///< "approved" or "superseded"
  std::string by_name;
  std::string meaning;  ///< approved: the meaning of the signature
  std::optional<std::int64_t> replaced_by;  ///< superseded: the replacing certificate
  std::string reason;   ///< superseded: why
  std::string recorded_at;
  std::string os_user;
};

std::vector<CertificateEvent> certificate_events(SQLite::Database& db, std::int64_t certificate_id);
std::optional<CertificateEvent> certificate_event(SQLite::Database& db, std::int64_t certificate_id,
                                                  const std::string& event);
void add_certificate_event(Recorder& rec, const CertificateEvent& e);

struct ServiceEvent {
  std::int64_t id = 0;
  std::string item_kind;  ///< "instrument" or "weight"
  std::string item_id;
  std::string event;      ///< "retired" or "reinstated"
  std::string reason;
  std::string by_name;
  std::string recorded_at;
  std::string os_user;
};

/// The latest retire/reinstate event of an item, if any.
std::optional<ServiceEvent> latest_service_event(SQLite::Database& db, const std::string& item_kind,
                                                 const std::string& item_id);
/// The retirement in force, if the item is retired now.
std::optional<ServiceEvent> retirement(SQLite::Database& db, const std::string& item_kind, const std::string& item_id);
/// Ids of the items of one kind that are retired now.
std::set<std::string> retired_ids(SQLite::Database& db, const std::string& item_kind);
void add_service_event(Recorder& rec, const ServiceEvent& e);

/// A run voided because it was entered in error (schema/006_lifecycle.sql).
void add_run_void(Recorder& rec, std::int64_t run_id, const std::string& reason);
/// A certificate withdrawn, with the reason (its run was voided).
struct CertificateWithdrawal {
  std::int64_t certificate_id = 0;
  std::string reason, by_name, recorded_at;
};
void add_certificate_withdrawal(Recorder& rec, std::int64_t certificate_id, const std::string& reason);
std::optional<CertificateWithdrawal> certificate_withdrawal(SQLite::Database& db, std::int64_t certificate_id);

}  // namespace plumb::store
