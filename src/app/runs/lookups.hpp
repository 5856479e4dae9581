#pragma once
// What recording a run needs to look up in the registry, read once per command (or once per import file).
#include <map>
#include <optional>
#include <string>

#include "core/dates.hpp"
#include "store/database.hpp"
#include "store/instrument_versions.hpp"
#include "store/records.hpp"
#include "store/status_events.hpp"

namespace plumb::app {

/// The registry look-ups that recording a check needs: the lab, the balance, the reference weight with the
/// certificate valid on the check date, and whether both are in service. A batch import keeps one for the
/// whole file: its transaction holds the registry still, so each balance and weight is read once, not once
/// per run.
class CheckLookups {
public:
  explicit CheckLookups(store::Database& db) : db_(db) {}

  /// Reads the whole registry a check can need (lab, balances, weights with their certificates,
  /// retirements) at once and from then on never touches the database: a batch import validates its runs on
  /// one thread while another writes, and one query per table beats thousands of look-ups.
  void load_all();
  void require_lab();
  /// The balance with its attributes in force now; InputError when it is not registered.
  const store::BalanceRecord& balance(const std::string& id);
  /// The balance with the attributes (policy, smallest net weight, location, identity) in force on `on`: a
  /// check, a correction or an imported run is judged by the policy of its own date.
  store::BalanceRecord balance_on(const std::string& id, Date on);
  /// The weight with the certificate in force on `on`; InputError when it is unknown, has no certificate
  /// dated on or before `on`, or that certificate was overdue on `on`.
  store::WeightRecord traceable_weight(const std::string& id, Date on);
  /// InputError when the instrument or weight is retired.
  void require_in_service(const std::string& item_kind, const std::string& id);

private:
  struct WeightHistory {
    store::WeightRecord weight;
    std::vector<store::WeightCalibration> calibrations;  ///< oldest first
  };
  store::Database& db_;
  bool all_loaded_ = false;  ///< load_all was called: a miss is an unknown item, not a query
  bool lab_checked_ = false;
  std::map<std::string, store::BalanceRecord> balances_;
  std::map<std::string, std::vector<store::InstrumentAttributes>> attribute_histories_;
  std::map<std::string, WeightHistory> weights_;
  std::map<std::string, std::optional<store::ServiceEvent>> retirements_;  ///< key: kind + '/' + id
};

}  // namespace plumb::app
