#include <sqlite3.h>

#include <iostream>

#include "cli/command.hpp"

int main(int argc, char** argv) {
  // Before any other SQLite call: no allocation statistics, which SQLite would otherwise keep under a global
  // mutex on every allocation (a batch import makes millions of them).
  sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0);
  return plumb::cli::run(argc, argv, std::cout, std::cerr);
}
