#pragma once
// Small helpers for plain-text reports: masses from JSON gram values, wrapping, rules.
#include <nlohmann/json.hpp>
#include <string>
#include <string_view>
#include <vector>

namespace plumb::report {

/// A gram value from JSON for people: "0.079 mg", "100.00028 g"; "-" for null.
std::string mass_text(const nlohmann::json& grams, int significant = 4);
/// Wraps `text` to `width` columns, each line prefixed with `indent` (after the first with `first`).
std::vector<std::string> wrap(const std::string& text, std::size_t width, const std::string& first = "",
                              const std::string& indent = "");
std::string rule(char c = '-', std::size_t width = 78);
/// `s` in capitals (ASCII), for titles and verdicts.
std::string upper_case(std::string s);
/// j[key] as a number; 0 when absent or not a number.
double number_field(const nlohmann::json& j, const char* key);
/// Appends `line` and a line end.
void add_line(std::string& out, const std::string& line);

/// j[key] as text: strings as they are, numbers as JSON prints them, `fallback` when absent or null.
std::string field_text(const nlohmann::json& j, const char* key, const std::string& fallback = "-");
/// A gram value of a certificate or result: exact decimal strings print exactly in a readable unit,
/// computed numbers through mass_text; "-" when absent.
std::string grams_field(const nlohmann::json& j, const char* key);
/// The item's identification on a certificate, "Norvale NX-220, serial NX22-00417, asset tag QA-17", from the
/// instrument block's maker, model, serial and asset_tag; "" when none is recorded.
std::string identity_text(const nlohmann::json& instrument);
/// The closing part every text certificate shares: signature lines, the caution and the content hash.
std::string certificate_closing_text(const nlohmann::json& certificate, const std::string& content_sha256);
/// The reasons (each fail) and notes of a result, wrapped as list items.
std::string reasons_and_notes_text(const nlohmann::json& result);

/// Free text made safe to print on one line: control characters (C0, DEL, C1), line and paragraph separators and
/// bidirectional overrides become visible escapes (\n, \t, \x1b, \u{2028}), as do bytes that are not UTF-8, so a
/// name or reason cannot end a line, start a forged one or reorder what a terminal shows.
std::string printable(std::string_view text);

/// A computed mass in mg with decimals that follow the readability d (decimal grams, "0.0001"): `finer` decimals
/// more than d has in mg, so d = 0.01 mg and finer 1 print "+0.018 mg". A d of 1 mg or more counts as 0 decimals.
std::string milligrams_for_d(double grams, const std::string& d_g, int finer, bool with_sign);

/// A computed gram value with a fixed number of decimals ("-" when absent).
std::string fixed_grams_field(const nlohmann::json& j, const char* key, int decimals);

}  // namespace plumb::report
