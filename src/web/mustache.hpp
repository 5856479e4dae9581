#pragma once
// A small Mustache renderer (the logic-less template syntax of mustache(5)) for the web pages: {{name}} is
// HTML-escaped, {{{name}}} and {{& name}} insert trusted HTML (renderings plumb made itself, never user text),
// {{#name}}...{{/name}} repeats over a list or shows when truthy, {{^name}}...{{/name}} shows when falsy or empty,
// {{> partial}} includes another template, {{! ...}} is a comment, {{.}} is the current item. Dotted names
// (a.b) look into objects. Names are looked up from the innermost context outwards.
#include <functional>
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>

namespace plumb::web {

/// The text of a partial by name; throws std::out_of_range for an unknown one.
using PartialLookup = std::function<std::string_view(std::string_view name)>;

/// Renders `text` with `context`. std::invalid_argument names the tag and its offset for an unclosed tag or
/// section, or a section closed by another name (a template is part of the program: such errors are bugs).
std::string render_mustache(std::string_view text, const nlohmann::json& context, const PartialLookup& partials);

/// The five characters that matter in HTML text and attribute values: & < > " '.
std::string escape_html(std::string_view text);

}  // namespace plumb::web
