#pragma once
// The pages of the web application, each a function from the request (with its database and visitor) to a
// response. routes.cpp says which path reaches which.
#include "store/database.hpp"
#include "web/page.hpp"
#include "web/security.hpp"

namespace plumb::web {

struct PageContext {
  const Site& site;
  store::Database& db;
  const WebRequest& request;
  const Visitor* visitor;  ///< null on the pages open to everyone (log-in, password change, static files)
  LoginLimiter& limiter;
  std::string notice;  ///< why the session cookie did not log in (it ended after the idle time)
};

// auth_pages.cpp
WebResponse login_form(PageContext& c);
WebResponse login_submit(PageContext& c);
WebResponse logout_submit(PageContext& c);
WebResponse password_submit(PageContext& c);

// lab_pages.cpp
WebResponse overview_page(PageContext& c);
WebResponse instruments_page(PageContext& c);
WebResponse instrument_item_page(PageContext& c);
WebResponse instrument_chart(PageContext& c);
WebResponse weights_page(PageContext& c);
WebResponse audit_page(PageContext& c);
WebResponse verification_page(PageContext& c);

// check_pages.cpp
WebResponse check_form(PageContext& c);
WebResponse check_preview(PageContext& c);
WebResponse check_submit(PageContext& c);

// pipette_pages.cpp
WebResponse pipette_check_form(PageContext& c);
WebResponse pipette_check_preview(PageContext& c);
WebResponse pipette_check_submit(PageContext& c);

// calibration_pages.cpp
WebResponse calibration_form(PageContext& c);
WebResponse calibration_submit(PageContext& c);

// run_pages.cpp
WebResponse run_page(PageContext& c);
WebResponse run_void_submit(PageContext& c);
WebResponse run_correct_submit(PageContext& c);

// user_pages.cpp
WebResponse users_page(PageContext& c);
WebResponse user_add_submit(PageContext& c);
WebResponse user_change_submit(PageContext& c);

// certificate_pages.cpp
WebResponse certificates_page(PageContext& c);
WebResponse certificate_item_page(PageContext& c);
WebResponse certificate_document_page(PageContext& c);
WebResponse certificate_download(PageContext& c);
WebResponse certificate_issue_submit(PageContext& c);
WebResponse certificate_approve_submit(PageContext& c);
WebResponse certificate_void_submit(PageContext& c);

}  // namespace plumb::web
