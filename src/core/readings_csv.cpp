#include "core/readings_csv.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/csv_columns.hpp"
#include "core/errors.hpp"

namespace plumb {
namespace {

std::string_view trim(std::string_view s) {
  while (!s.empty() && (s.front() == ' ' || s.front() == '\t')) s.remove_prefix(1);
  while (!s.empty() && (s.back() == ' ' || s.back() == '\t' || s.back() == '\r')) s.remove_suffix(1);
  return s;
}

}  // namespace

namespace {

/// The general path: RFC 4180 quoting.
void split_quoted(std::string_view line, std::vector<std::string>& fields) {
  fields.assign(1, std::string());
  bool quoted = false;
  for (std::size_t i = 0; i < line.size(); ++i) {
    const char c = line[i];
    if (quoted) {
      if (c == '"' && i + 1 < line.size() && line[i + 1] == '"') {
        fields.back() += '"';
        ++i;
      } else if (c == '"') {
        quoted = false;
      } else {
        fields.back() += c;
      }
    } else if (c == '"') {
      quoted = true;
    } else if (c == ',') {
      fields.emplace_back();
    } else {
      fields.back() += c;
    }
  }
  for (auto& f : fields) f = std::string(trim(f));
}

}  // namespace

void split_csv_line(std::string_view line, std::vector<std::string>& fields) {
  if (line.find('"') != std::string_view::npos) {
    split_quoted(line, fields);
    return;
  }
  // No quotes (the usual export): fields are the text between commas.
  std::size_t n = 0, from = 0;
  while (true) {
    const std::size_t comma = line.find(',', from);
    const std::string_view f = trim(line.substr(from, comma == std::string_view::npos ? line.size() - from : comma - from));
    if (n < fields.size()) fields[n].assign(f.data(), f.size());
    else fields.emplace_back(f);
    ++n;
    if (comma == std::string_view::npos) break;
    from = comma + 1;
  }
  fields.resize(n);
}

std::vector<std::string> split_csv_line(std::string_view line) {
  std::vector<std::string> fields;
  split_csv_line(line, fields);
  return fields;
}

std::vector<CsvReading> parse_readings_csv(std::string_view text, std::string_view source, MassUnit default_unit) {
  std::vector<CsvReading> out;
  int line_no = 0;
  int reading_col = -1, unit_col = -1;
  std::size_t columns = 0;
  std::vector<std::string> header;
  constexpr std::string_view known[] = {"reading", "unit"};
  std::size_t pos = 0;
  if (text.substr(0, 3) == "\xEF\xBB\xBF") pos = 3;  // a UTF-8 byte-order mark from spreadsheet exports
  while (pos <= text.size()) {
    std::size_t end = text.find('\n', pos);
    if (end == std::string_view::npos) end = text.size();
    std::string_view raw = text.substr(pos, end - pos);
    pos = end + 1;
    ++line_no;
    if (trim(raw).empty()) {
      if (end == text.size()) break;
      continue;
    }
    if (raw.find('\0') != std::string_view::npos)
      throw InputError(fmt::format("{} line {}: contains a NUL byte; this is not a text CSV file.", source, line_no));
    const auto fields = split_csv_line(raw);
    if (reading_col < 0) {
      check_csv_header(fields, known, source, line_no, "reading[,unit]");
      for (std::size_t i = 0; i < fields.size(); ++i) {
        const std::string name = csv_column_key(fields[i]);
        if (name == "reading") reading_col = static_cast<int>(i);
        if (name == "unit") unit_col = static_cast<int>(i);
      }
      if (reading_col < 0)
        throw InputError(fmt::format("{} line {}: the header has no \"reading\" column.", source, line_no));
      columns = fields.size();
      header = fields;
      continue;
    }
    if (fields.size() != columns)
      throw InputError(fmt::format("{} line {}: {} field(s) where the header has {}.", source, line_no,
                                   fields.size(), columns));
    check_csv_text(raw, fields, header, source, line_no);
    CsvReading r;
    r.line = line_no;
    const std::string where = fmt::format("{} line {} column reading: value", source, line_no);
    r.reading.text = fields[static_cast<std::size_t>(reading_col)];
    r.reading.value = Decimal::parse(r.reading.text, where);
    r.reading.unit = default_unit;
    if (unit_col >= 0) {
      const std::string& u = fields[static_cast<std::size_t>(unit_col)];
      if (!u.empty()) r.reading.unit = parse_mass_unit(u, fmt::format("{} line {} column unit: value", source, line_no));
    }
    out.push_back(std::move(r));
    if (end == text.size()) break;
  }
  if (reading_col < 0) throw InputError(fmt::format("{}: is empty; expected a header row with a \"reading\" column.", source));
  return out;
}

}  // namespace plumb
