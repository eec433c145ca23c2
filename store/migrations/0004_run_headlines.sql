-- 0004: each run's headline metrics, written with the run, so the drift
-- history of a new run is one query instead of decoding every earlier
-- run's results document. Append-only like the other run tables.

CREATE TABLE run_headlines (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    metric TEXT    NOT NULL CHECK (metric <> ''),
    value  REAL    NOT NULL,
    PRIMARY KEY (run_id, metric)
) STRICT, WITHOUT ROWID;

CREATE TRIGGER run_headlines_no_update BEFORE UPDATE ON run_headlines
BEGIN
    SELECT RAISE(ABORT, 'run headlines are append-only');
END;

CREATE TRIGGER run_headlines_no_delete BEFORE DELETE ON run_headlines
BEGIN
    SELECT RAISE(ABORT, 'run headlines are append-only');
END;
