-- Readings taken at the bench from a balance's data output (doc/capture.md). Append-only like every table.

-- How a balance's data output is reached and read. A change of settings is a new row; the latest (by id) is in
-- force, and the rows before it are the history.
CREATE TABLE balance_ports (
  id            INTEGER PRIMARY KEY,
  balance_id    TEXT NOT NULL REFERENCES balances(instrument_id),
  device        TEXT NOT NULL CHECK (length(device) > 0),  -- e.g. /dev/ttyUSB0
  baud          INTEGER NOT NULL CHECK (baud BETWEEN 50 AND 4000000),
  parity        TEXT NOT NULL CHECK (parity IN ('none', 'even', 'odd', 'mark', 'space')),
  data_bits     INTEGER NOT NULL CHECK (data_bits BETWEEN 5 AND 8),
  stop_bits     INTEGER NOT NULL CHECK (stop_bits IN (1, 2)),
  handshake     TEXT NOT NULL CHECK (handshake IN ('none', 'rts-cts', 'dtr-dsr', 'xon-xoff')),
  send_command  TEXT,                  -- sent (with CR LF) to ask for a reading; NULL: the balance sends by itself
  line_pattern  TEXT,                  -- the lab's line shape; NULL: the common shapes
  unit          TEXT NOT NULL CHECK (unit IN ('ug', 'mg', 'g', 'kg')),  -- the unit the balance is set to show
  reason        TEXT,
  created_at    TEXT NOT NULL,
  created_by    TEXT NOT NULL
);
CREATE INDEX balance_ports_by_balance ON balance_ports(balance_id, id);

-- The original record of a captured run: every line received (or typed), in order, with the time it arrived
-- and what became of it. `line` is the bytes as received, printable ASCII as is and every other byte as \xHH.
CREATE TABLE run_raw_lines (
  run_id       INTEGER NOT NULL REFERENCES check_runs(id),
  seq          INTEGER NOT NULL CHECK (seq >= 1),
  received_at  TEXT NOT NULL,          -- UTC, ISO 8601 with milliseconds
  source       TEXT NOT NULL CHECK (source IN ('port', 'typed')),
  line         TEXT NOT NULL,
  outcome      TEXT NOT NULL CHECK (outcome IN ('counted', 'unstable', 'not a reading', 'refused')),
  reading_seq  INTEGER,                -- the reading it became (check's readings seq) when counted
  note         TEXT,                   -- why it was not counted, as said at the bench
  PRIMARY KEY (run_id, seq)
);

CREATE TRIGGER balance_ports_no_update BEFORE UPDATE ON balance_ports BEGIN SELECT RAISE(ABORT, 'balance ports are append-only'); END;
CREATE TRIGGER balance_ports_no_delete BEFORE DELETE ON balance_ports BEGIN SELECT RAISE(ABORT, 'balance ports are append-only'); END;
CREATE TRIGGER run_raw_lines_no_update BEFORE UPDATE ON run_raw_lines BEGIN SELECT RAISE(ABORT, 'raw lines are append-only'); END;
CREATE TRIGGER run_raw_lines_no_delete BEFORE DELETE ON run_raw_lines BEGIN SELECT RAISE(ABORT, 'raw lines are append-only'); END;
