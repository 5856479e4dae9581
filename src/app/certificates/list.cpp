#include "app/certificates/list.hpp"

#include <fmt/format.h>

#include "app/certificates/state.hpp"
#include "core/errors.hpp"
#include "store/certificate_list.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

void require_instrument(store::Database& db, const std::string& id) {
  if (!store::instrument_exists(db.sql(), id))
    throw InputError(fmt::format("--instrument \"{}\" is not a registered instrument.", id));
}

report::CertificateListItem item_of(const store::CertificateListRow& row, CertificateState state) {
  report::CertificateListItem c;
  c.number = row.number;
  c.run_id = row.run_id;
  c.instrument = row.instrument_id;
  c.procedure = std::string(checks::to_string(row.procedure));
  c.check_date = row.performed_on;
  c.operator_name = row.operator_name;
  c.issued_at = row.issued_at;
  c.issued_by = row.issued_by;
  c.state = std::string(state_key(state));
  c.approved_by = row.approved_by;
  c.approved_at = row.approved_at;
  c.superseded_at = row.superseded_at;
  c.replaced_by = row.replaced_by;
  c.withdrawn_at = row.withdrawn_at;
  c.withdrawn_reason = row.withdrawn_reason;
  return c;
}

CertificateState state_of(const store::CertificateListRow& row) {
  return certificate_state(row.approved_at.has_value(), row.superseded_at.has_value(), row.withdrawn_at.has_value());
}

}  // namespace

CertificateList list_certificates(store::Database& db, const CertificateFilter& filter) {
  std::optional<CertificateState> wanted;
  if (filter.state) wanted = parse_certificate_state(*filter.state, "--state");
  store::CertificateListQuery query;
  if (filter.from) query.issued_from = parse_date(*filter.from, "--from");
  if (filter.to) query.issued_to = parse_date(*filter.to, "--to");
  if (query.issued_from && query.issued_to && *query.issued_to < *query.issued_from)
    throw InputError(fmt::format("--from {} is after --to {}; give the earlier date first.", *filter.from, *filter.to));
  if (filter.instrument) {
    require_instrument(db, *filter.instrument);
    query.instrument_id = filter.instrument;
  }

  CertificateList out;
  std::vector<std::string> scope;
  if (wanted) scope.push_back(fmt::format("state {}", state_key(*wanted)));
  if (filter.instrument) scope.push_back("instrument " + *filter.instrument);
  if (query.issued_from) scope.push_back("issued from " + to_string(*query.issued_from));
  if (query.issued_to) scope.push_back("issued to " + to_string(*query.issued_to));
  for (const auto& s : scope) out.scope += (out.scope.empty() ? "" : ", ") + s;

  for (const auto& row : store::list_certificates(db.sql(), query)) {
    const CertificateState state = state_of(row);
    if (!wanted || state == *wanted) out.items.push_back(item_of(row, state));
  }
  return out;
}

ApprovalQueue approval_queue(store::Database& db, const std::optional<std::string>& instrument,
                             const std::optional<std::string>& on) {
  ApprovalQueue q;
  q.on = on ? parse_date(*on, "--on") : today_utc();
  store::CertificateListQuery query;
  query.issued_to = q.on;
  if (instrument) {
    require_instrument(db, *instrument);
    query.instrument_id = instrument;
  }
  for (const auto& row : store::list_certificates(db.sql(), query)) {
    if (state_of(row) != CertificateState::draft) continue;
    report::CertificateListItem c = item_of(row, CertificateState::draft);
    c.waiting_days = days_between(parse_date(row.issued_at.substr(0, 10)), q.on);
    q.items.push_back(std::move(c));
  }
  return q;
}

}  // namespace plumb::app
