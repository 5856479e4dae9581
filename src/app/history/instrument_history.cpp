#include "app/history/instrument_history.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <SQLiteCpp/Statement.h>

#include <algorithm>
#include <cctype>
#include <map>

#include "core/errors.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

bool in_period(Date d, const Period& p) { return (!p.from || d >= *p.from) && (!p.to || d <= *p.to); }

std::optional<store::WeightCalibration> first_weight(store::Database& db, const store::RunRecord& run) {
  if (run.weights.empty()) return std::nullopt;
  return store::find_weight_calibration(db.sql(), run.weights.front().weight_calibration_id);
}

/// run id -> the id of the run that supersedes it.
std::map<std::int64_t, std::int64_t> superseded_by(const std::vector<store::RunRecord>& runs) {
  std::map<std::int64_t, std::int64_t> m;
  for (const auto& r : runs)
    if (r.supersedes) m[*r.supersedes] = r.id;
  return m;
}

report::QuantityView quantity_view(const RunHistory& h, const HistoryQuantity& q) {
  report::QuantityView v{q.key, q.label, q.unit, q.uncertainty_basis, {}, "", q.non_negative};
  // The latest current run of the quantity's procedure decides the label and the limits that apply now.
  const auto& runs = *h.runs;
  const auto replaced = superseded_by(runs);
  for (std::size_t i = runs.size(); i-- > 0;) {
    const auto& run = runs[i];
    if (run.procedure != q.procedure || replaced.count(run.id) || run.voided) continue;
    const RunContext c{run, h.first_weights[i]};
    v.label = q.axis_label(c);
    const auto t = q.tolerance(c, h.instrument);
    v.tolerance = t.limits;
    v.tolerance_basis = t.basis;
    return v;
  }
  v.tolerance_basis = "no check has been recorded";
  return v;
}

std::vector<const HistoryQuantity*> quantities_of(const InstrumentInfo& inst) {
  std::vector<const HistoryQuantity*> quantities;
  for (const auto& q : history_quantities())
    if (q.instrument_kind == inst.kind) quantities.push_back(&q);
  return quantities;
}

}  // namespace

Period parse_period(const std::optional<std::string>& from, const std::optional<std::string>& to) {
  Period p;
  if (from) p.from = parse_date(*from, "--from");
  if (to) p.to = parse_date(*to, "--to");
  if (p.from && p.to && *p.from > *p.to)
    throw InputError(fmt::format("--from {} is after --to {}.", *from, *to));
  return p;
}

InstrumentInfo find_instrument(store::Database& db, const std::string& id) {
  if (!store::instrument_exists(db.sql(), id)) throw InputError(fmt::format("instrument \"{}\" is not registered.", id));
  InstrumentInfo info;
  info.id = id;
  if (auto b = store::find_balance(db.sql(), id)) {
    info.kind = "balance";
    info.location = b->location;
    info.every = b->every;
    info.title = fmt::format("Balance {} ({}, d = {})", id, b->capacity.to_string(), b->readability.to_string());
    info.balance = std::move(b);
    return info;
  }
  SQLite::Statement q(db.sql(), "SELECT kind, location, check_every FROM instruments WHERE id = ?");
  q.bind(1, id);
  q.executeStep();
  info.kind = q.getColumn(0).getString();
  info.location = q.getColumn(1).getString();
  info.every = Interval::parse(q.getColumn(2).getString(), "check_every");
  info.title = fmt::format("{}{} {}", static_cast<char>(std::toupper(info.kind[0])), info.kind.substr(1), id);
  return info;
}

RunHistory read_run_history(store::Database& db, const InstrumentInfo& inst) {
  RunHistory h{inst, std::make_shared<const std::vector<store::RunRecord>>(store::runs_of(db.sql(), inst.id)), {}};
  // A lab uses a few reference weights for hundreds of runs: each certificate is read once.
  std::map<std::int64_t, std::optional<store::WeightCalibration>> certificates;
  h.first_weights.reserve(h.runs->size());
  for (const auto& run : *h.runs) {
    if (run.weights.empty()) {
      h.first_weights.emplace_back();
      continue;
    }
    const auto id = run.weights.front().weight_calibration_id;
    auto it = certificates.find(id);
    if (it == certificates.end()) it = certificates.emplace(id, store::find_weight_calibration(db.sql(), id)).first;
    h.first_weights.push_back(it->second);
  }
  return h;
}

report::HistoryView history_view(store::Database& db, const InstrumentInfo& inst, const Period& period) {
  return history_view(read_run_history(db, inst), period);
}

report::HistoryView history_view(store::Database& db, const InstrumentInfo& inst, const Period& period,
                                 const std::vector<const HistoryQuantity*>& quantities) {
  return history_view(read_run_history(db, inst), period, quantities);
}

report::HistoryView history_view(const RunHistory& h, const Period& period) {
  return history_view(h, period, quantities_of(h.instrument));
}

report::HistoryView history_view(const RunHistory& h, const Period& period,
                                 const std::vector<const HistoryQuantity*>& quantities) {
  const auto& runs = *h.runs;
  const auto replaced = superseded_by(runs);
  report::HistoryView view{h.instrument.id, h.instrument.title, period.from, period.to, {}, {}};
  for (const auto* q : quantities) view.columns.push_back(quantity_view(h, *q));
  for (std::size_t i = 0; i < runs.size(); ++i) {
    const auto& run = runs[i];
    if (!in_period(run.performed_on, period)) continue;
    report::HistoryRow row;
    row.run_id = run.id;
    row.date = run.performed_on;
    row.procedure = run.procedure;
    row.operator_name = run.operator_name;
    row.verdict = std::string(to_string(run.verdict));
    row.next_due = run.next_due;
    row.supersedes = run.supersedes;
    if (auto it = replaced.find(run.id); it != replaced.end()) row.superseded_by = it->second;
    if (run.voided) row.void_reason = run.voided->reason;
    row.results = std::shared_ptr<const nlohmann::json>(h.runs, &run.results);  // shares the history's, no copy
    const RunContext c{run, h.first_weights[i]};
    for (const auto* q : quantities) {
      const auto v = q->procedure == run.procedure ? q->read(c) : std::nullopt;
      row.values.push_back(v ? std::optional(v->value) : std::nullopt);
      row.uncertainties.push_back(v ? std::optional(v->expanded_uncertainty) : std::nullopt);
    }
    view.rows.push_back(std::move(row));
  }
  return view;
}

void require_results(store::Database& db, const InstrumentInfo& inst, const HistoryQuantity& q,
                     const std::string& asked) {
  std::vector<std::string> points;
  bool any_run = false;
  for (const auto& run : store::runs_of(db.sql(), inst.id)) {
    if (run.procedure != q.procedure) continue;
    any_run = true;
    if (q.read(RunContext{run, first_weight(db, run)})) return;
    if (q.points_tested)
      for (auto& p : q.points_tested(run))
        if (std::find(points.begin(), points.end(), p) == points.end()) points.push_back(std::move(p));
  }
  // Before the first check a plain quantity simply has no rows yet; a point of one (cv@15uL) names a test
  // volume or channel, which only a recorded check can show to exist.
  if (!any_run && asked.find('@') == std::string::npos) return;
  throw InputError(fmt::format("--quantity \"{}\": no check of {} {} has a result there{}.", asked, inst.kind, inst.id,
                               points.empty() ? std::string(" (no check has been recorded)")
                                              : fmt::format(" (tested: {})", fmt::join(points, ", "))));
}

report::SeriesView series_view(store::Database& db, const InstrumentInfo& inst, const HistoryQuantity& q,
                               const Period& period) {
  return series_view(read_run_history(db, inst), q, period);
}

report::SeriesView series_view(const RunHistory& h, const HistoryQuantity& q, const Period& period) {
  const auto& runs = *h.runs;
  const auto replaced = superseded_by(runs);
  report::SeriesView view{h.instrument.id, h.instrument.title, quantity_view(h, q), {}, {}, 0};
  for (std::size_t i = 0; i < runs.size(); ++i) {
    const auto& run = runs[i];
    if (run.procedure != q.procedure || !in_period(run.performed_on, period)) continue;
    if (replaced.count(run.id)) {
      ++view.superseded_left_out;
      continue;
    }
    if (run.voided) {
      ++view.void_left_out;
      continue;
    }
    const auto v = q.read(RunContext{run, h.first_weights[i]});
    if (!v) continue;
    view.points.push_back({run.performed_on, v->value, v->expanded_uncertainty});
    view.run_ids.push_back(run.id);
  }
  return view;
}

}  // namespace plumb::app
