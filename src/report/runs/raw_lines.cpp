#include "report/runs/raw_lines.hpp"

#include <fmt/format.h>

namespace plumb::report {

nlohmann::json raw_lines_json(const std::vector<store::RawLine>& lines) {
  auto out = nlohmann::json::array();
  for (const auto& l : lines) {
    nlohmann::json j = {
        {"seq", l.seq}, {"received_at", l.received_at}, {"source", l.source}, {"line", l.line}, {"outcome", l.outcome}};
    j["reading"] = l.reading_seq ? nlohmann::json(*l.reading_seq) : nlohmann::json();
    j["note"] = l.note.empty() ? nlohmann::json() : nlohmann::json(l.note);
    out.push_back(std::move(j));
  }
  return out;
}

std::string raw_lines_text(const std::vector<store::RawLine>& lines) {
  if (lines.empty()) return "";
  std::string out = fmt::format(
      "Original record ({} line(s) as received; bytes other than printable ASCII shown as \\xHH):\n", lines.size());
  for (const auto& l : lines) {
    const std::string what = l.reading_seq ? fmt::format("reading {}", *l.reading_seq) : l.outcome;
    out += fmt::format("  {:>3}  {}  {:<5}  {:<24}  {}\n", l.seq, l.received_at, l.source, "\"" + l.line + "\"", what);
    if (!l.note.empty()) out += fmt::format("       {}\n", l.note);
  }
  return out;
}

}  // namespace plumb::report
