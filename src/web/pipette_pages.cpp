// Recording a gravimetric pipette check in the browser: the form offers the pipettes in service and the balances the
// water may be weighed on, takes the conditions and the weighings exactly as `plumb check record --procedure
// gravimetric` does, and previews and records through the same app functions (app/pipette/record), so the volumes,
// errors, verdict and every refusal are the CLI's. Works with JavaScript off: the form's "Preview" button posts it and
// the page comes back with the server's preview.
#include <fmt/format.h>

#include "app/pipette/edition.hpp"
#include "app/pipette/record.hpp"
#include "app/status/due.hpp"
#include "core/dates.hpp"
#include "core/errors.hpp"
#include "report/runs/json.hpp"
#include "report/runs/text.hpp"
#include "store/pipettes.hpp"
#include "store/repository.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

/// The header line the weighings box starts with: the CSV that `check record --readings` reads for a pipette.
constexpr const char* weighings_header = "volume,channel,reading\n";

/// The form's optional conditions, by field name, and the `check record` option each stands for.
struct OptionalCondition {
  const char* field;
  const char* option;
};
constexpr OptionalCondition optional_conditions[] = {
    {"evaporation", "--evaporation"}, {"water_temp_u", "--water-temp-u"}, {"air_density_u", "--air-density-u"}};

/// Which field of the form a refusal is about, from the option or source its sentence names first.
std::string pipette_field_at_fault(const std::string& sentence, const PageContext& c) {
  for (const auto& o : optional_conditions)
    if (sentence.starts_with(o.option)) return o.field;
  if (sentence.starts_with("--water-temp")) return "water_temp";
  if (sentence.starts_with("--pressure")) return "pressure";
  if (sentence.starts_with("--humidity")) return "humidity";
  if (sentence.starts_with("--on")) return "on";
  if (sentence.starts_with("--unit")) return "unit";
  if (sentence.starts_with("--balance")) return "balance";
  if (sentence.starts_with("readings")) return "readings";
  if (sentence.starts_with("pipette")) return "pipette";
  // The service sentences name the instrument by its id.
  const std::string balance = c.request.param("balance"), pipette = c.request.param("pipette");
  if (!pipette.empty() && sentence.find(pipette) != std::string::npos) return "pipette";
  if (!balance.empty() && sentence.find(balance) != std::string::npos) return "balance";
  return "form";
}

app::PipetteCheckInput pipette_input(const PageContext& c) {
  app::PipetteCheckInput in;
  in.pipette_id = c.request.param("pipette");
  in.balance_id = c.request.param("balance");
  in.water_temperature = c.request.param("water_temp");
  in.pressure = c.request.param("pressure");
  in.humidity = c.request.param("humidity");
  const auto optional = [&](const char* field) -> std::optional<std::string> {
    const std::string v = c.request.param(field);
    if (v.empty()) return std::nullopt;
    return v;
  };
  in.evaporation = optional("evaporation");
  in.water_temperature_u = optional("water_temp_u");
  in.air_density_u = optional("air_density_u");
  in.readings_csv = c.request.param("readings");
  in.readings_source = "readings";
  in.default_unit = parse_mass_unit(c.request.param("unit").empty() ? "g" : c.request.param("unit"), "--unit");
  in.on = c.request.param("on").empty() ? to_string(today_local()) : c.request.param("on");
  in.operator_name = c.visitor->who.actor.name;
  return in;
}

/// Each test volume and channel with its mean volume, errors, limits and verdict, and the whole run's, as the
/// preview and the result page show them (the figures are those the run stores; only their printing is here).
json pipette_figures(const store::RunRecord& run) {
  const json r = report::run_json(run);
  json volumes = json::array();
  for (const auto& v : r.value("volumes", json::array())) {
    json channels = json::array();
    for (const auto& ch : v.value("channels", json::array())) {
      const json lim = ch.value("limits", json::object());
      channels.push_back({{"channel", ch.value("channel", 1)},
                          {"n", ch.value("n", 0)},
                          {"mean", fmt::format("{:.4f} µL", ch.value("mean_ul", 0.0))},
                          {"systematic", fmt::format("{:+.4f} µL ({:+.3f} %)", ch.value("systematic_error_ul", 0.0),
                                                     ch.value("systematic_error_pct", 0.0))},
                          {"systematic_limit", fmt::format("± {:.4g} µL", lim.value("systematic_ul", 0.0))},
                          {"random", fmt::format("{:.4f} µL (CV {:.3f} %)", ch.value("random_error_ul", 0.0),
                                                 ch.value("cv_pct", 0.0))},
                          {"random_limit", fmt::format("{:.4g} µL", lim.value("random_ul", 0.0))},
                          {"verdict", ch.value("verdict", "")},
                          {"reasons", ch.value("reasons", json::array())}});
    }
    volumes.push_back({{"selected", v.value("selected", "")}, {"channels", channels}});
  }
  const std::string verdict = r.value("verdict", "");
  std::string edition;
  if (r.contains("edition") && r["edition"].is_object()) edition = r["edition"].value("statement", "");
  return {{"volumes", volumes},
          {"verdict", verdict},
          {"instrument", run.instrument_id},
          {"edition", edition},
          {"reasons", r.value("reasons", json::array())},
          {"run_text", report::run_text(r)}};
}

/// The form's choices and what was typed, with the refusal (or the preview) beside it.
json pipette_form_context(PageContext& c, const std::string& refusal) {
  const Date today = today_local();
  const auto standings = app::standings_on(c.db, today, c.site.options.due_window_days);
  const auto standing_of = [&](const std::string& id) {
    const auto s = standings.find(app::standing_key("instrument", id));
    return s == standings.end() ? std::string("in date") : s->second.status;
  };
  const std::string pipette = c.request.param("pipette"), balance = c.request.param("balance");
  json pipettes = json::array(), balances = json::array();
  std::string requirements;
  // A pipette in service takes its check whatever its due date; out of service or retired it is not offered (and
  // app/pipette refuses it with its own sentence if sent anyway).
  for (const auto& p : store::list_pipettes(c.db.sql())) {
    const auto st = standing_of(p.id());
    if (st == "retired" || st == "out of service") continue;
    const auto edition = app::pipette_edition(c.db, p.id());
    pipettes.push_back({{"id", p.id()},
                        {"nominal", p.definition.nominal.to_string()},
                        {"channels", p.definition.channels},
                        {"edition", std::string(checks::key(edition))},
                        {"standing", st},
                        {"selected", p.id() == pipette}});
    if (p.id() == pipette) requirements = checks::edition_statement(edition, p.definition);
  }
  for (const auto& b : store::list_balances(c.db.sql()))
    if (const auto st = standing_of(b.id); st != "retired")
      balances.push_back(
          {{"id", b.id}, {"readability", b.readability.to_string()}, {"standing", st}, {"selected", b.id == balance}});
  const std::string readings = c.request.param("readings");
  json context = {{"pipettes", pipettes},
                  {"balances", balances},
                  {"requirements", requirements},
                  {"on", c.request.param("on").empty() ? to_string(today) : c.request.param("on")},
                  {"water_temp", c.request.param("water_temp")},
                  {"pressure", c.request.param("pressure")},
                  {"humidity", c.request.param("humidity")},
                  {"evaporation", c.request.param("evaporation")},
                  {"water_temp_u", c.request.param("water_temp_u")},
                  {"air_density_u", c.request.param("air_density_u")},
                  {"readings", readings.empty() ? std::string(weighings_header) : readings},
                  {"operator", c.visitor->who.actor.name}};
  if (!refusal.empty()) context[pipette_field_at_fault(refusal, c) + "_error"] = refusal;
  return context;
}

WebResponse pipette_form_page(PageContext& c, const std::string& refusal, const json& preview, int status) {
  json context = pipette_form_context(c, refusal);
  if (!preview.is_null()) context["preview_html"] = render_template("pipette_preview", preview);
  return html_page("pipette_form", "Record a pipette check", context, c.visitor, status);
}

}  // namespace

WebResponse pipette_check_form(PageContext& c) {
  require_role(*c.visitor, "check record");
  return pipette_form_page(c, "", json(), 200);
}

WebResponse pipette_check_preview(PageContext& c) {
  require_role(*c.visitor, "check record");
  json out;
  try {
    const auto draft = app::build_pipette_run(c.db, pipette_input(c));
    out = {{"field", ""}, {"message", ""}, {"html", render_template("pipette_preview", pipette_figures(draft.run))}};
  } catch (const InputError& e) {
    out = {{"field", pipette_field_at_fault(e.what(), c)}, {"message", e.what()}, {"html", ""}};
  }
  WebResponse r;
  r.content_type = "application/json";
  r.body = out.dump();
  return r;
}

WebResponse pipette_check_submit(PageContext& c) {
  require_role(*c.visitor, "check record");
  try {
    // Without JavaScript the "Preview" button posts the form here: the same computation, nothing written.
    if (c.request.param("intent") == "preview")
      return pipette_form_page(c, "", pipette_figures(app::build_pipette_run(c.db, pipette_input(c)).run), 200);
    const auto run = app::record_pipette_check(c.db, c.visitor->who.actor, pipette_input(c));
    json context = pipette_figures(run);
    context["run_id"] = run.id;
    context["may_issue"] = may(*c.visitor, "certificate issue");
    return html_page("pipette_result", fmt::format("Check run {} recorded", run.id), context, c.visitor);
  } catch (const InputError& e) {
    return pipette_form_page(c, e.what(), json(), 400);
  }
}

}  // namespace plumb::web
