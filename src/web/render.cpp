#include "web/render.hpp"

#include "web/assets.hpp"
#include "web/mustache.hpp"
#include "web/visitor.hpp"

namespace plumb::web {
namespace {

std::string_view template_text(std::string_view name) {
  return embedded_assets().at("templates/" + std::string(name) + ".html");
}

}  // namespace

std::string render_template(const std::string& name, const nlohmann::json& context) {
  return render_mustache(template_text(name), context, template_text);
}

WebResponse html_page(const std::string& name, const std::string& title, nlohmann::json context, const Visitor* visitor,
                      int status) {
  nlohmann::json layout = {{"title", title}};
  if (visitor) {
    layout["visitor"] = {{"name", visitor->who.actor.name}, {"login", visitor->who.login}, {"csrf", visitor->csrf}};
    layout["nav"] = navigation_of(*visitor);
    context["csrf"] = visitor->csrf;
  }
  layout["body"] = render_template(name, context);  // escaped by its own template: trusted HTML here
  WebResponse r;
  r.status = status;
  r.body = render_template("layout", layout);
  return r;
}

WebResponse message_page(int status, const std::string& title, const std::string& sentence, const Visitor* visitor) {
  return html_page("message", title, {{"title", title}, {"sentence", sentence}}, visitor, status);
}

WebResponse redirect_to(const std::string& location) {
  WebResponse r;
  r.status = 303;
  r.body = "";
  r.content_type = "text/plain; charset=utf-8";
  r.headers.emplace_back("Location", location);
  return r;
}

WebResponse static_file(const std::string& name) {
  const auto& all = embedded_assets();
  const auto it = all.find("static/" + name);
  WebResponse r;
  if (it == all.end()) {
    r.status = 404;
    r.content_type = "text/plain; charset=utf-8";
    r.body = "not found";
    return r;
  }
  r.body = std::string(it->second);
  r.content_type = name.ends_with(".css")  ? "text/css; charset=utf-8"
                   : name.ends_with(".js") ? "text/javascript; charset=utf-8"
                                           : "application/octet-stream";
  return r;
}

}  // namespace plumb::web
