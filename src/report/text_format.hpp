#pragma once
// Small helpers for plain-text reports: masses from JSON gram values, wrapping, rules.
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

namespace plumb::report {

/// A gram value from JSON for people: "0.079 mg", "100.00028 g"; "-" for null.
std::string mass_text(const nlohmann::json& grams, int significant = 4);
/// Wraps `text` to `width` columns, each line prefixed with `indent` (after the first with `first`).
std::vector<std::string> wrap(const std::string& text, std::size_t width, const std::string& first = "",
                              const std::string& indent = "");
std::string rule(char c = '-', std::size_t width = 78);

}  // namespace plumb::report
