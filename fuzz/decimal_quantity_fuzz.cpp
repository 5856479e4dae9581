// Fuzzes the exact decimal and mass-quantity parsers: any text either parses or raises InputError, and what
// parses survives a round trip through its canonical text unchanged.
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/errors.hpp"
#include "core/units.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  try {
    const plumb::Decimal d = plumb::Decimal::parse(text, "fuzz");
    if (plumb::Decimal::parse(d.to_string(), "round trip") != d) std::abort();
    (void)d.significant_scale();
    (void)d.to_double();
  } catch (const plumb::InputError&) {
  }
  try {
    const plumb::ExactMass m = plumb::ExactMass::parse(text, "fuzz");
    (void)m.to_string();
    if (plumb::ExactMass::parse(m.in_grams().to_string() + "g", "round trip") != m) std::abort();
  } catch (const plumb::InputError&) {
  }
  try {
    (void)plumb::parse_mass_unit(text, "fuzz");
  } catch (const plumb::InputError&) {
  }
  return 0;
}
