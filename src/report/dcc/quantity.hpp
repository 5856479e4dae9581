#pragma once
// D-SI quantities (si:real, si:realListXMLList) inside dcc:quantity elements, written from the numbers of a
// stored certificate document exactly as they are stored: a decimal text stays as typed, a computed number
// is written in its shortest form that reads back as the same double. Nothing is recomputed here.
#include <libxml/tree.h>

#include <nlohmann/json.hpp>
#include <optional>
#include <string>
#include <string_view>
#include <vector>

#include "report/dcc/units.hpp"

namespace plumb::report::dcc {

/// True when `text` is a number as D-SI writes one (si:decimalType: "-0.0001", "1.5e-05"; no "nan", no "inf").
bool is_dsi_decimal(std::string_view text);

/// A D-SI decimal read back as plain decimal text, exactly ("1.5E-5" -> "0.000015", "+2" -> "2"), for
/// Decimal::parse; nullopt when `text` is not a D-SI decimal.
std::optional<std::string> plain_decimal(std::string_view text);

/// A stored number as D-SI text: a string as stored, a number in its shortest round-trip form.
/// StorageError naming `what` for null, a non-finite number or a text that is not a decimal.
std::string decimal_text(const nlohmann::json& value, std::string_view what);

/// An expanded uncertainty as D-SI writes it: U (in the quantity's unit), k and the coverage probability.
struct ExpandedUncertainty {
  std::string uncertainty, coverage_factor, coverage_probability;
};

/// The coverage probability of a coverage factor stated without one (a weight's certificate gives only k):
/// the two-sided probability of a normal distribution, 2 Phi(k) - 1 = erf(k / sqrt 2), to four decimals
/// (k = 2: 0.9545, the "about 95 %" of GUM 6.2.2 and 6.3.3). StorageError for a k below 1.
std::string normal_coverage_probability(const nlohmann::json& k);

/// <dcc:quantity refType=...><dcc:name>..</dcc:name><si:real>..</si:real></dcc:quantity>
xmlNodePtr add_real_quantity(xmlNodePtr parent, std::string_view name, std::string_view ref_type,
                             const std::string& value, Unit unit,
                             const std::optional<ExpandedUncertainty>& uncertainty = std::nullopt);

/// A table column: one value per row (a load, a channel), each with the unit, optionally labelled
/// (labels must hold no space: D-SI separates list items by blanks) and with an uncertainty per value.
struct RealList {
  std::vector<std::string> labels;
  std::vector<std::string> values;
  Unit unit = Unit::one;
  std::vector<ExpandedUncertainty> uncertainties;  ///< empty, or one per value
};

/// An empty column in `unit`.
inline RealList list_in(Unit unit) {
  RealList list;
  list.unit = unit;
  return list;
}

/// <dcc:quantity refType=...><dcc:name>..</dcc:name><si:realListXMLList>..</si:realListXMLList></dcc:quantity>
xmlNodePtr add_list_quantity(xmlNodePtr parent, std::string_view name, std::string_view ref_type, const RealList& list);

/// A label for a D-SI list: blanks become underscores.
std::string list_label(std::string_view text);

}  // namespace plumb::report::dcc
