#include "app/calibration/run_file.hpp"

#include <fmt/format.h>
#include <fmt/ranges.h>

#include <algorithm>
#include <array>
#include <map>

#include "checks/eccentricity.hpp"
#include "core/csv_columns.hpp"
#include "core/errors.hpp"
#include "core/readings_csv.hpp"
#include "core/text_field.hpp"

namespace plumb::app {
namespace {

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

bool blank(std::string_view s) {
  return s.find_first_not_of(" \t\r") == std::string_view::npos;
}

}  // namespace

namespace {

/// A run file, or a plan (the same rows without their readings) when `plan` is set.
std::vector<CalibrationRow> parse_rows(std::string_view text, std::string_view source, MassUnit default_unit,
                                       bool plan) {
  constexpr std::array known{"stage", "part", "load", "position", "direction", "reading", "unit"};
  std::map<std::string, std::size_t> col;
  std::size_t columns = 0;
  std::vector<std::string> header_names;
  std::vector<CalibrationRow> rows;
  std::size_t pos = text.substr(0, 3) == "\xEF\xBB\xBF" ? 3 : 0;  // byte-order mark of spreadsheet exports
  int line_no = 0;
  while (pos <= text.size()) {
    std::size_t end = text.find('\n', pos);
    if (end == std::string_view::npos) end = text.size();
    const std::string_view raw = text.substr(pos, end - pos);
    pos = end + 1;
    ++line_no;
    if (blank(raw)) {
      if (end == text.size()) break;
      continue;
    }
    if (raw.find('\0') != std::string_view::npos)
      throw InputError(fmt::format("{} line {}: contains a NUL byte; this is not a text CSV file.", source, line_no));
    const auto fields = split_csv_line(raw);
    if (col.empty()) {
      for (std::size_t i = 0; i < fields.size(); ++i) {
        const std::string name = lower(fields[i]);
        if (plan && (name == "reading" || name == "unit"))
          throw InputError(
              fmt::format("{} line {}: column \"{}\" belongs in a run file; a plan says only where each "
                          "reading goes (the header is {}).",
                          source, line_no, name, calibration_plan_header));
        if (std::find(known.begin(), known.end(), name) == known.end())
          throw InputError(fmt::format("{} line {}: column \"{}\" is not known (the header is {}).", source, line_no,
                                       shown_on_one_line(fields[i]), calibration_csv_header));
        if (!col.emplace(name, i).second)
          throw InputError(
              fmt::format("{} line {}: column \"{}\" appears twice in the header.", source, line_no, name));
      }
      for (const char* required : {"stage", "part", "load", "reading"})
        if (!col.count(required) && !(plan && std::string_view(required) == "reading"))
          throw InputError(fmt::format("{} line {}: the header has no \"{}\" column (expected {}).", source, line_no,
                                       required, plan ? calibration_plan_header : calibration_csv_header));
      columns = fields.size();
      header_names = fields;
      continue;
    }
    if (fields.size() != columns)
      throw InputError(
          fmt::format("{} line {}: {} field(s) where the header has {}.", source, line_no, fields.size(), columns));
    check_csv_text(raw, fields, header_names, source, line_no);
    const auto field = [&](const char* name) -> std::string {
      const auto it = col.find(name);
      return it == col.end() ? std::string() : fields[it->second];
    };
    CalibrationRow r;
    r.line = line_no;
    r.stage = lower(field("stage"));
    if (r.stage != "as-found" && r.stage != "as-left")
      throw InputError(
          fmt::format("{} line {} column stage: \"{}\" is not as-found or as-left.", source, line_no, field("stage")));
    r.part = lower(field("part"));
    if (r.part != "repeatability" && r.part != "eccentricity" && r.part != "indication")
      throw InputError(fmt::format("{} line {} column part: \"{}\" is not repeatability, eccentricity or indication.",
                                   source, line_no, field("part")));
    r.load = field("load");
    if (r.load.empty())
      throw InputError(
          fmt::format("{} line {} column load: empty; name the weights on the pan, e.g. W100+W50.", source, line_no));
    r.position = lower(field("position"));
    if (r.position == "center") r.position = "centre";
    if (r.part == "eccentricity" && r.position.empty())
      throw InputError(
          fmt::format("{} line {} column position: an eccentricity reading needs its position on the "
                      "pan (centre, front-left, ...).",
                      source, line_no));
    if (r.part == "eccentricity" && std::find(checks::pan_positions.begin(), checks::pan_positions.end(), r.position) ==
                                        checks::pan_positions.end())
      throw InputError(fmt::format("{} line {} column position: \"{}\" is not a position on the pan (use {}).", source,
                                   line_no, shown_on_one_line(field("position")),
                                   fmt::join(checks::pan_positions, ", ")));
    if (r.part != "eccentricity" && !r.position.empty())
      throw InputError(
          fmt::format("{} line {} column position: \"{}\" is given for a {} reading; positions belong "
                      "to eccentricity readings only.",
                      source, line_no, field("position"), r.part));
    r.direction = lower(field("direction"));
    if (r.part == "indication" && r.direction.empty()) r.direction = "up";
    if (r.part == "indication" && r.direction != "up" && r.direction != "down")
      throw InputError(
          fmt::format("{} line {} column direction: \"{}\" is not up or down.", source, line_no, field("direction")));
    if (r.part != "indication" && !r.direction.empty())
      throw InputError(
          fmt::format("{} line {} column direction: \"{}\" is given for a {} reading; directions belong "
                      "to indication readings only.",
                      source, line_no, field("direction"), r.part));
    r.reading.unit = default_unit;
    if (!plan) {
      r.reading.text = field("reading");
      r.reading.value =
          Decimal::parse(r.reading.text, fmt::format("{} line {} column reading: value", source, line_no));
      if (const std::string u = field("unit"); !u.empty())
        r.reading.unit = parse_mass_unit(u, fmt::format("{} line {} column unit: value", source, line_no));
    }
    rows.push_back(std::move(r));
    if (end == text.size()) break;
  }
  if (col.empty())
    throw InputError(fmt::format("{}: is empty; expected the header {}.", source,
                                 plan ? calibration_plan_header : calibration_csv_header));
  if (rows.empty()) throw InputError(fmt::format("{}: has a header but no {}.", source, plan ? "rows" : "readings"));
  return rows;
}

}  // namespace

std::vector<CalibrationRow> parse_calibration_csv(std::string_view text, std::string_view source,
                                                  MassUnit default_unit) {
  return parse_rows(text, source, default_unit, false);
}

std::vector<CalibrationRow> parse_calibration_plan(std::string_view text, std::string_view source) {
  return parse_rows(text, source, MassUnit::g, true);
}

}  // namespace plumb::app
