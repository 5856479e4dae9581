// Fuzzes the history import parser line by line, as the importer feeds it: any bytes give runs or raise
// InputError; every run has readings, and its lines are in order within the text.
#include <cstdint>
#include <cstdlib>
#include <string_view>

#include "core/errors.hpp"
#include "core/history_csv.hpp"

namespace {

void check(const plumb::HistoryRun& run, int lines) {
  if (run.readings.empty() || run.weights.empty()) std::abort();
  if (run.first_line < 2 || run.first_line > run.last_line || run.last_line > lines) std::abort();
  if (run.readings.front().line != run.first_line || run.readings.back().line != run.last_line) std::abort();
}

}  // namespace

extern "C" int LLVMFuzzerTestOneInput(const std::uint8_t* data, std::size_t size) {
  std::string_view text(reinterpret_cast<const char*>(data), size);
  plumb::HistoryCsvParser parser("fuzz.csv");
  try {
    while (true) {
      const std::size_t end = text.find('\n');
      if (auto run = parser.feed(text.substr(0, end))) check(*run, parser.line());
      if (end == std::string_view::npos) break;
      text.remove_prefix(end + 1);
    }
    if (auto run = parser.finish()) check(*run, parser.line());
  } catch (const plumb::InputError&) {
  }
  return 0;
}
