// Output files are written whole or not at all (src/store/file_output.hpp), and a command that fails removes
// the file and folders it created (src/store/created_file.hpp).
#include <catch2/catch.hpp>

#include <fstream>
#include <sstream>

#include "core/errors.hpp"
#include "store/created_file.hpp"
#include "store/file_output.hpp"
#include "support/run_plumb.hpp"

namespace fs = std::filesystem;
using namespace plumb;

namespace {

std::string slurp(const fs::path& p) {
  std::ifstream in(p, std::ios::binary);
  std::stringstream s;
  s << in.rdbuf();
  return s.str();
}

std::size_t entries(const fs::path& dir) {
  return static_cast<std::size_t>(std::distance(fs::directory_iterator(dir), fs::directory_iterator()));
}

}  // namespace

TEST_CASE("an output file is written whole, replacing the old one, with no scratch file left", "[file_output]") {
  test::ScratchDir dir;
  store::write_whole_file(dir.file("c.pdf"), "first", "PDF file");
  store::write_whole_file(dir.file("c.pdf"), "second, longer", "PDF file");
  CHECK(slurp(dir.file("c.pdf")) == "second, longer");
  CHECK(entries(dir.path()) == 1);
}

TEST_CASE("an output file that cannot be written leaves nothing behind", "[file_output]") {
  test::ScratchDir dir;
  CHECK_THROWS_AS(store::write_whole_file(dir.file("missing/c.pdf"), "x", "PDF file"), StorageError);
  CHECK_THROWS_WITH(store::write_whole_file(dir.file("missing/c.pdf"), "x", "PDF file"),
                    Catch::Contains("cannot write the PDF file") && Catch::Contains("missing/c.pdf"));
  // A folder where the file should go: the rename fails, and the scratch file is removed.
  fs::create_directory(dir.file("taken.pdf"));
  CHECK_THROWS_AS(store::write_whole_file(dir.file("taken.pdf"), "x", "PDF file"), StorageError);
  CHECK(entries(dir.path()) == 1);
}

TEST_CASE("a created file and its new folders go when the command fails, and stay when it succeeds", "[file_output]") {
  test::ScratchDir dir;
  {
    store::CreatedFileGuard guard(dir.file("a/b/lab.db"));
    fs::create_directories(dir.file("a/b"));
    std::ofstream(dir.file("a/b/lab.db")) << "x";
    std::ofstream(dir.file("a/b/lab.db-wal")) << "x";
  }
  CHECK(entries(dir.path()) == 0);
  {
    store::CreatedFileGuard guard(dir.file("kept.db"));
    std::ofstream(dir.file("kept.db")) << "x";
    guard.keep();
  }
  CHECK(fs::exists(dir.file("kept.db")));
  {
    // A file that was there before is never removed.
    store::CreatedFileGuard guard(dir.file("kept.db"));
  }
  CHECK(fs::exists(dir.file("kept.db")));
}
