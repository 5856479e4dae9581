#include "app/runs/import.hpp"

#include <SQLiteCpp/Statement.h>
#include <SQLiteCpp/Transaction.h>
#include <fmt/format.h>

#include <array>
#include <condition_variable>
#include <exception>
#include <fstream>
#include <mutex>
#include <thread>

#include "app/weekly_check/record.hpp"
#include "checks/procedure.hpp"
#include "core/errors.hpp"
#include "core/history_csv.hpp"
#include "store/file_digest.hpp"
#include "store/repository.hpp"

namespace plumb::app {
namespace {

// build_check_run names the options of `check record`; in an import the same values come from columns.
std::string as_column_message(std::string message) {
  constexpr std::array<std::pair<std::string_view, std::string_view>, 3> renames{
      {{"--weight", "weight"}, {"--on", "date"}, {"--procedure", "procedure"}}};
  for (const auto& [option, column] : renames)
    if (message.rfind(option, 0) == 0 && message.size() > option.size() &&
        (message[option.size()] == ' ' || message[option.size()] == ':'))
      return std::string(column) + message.substr(option.size());
  return message;
}

/// A history file holds one reading per row: the shape of a weekly check. Other procedures have run files of
/// their own (calibration loads, pipette volumes) and are recorded with `check record`.
void require_importable(const std::string& key) {
  const checks::Procedure p = checks::parse_procedure(key, "procedure");
  switch (p) {
    case checks::Procedure::repeatability: return;
    case checks::Procedure::calibration:
    case checks::Procedure::gravimetric:
      throw InputError(fmt::format("procedure \"{}\" cannot be imported from a history file of one reading per row; "
                                   "record it with `plumb check record ... --procedure {}` and its run file.",
                                   key, key));
  }
}

class Importer {
public:
  Importer(store::Database& db, store::Recorder& rec, std::string source)
      : rec_(rec), lookups_(db), source_(std::move(source)) {
    lookups_.load_all();  // from here on, validating a run reads nothing from the database
  }

  /// Validates and computes one run and prepares its rows and audit record (no database access).
  store::PreparedGroup prepare(HistoryRun& run) {
    CheckInput in;
    in.instrument_id = std::move(run.instrument);
    in.weight_ids = std::move(run.weights);
    in.on = run.date;
    in.operator_name = std::move(run.operator_name);
    in.readings_source = source_;
    const long long readings = static_cast<long long>(run.readings.size());
    in.parsed_readings = std::move(run.readings);
    store::RunRecord built;
    try {
      require_importable(run.procedure);
      built = build_check_run(lookups_, in);
    } catch (const InputError& e) {
      std::string message = e.what();
      if (message.rfind(source_ + " line ", 0) == 0) throw;  // already names its line in the import file
      if (message.rfind(source_ + ": ", 0) == 0) message.erase(0, source_.size() + 2);
      throw InputError(fmt::format("{} line {} (run of {} on {}): {}", source_, run.first_line, in.instrument_id,
                                   run.date, as_column_message(message)));
    }
    std::int64_t id = 0;
    const bool failed = built.verdict == Verdict::fail;
    const Date on = built.performed_on;
    store::PreparedGroup prepared = store::prepare_run(rec_, std::move(built), id);

    auto [it, fresh] = report_.instruments.try_emplace(in.instrument_id);
    ImportedInstrument& ins = it->second;
    if (fresh) ins.first_on = ins.last_on = on;
    ins.first_on = std::min(ins.first_on, on);
    ins.last_on = std::max(ins.last_on, on);
    ++ins.runs;
    ins.readings += readings;
    if (failed) {
      ++ins.failed;
      report_.failures.push_back({id, in.instrument_id, run.date, run.first_line});
    }
    if (report_.first_run_id == 0) report_.first_run_id = id;
    report_.last_run_id = id;
    ++report_.runs;
    report_.readings += readings;
    return prepared;
  }

  ImportReport& report() { return report_; }

private:
  store::Recorder& rec_;
  CheckLookups lookups_;
  std::string source_;
  ImportReport report_;
};

/// A second thread that prepares chunks of runs one chunk ahead of the thread that writes them. One long-lived
/// thread (not one per chunk), so that its allocator caches stay warm; written chunks are handed back and freed
/// there too, by the thread that allocated them.
class ChunkQueue {
public:
  using Chunk = std::vector<store::PreparedGroup>;
  /// `produce` fills the next chunk and sets `last` on the final one; it runs on the second thread only.
  explicit ChunkQueue(std::function<Chunk(bool& last)> produce)
      : produce_(std::move(produce)), worker_([this] { run(); }) {}
  ChunkQueue(const ChunkQueue&) = delete;
  ChunkQueue& operator=(const ChunkQueue&) = delete;
  ~ChunkQueue() {
    {
      const std::lock_guard lock(mutex_);
      stop_ = true;
    }
    changed_.notify_all();
    worker_.join();  // after at most the chunk in preparation
  }

  /// The next chunk, in order; `last` is set on the final one. Rethrows what the producer threw.
  Chunk next(bool& last) {
    std::unique_lock lock(mutex_);
    changed_.wait(lock, [&] { return ready_; });
    if (error_) std::rethrow_exception(error_);
    Chunk chunk = std::move(slot_);
    last = last_;
    ready_ = false;
    changed_.notify_all();
    return chunk;
  }
  /// A written chunk, to be freed on the second thread.
  void recycle(Chunk&& chunk) {
    const std::lock_guard lock(mutex_);
    returned_ = std::move(chunk);
  }

private:
  void run() {
    for (bool last = false; !last;) {
      Chunk spent;
      {
        const std::lock_guard lock(mutex_);
        spent = std::move(returned_);
      }
      spent.clear();
      Chunk chunk;
      std::exception_ptr error;
      try {
        chunk = produce_(last);
      } catch (...) {
        error = std::current_exception();
        last = true;
      }
      std::unique_lock lock(mutex_);
      changed_.wait(lock, [&] { return !ready_ || stop_; });
      if (stop_) return;
      slot_ = std::move(chunk);
      last_ = last;
      error_ = error;
      ready_ = true;
      changed_.notify_all();
    }
  }

  std::function<Chunk(bool& last)> produce_;
  std::mutex mutex_;
  std::condition_variable changed_;
  Chunk slot_, returned_;
  bool ready_ = false, last_ = false, stop_ = false;
  std::exception_ptr error_;
  std::thread worker_;  // last: starts once everything above exists
};

void refuse_repeat(SQLite::Database& db, const std::string& source, const std::string& sha) {
  SQLite::Statement q(db, "SELECT id, file_name, imported_at, imported_by FROM import_batches WHERE file_sha256 = ?");
  q.bind(1, sha);
  if (q.executeStep())
    throw InputError(fmt::format("{}: this file (SHA-256 {}) was already imported as batch {} (\"{}\", {} by {}); "
                                 "it is not imported twice.",
                                 source, sha.substr(0, 16), q.getColumn(0).getInt64(), q.getColumn(1).getString(),
                                 q.getColumn(2).getString(), q.getColumn(3).getString()));
}

}  // namespace

ImportReport import_history(store::Database& db, const store::Actor& actor, const std::filesystem::path& file,
                            const std::string& source, const std::function<void(long long, long long)>& progress) {
  std::error_code ec;
  const auto total = static_cast<long long>(std::filesystem::file_size(file, ec));

  SQLite::Transaction tx(db.sql(), SQLite::TransactionBehavior::IMMEDIATE);
  store::Recorder rec(db.sql(), actor);
  Importer importer(db, rec, source);
  HistoryCsvParser parser(source);

  std::ifstream in(file, std::ios::binary);
  if (!in) throw InputError(fmt::format("import file \"{}\" cannot be read.", file.string()));

  // Two threads: this one writes the runs prepared so far while a second one reads, validates and prepares
  // the next chunk (parsing, statistics, results, audit JSON and hashes). The second thread never touches
  // the database: the registry was read by load_all and the Recorder's batch mode keeps the audit chain and
  // the next ids in memory. Chunks are written in file order, so the trail is the same as one thread's.
  rec.begin_batch({"check_runs", "run_weights", "readings"});
  std::string line;
  long long done = 0;
  const auto prepare_chunk = [&](bool& last) {
    ChunkQueue::Chunk chunk;
    chunk.reserve(256);
    while (chunk.size() < 256 && !last) {
      if (std::getline(in, line)) {
        done += static_cast<long long>(line.size()) + 1;
        if (auto run = parser.feed(line)) chunk.push_back(importer.prepare(*run));
        if (progress && (parser.line() & 4095) == 0) progress(done, total);
      } else {
        last = true;
        if (auto run = parser.finish()) chunk.push_back(importer.prepare(*run));
      }
    }
    return chunk;
  };
  std::string sha;
  {
    // If a write fails, the queue's destructor waits for the chunk in preparation before the rollback; a bad
    // row's InputError comes back from next().
    ChunkQueue queue(prepare_chunk);
    // The file's digest, which refuses a repeated import, is taken here while the first chunk is prepared;
    // nothing is written before the check, and a repeat is reported before any error in the file's rows.
    sha = store::sha256_of_file(file, "import file");
    refuse_repeat(db.sql(), source, sha);
    for (bool last = false; !last;) {
      ChunkQueue::Chunk chunk = queue.next(last);
      rec.write(chunk);
      queue.recycle(std::move(chunk));
    }
  }
  rec.end_batch();

  ImportReport& report = importer.report();
  report.file_sha256 = sha;
  report.batch_id = rec.insert("import_batches",
                               {{"file_sha256", sha},
                                {"file_name", source},
                                {"runs", report.runs},
                                {"readings", report.readings},
                                {"first_run_id", report.first_run_id},
                                {"last_run_id", report.last_run_id},
                                {"imported_at", rec.now()},
                                {"imported_by", actor.name}},
                               {"id"}, "history import");
  rec.commit(tx);
  if (progress) progress(total, total);
  return std::move(report);
}

}  // namespace plumb::app
