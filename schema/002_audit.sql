-- Audit-ready records: certificate approval and supersession, and retiring instruments or weights.
-- Like every table of plumb these are append-only: a status is never edited, a later event is added.

-- What happened to an issued certificate after it was issued. The certificate row itself never changes;
-- its status (draft, approved, superseded) is read from these events.
CREATE TABLE certificate_events (
  id             INTEGER PRIMARY KEY,
  certificate_id INTEGER NOT NULL REFERENCES certificates(id),
  event          TEXT NOT NULL CHECK (event IN ('approved', 'superseded')),
  by_name        TEXT NOT NULL CHECK (length(by_name) > 0),  -- as given; plumb does not authenticate people
  meaning        TEXT,                 -- approved: what the signature means, e.g. 'reviewed and approved'
  replaced_by    INTEGER REFERENCES certificates(id),        -- superseded: the certificate that replaces it
  reason         TEXT,                 -- superseded: why (the reason of the correction)
  recorded_at    TEXT NOT NULL,        -- UTC; the date of the signature
  os_user        TEXT NOT NULL,
  UNIQUE (certificate_id, event),      -- approved once, superseded once
  CHECK (event <> 'approved' OR length(coalesce(meaning, '')) > 0),
  CHECK (event <> 'superseded' OR (replaced_by IS NOT NULL AND length(coalesce(reason, '')) > 0))
);
CREATE INDEX certificate_events_by_certificate ON certificate_events(certificate_id);

-- Taking an instrument or a reference weight out of use, and bringing it back. The latest event wins;
-- the item and its history stay.
CREATE TABLE service_events (
  id           INTEGER PRIMARY KEY,
  item_kind    TEXT NOT NULL CHECK (item_kind IN ('instrument', 'weight')),
  item_id      TEXT NOT NULL,
  event        TEXT NOT NULL CHECK (event IN ('retired', 'reinstated')),
  reason       TEXT NOT NULL CHECK (length(reason) > 0),
  by_name      TEXT NOT NULL CHECK (length(by_name) > 0),
  recorded_at  TEXT NOT NULL,
  os_user      TEXT NOT NULL
);
CREATE INDEX service_events_by_item ON service_events(item_kind, item_id, id);

CREATE TRIGGER certificate_events_no_update BEFORE UPDATE ON certificate_events BEGIN SELECT RAISE(ABORT, 'certificate events are append-only'); END;
CREATE TRIGGER certificate_events_no_delete BEFORE DELETE ON certificate_events BEGIN SELECT RAISE(ABORT, 'certificate events are append-only'); END;
CREATE TRIGGER service_events_no_update BEFORE UPDATE ON service_events BEGIN SELECT RAISE(ABORT, 'service events are append-only'); END;
CREATE TRIGGER service_events_no_delete BEFORE DELETE ON service_events BEGIN SELECT RAISE(ABORT, 'service events are append-only'); END;
