-- What a lab declares for a balance in normal use (EURAMET cg-18 v4.0, uncertainty of a weighing result) and what
-- its minimum weight from calibration must meet (USP <1251> usage: required relative accuracy and safety factor).
-- Numbers are exact text as entered (masses in g). A change is a new row; the latest (by id) is in force, the rows
-- before it are the history. Append-only like every table.
CREATE TABLE balance_in_use_terms (
  id                      INTEGER PRIMARY KEY,
  balance_id              TEXT NOT NULL REFERENCES balances(instrument_id),
  rounding_zero_g         TEXT NOT NULL,   -- d_0 in use
  rounding_load_g         TEXT NOT NULL,   -- d_L in use
  repeatability_g         TEXT NOT NULL,   -- s of a single reading in use
  temperature_change_k    TEXT NOT NULL,   -- dT, full width of the temperature change in use
  sensitivity_ppm_per_k   TEXT NOT NULL,   -- TK, change of sensitivity in ppm (1e-6) per K
  sample_density_kg_m3    TEXT NOT NULL,
  sample_density_u_kg_m3  TEXT NOT NULL,
  air_density_u_kg_m3     TEXT NOT NULL,   -- u of the air density in use about 1.2 kg/m3
  drift_ppm               TEXT NOT NULL,   -- D_rel since calibration, ppm (1e-6)
  error_corrected         INTEGER NOT NULL CHECK (error_corrected IN (0, 1)),
  form                    TEXT NOT NULL CHECK (form IN ('linear', 'quadratic-sum')),
  required_accuracy_pct   TEXT NOT NULL,   -- A in percent
  safety_factor           TEXT NOT NULL,   -- SF
  reason                  TEXT,
  created_at              TEXT NOT NULL,
  created_by              TEXT NOT NULL
);
CREATE INDEX balance_in_use_terms_by_balance ON balance_in_use_terms(balance_id, id);
CREATE TRIGGER balance_in_use_terms_no_update BEFORE UPDATE ON balance_in_use_terms BEGIN SELECT RAISE(ABORT, 'balance in-use terms are append-only'); END;
CREATE TRIGGER balance_in_use_terms_no_delete BEFORE DELETE ON balance_in_use_terms BEGIN SELECT RAISE(ABORT, 'balance in-use terms are append-only'); END;

-- The edition of ISO 8655 a pipette is checked to ('2002': ISO 8655-2/-6:2002; '2022': ISO 8655-2/-6:2022). No row:
-- 2002. A change is a new row; the latest is in force.
CREATE TABLE pipette_editions (
  id          INTEGER PRIMARY KEY,
  pipette_id  TEXT NOT NULL REFERENCES pipettes(instrument_id),
  edition     TEXT NOT NULL CHECK (edition IN ('2002', '2022')),
  reason      TEXT,
  created_at  TEXT NOT NULL,
  created_by  TEXT NOT NULL
);
CREATE INDEX pipette_editions_by_pipette ON pipette_editions(pipette_id, id);
CREATE TRIGGER pipette_editions_no_update BEFORE UPDATE ON pipette_editions BEGIN SELECT RAISE(ABORT, 'pipette editions are append-only'); END;
CREATE TRIGGER pipette_editions_no_delete BEFORE DELETE ON pipette_editions BEGIN SELECT RAISE(ABORT, 'pipette editions are append-only'); END;
