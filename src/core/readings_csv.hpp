#pragma once
// Reads replicate readings from CSV text: a header row naming a `reading` column (and optionally a
// `unit` column), one reading per row, the values exactly as the balance displayed them.
#include <string>
#include <string_view>
#include <vector>

#include "core/units.hpp"

namespace plumb {

struct CsvReading {
  MassReading reading;
  int line = 0;  ///< 1-based line in the file, for error messages
};

/// Parses `text`. `source` names the file in messages ("readings.csv", "standard input").
/// Throws InputError naming the file, line, column and value for any bad field.
std::vector<CsvReading> parse_readings_csv(std::string_view text, std::string_view source, MassUnit default_unit);

/// Splits one CSV line into fields (RFC 4180 quoting, no embedded newlines), each trimmed of spaces and tabs.
std::vector<std::string> split_csv_line(std::string_view line);
/// The same into `fields`, reusing its strings (a long import splits millions of lines).
void split_csv_line(std::string_view line, std::vector<std::string>& fields);

}  // namespace plumb
