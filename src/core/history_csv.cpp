#include "core/history_csv.hpp"

#include <fmt/format.h>

#include <algorithm>

#include "core/csv_columns.hpp"
#include "core/errors.hpp"
#include "core/text_field.hpp"

namespace plumb {
namespace {

bool blank(std::string_view s) {
  return std::all_of(s.begin(), s.end(), [](char c) { return c == ' ' || c == '\t' || c == '\r'; });
}

std::string lower(std::string s) {
  std::transform(s.begin(), s.end(), s.begin(), [](unsigned char c) { return static_cast<char>(std::tolower(c)); });
  return s;
}

std::vector<std::string> split_weights(const std::string& text) {
  std::vector<std::string> ids(1);
  for (char c : text) {
    if (c == '+') ids.emplace_back();
    else ids.back() += c;
  }
  return ids;
}

}  // namespace

std::string HistoryCsvParser::where(const char* column) const {
  return fmt::format("{} line {} column {}: value", source_, line_, column);
}

void HistoryCsvParser::read_header(const std::vector<std::string>& fields) {
  for (std::size_t i = 0; i < fields.size(); ++i) {
    const std::string name = lower(fields[i]);
    int* slot = name == "instrument"                    ? &col_instrument_
                : name == "procedure"                   ? &col_procedure_
                : name == "date"                        ? &col_date_
                : name == "operator"                    ? &col_operator_
                : name == "weight" || name == "weights" ? &col_weight_
                : name == "reading"                     ? &col_reading_
                : name == "unit"                        ? &col_unit_
                : name == "run"                         ? &col_run_
                                                        : nullptr;
    if (!slot)
      throw InputError(fmt::format("{} line {}: header column \"{}\" is not known (expected {}, and optionally run).",
                                   source_, line_, shown_on_one_line(fields[i]), header));
    if (*slot >= 0)
      throw InputError(
          fmt::format("{} line {}: header column \"{}\" appears twice.", source_, line_, shown_on_one_line(fields[i])));
    *slot = static_cast<int>(i);
  }
  const std::pair<const char*, int> required[] = {{"instrument", col_instrument_}, {"procedure", col_procedure_},
                                                  {"date", col_date_},             {"operator", col_operator_},
                                                  {"weight", col_weight_},         {"reading", col_reading_},
                                                  {"unit", col_unit_}};
  for (const auto& [name, col] : required)
    if (col < 0)
      throw InputError(fmt::format("{} line {}: the header has no \"{}\" column (expected {}).", source_, line_, name,
                                   header));
  columns_ = fields.size();
  header_names_ = fields;
  have_header_ = true;
}

std::optional<HistoryRun> HistoryCsvParser::feed(std::string_view line) {
  ++line_;
  if (line_ == 1 && line.substr(0, 3) == "\xEF\xBB\xBF") line.remove_prefix(3);  // spreadsheet byte-order mark
  if (line.find('\0') != std::string_view::npos)
    throw InputError(fmt::format("{} line {}: contains a NUL byte; this is not a text CSV file.", source_, line_));
  if (blank(line)) return std::nullopt;
  split_csv_line(line, fields_);
  const std::vector<std::string>& fields = fields_;
  if (!have_header_) {
    read_header(fields);
    return std::nullopt;
  }
  if (fields.size() != columns_)
    throw InputError(
        fmt::format("{} line {}: {} field(s) where the header has {}.", source_, line_, fields.size(), columns_));
  check_csv_text(line, fields, header_names_, source_, line_);
  const auto field = [&](int col, const char* name) -> const std::string& {
    const std::string& v = fields[static_cast<std::size_t>(col)];
    if (v.empty()) throw InputError(fmt::format("{} line {} column {}: the value is empty.", source_, line_, name));
    return v;
  };
  const std::string& instrument = field(col_instrument_, "instrument");
  const std::string& procedure = field(col_procedure_, "procedure");
  const std::string& date = field(col_date_, "date");
  const std::string& operator_name = field(col_operator_, "operator");
  const std::string& weight = field(col_weight_, "weight");
  static const std::string no_label;
  const std::string& label = col_run_ >= 0 ? field(col_run_, "run") : no_label;
  CsvReading reading;
  reading.line = line_;
  reading.reading.text = field(col_reading_, "reading");
  // The message naming file, line and column is built only when a value is bad.
  try {
    reading.reading.value = Decimal::parse(reading.reading.text);
  } catch (const InputError&) {
    reading.reading.value = Decimal::parse(reading.reading.text, where("reading"));
  }
  const std::string& unit = field(col_unit_, "unit");
  try {
    reading.reading.unit = parse_mass_unit(unit);
  } catch (const InputError&) {
    reading.reading.unit = parse_mass_unit(unit, where("unit"));
  }
  ++rows_;

  const bool same_key = open_ && open_->instrument == instrument && open_->procedure == procedure &&
                        open_->date == date && open_->operator_name == operator_name && open_->weight == weight;
  if (open_ && col_run_ >= 0 && open_->label == label) {
    if (!same_key)
      throw InputError(fmt::format("{} line {}: run \"{}\" started at line {} for {} {} on {} by {} with {}; every row "
                                   "of a run must name the same instrument, procedure, date, operator and weight.",
                                   source_, line_, label, open_->first_line, open_->instrument, open_->procedure,
                                   open_->date, open_->operator_name, open_->weight));
  }
  if (open_ && same_key && (col_run_ < 0 || open_->label == label)) {
    open_->last_line = line_;
    open_->readings.push_back(std::move(reading));
    return std::nullopt;
  }
  if (col_run_ >= 0 && finished_labels_.count(label))
    throw InputError(fmt::format("{} line {} column run: value \"{}\" labels a run that ended earlier in the file; "
                                 "a run's rows must be consecutive.",
                                 source_, line_, label));
  std::optional<HistoryRun> done = std::move(open_);
  if (done && col_run_ >= 0) finished_labels_.insert(done->label);
  HistoryRun row;
  row.first_line = row.last_line = line_;
  row.instrument = instrument;
  row.procedure = procedure;
  row.date = date;
  row.operator_name = operator_name;
  row.weight = weight;
  row.label = label;
  row.weights = split_weights(row.weight);
  row.readings.reserve(16);
  row.readings.push_back(std::move(reading));
  open_ = std::move(row);
  return done;
}

std::optional<HistoryRun> HistoryCsvParser::finish() {
  if (!have_header_)
    throw InputError(fmt::format("{}: is empty; expected the header row {}.", source_, header));
  if (rows_ == 0) throw InputError(fmt::format("{}: has a header but no reading rows.", source_));
  return std::move(open_);
}

}  // namespace plumb
