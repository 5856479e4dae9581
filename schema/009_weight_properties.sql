-- What a lab states about a reference weight beyond its certificate, for the air buoyancy and drift terms of a
-- EURAMET cg-18 budget: its density with a standard uncertainty, or the OIML R 111-1:2004 class whose density
-- limits (Table 5) stand for it, and a drift allowance D for when there is no certificate history to estimate
-- drift from. One row per statement; the latest row of a weight (highest id) is in force, and the earlier rows
-- stay as its history with who entered them and when. Append-only like every table.
CREATE TABLE weight_properties (
  id               INTEGER PRIMARY KEY,
  weight_id        TEXT NOT NULL REFERENCES weights(id),
  density_source   TEXT NOT NULL CHECK (density_source IN ('entered', 'class')),
  density_kg_m3    TEXT,              -- entered density; NULL with density_source 'class'
  u_density_kg_m3  TEXT,              -- its standard uncertainty; NULL with density_source 'class'
  density_class    TEXT,              -- OIML R 111 class whose Table 5 limits apply; NULL with 'entered'
  drift_g          TEXT,              -- drift allowance D in grams (exact decimal); NULL: none stated
  by_name          TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at      TEXT NOT NULL,
  os_user          TEXT NOT NULL,
  CHECK ((density_source = 'entered' AND density_kg_m3 IS NOT NULL AND u_density_kg_m3 IS NOT NULL
          AND density_class IS NULL)
      OR (density_source = 'class' AND density_kg_m3 IS NULL AND u_density_kg_m3 IS NULL
          AND density_class IS NOT NULL))
);
CREATE INDEX weight_properties_by_weight ON weight_properties(weight_id, id);

CREATE TRIGGER weight_properties_no_update BEFORE UPDATE ON weight_properties BEGIN SELECT RAISE(ABORT, 'weight properties are append-only'); END;
CREATE TRIGGER weight_properties_no_delete BEFORE DELETE ON weight_properties BEGIN SELECT RAISE(ABORT, 'weight properties are append-only'); END;
