// Fuzzes date and interval parsing: any text parses or raises InputError; a parsed date prints back to the
// same date, a parsed interval to the same interval, and adding an interval never goes backwards.
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/dates.hpp"
#include "core/errors.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  try {
    const plumb::Date d = plumb::parse_date(text, "fuzz");
    if (plumb::parse_date(plumb::to_string(d)) != d) std::abort();
    if (plumb::days_between(d, plumb::add_days(d, 30)) != 30) std::abort();
  } catch (const plumb::InputError&) {
  }
  try {
    const plumb::Interval i = plumb::Interval::parse(text, "fuzz");
    if (plumb::Interval::parse(i.to_string()) != i) std::abort();
    const plumb::Date start = plumb::parse_date("2024-01-31");
    if (plumb::days_between(start, plumb::add_interval(start, i)) <= 0) std::abort();
  } catch (const plumb::InputError&) {
  }
  return 0;
}
