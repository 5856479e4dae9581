// PLUMB_GROUP: a lab whose database is written by several operating-system accounts names one group, and the files
// plumb creates for its records (folders, database, key, backups) are the group's: 0660 files, 02770 folders
// (set-group-ID, so that SQLite's -wal and -shm files join the group). Without it they are the owner's alone
// (people_test.cpp). A session token is personal and stays 0600 either way.
#include <grp.h>
#include <sys/stat.h>
#include <unistd.h>
#include <catch2/catch.hpp>

#include <cstdlib>
#include <filesystem>
#include <string>

#include "support/run_plumb.hpp"

using plumb::test::run_plumb;
using plumb::test::ScratchDir;

namespace {

struct stat status_of(const std::filesystem::path& p) {
  struct stat st {};
  REQUIRE(::stat(p.c_str(), &st) == 0);
  return st;
}

/// Sets an environment variable for the plumb processes this test starts, and unsets it again.
class ScopedEnv {
 public:
  ScopedEnv(const char* name, const std::string& value) : name_(name) { ::setenv(name, value.c_str(), 1); }
  ~ScopedEnv() { ::unsetenv(name_); }
  ScopedEnv(const ScopedEnv&) = delete;
  ScopedEnv& operator=(const ScopedEnv&) = delete;

 private:
  const char* name_;
};

std::string password_file(const ScratchDir& dir) {
  dir.write("admin.pw", "a long admin password\n");
  ::chmod(dir.file("admin.pw").c_str(), 0600);
  return dir.file("admin.pw").string();
}

}  // namespace

TEST_CASE("with PLUMB_GROUP the lab's folders, database, key and backups belong to that group", "[people][files]") {
  // The test user's own primary group: a group every account may give its files to.
  const group* own = ::getgrgid(::getgid());
  REQUIRE(own != nullptr);
  const std::string group_name = own->gr_name;
  ScratchDir dir;
  const ScopedEnv env("PLUMB_GROUP", group_name);
  const auto folder = dir.path() / "shared";
  const auto db = folder / "lab.db";
  auto r = run_plumb({"--db", db.string(), "--password-file", password_file(dir), "init", "--lab", "Group Lab",
                      "--admin", "ada", "--admin-name", "Ada Quill"},
                     dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK((status_of(folder).st_mode & 07777) == 02770);
  CHECK(status_of(folder).st_gid == own->gr_gid);
  for (const auto& file : {db, std::filesystem::path(db.string() + ".key")}) {
    INFO(file);
    CHECK((status_of(file).st_mode & 07777) == 0660);
    CHECK(status_of(file).st_gid == own->gr_gid);
  }
  r = run_plumb({"--db", db.string(), "backup", (dir.path() / "copy.db").string()}, dir.path());
  INFO(r.err);
  REQUIRE(r.status == 0);
  CHECK((status_of(dir.path() / "copy.db").st_mode & 07777) == 0660);
  CHECK(status_of(dir.path() / "copy.db").st_gid == own->gr_gid);
}

TEST_CASE("a PLUMB_GROUP that names no group is refused before any file is created", "[people][files]") {
  ScratchDir dir;
  const ScopedEnv env("PLUMB_GROUP", "no-such-group-for-plumb");
  const auto db = dir.path() / "lab.db";
  const auto r = run_plumb({"--db", db.string(), "--password-file", password_file(dir), "init", "--lab", "Group Lab",
                            "--admin", "ada", "--admin-name", "Ada Quill"},
                           dir.path());
  CHECK(r.status == 2);
  CHECK(r.err ==
        "plumb: PLUMB_GROUP \"no-such-group-for-plumb\" is not a group of this system (see /etc/group); unset it to "
        "keep the lab's files readable by their owner only.\n");
  CHECK_FALSE(std::filesystem::exists(db));
  CHECK_FALSE(std::filesystem::exists(db.string() + ".key"));
}
