#pragma once
// A small reader for the metrology CSVs in shared/reference-data: '#' comment lines, a header row,
// then comma-separated rows kept as text (so printed precision can be checked exactly).
#include <filesystem>
#include <fstream>
#include <map>
#include <sstream>
#include <stdexcept>
#include <string>
#include <vector>

namespace plumb::test {

struct CsvTable {
  std::vector<std::string> header;
  std::vector<std::map<std::string, std::string>> rows;
};

inline CsvTable read_reference_csv(const std::filesystem::path& file) {
  std::ifstream in(file);
  if (!in) throw std::runtime_error("cannot open " + file.string());
  const auto split = [](const std::string& line) {
    std::vector<std::string> out;
    std::stringstream ss(line);
    std::string cell;
    while (std::getline(ss, cell, ',')) out.push_back(cell);
    if (!line.empty() && line.back() == ',') out.emplace_back();
    return out;
  };
  CsvTable t;
  std::string line;
  while (std::getline(in, line)) {
    if (!line.empty() && line.back() == '\r') line.pop_back();
    if (line.empty() || line[0] == '#') continue;
    auto cells = split(line);
    if (t.header.empty()) {
      t.header = cells;
      continue;
    }
    std::map<std::string, std::string> row;
    for (std::size_t i = 0; i < t.header.size(); ++i) row[t.header[i]] = i < cells.size() ? cells[i] : "";
    t.rows.push_back(std::move(row));
  }
  return t;
}

/// The data rows of a reference CSV as cells in file order, after checking that its header is exactly
/// `expected_header` (so a column moved or renamed in the source fails loudly).
inline std::vector<std::vector<std::string>> read_reference_rows(const std::filesystem::path& file,
                                                                 const std::string& expected_header) {
  const CsvTable t = read_reference_csv(file);
  std::string header;
  for (const auto& h : t.header) header += (header.empty() ? "" : ",") + h;
  if (header != expected_header)
    throw std::runtime_error(file.string() + ": header \"" + header + "\" is not \"" + expected_header + "\"");
  std::vector<std::vector<std::string>> rows;
  for (const auto& r : t.rows) {
    std::vector<std::string> cells;
    for (const auto& h : t.header) cells.push_back(r.at(h));
    rows.push_back(std::move(cells));
  }
  return rows;
}

/// Decimals printed in a number's text ("2.025" -> 3).
inline int printed_decimals(const std::string& text) {
  const auto dot = text.find('.');
  return dot == std::string::npos ? 0 : static_cast<int>(text.size() - dot - 1);
}

}  // namespace plumb::test
