#pragma once
// The templates and static files of the web application, compiled into the binary (cmake/embed_web.cmake) from
// src/web/templates/ and src/web/static/.
#include <map>
#include <string_view>

namespace plumb::web {

/// "templates/overview.html" or "static/plumb.css" -> its text.
const std::map<std::string_view, std::string_view>& embedded_assets();

}  // namespace plumb::web
