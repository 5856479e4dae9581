-- A reference weight's certificate accepted although it does not meet the weight's class under OIML R 111-1:2004
-- (the correction beyond the MPE of Table 1, or the expanded uncertainty above a third of it, or no MPE for the
-- class at the nominal value). plumb refuses such a certificate unless the lab states why it accepts it; the
-- statement is kept here, one row per certificate, and shown with the weight. Append-only like every table.
CREATE TABLE weight_class_overrides (
  weight_calibration_id INTEGER PRIMARY KEY REFERENCES weight_calibrations(id),
  weight_class  TEXT NOT NULL,            -- the class the certificate was judged against
  mpe_g         TEXT,                     -- that class's MPE at the nominal value; NULL when Table 1 has none
  beyond        TEXT NOT NULL CHECK (beyond IN ('correction', 'uncertainty', 'correction and uncertainty',
                                                'no MPE')),
  reason        TEXT NOT NULL CHECK (length(reason) > 0),
  by_name       TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at   TEXT NOT NULL,
  os_user       TEXT NOT NULL
);

CREATE TRIGGER weight_class_overrides_no_update BEFORE UPDATE ON weight_class_overrides BEGIN SELECT RAISE(ABORT, 'weight class overrides are append-only'); END;
CREATE TRIGGER weight_class_overrides_no_delete BEFORE DELETE ON weight_class_overrides BEGIN SELECT RAISE(ABORT, 'weight class overrides are append-only'); END;
