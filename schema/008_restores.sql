-- A database restored from a backup says so in its own trail: from which file (and that file's SHA-256 and last
-- audit hash), who restored it and why, and what the restore took away from the database it replaced (its audit
-- records after the last one the two trails share). The replaced content itself is kept in the safety copy
-- named here. Append-only like every table.
CREATE TABLE restores (
  id                   INTEGER PRIMARY KEY,
  backup_file          TEXT NOT NULL,     -- absolute path, as it was when restored
  backup_sha256        TEXT NOT NULL,     -- of the backup file's bytes
  backup_records       INTEGER NOT NULL,  -- audit records in the backup
  backup_last_hash     TEXT NOT NULL,
  replaced_records     INTEGER,           -- audit records of the database replaced; NULL when there was none
  replaced_last_hash   TEXT,
  common_records       INTEGER NOT NULL,  -- the longest shared start of the two trails (equal hashes)
  removed_records      INTEGER NOT NULL CHECK (removed_records >= 0),  -- replaced_records - common_records
  safety_copy          TEXT,              -- where the replaced database was saved; NULL when there was none
  reason               TEXT NOT NULL CHECK (length(reason) > 0),
  by_name              TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at          TEXT NOT NULL,
  os_user              TEXT NOT NULL
);

CREATE TRIGGER restores_no_update BEFORE UPDATE ON restores BEGIN SELECT RAISE(ABORT, 'restores are append-only'); END;
CREATE TRIGGER restores_no_delete BEFORE DELETE ON restores BEGIN SELECT RAISE(ABORT, 'restores are append-only'); END;
