#pragma once
// Importing years of check history from one CSV file (format in core/history_csv.hpp). Every run is
// validated and computed by build_check_run exactly like a typed `check record`, and the whole file is
// written in one transaction: a bad row rejects the import with its line number and nothing is written.
// A file is remembered by the SHA-256 of its bytes (table import_batches), so importing it again is refused.
#include <filesystem>
#include <functional>
#include <map>
#include <string>
#include <vector>

#include "core/dates.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

struct ImportedInstrument {
  long long runs = 0;
  long long readings = 0;
  long long failed = 0;
  Date first_on;
  Date last_on;
};

struct FailedRun {
  std::int64_t run_id = 0;
  std::string instrument;
  std::string date;
  int first_line = 0;
};

struct ImportReport {
  std::int64_t batch_id = 0;
  std::string file_sha256;
  long long runs = 0;
  long long readings = 0;
  std::int64_t first_run_id = 0;
  std::int64_t last_run_id = 0;
  std::map<std::string, ImportedInstrument> instruments;
  std::vector<FailedRun> failures;  ///< runs that failed their check in the history
};

/// Imports `file`; `source` names it in messages. `progress(bytes_done, bytes_total)` is called as it goes.
ImportReport import_history(store::Database& db, const store::Actor& actor, const std::filesystem::path& file,
                            const std::string& source,
                            const std::function<void(long long, long long)>& progress = nullptr);

}  // namespace plumb::app
