#include "capture/interrupt.hpp"

namespace plumb::capture {
namespace {

volatile std::sig_atomic_t interrupt_seen = 0;

extern "C" void note_interrupt(int /*signal*/) {
  interrupt_seen = 1;
}

}  // namespace

InterruptGuard::InterruptGuard() {
  interrupt_seen = 0;
  struct sigaction on_interrupt {};
  on_interrupt.sa_handler = note_interrupt;
  sigemptyset(&on_interrupt.sa_mask);
  on_interrupt.sa_flags = 0;  // no SA_RESTART: a blocked wait returns, and the loop sees the flag
  sigaction(SIGINT, &on_interrupt, &previous_);
}

InterruptGuard::~InterruptGuard() {
  sigaction(SIGINT, &previous_, nullptr);
}

bool InterruptGuard::interrupted() {
  return interrupt_seen != 0;
}

}  // namespace plumb::capture
