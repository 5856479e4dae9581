#pragma once
// Pages from the templates in src/web/templates/: each page's template is rendered into the layout (header,
// navigation, the visitor's name, the log-out form).
#include <nlohmann/json.hpp>
#include <string>

#include "web/page.hpp"

namespace plumb::web {

/// templates/<name>.html rendered with `context` (partials are other templates by name).
std::string render_template(const std::string& name, const nlohmann::json& context);

/// A whole page: templates/<name>.html inside the layout. `visitor` null: the page of someone not logged in.
WebResponse html_page(const std::string& name, const std::string& title, nlohmann::json context, const Visitor* visitor,
                      int status = 200);

/// The page that says why a request was refused or failed, in one sentence.
WebResponse message_page(int status, const std::string& title, const std::string& sentence, const Visitor* visitor);

/// 303 See Other to `location` (after a form, and to the log-in page).
WebResponse redirect_to(const std::string& location);

/// A static file (static/<name>), or 404.
WebResponse static_file(const std::string& name);

}  // namespace plumb::web
