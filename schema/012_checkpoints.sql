-- The trail anchored outside the database. Every command that writes records ends with a checkpoint: how many
-- audit records the trail holds, the hash of the last one, and when, signed with the lab's Ed25519 key, which is
-- kept in a file outside the database (doc/audit-trail.md). Checkpoints are not audit records themselves (a record
-- of a checkpoint would need another checkpoint); `audit verify` proves them with the public key. Append-only.
CREATE TABLE checkpoints (
  number      INTEGER PRIMARY KEY,                       -- 1, 2, ... in the order signed
  records     INTEGER NOT NULL CHECK (records >= 0),     -- audit records 1..records are covered
  head_hash   TEXT NOT NULL,                             -- the hash of audit record `records`
  signed_at   TEXT NOT NULL,                             -- UTC
  covers      TEXT NOT NULL CHECK (covers IN ('command', 'records before checkpoints')),
  public_key  TEXT NOT NULL,                             -- Ed25519, raw, 64 hex digits
  signature   TEXT NOT NULL                              -- Ed25519 over the checkpoint's statement, 128 hex digits
);

CREATE TRIGGER checkpoints_no_update BEFORE UPDATE ON checkpoints BEGIN SELECT RAISE(ABORT, 'checkpoints are append-only'); END;
CREATE TRIGGER checkpoints_no_delete BEFORE DELETE ON checkpoints BEGIN SELECT RAISE(ABORT, 'checkpoints are append-only'); END;

-- A restore names the last signed checkpoint of the backup it put in place (NULL: the backup had none).
ALTER TABLE restores ADD COLUMN backup_checkpoint INTEGER;
ALTER TABLE restores ADD COLUMN backup_checkpoint_hash TEXT;
