-- Piston pipettes and the conditions of their gravimetric checks (ISO 8655-6). Append-only like 001_core.
-- A pipette is an instrument of kind 'pipette'; its check runs are check_runs rows with procedure
-- 'gravimetric', its weighings are readings rows whose series names the test volume and channel
-- (e.g. '100 uL channel 1'), and the conditions of each run are one pipette_run_conditions row.
-- Exact quantities are decimal TEXT: volumes in microlitres, masses in grams.

CREATE TABLE pipettes (
  instrument_id   TEXT PRIMARY KEY REFERENCES instruments(id),
  volume_kind     TEXT NOT NULL CHECK (volume_kind IN ('fixed', 'variable')),
  nominal_ul      TEXT NOT NULL,          -- the fixed volume, or the largest selectable volume
  lower_limit_ul  TEXT,                   -- variable: the smallest selectable volume; NULL when fixed
  channels        INTEGER NOT NULL CHECK (channels BETWEEN 1 AND 384),
  limits_policy   TEXT NOT NULL CHECK (limits_policy IN ('iso8655-2', 'lab-ul', 'lab-pct')),
  max_systematic  TEXT,                   -- lab limits: |systematic error| in uL or % of the selected volume
  max_random      TEXT,                   -- lab limits: SD in uL, or CV in %
  CHECK ((volume_kind = 'fixed') = (lower_limit_ul IS NULL)),
  CHECK ((limits_policy = 'iso8655-2') = (max_systematic IS NULL AND max_random IS NULL))
);

-- One row per gravimetric run: the balance used (and its latest check run on the run date, which gave
-- the repeatability judged against ISO 8655-6), and the environment the Z factor was computed from.
CREATE TABLE pipette_run_conditions (
  run_id              INTEGER PRIMARY KEY REFERENCES check_runs(id),
  balance_id          TEXT NOT NULL REFERENCES instruments(id),
  balance_run_id      INTEGER NOT NULL REFERENCES check_runs(id),
  water_temperature_c TEXT NOT NULL,      -- as entered, degC
  air_pressure_hpa    TEXT NOT NULL,      -- as entered, hPa
  humidity_pct        TEXT NOT NULL,      -- as entered, %RH
  evaporation_g       TEXT                -- mass lost per weighing, added to each; NULL when not given
);

CREATE TRIGGER pipettes_kind BEFORE INSERT ON pipettes
  WHEN (SELECT kind FROM instruments WHERE id = NEW.instrument_id) IS NOT 'pipette'
  BEGIN SELECT RAISE(ABORT, 'a pipette row needs an instrument of kind pipette'); END;
CREATE TRIGGER pipettes_no_update BEFORE UPDATE ON pipettes BEGIN SELECT RAISE(ABORT, 'pipettes are append-only'); END;
CREATE TRIGGER pipettes_no_delete BEFORE DELETE ON pipettes BEGIN SELECT RAISE(ABORT, 'pipettes are append-only'); END;
CREATE TRIGGER pipette_run_conditions_no_update BEFORE UPDATE ON pipette_run_conditions BEGIN SELECT RAISE(ABORT, 'pipette run conditions are append-only'); END;
CREATE TRIGGER pipette_run_conditions_no_delete BEFORE DELETE ON pipette_run_conditions BEGIN SELECT RAISE(ABORT, 'pipette run conditions are append-only'); END;
