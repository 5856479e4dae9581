#pragma once
// plumb's `--format csv` output read back with a real CSV parser (Python's csv module, RFC 4180 rules), for
// the CLI tests. Header-only so it needs no build change.
#include <catch2/catch.hpp>

#include <cstdlib>
#include <fstream>
#include <nlohmann/json.hpp>
#include <string>
#include <vector>

#include "support/run_plumb.hpp"

namespace plumb::test {

/// The records of a CSV text as Python's csv.reader returns them.
inline nlohmann::json parse_csv(const ScratchDir& dir, const std::string& text) {
  dir.write("out.csv", text);
  const auto script = dir.file("read.py");
  dir.write("read.py",
            "import csv, json, sys\n"
            "with open(sys.argv[1], newline='', encoding='utf-8') as f:\n"
            "    print(json.dumps(list(csv.reader(f, strict=True))))\n");
  const std::string cmd = "python3 '" + script.string() + "' '" + dir.file("out.csv").string() + "' > '" +
                          dir.file("parsed.json").string() + "'";
  REQUIRE(std::system(cmd.c_str()) == 0);
  std::ifstream in(dir.file("parsed.json"));
  return nlohmann::json::parse(in);
}

/// Runs a CSV command; checks the exit status and that every record has the header's field count.
inline nlohmann::json csv_of(const ScratchDir& dir, const std::vector<std::string>& args) {
  const auto r = run_plumb(args, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  const nlohmann::json rows = parse_csv(dir, r.out);
  REQUIRE(rows.size() >= 1);
  for (std::size_t i = 1; i < rows.size(); ++i) {
    INFO("record " << i << ": " << rows[i].dump());
    CHECK(rows[i].size() == rows[0].size());
  }
  return rows;
}

/// The index of the header's column `name`; fails the test when there is none.
inline std::size_t column(const nlohmann::json& rows, const std::string& name) {
  for (std::size_t i = 0; i < rows[0].size(); ++i)
    if (rows[0][i] == name) return i;
  FAIL("no column " << name);
  return 0;
}

}  // namespace plumb::test
