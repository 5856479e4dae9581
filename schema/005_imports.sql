-- Batch imports of check history. One row per imported file, keyed by the SHA-256 of its bytes, so the
-- same file cannot be imported twice. Append-only like every other table.

CREATE TABLE import_batches (
  id            INTEGER PRIMARY KEY,
  file_sha256   TEXT NOT NULL UNIQUE,
  file_name     TEXT NOT NULL,          -- as given on the command line, for people
  runs          INTEGER NOT NULL,
  readings      INTEGER NOT NULL,
  first_run_id  INTEGER REFERENCES check_runs(id),
  last_run_id   INTEGER REFERENCES check_runs(id),
  imported_at   TEXT NOT NULL,
  imported_by   TEXT NOT NULL
);

-- The lab status (due list, summary) looks for runs that something supersedes; without this index
-- that is a scan of every run.
CREATE INDEX check_runs_superseded ON check_runs(supersedes) WHERE supersedes IS NOT NULL;

CREATE TRIGGER import_batches_no_update BEFORE UPDATE ON import_batches BEGIN SELECT RAISE(ABORT, 'import batches are append-only'); END;
CREATE TRIGGER import_batches_no_delete BEFORE DELETE ON import_batches BEGIN SELECT RAISE(ABORT, 'import batches are append-only'); END;
