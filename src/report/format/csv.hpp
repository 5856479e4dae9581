#pragma once
// The one CSV writer behind every `--format csv` (RFC 4180): fields separated by commas, a field that holds a
// comma, a double quote, CR or LF is enclosed in double quotes with each double quote doubled. Free text is
// always quoted (so a reader sees at a glance which fields are text); values plumb formats itself only when
// they need it. Records end in LF, which spreadsheets and the csv modules of scripting languages read alike.
//
// Spreadsheet formula injection: a *text* field whose first character is '=', '+', '-', '@', TAB or CR would
// be run as a formula by a spreadsheet opening the file. Such a field is written with a leading apostrophe
// (and quoted), which spreadsheets show as text: `=HYPERLINK(...)` becomes `"'=HYPERLINK(...)"`. Numbers,
// dates and other values plumb formats itself go through `value()` and are written as they are, so a
// negative bias stays a number.
#include <cstddef>
#include <initializer_list>
#include <ostream>
#include <string>
#include <string_view>

namespace plumb::report {

class CsvWriter {
public:
  explicit CsvWriter(std::ostream& out) : out_(out) {}

  /// The header row: column names, written as values.
  void header(std::initializer_list<std::string_view> names);
  /// Free text from people or the database (names, locations, reasons): always quoted, and guarded against
  /// formula injection.
  CsvWriter& text(std::string_view s);
  /// A value plumb formatted itself (a number, a date, an id it validated, a key from a fixed list): quoted
  /// when needed, never altered.
  CsvWriter& value(std::string_view s);
  CsvWriter& integer(long long v);
  /// An absent value: an empty field.
  CsvWriter& empty();
  /// Ends the record.
  void end_row();

  [[nodiscard]] std::size_t fields_in_row() const { return fields_; }

private:
  void separate();
  void write_quoted(bool always, std::string_view prefix, std::string_view s);
  std::ostream& out_;
  std::size_t fields_ = 0;
};

/// One field as CsvWriter::text writes it (for tests and for writers that build a line at a time).
std::string csv_text_field(std::string_view s);

}  // namespace plumb::report
