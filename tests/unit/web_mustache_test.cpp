// The web pages' template renderer (src/web/mustache.cpp) against the behaviour mustache(5) specifies: escaping of
// {{name}}, raw {{{name}}} and {{& name}}, sections over lists and values, inverted sections, partials, comments,
// dotted names and the current item. Expected outputs are written out by hand from that specification.
#include <catch2/catch.hpp>

#include <stdexcept>

#include "web/mustache.hpp"

using nlohmann::json;
using plumb::web::escape_html;
using plumb::web::render_mustache;

namespace {

std::string_view no_partials(std::string_view name) {
  throw std::out_of_range(std::string(name));
}

std::string render(std::string_view text, const json& context) {
  return render_mustache(text, context, no_partials);
}

}  // namespace

TEST_CASE("web templates escape every value by default, and only a triple mustache inserts it as it is", "[web]") {
  const json c = {{"name", "<script>alert(\"x\")</script> & 'y'"}};
  CHECK(render("[{{name}}]", c) == "[&lt;script&gt;alert(&quot;x&quot;)&lt;/script&gt; &amp; &#39;y&#39;]");
  CHECK(render("[{{{name}}}]", c) == "[<script>alert(\"x\")</script> & 'y']");
  CHECK(render("[{{& name}}]", c) == "[<script>alert(\"x\")</script> & 'y']");
  CHECK(escape_html("a<b>\"c\"&'d'") == "a&lt;b&gt;&quot;c&quot;&amp;&#39;d&#39;");
  // A missing name renders as nothing; numbers and booleans as their JSON text.
  CHECK(render("[{{missing}}|{{n}}|{{t}}]", {{"n", 12}, {"t", true}}) == "[|12|true]");
}

TEST_CASE("web templates repeat a section over a list, show it for a true value and invert it", "[web]") {
  const json c = {{"rows", json::array({{{"id", "B-1"}}, {{"id", "B<2>"}}})},
                  {"empty", json::array()},
                  {"yes", true},
                  {"no", false},
                  {"label", "top"}};
  CHECK(render("{{#rows}}<{{id}}:{{label}}>{{/rows}}", c) == "<B-1:top><B&lt;2&gt;:top>");
  CHECK(render("{{#empty}}x{{/empty}}{{^empty}}none{{/empty}}", c) == "none");
  CHECK(render("{{#yes}}Y{{/yes}}{{#no}}N{{/no}}{{^no}}not{{/no}}", c) == "Ynot");
  CHECK(render("{{#rows}}{{#rows}}.{{/rows}}|{{/rows}}", c) == "..|..|");  // a nested section of the same name
  CHECK(render("{{#list}}[{{.}}]{{/list}}", {{"list", {"a", "<b>"}}}) == "[a][&lt;b&gt;]");
}

TEST_CASE("web templates read dotted names, list items by index, comments and partials", "[web]") {
  const json c = {{"who", {{"name", "Ada"}, {"roles", {"technician"}}}}, {"reasons", {"too high"}}};
  CHECK(render("{{who.name}} {{! never shown }}{{who.roles.0}} {{who.missing}}.", c) == "Ada technician .");
  CHECK(render("{{#reasons.0}}has{{/reasons.0}}{{#who.roles.3}}no{{/who.roles.3}}", c) == "has");
  const auto partials = [](std::string_view name) -> std::string_view {
    if (name == "row") return "<li>{{name}}</li>";
    throw std::out_of_range(std::string(name));
  };
  CHECK(render_mustache("<ul>{{#who}}{{> row}}{{/who}}</ul>", c, partials) == "<ul><li>Ada</li></ul>");
}

TEST_CASE("web templates with an unclosed tag or section are refused, naming it", "[web]") {
  CHECK_THROWS_WITH(render("{{#rows}}x", json::object()), Catch::Contains("{{#rows}} is never closed"));
  CHECK_THROWS_WITH(render("a {{name", json::object()), Catch::Contains("offset 2 is never closed"));
  CHECK_THROWS_WITH(render("{{/rows}}", json::object()), Catch::Contains("closes nothing"));
}
