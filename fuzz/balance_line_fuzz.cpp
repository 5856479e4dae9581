// Fuzzes the balance line parser: the first line of the input is tried as a lab's line pattern (it parses or
// raises InputError), the rest is fed in two pieces through the line splitter, and every line is read by the
// pattern and by the common shapes. A reading's value re-parses from its own text; no line is longer than the
// splitter allows; the escaped form of any bytes is printable ASCII.
#include <cstdint>
#include <cstdlib>
#include <optional>
#include <string_view>

#include "core/balance_line.hpp"
#include "core/errors.hpp"
#include "core/line_splitter.hpp"

namespace {

void check_reading(const std::optional<plumb::BalanceLineReading>& r) {
  if (!r) return;
  if (plumb::Decimal::parse(r->text) != r->value) std::abort();
  if (r->unit_text.empty()) std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  const std::string_view input(reinterpret_cast<const char*>(data), size);
  const std::size_t end = input.find('\n');
  const std::string_view pattern_text = input.substr(0, end == std::string_view::npos ? input.size() : end);
  const std::string_view lines = end == std::string_view::npos ? std::string_view() : input.substr(end + 1);
  std::optional<plumb::LinePattern> pattern;
  try {
    pattern = plumb::LinePattern::parse(pattern_text, "--line-pattern");
  } catch (const plumb::InputError&) {
  }
  plumb::LineSplitter splitter;
  splitter.feed(lines.substr(0, lines.size() / 2));
  splitter.feed(lines.substr(lines.size() / 2));
  while (const auto line = splitter.next()) {
    if (line->size() > plumb::longest_balance_line) std::abort();
    check_reading(plumb::read_balance_line(*line));
    if (pattern) check_reading(plumb::read_balance_line(*line, &*pattern));
    for (const char c : plumb::escaped_line(*line))
      if (static_cast<unsigned char>(c) < 0x20 || static_cast<unsigned char>(c) >= 0x7f) std::abort();
  }
  return 0;
}
