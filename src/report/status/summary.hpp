#pragma once
// The lab summary (`plumb summary`) as text, CSV or JSON, written row by row as the rows arrive so that a lab
// of thousands of instruments is printed without being held in memory.
#include <cstddef>
#include <ostream>
#include <string>

#include "report/status/views.hpp"

namespace plumb::report {

enum class SummaryFormat { as_text, as_csv, as_json };

class SummaryWriter {
public:
  SummaryWriter(std::ostream& out, SummaryFormat format, Date on);
  void row(const SummaryRow& r);
  /// The closing lines (the count, the end of the JSON document).
  void finish();

private:
  std::ostream& out_;
  SummaryFormat format_;
  std::size_t count_ = 0;
};

}  // namespace plumb::report
