// Certificates in the browser: the approval queue and the list, one certificate with its standing and its
// renderings (the report/ HTML document, PDF, JSON, DCC), issuing one for a run, and approving one as an
// electronic signature with the password entered again and a stated meaning (app/certificates, app/people).
#include <fmt/format.h>

#include "app/certificates/dcc_export.hpp"
#include "app/certificates/issue.hpp"
#include "app/certificates/list.hpp"
#include "app/certificates/resolve.hpp"
#include "app/certificates/review.hpp"
#include "app/people/authenticate.hpp"
#include "app/runs/void_run.hpp"
#include "core/dates.hpp"
#include "core/errors.hpp"
#include "report/certificates/document.hpp"
#include "report/certificates/renderings.hpp"
#include "report/document/pdf.hpp"
#include "web/pages.hpp"
#include "web/render.hpp"
#include "web/signature.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

using nlohmann::json;

json certificate_row(const report::CertificateListItem& i) {
  return {{"number", i.number},
          {"run_id", i.run_id},
          {"instrument", i.instrument},
          {"procedure", i.procedure},
          {"check_date", to_string(i.check_date)},
          {"operator", i.operator_name},
          {"issued_at", i.issued_at},
          {"state", i.state},
          {"approved_by", i.approved_by.value_or("")},
          {"waiting_days", i.waiting_days ? json(*i.waiting_days) : json("")}};
}

/// The certificate page with a form's refusal beside its field.
WebResponse certificate_view(PageContext& c, const std::string& number, json refusal, int status) {
  const auto cert = app::resolve_certificate(c.db, number);
  const json standing = app::certificate_status(c.db, cert);
  const std::string state = standing.value("state", "draft");
  json context = {
      {"number", cert.number},
      {"run_id", cert.run_id},
      {"kind", cert.kind},
      {"issued_at", cert.issued_at},
      {"issued_by", cert.issued_by},
      {"sha256", cert.content_sha256},
      {"state", state},
      {"approval", standing["approval"]},
      {"withdrawn", standing["withdrawn"]},
      {"may_approve", state == "draft" && may(*c.visitor, "certificate approve")},
      {"may_void", (state == "draft" || state == "approved") && may(*c.visitor, "check void")},
      {"void_reason", c.request.param("reason")},
      {"meaning", c.request.param("meaning").empty() ? "reviewed and approved" : c.request.param("meaning")}};
  for (auto& [key, value] : refusal.items()) context[key] = value;
  return html_page("certificate", "Certificate " + cert.number, context, c.visitor, status);
}

}  // namespace

WebResponse certificates_page(PageContext& c) {
  const auto queue = app::approval_queue(c.db, std::nullopt, std::nullopt);
  json waiting = json::array();
  for (const auto& i : queue.items) waiting.push_back(certificate_row(i));
  app::CertificateFilter filter;
  if (!c.request.param("state").empty()) filter.state = c.request.param("state");
  const auto found = app::list_certificates(c.db, filter);
  json all = json::array();
  for (auto it = found.items.rbegin(); it != found.items.rend(); ++it) all.push_back(certificate_row(*it));
  json states = json::array();
  for (const char* s : {"draft", "approved", "superseded", "withdrawn"})
    states.push_back({{"value", s}, {"selected", c.request.param("state") == s}});
  return html_page("certificates", "Certificates",
                   {{"waiting", waiting},
                    {"has_waiting", !waiting.empty()},
                    {"all", all},
                    {"count", all.size()},
                    {"states", states},
                    {"on", to_string(queue.on)}},
                   c.visitor);
}

WebResponse certificate_item_page(PageContext& c) {
  return certificate_view(c, c.request.path_parts.at(0), json::object(), 200);
}

WebResponse certificate_document_page(PageContext& c) {
  const auto cert = app::resolve_certificate(c.db, c.request.path_parts.at(0));
  WebResponse r;
  r.body = report::certificate_html(app::certificate_document(c.db, cert));
  // The document is the self-contained HTML rendering (its style inline): it may style itself, and nothing in
  // it may run or fetch anything; the certificate page shows it in a frame of this site only.
  r.csp = "default-src 'none'; style-src 'unsafe-inline'; img-src data:; frame-ancestors 'self'";
  return r;
}

WebResponse certificate_download(PageContext& c) {
  const std::string number = c.request.path_parts.at(0), format = c.request.path_parts.at(1);
  const auto cert = app::resolve_certificate(c.db, number);
  WebResponse r;
  if (format == "pdf") {
    r.body = report::render_pdf(report::certificate_document(app::certificate_document(c.db, cert))).bytes;
    r.content_type = "application/pdf";
  } else if (format == "json") {
    r.body = report::certificate_json(app::certificate_document(c.db, cert)).dump(2) + "\n";
    r.content_type = "application/json";
  } else {
    r.body = app::certificate_dcc(c.db, cert.number, {c.request.param("country"), c.site.options.software_release});
    r.content_type = "application/xml";
  }
  const std::string extension = format == "dcc" ? "dcc.xml" : format;
  r.headers.emplace_back("Content-Disposition", fmt::format("attachment; filename=\"{}.{}\"", cert.number, extension));
  return r;
}

WebResponse certificate_issue_submit(PageContext& c) {
  require_role(*c.visitor, "certificate issue");
  const auto issued = app::issue_certificate(c.db, c.visitor->who.actor, c.request.param("run"), std::nullopt);
  return redirect_to("/certificates/" + issued.certificate.number);
}

WebResponse certificate_approve_submit(PageContext& c) {
  require_role(*c.visitor, "certificate approve");
  const std::string number = c.request.path_parts.at(0);
  try {
    // A signature: the password is entered for this very approval.
    const auto signer = signer_of(c, "certificate approve");
    const auto approved = app::approve_certificate(c.db, signer.actor, number, c.request.param("meaning"));
    return redirect_to("/certificates/" + approved.number);
  } catch (const AccessError& e) {
    return certificate_view(c, number, {{"password_error", e.what()}}, 403);
  } catch (const InputError& e) {
    const std::string sentence = e.what();
    const bool about_meaning = sentence.find("meaning") != std::string::npos;
    return certificate_view(c, number, {{about_meaning ? "meaning_error" : "approve_error", sentence}}, 400);
  }
}

WebResponse certificate_void_submit(PageContext& c) {
  require_role(*c.visitor, "check void");
  const std::string number = c.request.path_parts.at(0);
  try {
    const auto cert = app::resolve_certificate(c.db, number);
    const auto signer = signer_of(c, "check void");
    app::void_run(c.db, signer.actor, std::to_string(cert.run_id), c.request.param("reason"));
    return redirect_to("/certificates/" + cert.number);
  } catch (const AccessError& e) {
    return certificate_view(c, number, {{"void_password_error", e.what()}}, 403);
  } catch (const InputError& e) {
    return certificate_view(c, number, {{"reason_error", e.what()}}, 400);
  }
}

}  // namespace plumb::web
