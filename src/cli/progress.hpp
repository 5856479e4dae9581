#pragma once
// A progress line for long work on a terminal; silent when output is piped.
#include <chrono>
#include <ostream>
#include <string>

namespace plumb::cli {

class Progress {
public:
  Progress(std::ostream& out, std::string label, bool enabled) : out_(out), label_(std::move(label)), on_(enabled) {}
  void update(long long done, long long total);
  void finish();

private:
  std::ostream& out_;
  std::string label_;
  bool on_;
  int last_percent_ = -1;
};

}  // namespace plumb::cli
