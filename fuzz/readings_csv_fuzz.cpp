// Fuzzes the readings CSV parser: any bytes either give readings or raise InputError; every reading's line
// number lies within the text and its value re-parses from its own text.
#include <algorithm>
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/errors.hpp"
#include "core/readings_csv.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  try {
    const auto readings = plumb::parse_readings_csv(text, "fuzz.csv", plumb::MassUnit::g);
    const auto lines = static_cast<int>(std::count(text.begin(), text.end(), '\n')) + 1;
    for (const auto& r : readings) {
      if (r.line < 2 || r.line > lines) std::abort();
      if (plumb::Decimal::parse(r.reading.text) != r.reading.value) std::abort();
    }
  } catch (const plumb::InputError&) {
  }
  return 0;
}
