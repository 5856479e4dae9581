#include "core/line_splitter.hpp"

namespace plumb {

void LineSplitter::feed(std::string_view bytes) {
  for (const char c : bytes) {
    if (c == '\r' || c == '\n') {
      if (!partial_.empty()) lines_.push_back(std::move(partial_));
      partial_.clear();
      continue;
    }
    partial_ += c;
    if (partial_.size() >= longest_balance_line) {
      lines_.push_back(std::move(partial_));
      partial_.clear();
    }
  }
}

std::optional<std::string> LineSplitter::next() {
  if (lines_.empty()) return std::nullopt;
  std::string line = std::move(lines_.front());
  lines_.pop_front();
  return line;
}

}  // namespace plumb
