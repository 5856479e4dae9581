#include "app/registry/service_status.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include "app/registry/fields.hpp"
#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

bool item_exists(store::Database& db, const std::string& item_kind, const std::string& id) {
  return item_kind == "weight" ? store::find_weight(db.sql(), id).has_value() : store::instrument_exists(db.sql(), id);
}

}  // namespace

store::ServiceEvent change_service_status(store::Database& db, const store::Actor& actor, const std::string& item_kind,
                                          const std::string& id, const std::string& event, const std::string& reason) {
  if (item_kind != "instrument" && item_kind != "weight")
    throw InputError(fmt::format("\"{}\" cannot be retired (only an instrument or a weight).", item_kind));
  if (event != "retired" && event != "reinstated")
    throw InputError(fmt::format("service event \"{}\" is not retired or reinstated.", event));
  const std::string verb = event == "retired" ? "retire" : "reinstate";
  validate_free_text(reason, "--reason", false);
  if (reason.find_first_not_of(" \t") == std::string::npos)
    throw InputError(fmt::format("--reason must say why {} {} is {}.", item_kind, id, event));
  if (actor.name.find_first_not_of(" \t") == std::string::npos)
    throw InputError(fmt::format("the user who decides to {} {} {} has no printed name.", verb, item_kind, id));
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (!item_exists(db, item_kind, id)) throw InputError(fmt::format("{} \"{}\" is not registered.", item_kind, id));
  const auto retired = store::retirement(db.sql(), item_kind, id);
  if (event == "retired" && retired)
    throw InputError(fmt::format("{} {} is already retired (since {}, by {}: {}).", item_kind, id, retired->recorded_at,
                                 retired->by_name, retired->reason));
  if (event == "reinstated" && !retired)
    throw InputError(
        fmt::format("{} {} is in service; only a retired {} can be reinstated.", item_kind, id, item_kind));
  store::Recorder rec(db.sql(), actor);
  store::ServiceEvent e;
  e.item_kind = item_kind;
  e.item_id = id;
  e.event = event;
  e.reason = reason;
  e.by_name = actor.name;
  e.recorded_at = rec.now();
  e.os_user = actor.os_user;
  store::add_service_event(rec, e);
  rec.commit(tx);
  return *store::latest_service_event(db.sql(), item_kind, id);
}

void require_in_service(store::Database& db, const std::string& item_kind, const std::string& id) {
  require_in_service(item_kind, id, store::retirement(db.sql(), item_kind, id));
}

void require_in_service(const std::string& item_kind, const std::string& id,
                        const std::optional<store::ServiceEvent>& retired) {
  if (!retired) return;
  const std::string option = item_kind == "weight" ? "--weight" : "instrument";
  throw InputError(
      fmt::format("{} {} was retired on {} by {} ({}); reinstate it with `plumb {} reinstate {} "
                  "--reason ...` before recording a new check.",
                  option, id, retired->recorded_at, retired->by_name, retired->reason, item_kind, id));
}

}  // namespace plumb::app
