#pragma once
// The header and the fields of plumb's CSV inputs (readings, calibration and pipette run files, the history
// import): columns are found by name, so a column that is not known, or one named twice, would otherwise be
// dropped without a word (`reading,reading`, `reading,units`). Both are refused, and so is a field that is not
// plain text on one line (core/text_field.hpp).
#include <span>
#include <string>
#include <string_view>
#include <vector>

namespace plumb {

/// `name` in lower case (ASCII letters only), as headers are matched.
std::string csv_column_key(std::string_view name);

/// Refuses a header column that is not one of `known` (matched case-insensitively) or that comes twice.
/// `expected` shows the header in the message, e.g. "reading[,unit]". InputError naming the file, line and
/// column.
void check_csv_header(const std::vector<std::string>& fields, std::span<const std::string_view> known,
                      std::string_view source, int line, std::string_view expected);

/// Refuses a field of a data row that is not plain text on one line, naming the file, line and column
/// (`header` holds the column names). Cheap on the usual printable-ASCII line: only a line with another byte
/// is looked at field by field.
void check_csv_text(std::string_view raw_line, const std::vector<std::string>& fields,
                    const std::vector<std::string>& header, std::string_view source, int line);

}  // namespace plumb
