-- plumb core schema. Records are append-only: no row of these tables is ever updated or deleted
-- (the triggers at the end refuse it). A change is a new row; the latest row wins where that applies.
-- Exact quantities are stored as decimal TEXT in grams (e.g. '0.0001'), never as floating point.

CREATE TABLE lab (
  id          INTEGER PRIMARY KEY CHECK (id = 1),
  name        TEXT NOT NULL CHECK (length(name) > 0),
  created_at  TEXT NOT NULL,
  created_by  TEXT NOT NULL
);

CREATE TABLE weights (
  id            TEXT PRIMARY KEY,
  nominal_text  TEXT NOT NULL,          -- as entered, e.g. '100g'
  nominal_g     TEXT NOT NULL,          -- exact decimal grams
  weight_class  TEXT NOT NULL,          -- OIML R 111 class, e.g. 'E2'
  density_kg_m3 TEXT,                   -- NULL: 8000 assumed (conventional)
  created_at    TEXT NOT NULL,
  created_by    TEXT NOT NULL
);

-- One row per certificate of a reference weight; the latest (by calibrated_on, id) is current.
CREATE TABLE weight_calibrations (
  id               INTEGER PRIMARY KEY,
  weight_id        TEXT NOT NULL REFERENCES weights(id),
  certificate_no   TEXT NOT NULL,
  correction_g     TEXT NOT NULL,       -- conventional mass = nominal + correction
  uncertainty_g    TEXT NOT NULL,       -- expanded uncertainty U
  coverage_k       TEXT NOT NULL,
  calibrated_on    TEXT NOT NULL,
  due_on           TEXT NOT NULL CHECK (due_on > calibrated_on),
  created_at       TEXT NOT NULL,
  created_by       TEXT NOT NULL
);
CREATE INDEX weight_calibrations_by_weight ON weight_calibrations(weight_id, calibrated_on);

CREATE TABLE instruments (
  id          TEXT PRIMARY KEY,
  kind        TEXT NOT NULL CHECK (kind IN ('balance', 'pipette')),
  location    TEXT NOT NULL DEFAULT '',
  check_every TEXT NOT NULL,            -- interval such as '7d', '6mo'
  created_on  TEXT NOT NULL,            -- date from which the first check is due
  created_at  TEXT NOT NULL,
  created_by  TEXT NOT NULL
);

CREATE TABLE balances (
  instrument_id  TEXT PRIMARY KEY REFERENCES instruments(id),
  capacity_g     TEXT NOT NULL,
  readability_g  TEXT NOT NULL,         -- d
  smallest_net_g TEXT,                  -- smallest net weight the lab weighs on it
  policy         TEXT NOT NULL CHECK (policy IN ('usp41', 'lab')),
  max_bias_g     TEXT,
  max_sd_g       TEXT
);

CREATE TABLE check_runs (
  id            INTEGER PRIMARY KEY,
  instrument_id TEXT NOT NULL REFERENCES instruments(id),
  procedure     TEXT NOT NULL,
  performed_on  TEXT NOT NULL,
  operator      TEXT NOT NULL,
  results_json  TEXT NOT NULL,          -- results as computed when recorded (never recomputed silently)
  verdict       TEXT NOT NULL CHECK (verdict IN ('pass', 'fail')),
  next_due      TEXT,                   -- NULL after a fail: out of service until a passing check
  supersedes    INTEGER REFERENCES check_runs(id),
  reason        TEXT,                   -- why this run supersedes another
  recorded_at   TEXT NOT NULL,
  os_user       TEXT NOT NULL
);
CREATE INDEX check_runs_by_instrument ON check_runs(instrument_id, performed_on, id);

CREATE TABLE run_weights (
  run_id                INTEGER NOT NULL REFERENCES check_runs(id),
  position              INTEGER NOT NULL,
  weight_id             TEXT NOT NULL REFERENCES weights(id),
  weight_calibration_id INTEGER NOT NULL REFERENCES weight_calibrations(id),
  PRIMARY KEY (run_id, position)
);

CREATE TABLE readings (
  run_id  INTEGER NOT NULL REFERENCES check_runs(id),
  seq     INTEGER NOT NULL,             -- 1-based order within the run
  series  TEXT NOT NULL DEFAULT '',     -- which load / position / volume the reading belongs to
  text    TEXT NOT NULL,                -- exactly as displayed
  unit    TEXT NOT NULL,
  units   INTEGER NOT NULL,             -- exact value = units * 10^-scale in `unit`
  scale   INTEGER NOT NULL,
  PRIMARY KEY (run_id, seq)
);

CREATE TABLE certificates (
  id            INTEGER PRIMARY KEY,
  number        TEXT NOT NULL UNIQUE,
  run_id        INTEGER NOT NULL REFERENCES check_runs(id),
  kind          TEXT NOT NULL,
  issued_at     TEXT NOT NULL,
  issued_by     TEXT NOT NULL,
  content_json  TEXT NOT NULL,          -- the whole certificate; text/PDF are renderings of it
  content_sha256 TEXT NOT NULL,
  supersedes    INTEGER REFERENCES certificates(id)
);

-- Tamper-evident trail: every insert above is mirrored here; each row hashes its content and the
-- previous row's hash (SHA-256), so a changed, removed or reordered record breaks the chain.
CREATE TABLE audit_log (
  seq         INTEGER PRIMARY KEY,
  at          TEXT NOT NULL,            -- UTC timestamp
  os_user     TEXT NOT NULL,
  actor       TEXT NOT NULL,            -- the --by name as given
  action      TEXT NOT NULL,
  table_name  TEXT NOT NULL,
  row_key     TEXT NOT NULL,
  before_json TEXT,
  after_json  TEXT,
  reason      TEXT,
  prev_hash   TEXT NOT NULL,
  hash        TEXT NOT NULL
);

CREATE TRIGGER lab_no_update BEFORE UPDATE ON lab BEGIN SELECT RAISE(ABORT, 'lab records are append-only'); END;
CREATE TRIGGER lab_no_delete BEFORE DELETE ON lab BEGIN SELECT RAISE(ABORT, 'lab records are append-only'); END;
CREATE TRIGGER weights_no_update BEFORE UPDATE ON weights BEGIN SELECT RAISE(ABORT, 'weights are append-only'); END;
CREATE TRIGGER weights_no_delete BEFORE DELETE ON weights BEGIN SELECT RAISE(ABORT, 'weights are append-only'); END;
CREATE TRIGGER weight_calibrations_no_update BEFORE UPDATE ON weight_calibrations BEGIN SELECT RAISE(ABORT, 'weight calibrations are append-only'); END;
CREATE TRIGGER weight_calibrations_no_delete BEFORE DELETE ON weight_calibrations BEGIN SELECT RAISE(ABORT, 'weight calibrations are append-only'); END;
CREATE TRIGGER instruments_no_update BEFORE UPDATE ON instruments BEGIN SELECT RAISE(ABORT, 'instruments are append-only'); END;
CREATE TRIGGER instruments_no_delete BEFORE DELETE ON instruments BEGIN SELECT RAISE(ABORT, 'instruments are append-only'); END;
CREATE TRIGGER balances_no_update BEFORE UPDATE ON balances BEGIN SELECT RAISE(ABORT, 'balances are append-only'); END;
CREATE TRIGGER balances_no_delete BEFORE DELETE ON balances BEGIN SELECT RAISE(ABORT, 'balances are append-only'); END;
CREATE TRIGGER check_runs_no_update BEFORE UPDATE ON check_runs BEGIN SELECT RAISE(ABORT, 'check runs are append-only'); END;
CREATE TRIGGER check_runs_no_delete BEFORE DELETE ON check_runs BEGIN SELECT RAISE(ABORT, 'check runs are append-only'); END;
CREATE TRIGGER run_weights_no_update BEFORE UPDATE ON run_weights BEGIN SELECT RAISE(ABORT, 'run weights are append-only'); END;
CREATE TRIGGER run_weights_no_delete BEFORE DELETE ON run_weights BEGIN SELECT RAISE(ABORT, 'run weights are append-only'); END;
CREATE TRIGGER readings_no_update BEFORE UPDATE ON readings BEGIN SELECT RAISE(ABORT, 'readings are append-only'); END;
CREATE TRIGGER readings_no_delete BEFORE DELETE ON readings BEGIN SELECT RAISE(ABORT, 'readings are append-only'); END;
CREATE TRIGGER certificates_no_update BEFORE UPDATE ON certificates BEGIN SELECT RAISE(ABORT, 'certificates never change'); END;
CREATE TRIGGER certificates_no_delete BEFORE DELETE ON certificates BEGIN SELECT RAISE(ABORT, 'certificates never change'); END;
CREATE TRIGGER audit_log_no_update BEFORE UPDATE ON audit_log BEGIN SELECT RAISE(ABORT, 'the audit trail is append-only'); END;
CREATE TRIGGER audit_log_no_delete BEFORE DELETE ON audit_log BEGIN SELECT RAISE(ABORT, 'the audit trail is append-only'); END;
