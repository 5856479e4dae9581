#define CATCH_CONFIG_RUNNER
#include <catch2/catch.hpp>

#include <cstdlib>

// Databases the unit tests create hash passwords with libsodium's minimum limits (doc/people.md, "Tests"): the
// setting is read only when a new database gets its first administrator.
int main(int argc, char* argv[]) {
  ::setenv("PLUMB_TEST_ONLY_FAST_PASSWORD_HASHING", "1", 1);
  return Catch::Session().run(argc, argv);
}
