-- The life of instruments, runs and certificates over the years. Append-only like every table of plumb: a change
-- is a new row; the latest row in force wins.

-- An instrument's attributes over time. The row of `instruments` (and of `balances`) is its state at
-- registration; each version here holds the whole set of attributes from `effective_on` on, with who changed
-- them and why. The version in force on a date is the latest with effective_on <= that date (by effective_on,
-- then id); certificates print the attributes as they were on the check date.
CREATE TABLE instrument_versions (
  id             INTEGER PRIMARY KEY,
  instrument_id  TEXT NOT NULL REFERENCES instruments(id),
  maker          TEXT NOT NULL DEFAULT '',
  model          TEXT NOT NULL DEFAULT '',
  serial_no      TEXT NOT NULL DEFAULT '',
  asset_tag      TEXT NOT NULL DEFAULT '',
  location       TEXT NOT NULL DEFAULT '',
  check_every    TEXT NOT NULL,          -- interval such as '7d', '3mo'
  -- A balance's weekly-check policy (NULL for a pipette).
  policy         TEXT CHECK (policy IS NULL OR policy IN ('usp41', 'lab')),
  smallest_net_g TEXT,
  max_bias_g     TEXT,
  max_sd_g       TEXT,
  min_readings   INTEGER CHECK (min_readings IS NULL OR min_readings BETWEEN 2 AND 100),
  effective_on   TEXT NOT NULL,          -- the date from which these attributes hold
  reason         TEXT NOT NULL CHECK (length(reason) > 0),
  created_at     TEXT NOT NULL,
  created_by     TEXT NOT NULL
);
CREATE INDEX instrument_versions_by_instrument ON instrument_versions(instrument_id, effective_on, id);

-- Attributes given at registration that the first schema did not hold (maker, model, serial, asset tag).
CREATE TABLE instrument_identities (
  instrument_id  TEXT PRIMARY KEY REFERENCES instruments(id),
  maker          TEXT NOT NULL DEFAULT '',
  model          TEXT NOT NULL DEFAULT '',
  serial_no      TEXT NOT NULL DEFAULT '',
  asset_tag      TEXT NOT NULL DEFAULT ''
);

-- A run entered in error: it stays, marked void, and drops out of due lists, trends and summaries.
CREATE TABLE run_voids (
  run_id       INTEGER PRIMARY KEY REFERENCES check_runs(id),
  reason       TEXT NOT NULL CHECK (length(reason) > 0),
  by_name      TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at  TEXT NOT NULL,
  os_user      TEXT NOT NULL
);

-- A certificate withdrawn (its run was voided): it stays, marked withdrawn, with the reason.
CREATE TABLE certificate_withdrawals (
  certificate_id INTEGER PRIMARY KEY REFERENCES certificates(id),
  reason         TEXT NOT NULL CHECK (length(reason) > 0),
  by_name        TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at    TEXT NOT NULL,
  os_user        TEXT NOT NULL
);

-- The lab status leaves void runs out; without this index that would be a look-up per run.
CREATE INDEX check_runs_by_procedure ON check_runs(instrument_id, procedure, performed_on, id);

CREATE TRIGGER instrument_versions_no_update BEFORE UPDATE ON instrument_versions BEGIN SELECT RAISE(ABORT, 'instrument versions are append-only'); END;
CREATE TRIGGER instrument_versions_no_delete BEFORE DELETE ON instrument_versions BEGIN SELECT RAISE(ABORT, 'instrument versions are append-only'); END;
CREATE TRIGGER instrument_identities_no_update BEFORE UPDATE ON instrument_identities BEGIN SELECT RAISE(ABORT, 'instrument identities are append-only'); END;
CREATE TRIGGER instrument_identities_no_delete BEFORE DELETE ON instrument_identities BEGIN SELECT RAISE(ABORT, 'instrument identities are append-only'); END;
CREATE TRIGGER run_voids_no_update BEFORE UPDATE ON run_voids BEGIN SELECT RAISE(ABORT, 'run voids are append-only'); END;
CREATE TRIGGER run_voids_no_delete BEFORE DELETE ON run_voids BEGIN SELECT RAISE(ABORT, 'run voids are append-only'); END;
CREATE TRIGGER certificate_withdrawals_no_update BEFORE UPDATE ON certificate_withdrawals BEGIN SELECT RAISE(ABORT, 'certificate withdrawals are append-only'); END;
CREATE TRIGGER certificate_withdrawals_no_delete BEFORE DELETE ON certificate_withdrawals BEGIN SELECT RAISE(ABORT, 'certificate withdrawals are append-only'); END;
