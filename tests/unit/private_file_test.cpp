// Exclusive creation of files readable by their owner only (store/private_file.hpp).
#include <catch2/catch.hpp>

#include <sys/stat.h>

#include <fstream>

#include "store/private_file.hpp"
#include "support/run_plumb.hpp"

using namespace plumb;

TEST_CASE("private files are created exclusively with mode 0600, a taken name gets a counter", "[unit][files]") {
  test::ScratchDir dir;
  const auto base = dir.file("lab.db.before-restore-20261203T070000Z");
  CHECK(store::create_private_file(base));
  CHECK_FALSE(store::create_private_file(base));  // never opens what exists
  std::ofstream(base) << "first";
  const auto second = store::create_unique_private_file(base);
  CHECK(second == base.string() + "-2");
  const auto third = store::create_unique_private_file(base);
  CHECK(third == base.string() + "-3");
  for (const auto& p : {base, second, third}) {
    struct stat st {};
    REQUIRE(::stat(p.c_str(), &st) == 0);
    CHECK((st.st_mode & 0777U) == 0600U);
  }
  std::ifstream in(base);
  std::string text;
  in >> text;
  CHECK(text == "first");
}
