// Commands that draw nothing do not load the drawing libraries (cairo, pango and what they pull in); a command
// that draws loads them through the drawing module. Read from the dynamic loader's own account of what it
// loaded (glibc's LD_DEBUG=libs), not from a timing.
#include <catch2/catch.hpp>

#include <cstdio>
#include <string>
#include <vector>

#include "support/paths.hpp"
#include "support/run_plumb.hpp"

namespace {

// What the loader reports while `plumb ARGS` runs in `cwd` (its own output discarded).
std::string loader_log(const std::string& args, const std::filesystem::path& cwd) {
  const std::string cmd = "cd '" + cwd.string() + "' && LD_DEBUG=libs '" + plumb::test::plumb_binary().string() +
                          "' " + args + " 2>&1 >/dev/null";
  std::string out;
  if (FILE* p = popen(cmd.c_str(), "r")) {
    char buf[4096];
    std::size_t n;
    while ((n = fread(buf, 1, sizeof buf, p)) > 0) out.append(buf, n);
    pclose(p);
  }
  return out;
}

}  // namespace

TEST_CASE("commands that draw nothing do not load cairo or pango, and a command that draws loads them through the module",
          "[cli][startup]") {
  plumb::test::ScratchDir dir;
  const auto db = plumb::test::example_lab(dir).string();
  const std::vector<std::string> quiet = {"--help", "--db '" + db + "' due --on 2026-03-31",
                                          "--db '" + db + "' balance list"};
  for (const auto& args : quiet) {
    const std::string log = loader_log(args, dir.path());
    INFO(args);
    REQUIRE(log.find("calling init") != std::string::npos);  // the loader did report: LD_DEBUG works here
    CHECK(log.find("libcairo") == std::string::npos);
    CHECK(log.find("libpango") == std::string::npos);
    CHECK(log.find("plumb-drawing.so") == std::string::npos);
  }
  // The demo draws its logo, a certificate PDF and the report's charts.
  const std::string drawn = loader_log("demo", dir.path());
  CHECK(drawn.find("plumb-drawing.so") != std::string::npos);
  CHECK(drawn.find("libcairo") != std::string::npos);
}
