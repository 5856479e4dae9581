// Fuzzes the rule for stored text: any bytes give a fault or none without a crash; a text with no fault is shown
// unchanged; what shown_on_one_line writes never has a fault itself (so a message is always one line); and a
// fault names a character and byte inside the text.
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/errors.hpp"
#include "core/text_field.hpp"

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view text(reinterpret_cast<const char*>(data), size);
  const auto fault = plumb::text_fault(text);
  const std::string shown = plumb::shown_on_one_line(text);
  if (plumb::text_fault(shown)) std::abort();
  if (!fault && shown != text) std::abort();
  if (fault && (fault->byte >= size || fault->character == 0 || fault->character > size)) std::abort();
  try {
    plumb::check_text_field(text, "fuzz");
    if (fault) std::abort();
  } catch (const plumb::InputError&) {
    if (!fault) std::abort();
  }
  return 0;
}
