#include "report/document/layout.hpp"

#include <fmt/format.h>

#include <cstdlib>
#include <fstream>
#include <sstream>

#include "core/errors.hpp"
#include "store/embedded.hpp"

namespace plumb::report {

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
  try {
    const auto custom = nlohmann::json::parse(text.str());
    if (!custom.is_object()) throw InputError(fmt::format("layout file \"{}\" must hold a JSON object.", *file));
    for (const auto& [k, v] : custom.items()) layout[k] = v;
  } catch (const nlohmann::json::parse_error& e) {
    throw InputError(fmt::format("layout file \"{}\" is not valid JSON ({}).", *file, e.what()));
  }
  return layout;
}

}  // namespace plumb::report
