#include "report/format/csv.hpp"

#include <sstream>

namespace plumb::report {
namespace {

bool starts_a_formula(std::string_view s) {
  if (s.empty()) return false;
  switch (s.front()) {
    case '=':
    case '+':
    case '-':
    case '@':
    case '\t':
    case '\r': return true;
    default: return false;
  }
}

}  // namespace

void CsvWriter::separate() {
  if (fields_ > 0) out_ << ',';
  ++fields_;
}

void CsvWriter::write_quoted(bool always, std::string_view prefix, std::string_view s) {
  const bool quote = always || !prefix.empty() || s.find_first_of(",\"\r\n") != std::string_view::npos;
  if (!quote) {
    out_ << s;
    return;
  }
  out_ << '"' << prefix;
  for (const char c : s) {
    if (c == '"') out_ << '"';
    out_ << c;
  }
  out_ << '"';
}

void CsvWriter::header(std::initializer_list<std::string_view> names) {
  for (const auto n : names) value(n);
  end_row();
}

CsvWriter& CsvWriter::text(std::string_view s) {
  separate();
  write_quoted(true, starts_a_formula(s) ? "'" : "", s);
  return *this;
}

CsvWriter& CsvWriter::value(std::string_view s) {
  separate();
  write_quoted(false, "", s);
  return *this;
}

CsvWriter& CsvWriter::integer(long long v) {
  separate();
  out_ << v;
  return *this;
}

CsvWriter& CsvWriter::empty() {
  separate();
  return *this;
}

void CsvWriter::end_row() {
  out_ << '\n';
  fields_ = 0;
}

std::string csv_text_field(std::string_view s) {
  std::ostringstream out;
  CsvWriter(out).text(s);
  return out.str();
}

}  // namespace plumb::report
