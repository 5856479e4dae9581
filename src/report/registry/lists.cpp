#include "report/registry/lists.hpp"

#include <fmt/format.h>

#include <sstream>

#include "report/format/csv.hpp"

namespace plumb::report {

using nlohmann::json;

namespace {

std::string status_text(const WeightStatuses& status, const std::string& id) {
  const auto it = status.find(id);
  return it == status.end() ? std::string() : it->second;
}

}  // namespace

std::string weights_text(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status) {
  constexpr const char* row = "{:<10}{:<10}{:<6}{:<22}{:<14}{:<12}{}\n";
  std::string out = fmt::format(row, "id", "nominal", "class", "conventional mass (g)", "certificate", "due", "status");
  for (const auto& w : weights)
    out += fmt::format(row, w.id, w.nominal_text, w.weight_class, w.conventional_mass().in_grams().to_string(),
                       w.current.certificate_no, to_string(w.current.due_on), status_text(status, w.id));
  return out;
}

json weights_json(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status) {
  json j = json::array();
  for (const auto& w : weights)
    j.push_back({{"id", w.id},
                 {"nominal", w.nominal_text},
                 {"nominal_g", w.nominal.approx().g()},
                 {"class", w.weight_class},
                 {"conventional_mass_g", w.conventional_mass().approx().g()},
                 {"correction_mg", w.current.correction.approx().mg()},
                 {"uncertainty_mg", w.current.uncertainty.approx().mg()},
                 {"k", w.current.k.to_double()},
                 {"certificate", w.current.certificate_no},
                 {"calibrated_on", to_string(w.current.calibrated_on)},
                 {"due_on", to_string(w.current.due_on)},
                 {"status", status_text(status, w.id)}});
  return j;
}

// Exact values as stored (decimal grams), so a spreadsheet gets the certificate's digits, not a rounded float.
std::string weights_csv(const std::vector<store::WeightRecord>& weights, const WeightStatuses& status) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"id", "nominal", "nominal_g", "class", "conventional_mass_g", "correction_g", "uncertainty_g", "k",
              "certificate", "calibrated_on", "due_on", "status"});
  for (const auto& w : weights) {
    csv.value(w.id).text(w.nominal_text).value(w.nominal.in_grams().to_string()).value(w.weight_class);
    csv.value(w.conventional_mass().in_grams().to_string()).value(w.current.correction.in_grams().to_string());
    csv.value(w.current.uncertainty.in_grams().to_string()).value(w.current.k.to_string());
    csv.text(w.current.certificate_no).value(to_string(w.current.calibrated_on)).value(to_string(w.current.due_on));
    csv.value(status_text(status, w.id));
    csv.end_row();
  }
  return out.str();
}

namespace {
std::string status_of(const InstrumentStatuses& status, const std::string& id) {
  const auto it = status.find(id);
  return it == status.end() ? std::string() : it->second;
}
}  // namespace

std::string balances_text(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status) {
  constexpr const char* row = "{:<10}{:<12}{:<12}{:<8}{:<12}{:<16}{}\n";
  std::string out = fmt::format(row, "id", "capacity", "d", "every", "policy", "status", "location");
  for (const auto& b : balances)
    out += fmt::format(row, b.id, b.capacity.to_string(), b.readability.to_string(), b.every.to_string(),
                       b.policy.key(), status_of(status, b.id), b.location);
  return out;
}

json balances_json(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status) {
  json j = json::array();
  for (const auto& b : balances)
    j.push_back({{"id", b.id},
                 {"location", b.location},
                 {"capacity_g", b.capacity.approx().g()},
                 {"readability_g", b.readability.approx().g()},
                 {"smallest_net_g", b.smallest_net ? json(b.smallest_net->approx().g()) : json()},
                 {"every", b.every.to_string()},
                 {"policy", b.policy.key()},
                 {"status", status_of(status, b.id)}});
  return j;
}

std::string balances_csv(const std::vector<store::BalanceRecord>& balances, const InstrumentStatuses& status) {
  std::ostringstream out;
  CsvWriter csv(out);
  csv.header({"id", "capacity_g", "readability_g", "smallest_net_g", "every", "policy", "location", "status"});
  for (const auto& b : balances) {
    csv.value(b.id).value(b.capacity.in_grams().to_string()).value(b.readability.in_grams().to_string());
    csv.value(b.smallest_net ? b.smallest_net->in_grams().to_string() : "");
    csv.value(b.every.to_string()).value(b.policy.key()).text(b.location).value(status_of(status, b.id));
    csv.end_row();
  }
  return out.str();
}

}  // namespace plumb::report
