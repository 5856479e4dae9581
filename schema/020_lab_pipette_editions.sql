-- The laboratory's default edition of ISO 8655 ('2002' or '2022'): the edition of every pipette that has no edition
-- of its own in pipette_editions (migration 015). No row: 2002. A change is a new row, with who, when and why; the
-- latest is in force.
CREATE TABLE lab_pipette_editions (
  id          INTEGER PRIMARY KEY,
  edition     TEXT NOT NULL CHECK (edition IN ('2002', '2022')),
  reason      TEXT,
  created_at  TEXT NOT NULL,
  created_by  TEXT NOT NULL
);
CREATE TRIGGER lab_pipette_editions_no_update BEFORE UPDATE ON lab_pipette_editions BEGIN SELECT RAISE(ABORT, 'the lab''s pipette editions are append-only'); END;
CREATE TRIGGER lab_pipette_editions_no_delete BEFORE DELETE ON lab_pipette_editions BEGIN SELECT RAISE(ABORT, 'the lab''s pipette editions are append-only'); END;
