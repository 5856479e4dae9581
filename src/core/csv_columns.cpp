#include "core/csv_columns.hpp"

#include <fmt/format.h>

#include <algorithm>
#include <set>

#include "core/errors.hpp"
#include "core/text_field.hpp"

namespace plumb {

std::string csv_column_key(std::string_view name) {
  std::string key(name);
  std::transform(key.begin(), key.end(), key.begin(),
                 [](unsigned char c) { return c < 0x80 ? static_cast<char>(std::tolower(c)) : static_cast<char>(c); });
  return key;
}

void check_csv_header(const std::vector<std::string>& fields, std::span<const std::string_view> known,
                      std::string_view source, int line, std::string_view expected) {
  std::set<std::string> seen;
  for (const auto& field : fields) {
    const std::string key = csv_column_key(field);
    if (std::find(known.begin(), known.end(), key) == known.end())
      throw InputError(fmt::format("{} line {}: column \"{}\" is not known (the header is {}).", source, line,
                                   shown_on_one_line(field), expected));
    if (!seen.insert(key).second)
      throw InputError(fmt::format("{} line {}: column \"{}\" appears twice in the header.", source, line,
                                   shown_on_one_line(field)));
  }
}

void check_csv_text(std::string_view raw_line, const std::vector<std::string>& fields,
                    const std::vector<std::string>& header, std::string_view source, int line) {
  const bool plain_ascii = std::all_of(raw_line.begin(), raw_line.end(), [](char c) {
    const auto b = static_cast<unsigned char>(c);
    return b >= 0x20 && b < 0x7F;
  });
  if (plain_ascii) return;
  for (std::size_t i = 0; i < fields.size(); ++i) {
    const std::string column = i < header.size() ? header[i] : fmt::format("{}", i + 1);
    check_text_field(fields[i], fmt::format("{} line {} column {}: value", source, line, column));
  }
}

}  // namespace plumb
