// The help listings: a column as wide as the longest name, and positional arguments named by what they are.
#include <catch2/catch.hpp>

#include "cli/help_text.hpp"

using plumb::cli::Command;
using plumb::cli::help::name_column_width;
using plumb::cli::help::positional_label;

TEST_CASE("the name column is the longest name and two spaces", "[unit][help]") {
  // "balance set-calibration" is 23 characters: it needs a 25-character column to leave a gap of two.
  CHECK(name_column_width({"init", "balance set-calibration", "due"}) == 25);
  CHECK(name_column_width({"a"}) == 3);
  CHECK(name_column_width({}) == 2);
}

TEST_CASE("a positional id is named by the command's noun", "[unit][help]") {
  Command balance{"balance", "add", "", "", {}, {}};
  Command check{"check", "show", "", "", {}, {}};
  Command weight{"weight", "retire", "", "", {}, {}};
  CHECK(positional_label(balance, "id") == "BALANCE");
  CHECK(positional_label(weight, "id") == "WEIGHT");
  CHECK(positional_label(check, "run") == "RUN");
  CHECK(positional_label(check, "instrument") == "INSTRUMENT");
}
