#pragma once
// Bytes from a balance's data output arrive in pieces that need not end where a line ends (a read may stop
// half-way through a line, or hold three). LineSplitter joins the pieces and hands out whole lines.
#include <cstddef>
#include <deque>
#include <optional>
#include <string>
#include <string_view>

namespace plumb {

/// A line longer than this is not a reading from a balance (they print a few dozen bytes): it is handed out
/// as it stands once this many bytes have come without a line end, so garbage cannot grow the buffer.
inline constexpr std::size_t longest_balance_line = 200;

class LineSplitter {
 public:
  /// Appends bytes as they arrived. CR, LF and CR LF each end a line; empty lines are dropped.
  void feed(std::string_view bytes);
  /// The next whole line, without its line end.
  std::optional<std::string> next();
  /// Bytes received after the last line end (an unfinished line when the line closed).
  [[nodiscard]] const std::string& unfinished() const { return partial_; }

 private:
  std::deque<std::string> lines_;
  std::string partial_;
};

}  // namespace plumb
