#include "report/dcc/quantity.hpp"

#include <fmt/format.h>

#include <cmath>
#include <regex>

#include "core/errors.hpp"
#include "report/dcc/xml_tree.hpp"

namespace plumb::report::dcc {
namespace {

std::string joined(const std::vector<std::string>& items) {
  std::string out;
  for (const auto& i : items) {
    if (!out.empty()) out += ' ';
    out += i;
  }
  return out;
}

void add_name_and_ref_type(xmlNodePtr quantity, std::string_view name, std::string_view ref_type) {
  if (!ref_type.empty()) set_attribute(quantity, "refType", ref_type);
  add_text(quantity, "name", name);
}

}  // namespace

bool is_dsi_decimal(std::string_view text) {
  // si:decimalType of D-SI 2.1.0 (SI_Format-2.1.0.xsd), the same pattern.
  static const std::regex pattern(R"([-+]?((\d*\.\d+)|(\d+\.\d*)|(\d+\.?))([Ee][-+]?\d+)?)");
  return std::regex_match(text.begin(), text.end(), pattern);
}

std::optional<std::string> plain_decimal(std::string_view text) {
  if (!is_dsi_decimal(text)) return std::nullopt;
  std::string s(text);
  bool negative = false;
  if (s[0] == '+' || s[0] == '-') {
    negative = s[0] == '-';
    s.erase(0, 1);
  }
  int exponent = 0;
  if (const auto e = s.find_first_of("eE"); e != std::string::npos) {
    const std::string digits = s.substr(e + 1);
    if (digits.size() > 4) return std::nullopt;  // beyond any mass or volume plumb keeps
    exponent = std::stoi(digits);
    s.erase(e);
  }
  // Digits without the point, and where the point stood: the value is 0.DIGITS x 10^point.
  std::string digits;
  int point = -1;
  for (char c : s) {
    if (c == '.')
      point = static_cast<int>(digits.size());
    else
      digits += c;
  }
  if (point < 0) point = static_cast<int>(digits.size());
  point += exponent;
  if (point > 40 || point < -40) return std::nullopt;
  if (point <= 0) {
    digits.insert(0, static_cast<std::size_t>(-point) + 1, '0');
    point = 1;
  }
  if (point > static_cast<int>(digits.size())) digits.append(static_cast<std::size_t>(point) - digits.size(), '0');
  std::string out = digits.substr(0, static_cast<std::size_t>(point));
  const std::string fraction = digits.substr(static_cast<std::size_t>(point));
  if (!fraction.empty()) out += "." + fraction;
  // Leading zeros of the integer part are noise; one stays before the point.
  const auto first = out.find_first_not_of('0');
  if (first == std::string::npos || out[first] == '.')
    out = "0" + out.substr(first == std::string::npos ? out.size() : first);
  else
    out = out.substr(first);
  return negative ? "-" + out : out;
}

std::string decimal_text(const nlohmann::json& value, std::string_view what) {
  std::string text;
  if (value.is_string())
    text = value.get<std::string>();
  else if (value.is_number_integer())
    text = fmt::format("{}", value.get<long long>());
  else if (value.is_number() && std::isfinite(value.get<double>()))
    text = fmt::format("{}", value.get<double>());
  if (!is_dsi_decimal(text))
    throw StorageError(
        fmt::format("the stored certificate's {} ({}) is not a number a DCC can carry.", what, value.dump()));
  return text;
}

std::string normal_coverage_probability(const nlohmann::json& k) {
  const double factor = std::stod(decimal_text(k, "coverage factor"));
  if (!(factor >= 1.0)) throw StorageError(fmt::format("coverage factor {} is below 1.", k.dump()));
  return fmt::format("{:.4f}", std::erf(factor / std::sqrt(2.0)));
}

xmlNodePtr add_real_quantity(xmlNodePtr parent, std::string_view name, std::string_view ref_type,
                             const std::string& value, Unit unit,
                             const std::optional<ExpandedUncertainty>& uncertainty) {
  xmlNodePtr q = add(parent, "quantity");
  add_name_and_ref_type(q, name, ref_type);
  xmlNodePtr real = add_si(q, "real");
  add_si(real, "value", value);
  add_si(real, "unit", dsi_text(unit));
  if (uncertainty) {
    xmlNodePtr u = add_si(real, "expandedUnc");
    add_si(u, "uncertainty", uncertainty->uncertainty);
    add_si(u, "coverageFactor", uncertainty->coverage_factor);
    add_si(u, "coverageProbability", uncertainty->coverage_probability);
  }
  return q;
}

xmlNodePtr add_list_quantity(xmlNodePtr parent, std::string_view name, std::string_view ref_type,
                             const RealList& list) {
  xmlNodePtr q = add(parent, "quantity");
  add_name_and_ref_type(q, name, ref_type);
  xmlNodePtr l = add_si(q, "realListXMLList");
  if (!list.labels.empty()) add_si(l, "labelXMLList", joined(list.labels));
  add_si(l, "valueXMLList", joined(list.values));
  // One unit per value: D-SI also reads a single unit as the unit of all, but one each cannot be misread.
  add_si(l, "unitXMLList", joined(std::vector<std::string>(list.values.size(), std::string(dsi_text(list.unit)))));
  if (!list.uncertainties.empty()) {
    std::vector<std::string> u, k, p;
    for (const auto& e : list.uncertainties) {
      u.push_back(e.uncertainty);
      k.push_back(e.coverage_factor);
      p.push_back(e.coverage_probability);
    }
    xmlNodePtr unc = add_si(l, "expandedUncXMLList");
    add_si(unc, "uncertaintyXMLList", joined(u));
    add_si(unc, "coverageFactorXMLList", joined(k));
    add_si(unc, "coverageProbabilityXMLList", joined(p));
  }
  return q;
}

std::string list_label(std::string_view text) {
  std::string out(text);
  for (char& c : out)
    if (c == ' ' || c == '\t' || c == '\n') c = '_';
  return out.empty() ? "-" : out;
}

}  // namespace plumb::report::dcc
