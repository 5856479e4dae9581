#include <sqlite3.h>
#include <sys/stat.h>

#include <iostream>

#include "cli/command.hpp"

int main(int argc, char** argv) {
  // Before any other SQLite call: no allocation statistics, which SQLite would otherwise keep under a global
  // mutex on every allocation (a batch import makes millions of them).
  sqlite3_config(SQLITE_CONFIG_MEMSTATUS, 0);
  // Every file plumb creates (the database and its journal, backups, certificates, reports, charts) holds the
  // lab's records: readable and writable by its owner only (0600; folders 0700) until run() has read whether the
  // lab shares them with a group (PLUMB_GROUP, store/file_access.hpp).
  umask(077);
  return plumb::cli::run(argc, argv, std::cout, std::cerr);
}
