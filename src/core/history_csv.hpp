#pragma once
// The history import file: a long CSV of past checks, one reading per row, which plumb groups into runs.
//
//   instrument,procedure,date,operator,weight,reading,unit[,run]
//   BAL-A,repeatability,2024-03-04,A. Technician,W100,100.0003,g
//
// Columns are found by name (any order, case-insensitive; `weights` is accepted for `weight`); every
// row must fill every column. `weight` holds one reference weight id, or several joined with '+'.
// A run is a block of consecutive rows with the same instrument, procedure, date, operator and weight.
// The optional `run` column labels runs explicitly: a new label starts a new run (so two runs of the
// same instrument on the same day can follow each other), and a label may not come back later in the file.
//
// The parser is fed one line at a time and hands back each run as soon as it is complete, so a file of
// millions of rows never has to be held in memory.
#include <optional>
#include <set>
#include <string>
#include <string_view>
#include <vector>

#include "core/readings_csv.hpp"

namespace plumb {

struct HistoryRun {
  int first_line = 0;
  int last_line = 0;
  std::string instrument;
  std::string procedure;
  std::string date;
  std::string operator_name;
  std::string weight;                ///< as written, e.g. "W100" or "W100+W50"
  std::vector<std::string> weights;  ///< the ids split on '+'
  std::string label;                 ///< the `run` column, empty without one
  std::vector<CsvReading> readings;  ///< each with its line in the import file
};

class HistoryCsvParser {
public:
  /// `source` names the file in messages.
  explicit HistoryCsvParser(std::string source) : source_(std::move(source)) {}

  /// Feeds the next line (without its newline). Returns the previous run when this line starts a new one.
  /// Throws InputError naming the file, line, column and value for any bad field.
  std::optional<HistoryRun> feed(std::string_view line);
  /// Ends the file: returns the last run. Throws InputError when there was no header or no row.
  std::optional<HistoryRun> finish();

  [[nodiscard]] int line() const { return line_; }
  /// The header line the file must start with (for messages and help).
  static constexpr const char* header = "instrument,procedure,date,operator,weight,reading,unit";

private:
  void read_header(const std::vector<std::string>& fields);
  [[nodiscard]] std::string where(const char* column) const;

  std::string source_;
  int line_ = 0;
  bool have_header_ = false;
  std::size_t columns_ = 0;
  std::vector<std::string> header_names_;
  int col_instrument_ = -1, col_procedure_ = -1, col_date_ = -1, col_operator_ = -1, col_weight_ = -1,
      col_reading_ = -1, col_unit_ = -1, col_run_ = -1;
  std::optional<HistoryRun> open_;
  std::vector<std::string> fields_;  ///< the current line's fields (reused from line to line)
  std::set<std::string> finished_labels_;
  long long rows_ = 0;
};

}  // namespace plumb
