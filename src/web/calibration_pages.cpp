// Recording a balance calibration in the browser: the calibration run file (app/calibration/run_file.hpp, the file
// `plumb check record --procedure calibration --readings` takes) is uploaded with the run's conditions, and its bytes
// go to the same app function as the CLI's (app::record_calibration): every refusal is the CLI's sentence, shown beside
// its field, and nothing is written. The server's body limit (--body-limit) bounds the file.
#include <fmt/format.h>

#include <regex>

#include "app/calibration/record.hpp"
#include "app/calibration/run_file.hpp"
#include "app/status/due.hpp"
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

/// The form's condition fields and the `check record` options they stand for (the longer names first: a sentence
/// about --temperature-u also starts with --temperature).
struct CalibrationField {
  const char* field;
  const char* option;
};
constexpr CalibrationField calibration_fields[] = {{"temperature_u", "--temperature-u"},
                                                   {"pressure_u", "--pressure-u"},
                                                   {"humidity_u", "--humidity-u"},
                                                   {"temperature", "--temperature"},
                                                   {"pressure", "--pressure"},
                                                   {"humidity", "--humidity"},
                                                   {"air_formula", "--air-formula"},
                                                   {"model", "--model"},
                                                   {"on", "--on"},
                                                   {"unit", "--unit"}};

/// The name the run file's lines are named by in a refusal: the uploaded file's own name when it is a plain one,
/// else "run file" (a name is the browser's to send and is never trusted as more than a label).
std::string run_file_label(const PageContext& c) {
  static const std::regex plain(R"([A-Za-z0-9][A-Za-z0-9._ -]{0,79})");
  const auto f = c.request.files.find("run_file");
  if (f != c.request.files.end() && std::regex_match(f->second.filename, plain)) return f->second.filename;
  return "run file";
}

std::string calibration_field_at_fault(const std::string& sentence, const PageContext& c) {
  for (const auto& f : calibration_fields)
    if (sentence.starts_with(f.option)) return f.field;
  if (sentence.starts_with(run_file_label(c))) return "run_file";
  if (sentence.starts_with("balance")) return "balance";
  return "form";
}

std::optional<std::string> optional_param(const PageContext& c, const char* name) {
  const std::string v = c.request.param(name);
  if (v.empty()) return std::nullopt;
  return v;
}

app::CalibrationRunInput calibration_input(const PageContext& c) {
  app::CalibrationRunInput in;
  in.instrument_id = c.request.param("balance");
  const auto file = c.request.files.find("run_file");
  in.readings_source = run_file_label(c);
  if (file == c.request.files.end())
    throw InputError(fmt::format("run file: choose the calibration run file to upload (a CSV with the header {}).",
                                 app::calibration_csv_header));
  in.readings_csv = file->second.content;
  in.default_unit = parse_mass_unit(c.request.param("unit").empty() ? "g" : c.request.param("unit"), "--unit");
  in.on = c.request.param("on").empty() ? to_string(today_local()) : c.request.param("on");
  in.temperature_c = optional_param(c, "temperature");
  in.pressure_hpa = optional_param(c, "pressure");
  in.humidity_pct = optional_param(c, "humidity");
  in.temperature_u = optional_param(c, "temperature_u");
  in.pressure_u = optional_param(c, "pressure_u");
  in.humidity_u = optional_param(c, "humidity_u");
  if (!c.request.param("air_formula").empty()) in.air_formula = c.request.param("air_formula");
  if (!c.request.param("model").empty()) in.model = c.request.param("model");
  in.operator_name = c.visitor->who.actor.name;
  return in;
}

json choices(const std::vector<const char*>& values, const std::string& chosen) {
  json out = json::array();
  for (const char* v : values) out.push_back({{"value", v}, {"selected", chosen == v}});
  return out;
}

WebResponse calibration_form_page(PageContext& c, const std::string& refusal, int status) {
  const Date today = today_local();
  const auto standings = app::standings_on(c.db, today, c.site.options.due_window_days);
  json balances = json::array();
  const std::string balance = c.request.param("balance");
  for (const auto& b : store::list_balances(c.db.sql())) {
    const auto s = standings.find(app::standing_key("instrument", b.id));
    const std::string st = s == standings.end() ? std::string("in date") : s->second.status;
    if (st != "retired") balances.push_back({{"id", b.id}, {"standing", st}, {"selected", b.id == balance}});
  }
  json context = {{"balances", balances},
                  {"header", app::calibration_csv_header},
                  {"on", c.request.param("on").empty() ? to_string(today) : c.request.param("on")},
                  {"air_formulas", choices({"cipm2007", "oiml-r111"}, c.request.param("air_formula"))},
                  {"models", choices({"line", "through-origin", "quadratic"}, c.request.param("model"))},
                  {"operator", c.visitor->who.actor.name}};
  for (const auto& f : calibration_fields)
    if (!context.contains(f.field)) context[f.field] = c.request.param(f.field);
  if (!refusal.empty()) context[calibration_field_at_fault(refusal, c) + "_error"] = refusal;
  return html_page("calibration_form", "Record a balance calibration", context, c.visitor, status);
}

}  // namespace

WebResponse calibration_form(PageContext& c) {
  require_role(*c.visitor, "check record");
  return calibration_form_page(c, "", 200);
}

WebResponse calibration_submit(PageContext& c) {
  require_role(*c.visitor, "check record");
  try {
    const auto run = app::record_calibration(c.db, c.visitor->who.actor, calibration_input(c));
    const json r = report::run_json(run);
    return html_page("calibration_result", fmt::format("Check run {} recorded", run.id),
                     {{"run_id", run.id},
                      {"instrument", run.instrument_id},
                      {"verdict", r.value("verdict", "")},
                      {"next_due", r.value("next_due", json("")).is_string() ? r.value("next_due", "") : ""},
                      {"run_text", report::run_text(r)},
                      {"may_issue", may(*c.visitor, "certificate issue")}},
                     c.visitor);
  } catch (const InputError& e) {
    return calibration_form_page(c, e.what(), 400);
  }
}

}  // namespace plumb::web
