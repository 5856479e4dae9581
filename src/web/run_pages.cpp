// One check run in the browser: its record as `plumb check show` prints it, its standing (counts, corrected, void),
// and for a reviewer the two ways of mending it that the CLI has: a correction (a new run supersedes it; what is not
// given is taken from the original) and a void (entered in error). Both need the reason and are electronic
// signatures (the table of permissions marks `check correct` and `check void` so): the password is entered again.
// They call the CLI's app functions (app/runs/correct, app/runs/void_run), so every refusal is the CLI's sentence.
#include <fmt/format.h>

#include <algorithm>

#include "app/runs/correct.hpp"
#include "app/runs/resolve.hpp"
#include "app/runs/void_run.hpp"
#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "report/runs/json.hpp"
#include "report/runs/text.hpp"
#include "store/repository.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/signature.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

/// The form field of a `check record` option on the correction form ("water-temp" -> "correct-water-temp").
std::string correction_field(std::string_view option) {
  return "correct-" + std::string(option);
}

/// Which field of the correction form a refusal is about: the option its sentence names first, else the readings
/// (their source is "readings"), the reason or the date.
std::string correction_field_at_fault(const std::string& sentence, const store::RunRecord& run) {
  std::string best;
  for (const std::string_view option : checks::spec(run.procedure).options) {
    const std::string flag = "--" + std::string(option);
    // The longest option the sentence starts with: --water-temp-u, not --water-temp.
    if (sentence.starts_with(flag) && (sentence.size() == flag.size() || sentence[flag.size()] == ' ' ||
                                       sentence[flag.size()] == ':' || sentence[flag.size()] == '"'))
      if (option.size() > best.size()) best = std::string(option);
  }
  if (!best.empty()) return correction_field(best);
  if (sentence.starts_with("readings")) return "correct-readings";
  if (sentence.starts_with("--on")) return "correct-on";
  if (sentence.find("reason") != std::string::npos) return "correct-reason";
  return "correct-form";
}

std::int64_t run_id_of(PageContext& c) {
  return app::resolve_run(c.db, c.request.path_parts.at(0));
}

/// The run page, with a form's refusal beside its field (`refusal`: field -> sentence).
WebResponse run_view(PageContext& c, std::int64_t id, const json& refusal, int status) {
  const auto run = store::find_run(c.db.sql(), id);
  if (!run) throw InputError(fmt::format("run {} is not registered.", id));
  const json r = report::run_json(*run);
  const auto& spec = checks::spec(run->procedure);
  const auto cert = store::certificate_for_run(c.db.sql(), id);
  const std::string standing = run->voided          ? "void"
                               : run->superseded_by ? fmt::format("corrected by run {}", *run->superseded_by)
                                                    : "counts";
  // One input per option the run's procedure takes, empty meaning "as recorded".
  json options = json::array();
  for (const std::string_view option : spec.options) {
    const std::string field = correction_field(option);
    options.push_back({{"name", field},
                       {"option", std::string(option)},
                       {"value", c.request.param(field)},
                       {"error", refusal.value(field, "")}});
  }
  json context = {{"run_id", run->id},
                  {"instrument", run->instrument_id},
                  {"procedure", std::string(checks::to_string(run->procedure))},
                  {"performed_on", to_string(run->performed_on)},
                  {"operator", run->operator_name},
                  {"verdict", r.value("verdict", "")},
                  {"standing", standing},
                  {"current", run->current()},
                  {"voided", run->voided ? json{{"reason", run->voided->reason},
                                                {"by", run->voided->by_name},
                                                {"at", run->voided->recorded_at}}
                                         : json()},
                  {"supersedes", run->supersedes ? json(*run->supersedes) : json()},
                  {"superseded_by", run->superseded_by ? json(*run->superseded_by) : json()},
                  {"correction_reason", run->supersedes ? json(run->reason) : json()},
                  {"certificate", cert ? json(cert->number) : json()},
                  {"run_text", report::run_text(r)},
                  {"may_void", run->current() && may(*c.visitor, "check void")},
                  {"may_correct", run->current() && spec.correctable && may(*c.visitor, "check correct")},
                  {"options", options},
                  {"void_reason", c.request.param("void-reason")},
                  {"correct_reason", c.request.param("correct-reason")},
                  {"correct_readings", c.request.param("correct-readings")},
                  {"correct_on", c.request.param("correct-on")}};
  // "correct-reason" -> {{correct_reason_error}} in the template.
  for (const auto& [key, value] : refusal.items()) {
    std::string name = key;
    std::replace(name.begin(), name.end(), '-', '_');
    context[name + "_error"] = value;
  }
  return html_page("run", fmt::format("Check run {}", run->id), context, c.visitor, status);
}

}  // namespace

WebResponse run_page(PageContext& c) {
  return run_view(c, run_id_of(c), json::object(), 200);
}

WebResponse run_void_submit(PageContext& c) {
  require_role(*c.visitor, "check void");
  const std::int64_t id = run_id_of(c);
  try {
    const auto signer = signer_of(c, "check void");
    app::void_run(c.db, signer.actor, std::to_string(id), c.request.param("void-reason"));
    return redirect_to(fmt::format("/runs/{}", id));
  } catch (const AccessError& e) {
    return run_view(c, id, {{"void-password", e.what()}}, 403);
  } catch (const InputError& e) {
    return run_view(c, id, {{"void-reason", e.what()}}, 400);
  }
}

WebResponse run_correct_submit(PageContext& c) {
  require_role(*c.visitor, "check correct");
  const std::int64_t id = run_id_of(c);
  const auto run = store::find_run(c.db.sql(), id);
  if (!run) throw InputError(fmt::format("run {} is not registered.", id));
  try {
    app::CorrectionInput in;
    in.run = std::to_string(id);
    in.reason = c.request.param("correct-reason");
    if (!c.request.param("correct-readings").empty()) {
      in.readings_csv = c.request.param("correct-readings");
      in.readings_source = "readings";
    }
    if (!c.request.param("correct-on").empty()) in.on = c.request.param("correct-on");
    for (const std::string_view option : checks::spec(run->procedure).options) {
      const std::string value = c.request.param(correction_field(option));
      if (value.empty()) continue;
      if (option == "weight")
        in.weight_ids = std::vector<std::string>{value};
      else
        in.conditions[std::string(option)] = value;
    }
    const auto signer = signer_of(c, "check correct");
    const auto out = app::correct_check(c.db, signer.actor, in);
    return redirect_to(fmt::format("/runs/{}", out.correction.id));
  } catch (const AccessError& e) {
    return run_view(c, id, {{"correct-password", e.what()}}, 403);
  } catch (const InputError& e) {
    return run_view(c, id, {{correction_field_at_fault(e.what(), *run), e.what()}}, 400);
  }
}

}  // namespace plumb::web
