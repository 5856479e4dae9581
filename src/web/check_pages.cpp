// Recording a weekly check in the browser: the form offers the balances and weights in date and in service; the
// preview and the record go through the same app functions as `plumb check record` (app/weekly_check), so the
// numbers, the verdict and every refusal are the CLI's. Works with JavaScript off: the "Preview" button posts the form
// and the page comes back with the server's preview; "Record" records.
#include <fmt/format.h>

#include <cmath>

#include "app/runs/lookups.hpp"
#include "app/status/due.hpp"
#include "app/status/lab_overview.hpp"
#include "app/weekly_check/record.hpp"
#include "core/dates.hpp"
#include "core/errors.hpp"
#include "report/runs/json.hpp"
#include "report/runs/text.hpp"
#include "store/repository.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

/// The header line the readings box starts with: the CSV that `check record --readings` reads.
constexpr const char* readings_header = "reading\n";

/// Which field of the form a refusal is about, from the option or source its sentence names first.
std::string field_at_fault(const std::string& sentence) {
  if (sentence.starts_with("--weight")) return "weight";
  if (sentence.starts_with("--on")) return "on";
  if (sentence.starts_with("--unit")) return "unit";
  if (sentence.starts_with("readings")) return "readings";
  if (sentence.find("balance") != std::string::npos || sentence.find("instrument") != std::string::npos)
    return "balance";
  return "form";
}

app::CheckInput check_input(const PageContext& c) {
  app::CheckInput in;
  in.instrument_id = c.request.param("balance");
  if (!c.request.param("weight").empty()) in.weight_ids = {c.request.param("weight")};
  in.readings_csv = c.request.param("readings");
  in.readings_source = "readings";
  const std::string unit = c.request.param("unit").empty() ? "g" : c.request.param("unit");
  in.default_unit = parse_mass_unit(unit, "--unit");
  in.on = c.request.param("on").empty() ? to_string(today_local()) : c.request.param("on");
  in.operator_name = c.visitor->who.actor.name;
  return in;
}

/// Decimals that show a value in grams to the balance's readability and one digit more.
int shown_decimals(double readability_g) {
  return readability_g > 0 ? std::max(0, static_cast<int>(std::lround(-std::log10(readability_g)))) + 1 : 6;
}

/// n, mean, s, bias and the verdict of a run, as the preview and the result page show them.
json run_figures(store::RunRecord run) {
  // A weekly check built for writing carries its results as the JSON text it will store (results_text).
  if ((run.results.is_null() || run.results.empty()) && !run.results_text.empty())
    run.results = json::parse(run.results_text);
  const json r = report::run_json(run);
  const json& j = r;
  const int places = shown_decimals(r.value("readability_g", 0.0));
  const auto grams = [&](const char* key) {
    return r.contains(key) && r[key].is_number() ? fmt::format("{:.{}f} g", r[key].get<double>(), places) : "";
  };
  // s and bias are small: in mg, to a tenth of the balance's d and one digit more.
  const auto milligrams = [&](const char* key) {
    return r.contains(key) && r[key].is_number()
               ? fmt::format("{:.{}f} mg", r[key].get<double>() * 1000.0, std::max(0, places - 1))
               : "";
  };
  json reasons = json::array();
  for (const auto& reason : r.value("reasons", json::array())) reasons.push_back(reason);
  const std::string verdict = j.value("verdict", "");
  return {{"n", r.value("n", 0)},     {"mean", grams("mean_g")},
          {"sd", milligrams("sd_g")}, {"bias", milligrams("bias_g")},
          {"verdict", verdict},       {"passed", verdict == "pass"},
          {"reasons", reasons},       {"run_text", report::run_text(j)}};
}

/// The form's choices and what was typed, with the refusal beside its field.
json form_context(PageContext& c, const std::string& refusal) {
  const Date today = today_local();
  const auto overview = app::lab_overview(c.db, today, c.site.options.due_window_days);  // kept between requests
  const auto& standings = overview->standings;
  const auto standing_of = [&](const std::string& kind, const std::string& id) {
    const auto s = standings.find(app::standing_key(kind, id));
    return s == standings.end() ? std::string("in date") : s->second.status;
  };
  const std::string balance = c.request.param("balance"), weight = c.request.param("weight");
  json balances = json::array(), weights = json::array();
  // A balance in service takes its check whatever its due date (an overdue one needs it most); a weight must be in
  // service and its certificate in date. app/weekly_check refuses anything else with its own sentence.
  for (const auto& b : store::list_balances(c.db.sql()))
    if (const auto st = standing_of("instrument", b.id); st != "retired")
      balances.push_back({{"id", b.id}, {"location", b.location}, {"standing", st}, {"selected", b.id == balance}});
  for (const auto& w : store::list_weights(c.db.sql()))
    if (const auto st = standing_of("weight", w.id); st == "in date" || st == "due")
      weights.push_back({{"id", w.id}, {"nominal", w.nominal_text}, {"standing", st}, {"selected", w.id == weight}});
  const std::string readings = c.request.param("readings");
  json context = {{"balances", balances},
                  {"weights", weights},
                  {"on", c.request.param("on").empty() ? to_string(today) : c.request.param("on")},
                  {"readings", readings.empty() ? std::string(readings_header) : readings},
                  {"operator", c.visitor->who.actor.name}};
  if (!refusal.empty()) context[field_at_fault(refusal) + "_error"] = refusal;
  return context;
}

}  // namespace

WebResponse check_form(PageContext& c) {
  require_role(*c.visitor, "check record");
  return html_page("check_form", "Record a weekly check", form_context(c, ""), c.visitor);
}

WebResponse check_preview(PageContext& c) {
  require_role(*c.visitor, "check record");
  json out;
  try {
    app::CheckLookups lookups(c.db);
    const auto run = app::build_check_run(lookups, check_input(c));
    out = {{"field", ""}, {"message", ""}, {"html", render_template("check_preview", run_figures(run))}};
  } catch (const InputError& e) {
    out = {{"field", field_at_fault(e.what())}, {"message", e.what()}, {"html", ""}};
  }
  WebResponse r;
  r.content_type = "application/json";
  r.body = out.dump();
  return r;
}

WebResponse check_submit(PageContext& c) {
  require_role(*c.visitor, "check record");
  try {
    // Without JavaScript the "Preview" button posts the form here: the same computation, nothing written.
    if (c.request.param("intent") == "preview") {
      app::CheckLookups lookups(c.db);
      json context = form_context(c, "");
      context["preview_html"] =
          render_template("check_preview", run_figures(app::build_check_run(lookups, check_input(c))));
      return html_page("check_form", "Record a weekly check", context, c.visitor);
    }
    const auto run = app::record_check(c.db, c.visitor->who.actor, check_input(c));
    json context = run_figures(run);
    context["run_id"] = run.id;
    context["instrument"] = run.instrument_id;
    context["may_issue"] = may(*c.visitor, "certificate issue");
    return html_page("check_result", fmt::format("Check run {} recorded", run.id), context, c.visitor);
  } catch (const InputError& e) {
    return html_page("check_form", "Record a weekly check", form_context(c, e.what()), c.visitor, 400);
  }
}

}  // namespace plumb::web
