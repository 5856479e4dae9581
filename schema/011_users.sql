-- People, their authority and their electronic signatures (21 CFR Part 11 11.50, 11.70, 11.100, 11.300; EU GMP
-- Annex 11 item 12). Append-only like every record of plumb: an account is never deleted and its id never reused
-- (AUTOINCREMENT), a role is granted and revoked by later events, a password replaced by a later row. The one
-- exception is session_activity (the time a session was last used), which is operational state, not a record.

CREATE TABLE users (
  id          INTEGER PRIMARY KEY AUTOINCREMENT,
  login       TEXT NOT NULL UNIQUE CHECK (length(login) BETWEEN 1 AND 64),
  full_name   TEXT NOT NULL CHECK (length(full_name) > 0),  -- the printed name on records and signatures
  created_at  TEXT NOT NULL
);

-- The latest row of a user is the password in force.
CREATE TABLE passwords (
  id           INTEGER PRIMARY KEY,
  user_id      INTEGER NOT NULL REFERENCES users(id),
  hash         TEXT NOT NULL,     -- Argon2id in libsodium's crypto_pwhash_str format (salt and limits inside)
  must_change  INTEGER NOT NULL CHECK (must_change IN (0, 1)),  -- set by an administrator: changed at next log-in
  set_at       TEXT NOT NULL
);
CREATE INDEX passwords_by_user ON passwords(user_id, id);

-- Roles granted and revoked, accounts deactivated and reactivated, failed log-ins, lock-outs and unlocks.
CREATE TABLE account_events (
  id       INTEGER PRIMARY KEY,
  user_id  INTEGER NOT NULL REFERENCES users(id),
  event    TEXT NOT NULL CHECK (event IN ('role granted', 'role revoked', 'deactivated', 'reactivated',
                                          'failed log-in', 'locked', 'unlocked', 'logged in')),
  role     TEXT CHECK (role IS NULL OR role IN ('technician', 'reviewer', 'quality manager', 'administrator')),
  reason   TEXT,
  at       TEXT NOT NULL,
  CHECK ((event IN ('role granted', 'role revoked')) = (role IS NOT NULL))
);
CREATE INDEX account_events_by_user ON account_events(user_id, id);

-- The lab's rules for passwords and sessions; the latest row is in force, none means the defaults of
-- doc/people.md. password_hashing is fixed when the database is created.
CREATE TABLE security_settings (
  id                     INTEGER PRIMARY KEY,
  min_password_length    INTEGER NOT NULL CHECK (min_password_length >= 8),
  max_failed_logins      INTEGER NOT NULL CHECK (max_failed_logins >= 1),
  idle_minutes           INTEGER NOT NULL CHECK (idle_minutes >= 1),
  password_max_age_days  INTEGER CHECK (password_max_age_days IS NULL OR password_max_age_days >= 1),
  password_hashing       TEXT NOT NULL CHECK (password_hashing IN ('moderate', 'test-only-fast')),
  set_at                 TEXT NOT NULL
);

-- A session opened by `plumb login`: only the SHA-256 of its token is stored.
CREATE TABLE sessions (
  id            INTEGER PRIMARY KEY,
  user_id       INTEGER NOT NULL REFERENCES users(id),
  token_sha256  TEXT NOT NULL UNIQUE,
  opened_at     TEXT NOT NULL,
  idle_minutes  INTEGER NOT NULL
);
CREATE TABLE session_ends (
  session_id  INTEGER PRIMARY KEY REFERENCES sessions(id),
  ended_at    TEXT NOT NULL,
  why         TEXT NOT NULL CHECK (why IN ('logged out', 'idle', 'account closed'))
);
-- Not a record (updated in place, not in the audit trail): when a session was last used, for its idle expiry.
CREATE TABLE session_activity (
  session_id    INTEGER PRIMARY KEY REFERENCES sessions(id),
  last_used_at  TEXT NOT NULL
);

-- Electronic signatures: who (id and printed name), when (UTC), what it means, and which record, with the
-- SHA-256 of exactly what was signed (that record's audit-trail content, see doc/people.md).
CREATE TABLE signatures (
  id             INTEGER PRIMARY KEY,
  user_id        INTEGER NOT NULL REFERENCES users(id),
  printed_name   TEXT NOT NULL CHECK (length(printed_name) > 0),
  signed_at      TEXT NOT NULL,
  meaning        TEXT NOT NULL CHECK (length(meaning) > 0),
  table_name     TEXT NOT NULL,
  row_key        TEXT NOT NULL,
  signed_sha256  TEXT NOT NULL CHECK (length(signed_sha256) = 64)
);
CREATE INDEX signatures_by_record ON signatures(table_name, row_key);

-- Who wrote each audit record from now on; NULL marks a record written before user accounts existed (its
-- free-text name stays as it was). The record's hash covers the id when there is one.
ALTER TABLE audit_log ADD COLUMN user_id INTEGER REFERENCES users(id);
CREATE INDEX audit_log_by_row ON audit_log(table_name, row_key);

CREATE TRIGGER users_no_update BEFORE UPDATE ON users BEGIN SELECT RAISE(ABORT, 'user accounts are append-only'); END;
CREATE TRIGGER users_no_delete BEFORE DELETE ON users BEGIN SELECT RAISE(ABORT, 'user accounts are never deleted'); END;
CREATE TRIGGER passwords_no_update BEFORE UPDATE ON passwords BEGIN SELECT RAISE(ABORT, 'passwords are append-only'); END;
CREATE TRIGGER passwords_no_delete BEFORE DELETE ON passwords BEGIN SELECT RAISE(ABORT, 'passwords are append-only'); END;
CREATE TRIGGER account_events_no_update BEFORE UPDATE ON account_events BEGIN SELECT RAISE(ABORT, 'account events are append-only'); END;
CREATE TRIGGER account_events_no_delete BEFORE DELETE ON account_events BEGIN SELECT RAISE(ABORT, 'account events are append-only'); END;
CREATE TRIGGER security_settings_no_update BEFORE UPDATE ON security_settings BEGIN SELECT RAISE(ABORT, 'security settings are append-only'); END;
CREATE TRIGGER security_settings_no_delete BEFORE DELETE ON security_settings BEGIN SELECT RAISE(ABORT, 'security settings are append-only'); END;
CREATE TRIGGER sessions_no_update BEFORE UPDATE ON sessions BEGIN SELECT RAISE(ABORT, 'sessions are append-only'); END;
CREATE TRIGGER sessions_no_delete BEFORE DELETE ON sessions BEGIN SELECT RAISE(ABORT, 'sessions are append-only'); END;
CREATE TRIGGER session_ends_no_update BEFORE UPDATE ON session_ends BEGIN SELECT RAISE(ABORT, 'session ends are append-only'); END;
CREATE TRIGGER session_ends_no_delete BEFORE DELETE ON session_ends BEGIN SELECT RAISE(ABORT, 'session ends are append-only'); END;
CREATE TRIGGER signatures_no_update BEFORE UPDATE ON signatures BEGIN SELECT RAISE(ABORT, 'signatures never change'); END;
CREATE TRIGGER signatures_no_delete BEFORE DELETE ON signatures BEGIN SELECT RAISE(ABORT, 'signatures never change'); END;
