#pragma once
// The lab's signing key: created with the database (`init`), or for a database from before signed checkpoints
// (`key create`), whose first checkpoint then covers the records written before checkpoints.
#include <filesystem>
#include <optional>
#include <string>

#include "store/checkpoints.hpp"
#include "store/database.hpp"
#include "store/recorder.hpp"

namespace plumb::app {

struct LabKeyFiles {
  std::filesystem::path key, public_key;
  std::string fingerprint;
  bool created = false;  ///< false: the key file existed and is used as it is
};

/// The key of `db` (store::key_path_for): read when its file exists, else generated and written (0600) with its
/// public key beside it. Used by `init` before the lab's first record.
LabKeyFiles ensure_lab_key(const std::filesystem::path& db);

struct KeyCreation {
  LabKeyFiles files;
  std::optional<store::Checkpoint> first;  ///< the checkpoint signed at once (of the records already there)
};

/// `plumb key create`: a new key for a database that has none, and its first checkpoint, covering the records
/// written before checkpoints. Refused when the key file exists, or when the database already has checkpoints (they
/// were signed with another key, which a new one cannot continue).
KeyCreation create_lab_key(store::Database& db, const store::Actor& actor);

}  // namespace plumb::app
