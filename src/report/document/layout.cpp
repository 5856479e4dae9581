#include "report/document/layout.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <cstdlib>
#include <fstream>
#include <sstream>

#include "core/errors.hpp"
#include "core/text_field.hpp"
#include "store/embedded.hpp"

namespace plumb::report {
namespace {

using nlohmann::json;

void require_text(const json& value, std::string_view file, const std::string& field) {
  if (!value.is_string())
    throw InputError(fmt::format("layout file \"{}\" field {}: must be a text (a JSON string), not {}.", file, field,
                                 value.type_name()));
  check_text_field(value.get<std::string>(), fmt::format("layout file \"{}\" field {}:", file, field));
}

void require_text_list(const json& value, std::string_view file, const std::string& field) {
  if (!value.is_array())
    throw InputError(fmt::format("layout file \"{}\" field {}: must be a list of texts (a JSON array), not {}.", file,
                                 field, value.type_name()));
  for (std::size_t i = 0; i < value.size(); ++i) require_text(value[i], file, fmt::format("{}[{}]", field, i));
}

void require_png(const json& value, std::string_view file) {
  require_text(value, file, "logo_png");
  const auto path = value.get<std::string>();
  if (path.empty()) return;
  std::ifstream in(path, std::ios::binary);
  char signature[8] = {};
  // The eight bytes every PNG file starts with (PNG specification, 5.2).
  constexpr char png_signature[8] = {'\x89', 'P', 'N', 'G', '\r', '\n', '\x1a', '\n'};
  if (!in || !in.read(signature, 8) || !std::equal(signature, signature + 8, png_signature))
    throw InputError(fmt::format("layout file \"{}\" field logo_png: \"{}\" is not a readable PNG image.", file,
                                 shown_on_one_line(path)));
}

}  // namespace

void validate_layout(const json& layout, std::string_view file) {
  if (!layout.is_object()) throw InputError(fmt::format("layout file \"{}\" must hold a JSON object.", file));
  for (const auto& [key, value] : layout.items()) {
    if (key == "comment" || key == "accreditation" || key == "caution" || key == "customer") {
      require_text(value, file, key);
    } else if (key == "address_lines") {
      require_text_list(value, file, key);
    } else if (key == "logo_png") {
      require_png(value, file);
    } else if (key == "signatories") {
      if (!value.is_array())
        throw InputError(
            fmt::format("layout file \"{}\" field signatories: must be a list of {{\"role\", \"name\"}} "
                        "objects, not {}.",
                        file, value.type_name()));
      for (std::size_t i = 0; i < value.size(); ++i) {
        const std::string where = fmt::format("signatories[{}]", i);
        if (!value[i].is_object())
          throw InputError(
              fmt::format("layout file \"{}\" field {}: must be an object with \"role\" and \"name\".", file, where));
        for (const auto& [k, v] : value[i].items()) {
          if (k != "role" && k != "name")
            throw InputError(
                fmt::format("layout file \"{}\" field {}.{}: is not known (a signatory has role and "
                            "name).",
                            file, where, shown_on_one_line(k)));
          require_text(v, file, fmt::format("{}.{}", where, k));
        }
        if (!value[i].contains("role"))
          throw InputError(fmt::format("layout file \"{}\" field {}: has no \"role\".", file, where));
      }
    } else {
      throw InputError(
          fmt::format("layout file \"{}\" field {}: is not known (a layout has comment, address_lines, customer, "
                      "accreditation, logo_png, signatories and caution).",
                      file, shown_on_one_line(key)));
    }
  }
}

nlohmann::json load_layout(const std::optional<std::string>& path) {
  nlohmann::json layout = nlohmann::json::parse(embedded::default_layout());
  std::optional<std::string> file = path;
  if (!file) {
    if (const char* env = std::getenv("PLUMB_LAYOUT"); env && *env) file = env;
  }
  if (!file) return layout;
  std::ifstream in(*file);
  if (!in) throw InputError(fmt::format("layout file \"{}\" cannot be read.", *file));
  std::stringstream text;
  text << in.rdbuf();
  json custom;
  try {
    custom = nlohmann::json::parse(text.str());
  } catch (const nlohmann::json::parse_error& e) {
    throw InputError(fmt::format("layout file \"{}\" is not valid JSON ({}).", *file, e.what()));
  }
  validate_layout(custom, *file);
  for (const auto& [k, v] : custom.items()) layout[k] = v;
  return layout;
}

}  // namespace plumb::report
