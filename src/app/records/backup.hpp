#pragma once
// Backing up and restoring the database with SQLite's online backup API, which copies a consistent
// snapshot while other plumb processes keep reading and writing. A copy counts only once it has passed
// PRAGMA integrity_check and `audit verify`.
#include <filesystem>
#include <functional>
#include <optional>
#include <string>

#include "store/audit_trail.hpp"
#include "store/checkpoints.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"
#include "store/trail_comparison.hpp"

namespace plumb::app {

struct CopyCheck {
  bool ok = false;
  std::string failure;       ///< one sentence when not ok
  std::string integrity;     ///< PRAGMA integrity_check's first line ("ok" when sound)
  int schema_version = 0;
  store::AuditVerification audit;
};

struct BackupOutcome {
  std::filesystem::path file;
  CopyCheck check;  ///< when not ok the copy was removed
};

/// Copies `db` to `file` (refused when it exists, unless `force`), then verifies the copy. The copy is
/// written beside `file` and renamed into place only when verified.
BackupOutcome backup_database(store::Database& db, const std::filesystem::path& file, bool force);

struct RestoreRequest {
  std::filesystem::path db_path;  ///< the database to restore into
  std::filesystem::path file;     ///< the backup
  bool force = false;             ///< replace an existing database
  bool other_lab = false;         ///< ... even one whose lab is not the backup's lab
  std::string reason;             ///< why; recorded in the restored trail
};

struct RestoreOutcome {
  CopyCheck source;                     ///< verification of the backup file, before anything was written
  bool restored = false;
  bool replaced_existing = false;
  std::filesystem::path previous_saved;  ///< where the replaced database was saved, if there was one
  std::int64_t previous_records = 0;     ///< audit records the replaced database had
  store::TrailComparison difference;     ///< the replaced trail (first) against the backup's (second)
  std::optional<store::LabIdentity> replaced_lab, backup_lab;
  std::optional<store::Checkpoint> backup_checkpoint;  ///< the backup's last signed checkpoint (recorded with it)
  store::AuditVerification after;        ///< the restored database, verified again once in place
};

/// Verifies the backup, then copies it over the database (refused when that exists, unless `force`; refused when
/// the two belong to different labs, unless also `other_lab`). The replaced content is first saved beside it as
/// DB.before-restore-TIMESTAMP (a new name each time, mode 0600). The restore is recorded in the restored trail
/// (table restores): the backup file, its SHA-256, last audit hash and last signed checkpoint, who, why, and how
/// many audit records of the replaced database the restore removed; then signed like any command. Refused first
/// when the lab's signing key (store::key_path_for) cannot be read.
/// `who` authenticates the person restoring: against the database being replaced when there is one (before
/// anything changes), else against the restored accounts (a failure removes the restored file again).
RestoreOutcome restore_database(const RestoreRequest& request,
                                const std::function<store::Actor(store::Database&)>& who);

/// Integrity check, schema version and audit verification of the database file at `path`, opened read-only.
CopyCheck check_copy(const std::filesystem::path& path);

}  // namespace plumb::app
