#pragma once
// Ctrl-C during a capture: the handler only notes it, and the capture loop (which wakes at least every few
// tenths of a second) stops without writing. The previous handler comes back when the guard goes.
#include <csignal>

namespace plumb::capture {

class InterruptGuard {
 public:
  InterruptGuard();
  ~InterruptGuard();
  InterruptGuard(const InterruptGuard&) = delete;
  InterruptGuard& operator=(const InterruptGuard&) = delete;
  [[nodiscard]] static bool interrupted();

 private:
  struct sigaction previous_ {};
};

}  // namespace plumb::capture
