#include "web/mustache.hpp"

#include <fmt/format.h>

#include <stdexcept>
#include <vector>

namespace plumb::web {
namespace {

using nlohmann::json;

struct MustacheRenderer {
  const PartialLookup& partials;
  std::vector<const json*> stack;
  int depth = 0;

  /// The value of `name` in the innermost context that has it; nullptr when none does.
  [[nodiscard]] const json* lookup(std::string_view name) const {
    if (name == ".") return stack.back();
    const auto dot = name.find('.');
    const std::string head(name.substr(0, dot));
    for (auto it = stack.rbegin(); it != stack.rend(); ++it) {
      const json& ctx = **it;
      if (!ctx.is_object()) continue;
      const auto found = ctx.find(head);
      if (found == ctx.end()) continue;
      const json* value = &*found;
      std::string_view rest = dot == std::string_view::npos ? std::string_view{} : name.substr(dot + 1);
      while (!rest.empty()) {
        const auto next = rest.find('.');
        const std::string part(rest.substr(0, next));
        if (value->is_array() && !part.empty() && part.find_first_not_of("0123456789") == std::string::npos) {
          const auto index = std::stoul(part);
          if (index >= value->size()) return nullptr;
          value = &(*value)[index];
        } else if (value->is_object() && value->contains(part)) {
          value = &(*value)[part];
        } else {
          return nullptr;
        }
        rest = next == std::string_view::npos ? std::string_view{} : rest.substr(next + 1);
      }
      return value;
    }
    return nullptr;
  }

  static bool truthy(const json* v) {
    if (!v || v->is_null()) return false;
    if (v->is_boolean()) return v->get<bool>();
    if (v->is_array()) return !v->empty();
    if (v->is_string()) return !v->get_ref<const std::string&>().empty();
    return true;
  }

  static std::string as_text(const json* v) {
    if (!v || v->is_null()) return "";
    if (v->is_string()) return v->get<std::string>();
    if (v->is_boolean()) return v->get<bool>() ? "true" : "false";
    return v->dump();
  }

  static std::string_view trim(std::string_view s) {
    while (!s.empty() && s.front() == ' ') s.remove_prefix(1);
    while (!s.empty() && s.back() == ' ') s.remove_suffix(1);
    return s;
  }

  /// Where the section `name` opened before `from` closes: the offset of its {{/name}} tag, nested sections of the
  /// same name counted.
  static std::size_t closing_tag(std::string_view text, std::size_t from, std::string_view name) {
    int open = 1;
    std::size_t at = from;
    while (true) {
      const auto start = text.find("{{", at);
      if (start == std::string_view::npos)
        throw std::invalid_argument(fmt::format("template: section {{{{#{}}}}} is never closed", name));
      const auto end = text.find("}}", start + 2);
      if (end == std::string_view::npos)
        throw std::invalid_argument(fmt::format("template: tag at offset {} is never closed", start));
      const std::string_view tag = text.substr(start + 2, end - start - 2);
      if (!tag.empty() && (tag[0] == '#' || tag[0] == '^') && trim(tag.substr(1)) == name) ++open;
      if (!tag.empty() && tag[0] == '/' && trim(tag.substr(1)) == name && --open == 0) return start;
      at = end + 2;
    }
  }

  void render(std::string_view text, std::string& out) {
    if (++depth > 32) throw std::invalid_argument("template: partials nested more than 32 deep");
    std::size_t at = 0;
    while (at < text.size()) {
      const auto start = text.find("{{", at);
      if (start == std::string_view::npos) {
        out.append(text.substr(at));
        break;
      }
      out.append(text.substr(at, start - at));
      const bool triple = text.substr(start, 3) == "{{{";
      const auto end = text.find(triple ? "}}}" : "}}", start + (triple ? 3 : 2));
      if (end == std::string_view::npos)
        throw std::invalid_argument(fmt::format("template: tag at offset {} is never closed", start));
      std::string_view tag = text.substr(start + (triple ? 3 : 2), end - start - (triple ? 3 : 2));
      at = end + (triple ? 3 : 2);
      if (triple) {
        out += as_text(lookup(trim(tag)));
        continue;
      }
      if (tag.empty()) throw std::invalid_argument(fmt::format("template: empty tag at offset {}", start));
      const char kind = tag[0];
      const std::string_view name = trim(tag.substr(1));
      switch (kind) {
        case '!':
          break;
        case '&':
          out += as_text(lookup(name));
          break;
        case '>':
          render(partials(name), out);
          break;
        case '/':
          throw std::invalid_argument(fmt::format("template: {{{{/{}}}}} at offset {} closes nothing", name, start));
        case '#':
        case '^': {
          const auto close = closing_tag(text, at, name);
          const std::string_view inner = text.substr(at, close - at);
          at = text.find("}}", close) + 2;
          const json* value = lookup(name);
          if (kind == '^') {
            if (!truthy(value)) render(inner, out);
          } else if (value && value->is_array()) {
            for (const auto& item : *value) {
              stack.push_back(&item);
              render(inner, out);
              stack.pop_back();
            }
          } else if (truthy(value)) {
            stack.push_back(value);
            render(inner, out);
            stack.pop_back();
          }
          break;
        }
        default:
          out += escape_html(as_text(lookup(trim(tag))));
      }
    }
    --depth;
  }
};

}  // namespace

std::string escape_html(std::string_view text) {
  std::string out;
  out.reserve(text.size());
  for (const char c : text) {
    switch (c) {
      case '&':
        out += "&amp;";
        break;
      case '<':
        out += "&lt;";
        break;
      case '>':
        out += "&gt;";
        break;
      case '"':
        out += "&quot;";
        break;
      case '\'':
        out += "&#39;";
        break;
      default:
        out += c;
    }
  }
  return out;
}

std::string render_mustache(std::string_view text, const nlohmann::json& context, const PartialLookup& partials) {
  MustacheRenderer r{partials, {&context}};
  std::string out;
  r.render(text, out);
  return out;
}

}  // namespace plumb::web
