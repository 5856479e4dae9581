-- Full balance calibration (EURAMET cg-18): per-balance calibration settings and the structure of each
-- calibration run. The readings themselves stay in `readings` (series "stage/part/load/position/direction");
-- the computed results in check_runs.results_json. Append-only like 001: a newer settings row supersedes.

-- How a balance is calibrated and judged; the latest row (by id) for an instrument is current.
CREATE TABLE balance_calibration_settings (
  id                      INTEGER PRIMARY KEY,
  instrument_id           TEXT NOT NULL REFERENCES instruments(id),
  accuracy_class          TEXT CHECK (accuracy_class IN ('I', 'II', 'III', 'IIII')),  -- OIML R 76
  verification_interval_g TEXT,           -- e; NULL: e = d
  tolerance               TEXT NOT NULL CHECK (tolerance IN ('r76', 'usp41', 'lab')),
  lab_limit_g             TEXT,           -- lab: +/- absolute limit on E
  lab_percent             TEXT,           -- lab: +/- percent of the load
  decision_rule           TEXT NOT NULL CHECK (decision_rule IN ('simple', 'guard-band')),
  calibrate_every         TEXT NOT NULL,  -- calibration interval, e.g. '1y' (weekly checks keep check_every)
  effective_on            TEXT NOT NULL,  -- first calibration due on this date when none is recorded yet
  created_at              TEXT NOT NULL,
  created_by              TEXT NOT NULL,
  CHECK (tolerance <> 'r76' OR accuracy_class IS NOT NULL),
  CHECK (tolerance <> 'lab' OR lab_limit_g IS NOT NULL OR lab_percent IS NOT NULL)
);
CREATE INDEX balance_calibration_settings_by_instrument ON balance_calibration_settings(instrument_id, id);

-- One row per calibration run: the settings used and the environment.
CREATE TABLE calibration_runs (
  run_id            INTEGER PRIMARY KEY REFERENCES check_runs(id),
  settings_id       INTEGER NOT NULL REFERENCES balance_calibration_settings(id),
  model             TEXT NOT NULL CHECK (model IN ('line', 'through-origin', 'quadratic')),
  temperature_c     TEXT,                 -- as entered; NULL when not measured
  pressure_hpa      TEXT,
  humidity_pct      TEXT,
  air_density_kg_m3 TEXT NOT NULL,        -- computed (or the assumed 1.2), as printed
  u_air_density     TEXT NOT NULL,        -- its standard uncertainty, kg/m3
  air_method        TEXT NOT NULL CHECK (air_method IN ('cipm2007', 'oiml-r111', 'assumed')),
  as_found_state    TEXT NOT NULL,        -- conformity: pass, pass-not-proven, fail-not-proven, fail
  as_left_state     TEXT                  -- NULL when no adjustment was made
);

-- The loads of a run: a combination of reference weights, per stage and part.
CREATE TABLE calibration_loads (
  run_id          INTEGER NOT NULL REFERENCES check_runs(id),
  stage           TEXT NOT NULL CHECK (stage IN ('as-found', 'as-left')),
  part            TEXT NOT NULL CHECK (part IN ('repeatability', 'eccentricity', 'indication')),
  load_no         INTEGER NOT NULL,       -- 1-based, in the order of the file
  combination     TEXT NOT NULL,          -- e.g. 'W100+W50'
  nominal_g       TEXT NOT NULL,          -- exact sums
  conventional_g  TEXT NOT NULL,
  PRIMARY KEY (run_id, stage, part, load_no)
);

-- Which weight (and which of its certificates) made up each load.
CREATE TABLE calibration_load_weights (
  run_id                INTEGER NOT NULL REFERENCES check_runs(id),
  stage                 TEXT NOT NULL,
  part                  TEXT NOT NULL,
  load_no               INTEGER NOT NULL,
  item                  INTEGER NOT NULL,
  weight_id             TEXT NOT NULL REFERENCES weights(id),
  weight_calibration_id INTEGER NOT NULL REFERENCES weight_calibrations(id),
  PRIMARY KEY (run_id, stage, part, load_no, item),
  FOREIGN KEY (run_id, stage, part, load_no) REFERENCES calibration_loads(run_id, stage, part, load_no)
);

-- Where each reading of the run belongs (eccentricity positions, directions), keyed to `readings`.
CREATE TABLE calibration_readings (
  run_id     INTEGER NOT NULL,
  seq        INTEGER NOT NULL,
  stage      TEXT NOT NULL,
  part       TEXT NOT NULL,
  load_no    INTEGER NOT NULL,
  position   TEXT,                        -- eccentricity: centre, front-left, ...
  direction  TEXT CHECK (direction IS NULL OR direction IN ('up', 'down')),  -- indication
  PRIMARY KEY (run_id, seq),
  FOREIGN KEY (run_id, seq) REFERENCES readings(run_id, seq),
  FOREIGN KEY (run_id, stage, part, load_no) REFERENCES calibration_loads(run_id, stage, part, load_no)
);

CREATE TRIGGER balance_calibration_settings_no_update BEFORE UPDATE ON balance_calibration_settings BEGIN SELECT RAISE(ABORT, 'calibration settings are append-only'); END;
CREATE TRIGGER balance_calibration_settings_no_delete BEFORE DELETE ON balance_calibration_settings BEGIN SELECT RAISE(ABORT, 'calibration settings are append-only'); END;
CREATE TRIGGER calibration_runs_no_update BEFORE UPDATE ON calibration_runs BEGIN SELECT RAISE(ABORT, 'calibration runs are append-only'); END;
CREATE TRIGGER calibration_runs_no_delete BEFORE DELETE ON calibration_runs BEGIN SELECT RAISE(ABORT, 'calibration runs are append-only'); END;
CREATE TRIGGER calibration_loads_no_update BEFORE UPDATE ON calibration_loads BEGIN SELECT RAISE(ABORT, 'calibration loads are append-only'); END;
CREATE TRIGGER calibration_loads_no_delete BEFORE DELETE ON calibration_loads BEGIN SELECT RAISE(ABORT, 'calibration loads are append-only'); END;
CREATE TRIGGER calibration_load_weights_no_update BEFORE UPDATE ON calibration_load_weights BEGIN SELECT RAISE(ABORT, 'calibration load weights are append-only'); END;
CREATE TRIGGER calibration_load_weights_no_delete BEFORE DELETE ON calibration_load_weights BEGIN SELECT RAISE(ABORT, 'calibration load weights are append-only'); END;
CREATE TRIGGER calibration_readings_no_update BEFORE UPDATE ON calibration_readings BEGIN SELECT RAISE(ABORT, 'calibration readings are append-only'); END;
CREATE TRIGGER calibration_readings_no_delete BEFORE DELETE ON calibration_readings BEGIN SELECT RAISE(ABORT, 'calibration readings are append-only'); END;
