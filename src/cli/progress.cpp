#include "cli/progress.hpp"

#include <fmt/ostream.h>

namespace plumb::cli {

void Progress::update(long long done, long long total) {
  if (!on_ || total <= 0) return;
  const int percent = static_cast<int>(100 * done / total);
  if (percent == last_percent_) return;
  last_percent_ = percent;
  const int filled = percent / 5;
  fmt::print(out_, "\r{} [{}{}] {:3}% ({}/{})", label_, std::string(static_cast<std::size_t>(filled), '#'),
             std::string(static_cast<std::size_t>(20 - filled), ' '), percent, done, total);
  out_.flush();
}

void Progress::finish() {
  if (on_ && last_percent_ >= 0) fmt::print(out_, "\n");
}

}  // namespace plumb::cli
