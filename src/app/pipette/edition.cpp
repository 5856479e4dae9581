#include "app/pipette/edition.hpp"

#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <vector>

#include "app/registry/lab.hpp"
#include "core/errors.hpp"
#include "store/pipettes.hpp"

namespace plumb::app {

store::PipetteEdition set_pipette_edition(store::Database& db, const store::Actor& actor, const std::string& pipette_id,
                                          const std::string& edition, const std::string& reason) {
  const auto e = checks::parse_iso8655_edition(edition, "--edition");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  const auto pipette = store::find_pipette(db.sql(), pipette_id);
  if (!pipette) throw InputError(fmt::format("pipette \"{}\" is not registered.", pipette_id));
  // The 2022 limits are not held: a pipette judged by the 2002 table could record no run under 2022.
  if (e == checks::Iso8655Edition::e2022 &&
      pipette->definition.limits.kind == pipette_limits::LimitsPolicy::Kind::iso8655_2)
    throw InputError(fmt::format(
        "--edition 2022: pipette {} is judged by ISO 8655-2:2002 Table 1; plumb does not hold the 2022 edition's "
        "limits, so a pipette checked to ISO 8655:2022 must be registered with the laboratory's limits (pipette add "
        "--max-systematic --max-random).",
        pipette->id()));
  store::PipetteEdition row;
  row.pipette_id = pipette->id();
  row.edition = std::string(checks::key(e));
  row.reason = reason;
  store::Recorder rec(db.sql(), actor);
  row.id = store::add_pipette_edition(rec, row);
  rec.commit(tx);
  return store::pipette_edition_history(db.sql(), row.pipette_id).back();
}

store::PipetteEdition set_lab_pipette_edition(store::Database& db, const store::Actor& actor,
                                              const std::string& edition, const std::string& reason) {
  const auto e = checks::parse_iso8655_edition(edition, "--edition");
  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  require_lab(db);
  if (e == checks::Iso8655Edition::e2022) {
    std::vector<std::string> held_back;
    for (const auto& p : store::list_pipettes(db.sql()))
      if (store::pipette_edition_history(db.sql(), p.id()).empty() &&
          p.definition.limits.kind == pipette_limits::LimitsPolicy::Kind::iso8655_2)
        held_back.push_back(p.id());
    if (!held_back.empty())
      throw InputError(fmt::format(
          "--edition 2022: pipette {} (and {} other(s)) would follow the lab's default but is judged by ISO "
          "8655-2:2002 "
          "Table 1; plumb does not hold the 2022 edition's limits, so keep it at 2002 first (pipette set-edition {} "
          "--edition 2002) or register it with the laboratory's limits.",
          held_back.front(), held_back.size() - 1, held_back.front()));
  }
  store::PipetteEdition row;
  row.edition = std::string(checks::key(e));
  row.reason = reason;
  store::Recorder rec(db.sql(), actor);
  row.id = store::add_lab_pipette_edition(rec, row);
  rec.commit(tx);
  return store::lab_pipette_edition_history(db.sql()).back();
}

checks::Iso8655Edition pipette_edition(store::Database& db, const std::string& pipette_id) {
  return checks::parse_iso8655_edition(store::current_pipette_edition(db.sql(), pipette_id), "stored edition");
}

}  // namespace plumb::app
