#pragma once
// The two ends a capture at the bench talks to in the tests: a simulated balance (a pseudo-terminal the test writes
// balance lines to) and a real terminal (a pseudo-terminal the test types on as a technician would).
#include <catch2/catch.hpp>

#include <fcntl.h>
#include <poll.h>
#include <pty.h>
#include <termios.h>
#include <unistd.h>

#include <cerrno>
#include <chrono>
#include <string>
#include <thread>

namespace plumb::test {

/// The simulated balance: a pseudo-terminal. plumb reads the slave side (by its name); the test writes to the
/// master side as the balance would, and holds a slave descriptor of its own to see when plumb has read a piece.
class BalanceSimulator {
 public:
  BalanceSimulator() {
    REQUIRE(::openpty(&master_, &slave_, nullptr, nullptr, nullptr) == 0);
    termios t{};
    ::tcgetattr(slave_, &t);
    ::cfmakeraw(&t);  // bytes pass as the balance sent them: no echo, CR not turned into LF
    ::tcsetattr(slave_, TCSANOW, &t);
    // plumb opens the slave through this process's descriptor: some containers mount a devpts instance of
    // their own over /dev/pts, where the slave's name (ptsname) does not exist.
    device_ = "/proc/" + std::to_string(::getpid()) + "/fd/" + std::to_string(slave_);
  }
  ~BalanceSimulator() {
    close_line();
    if (slave_ >= 0) ::close(slave_);
  }
  BalanceSimulator(const BalanceSimulator&) = delete;
  BalanceSimulator& operator=(const BalanceSimulator&) = delete;
  [[nodiscard]] const std::string& device() const { return device_; }

  /// Sends bytes as the balance would. (When plumb has read them, the test learns from what plumb prints: the
  /// kernel moves bytes from the master to the slave's queue asynchronously, so an empty queue does not mean read.)
  void send(const std::string& bytes) const {
    REQUIRE(::write(master_, bytes.data(), bytes.size()) == static_cast<ssize_t>(bytes.size()));
  }
  /// Sends half a line, and the rest once plumb has had time to read the first half on its own (it waits on the
  /// port with poll and reads at once; 20 ms is ample).
  void send_split(const std::string& first, const std::string& rest) const {
    send(first);
    std::this_thread::sleep_for(std::chrono::milliseconds(20));
    send(rest);
  }
  /// What plumb sent to the balance, once `bytes` of it have come (at most 10 s).
  [[nodiscard]] std::string received(std::size_t bytes) const {
    std::string got;
    for (int waited_ms = 0; got.size() < bytes; ++waited_ms) {
      REQUIRE(waited_ms < 10000);
      pollfd p{master_, POLLIN, 0};
      if (::poll(&p, 1, 1) == 1) {
        char buf[64];
        const ssize_t n = ::read(master_, buf, sizeof buf);
        if (n > 0) got.append(buf, static_cast<std::size_t>(n));
      }
    }
    return got;
  }
  /// The cable pulled: the balance's end goes away.
  void close_line() {
    if (master_ >= 0) ::close(master_);
    master_ = -1;
  }

 private:
  int master_ = -1, slave_ = -1;
  std::string device_;
};

/// plumb on a real terminal: its stdin and stdout are a pseudo-terminal's slave, in the terminal's usual line
/// mode, and the test types on the master side as a technician would at the keyboard.
class Terminal {
 public:
  Terminal() {
    char name[128] = {};
    REQUIRE(::openpty(&master_, &slave_, name, nullptr, nullptr) == 0);
    ::fcntl(master_, F_SETFL, O_NONBLOCK);
  }
  ~Terminal() {
    if (master_ >= 0) ::close(master_);
    if (slave_ >= 0) ::close(slave_);
  }
  Terminal(const Terminal&) = delete;
  Terminal& operator=(const Terminal&) = delete;
  [[nodiscard]] int slave() const { return slave_; }
  /// Once plumb has the slave, the test lets go of it, so the master reads end when plumb ends.
  void release_slave() {
    ::close(slave_);
    slave_ = -1;
  }
  void type(const std::string& keys) const {
    REQUIRE(::write(master_, keys.data(), keys.size()) == static_cast<ssize_t>(keys.size()));
  }
  /// Reads the screen until `text` appears after what was seen before (at most 10 s).
  void wait_for(const std::string& text) {
    for (int waited_ms = 0; screen_.find(text, seen_) == std::string::npos; ++waited_ms) {
      INFO("waiting for: " << text << "\nscreen so far:\n" << screen_);
      REQUIRE(waited_ms < 10000);
      if (!drain()) std::this_thread::sleep_for(std::chrono::milliseconds(1));
    }
    seen_ = screen_.find(text, seen_) + text.size();
  }
  /// Reads until plumb has closed the terminal.
  void read_to_end() {
    for (int waited_ms = 0; !closed_; ++waited_ms) {
      REQUIRE(waited_ms < 10000);
      if (!drain()) std::this_thread::sleep_for(std::chrono::milliseconds(1));
    }
  }
  [[nodiscard]] const std::string& screen() const { return screen_; }

 private:
  bool drain() {
    char buf[512];
    const ssize_t n = ::read(master_, buf, sizeof buf);
    if (n > 0) screen_.append(buf, static_cast<std::size_t>(n));
    if (n == 0 || (n < 0 && errno == EIO)) closed_ = true;
    return n > 0;
  }
  int master_ = -1, slave_ = -1;
  std::string screen_;
  std::size_t seen_ = 0;
  bool closed_ = false;
};

}  // namespace plumb::test
