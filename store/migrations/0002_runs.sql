-- 0002: pack runs, their long-form metrics and their PDFs.
--
-- Runs are append-only: no row of these tables can be updated or deleted
-- (triggers below). Re-running a portfolio's as-of date adds a new
-- revision whose "supersedes" names the run it replaces, with a reason;
-- both remain. The current run of a date is the one no other run
-- supersedes (view current_runs).

CREATE TABLE runs (
    id              INTEGER PRIMARY KEY,
    portfolio_id    TEXT    NOT NULL REFERENCES portfolios (portfolio_id),
    as_of           TEXT    NOT NULL CHECK (date(julianday(as_of)) IS as_of),
    revision        INTEGER NOT NULL CHECK (revision >= 1),
    supersedes      INTEGER UNIQUE REFERENCES runs (id),
    reason          TEXT,
    created_at      TEXT    NOT NULL CHECK (created_at GLOB '[0-9][0-9][0-9][0-9]-[0-9][0-9]-[0-9][0-9]T*Z'),
    program_version TEXT    NOT NULL CHECK (program_version <> ''),
    -- The effective configuration (canonical JSON, no secrets) and its sha256.
    config_json     TEXT    NOT NULL CHECK (json_valid(config_json)),
    config_hash     TEXT    NOT NULL CHECK (length(config_hash) = 64),
    -- sha256 of the canonical JSON of every input row used.
    input_hash      TEXT    NOT NULL CHECK (length(input_hash) = 64),
    -- The highest ingest_files id visible to the run: a later correction
    -- does not change what verify recomputes for this run.
    ledger_mark     INTEGER NOT NULL CHECK (ledger_mark >= 0),
    results_schema  TEXT    NOT NULL,
    results_json    TEXT    NOT NULL CHECK (json_valid(results_json)),
    results_hash    TEXT    NOT NULL CHECK (length(results_hash) = 64),
    UNIQUE (portfolio_id, as_of, revision),
    CHECK ((supersedes IS NULL) = (revision = 1)),
    CHECK (supersedes IS NULL OR (reason IS NOT NULL AND reason <> ''))
) STRICT;

CREATE INDEX runs_portfolio_as_of ON runs (portfolio_id, as_of);

CREATE VIEW current_runs AS
    SELECT r.* FROM runs r
    WHERE NOT EXISTS (SELECT 1 FROM runs n WHERE n.supersedes = r.id);

CREATE TRIGGER runs_no_update BEFORE UPDATE ON runs
BEGIN
    SELECT RAISE(ABORT, 'runs are append-only');
END;

CREATE TRIGGER runs_no_delete BEFORE DELETE ON runs
BEGIN
    SELECT RAISE(ABORT, 'runs are append-only');
END;

-- Metrics in long form for SQL: scope is portfolio, sector, holding,
-- scenario or limit; key names the sector, holding, scenario or limit
-- ('' for the portfolio).
CREATE TABLE run_metrics (
    run_id INTEGER NOT NULL REFERENCES runs (id),
    scope  TEXT    NOT NULL CHECK (scope IN ('portfolio', 'sector', 'holding', 'scenario', 'limit')),
    key    TEXT    NOT NULL,
    metric TEXT    NOT NULL CHECK (metric <> ''),
    value  REAL    NOT NULL,
    PRIMARY KEY (run_id, scope, key, metric)
) STRICT, WITHOUT ROWID;

CREATE INDEX run_metrics_metric ON run_metrics (metric, scope, key);

CREATE TRIGGER run_metrics_no_update BEFORE UPDATE ON run_metrics
BEGIN
    SELECT RAISE(ABORT, 'run metrics are append-only');
END;

CREATE TRIGGER run_metrics_no_delete BEFORE DELETE ON run_metrics
BEGIN
    SELECT RAISE(ABORT, 'run metrics are append-only');
END;

-- The rendered PDF of a run, as mailed.
CREATE TABLE run_pdfs (
    run_id      INTEGER PRIMARY KEY REFERENCES runs (id),
    sha256      TEXT    NOT NULL CHECK (length(sha256) = 64),
    pdf         BLOB    NOT NULL,
    pages       INTEGER NOT NULL DEFAULT 0 CHECK (pages >= 0)
) STRICT;

CREATE TRIGGER run_pdfs_no_update BEFORE UPDATE ON run_pdfs
BEGIN
    SELECT RAISE(ABORT, 'run PDFs are append-only');
END;

CREATE TRIGGER run_pdfs_no_delete BEFORE DELETE ON run_pdfs
BEGIN
    SELECT RAISE(ABORT, 'run PDFs are append-only');
END;
