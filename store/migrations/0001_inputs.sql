-- 0001: end-of-day inputs and the ledger of ingested files.
--
-- Conventions:
--   * Dates are TEXT 'YYYY-MM-DD'; date(julianday(d)) IS d refuses
--     anything else, including impossible days such as 2026-02-30.
--   * Tables are STRICT, so a REAL column refuses text like 'abc'.
--   * Every input row names the ingest_files row it came from
--     (source_file_id) and its line in that file (source_line).
--   * Nothing is overwritten: input rows cannot be updated or deleted
--     (triggers below). A corrected holdings file adds a new revision of
--     the snapshot and marks the old one superseded_by the new one.

-- The ledger: one row per file offered to ingest, whatever the outcome.
CREATE TABLE ingest_files (
    id          INTEGER PRIMARY KEY,
    name        TEXT    NOT NULL CHECK (name <> ''),
    path        TEXT    NOT NULL,
    sha256      TEXT    NOT NULL CHECK (length(sha256) = 64 AND sha256 NOT GLOB '*[^0-9a-f]*'),
    kind        TEXT    CHECK (kind IN ('portfolios', 'securities', 'assumptions', 'prices',
                                        'yields', 'premiums', 'holdings', 'flows')),
    rows        INTEGER NOT NULL DEFAULT 0 CHECK (rows >= 0),
    outcome     TEXT    NOT NULL CHECK (outcome IN ('accepted', 'rejected', 'duplicate')),
    error       TEXT,
    ingested_at TEXT    NOT NULL DEFAULT (strftime('%Y-%m-%dT%H:%M:%fZ', 'now')),
    CHECK ((outcome = 'rejected') = (error IS NOT NULL)),
    CHECK (outcome = 'rejected' OR kind IS NOT NULL)
) STRICT;

-- A file's content is accepted at most once.
CREATE UNIQUE INDEX ingest_files_accepted_sha256 ON ingest_files (sha256) WHERE outcome = 'accepted';

CREATE TRIGGER ingest_files_no_delete BEFORE DELETE ON ingest_files
BEGIN
    SELECT RAISE(ABORT, 'the ingest ledger is append-only');
END;

-- Only the row count may change, while the file's transaction is open.
CREATE TRIGGER ingest_files_no_update
BEFORE UPDATE OF id, name, path, sha256, kind, outcome, error, ingested_at ON ingest_files
BEGIN
    SELECT RAISE(ABORT, 'the ingest ledger is append-only');
END;

CREATE TABLE portfolios (
    portfolio_id     TEXT    PRIMARY KEY
                     CHECK (length(portfolio_id) BETWEEN 1 AND 32
                            AND portfolio_id GLOB '[A-Z]*'
                            AND portfolio_id NOT GLOB '*[^A-Z0-9_-]*'),
    name             TEXT    NOT NULL CHECK (name <> ''),
    strategy         TEXT    NOT NULL CHECK (strategy <> ''),
    inception_date   TEXT    NOT NULL CHECK (date(julianday(inception_date)) IS inception_date),
    benchmark_method TEXT    NOT NULL
                     CHECK (benchmark_method IN ('value', 'price', 'equal', 'equal_geometric')),
    source_file_id   INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line      INTEGER NOT NULL CHECK (source_line > 0)
) STRICT;

CREATE TABLE securities (
    security_id        TEXT    PRIMARY KEY
                       CHECK (length(security_id) BETWEEN 1 AND 16
                              AND security_id GLOB '[A-Z]*'
                              AND security_id NOT GLOB '*[^A-Z0-9.]*'
                              AND security_id <> 'CASH'),
    name               TEXT    NOT NULL CHECK (name <> ''),
    sector             TEXT    NOT NULL CHECK (sector <> ''),
    currency           TEXT    NOT NULL CHECK (length(currency) = 3 AND currency NOT GLOB '*[^A-Z]*'),
    shares_outstanding REAL    NOT NULL CHECK (shares_outstanding > 0),
    source_file_id     INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line        INTEGER NOT NULL CHECK (source_line > 0)
) STRICT;

-- Valuation assumptions; those in effect on date t have the latest
-- effective_date <= t.
CREATE TABLE assumptions (
    id              INTEGER PRIMARY KEY,
    security_id     TEXT    NOT NULL REFERENCES securities (security_id),
    effective_date  TEXT    NOT NULL CHECK (date(julianday(effective_date)) IS effective_date),
    annual_dividend REAL    NOT NULL CHECK (annual_dividend >= 0),
    frequency       INTEGER NOT NULL CHECK (frequency IN (1, 2, 4, 12)),
    growth          REAL    NOT NULL CHECK (growth > -1 AND growth < 1),
    beta            REAL,   -- NULL: estimate from returns
    discount_rate   REAL    CHECK (discount_rate > 0), -- NULL: CAPM
    source_file_id  INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line     INTEGER NOT NULL CHECK (source_line > 0),
    UNIQUE (security_id, effective_date)
) STRICT;

-- The multi-stage forecast of an assumption, in order (ordinal 1 first).
CREATE TABLE assumption_stages (
    assumption_id INTEGER NOT NULL REFERENCES assumptions (id),
    ordinal       INTEGER NOT NULL CHECK (ordinal >= 1),
    years         INTEGER NOT NULL CHECK (years > 0),
    growth        REAL    NOT NULL CHECK (growth > -1),
    rate          REAL    CHECK (rate > 0), -- NULL: the assumption's discount rate
    PRIMARY KEY (assumption_id, ordinal)
) STRICT, WITHOUT ROWID;

-- One holdings snapshot per (portfolio, as_of, revision). The current
-- revision has superseded_by NULL; at most one is current.
CREATE TABLE holding_snapshots (
    id             INTEGER PRIMARY KEY,
    portfolio_id   TEXT    NOT NULL REFERENCES portfolios (portfolio_id),
    as_of          TEXT    NOT NULL CHECK (date(julianday(as_of)) IS as_of),
    revision       INTEGER NOT NULL CHECK (revision >= 1),
    source_file_id INTEGER NOT NULL REFERENCES ingest_files (id),
    -- Deferred: the replacing snapshot is inserted after the old one is marked.
    superseded_by  INTEGER REFERENCES holding_snapshots (id) DEFERRABLE INITIALLY DEFERRED
                   CHECK (superseded_by <> id),
    UNIQUE (portfolio_id, as_of, revision)
) STRICT;

CREATE UNIQUE INDEX holding_snapshots_current ON holding_snapshots (portfolio_id, as_of)
    WHERE superseded_by IS NULL;

CREATE TRIGGER holding_snapshots_no_delete BEFORE DELETE ON holding_snapshots
BEGIN
    SELECT RAISE(ABORT, 'holding snapshots are append-only');
END;

-- The only change allowed: marking a current snapshot superseded.
CREATE TRIGGER holding_snapshots_only_supersede BEFORE UPDATE ON holding_snapshots
WHEN OLD.superseded_by IS NOT NULL OR NEW.superseded_by IS NULL
  OR NEW.id IS NOT OLD.id OR NEW.portfolio_id IS NOT OLD.portfolio_id
  OR NEW.as_of IS NOT OLD.as_of OR NEW.revision IS NOT OLD.revision
  OR NEW.source_file_id IS NOT OLD.source_file_id
BEGIN
    SELECT RAISE(ABORT, 'a holding snapshot can only be marked superseded, once');
END;

-- The lines of a snapshot: a security (security_id) or cash (security_id
-- NULL, quantity = amount, price = 1).
CREATE TABLE holding_lines (
    snapshot_id INTEGER NOT NULL REFERENCES holding_snapshots (id),
    security_id TEXT    REFERENCES securities (security_id),
    quantity    REAL    NOT NULL,
    price       REAL    NOT NULL CHECK (price > 0),
    source_line INTEGER NOT NULL CHECK (source_line > 0),
    CHECK (CASE WHEN security_id IS NULL THEN price = 1 ELSE quantity >= 0 END)
) STRICT;

CREATE UNIQUE INDEX holding_lines_key ON holding_lines (snapshot_id, ifnull(security_id, 'CASH'));

-- Daily prices: close unadjusted, dividend per share going ex that day,
-- split ratio = new shares per old share effective at the open.
CREATE TABLE prices (
    date           TEXT    NOT NULL CHECK (date(julianday(date)) IS date
                                           AND strftime('%w', date) NOT IN ('0', '6')),
    security_id    TEXT    NOT NULL REFERENCES securities (security_id),
    close          REAL    NOT NULL CHECK (close > 0),
    dividend       REAL    NOT NULL DEFAULT 0 CHECK (dividend >= 0),
    split_ratio    REAL    NOT NULL DEFAULT 1 CHECK (split_ratio > 0),
    source_file_id INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line    INTEGER NOT NULL CHECK (source_line > 0),
    PRIMARY KEY (date, security_id)
) STRICT, WITHOUT ROWID;

-- Annually compounded zero-coupon yields, decimal.
CREATE TABLE yields (
    date           TEXT    NOT NULL CHECK (date(julianday(date)) IS date),
    tenor_months   INTEGER NOT NULL CHECK (tenor_months BETWEEN 1 AND 600),
    yield          REAL    NOT NULL CHECK (yield > -0.05 AND yield < 0.5),
    source_file_id INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line    INTEGER NOT NULL CHECK (source_line > 0),
    PRIMARY KEY (date, tenor_months)
) STRICT, WITHOUT ROWID;

-- Equity risk premium, decimal.
CREATE TABLE premiums (
    date                TEXT    PRIMARY KEY CHECK (date(julianday(date)) IS date),
    equity_risk_premium REAL    NOT NULL CHECK (equity_risk_premium >= 0 AND equity_risk_premium < 0.5),
    source_file_id      INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line         INTEGER NOT NULL CHECK (source_line > 0)
) STRICT, WITHOUT ROWID;

-- External cash flows, end of day, base currency, + in / - out. One net
-- flow per portfolio and day.
CREATE TABLE flows (
    date           TEXT    NOT NULL CHECK (date(julianday(date)) IS date),
    portfolio_id   TEXT    NOT NULL REFERENCES portfolios (portfolio_id),
    amount         REAL    NOT NULL CHECK (amount <> 0),
    source_file_id INTEGER NOT NULL REFERENCES ingest_files (id),
    source_line    INTEGER NOT NULL CHECK (source_line > 0),
    PRIMARY KEY (date, portfolio_id)
) STRICT, WITHOUT ROWID;

-- Input rows are never changed or removed.
CREATE TRIGGER portfolios_no_update BEFORE UPDATE ON portfolios
BEGIN SELECT RAISE(ABORT, 'portfolios are append-only'); END;
CREATE TRIGGER portfolios_no_delete BEFORE DELETE ON portfolios
BEGIN SELECT RAISE(ABORT, 'portfolios are append-only'); END;
CREATE TRIGGER securities_no_update BEFORE UPDATE ON securities
BEGIN SELECT RAISE(ABORT, 'securities are append-only'); END;
CREATE TRIGGER securities_no_delete BEFORE DELETE ON securities
BEGIN SELECT RAISE(ABORT, 'securities are append-only'); END;
CREATE TRIGGER assumptions_no_update BEFORE UPDATE ON assumptions
BEGIN SELECT RAISE(ABORT, 'assumptions are append-only'); END;
CREATE TRIGGER assumptions_no_delete BEFORE DELETE ON assumptions
BEGIN SELECT RAISE(ABORT, 'assumptions are append-only'); END;
CREATE TRIGGER assumption_stages_no_update BEFORE UPDATE ON assumption_stages
BEGIN SELECT RAISE(ABORT, 'assumption stages are append-only'); END;
CREATE TRIGGER assumption_stages_no_delete BEFORE DELETE ON assumption_stages
BEGIN SELECT RAISE(ABORT, 'assumption stages are append-only'); END;
CREATE TRIGGER holding_lines_no_update BEFORE UPDATE ON holding_lines
BEGIN SELECT RAISE(ABORT, 'holding lines are append-only'); END;
CREATE TRIGGER holding_lines_no_delete BEFORE DELETE ON holding_lines
BEGIN SELECT RAISE(ABORT, 'holding lines are append-only'); END;
CREATE TRIGGER prices_no_update BEFORE UPDATE ON prices
BEGIN SELECT RAISE(ABORT, 'prices are append-only'); END;
CREATE TRIGGER prices_no_delete BEFORE DELETE ON prices
BEGIN SELECT RAISE(ABORT, 'prices are append-only'); END;
CREATE TRIGGER yields_no_update BEFORE UPDATE ON yields
BEGIN SELECT RAISE(ABORT, 'yields are append-only'); END;
CREATE TRIGGER yields_no_delete BEFORE DELETE ON yields
BEGIN SELECT RAISE(ABORT, 'yields are append-only'); END;
CREATE TRIGGER premiums_no_update BEFORE UPDATE ON premiums
BEGIN SELECT RAISE(ABORT, 'premiums are append-only'); END;
CREATE TRIGGER premiums_no_delete BEFORE DELETE ON premiums
BEGIN SELECT RAISE(ABORT, 'premiums are append-only'); END;
CREATE TRIGGER flows_no_update BEFORE UPDATE ON flows
BEGIN SELECT RAISE(ABORT, 'flows are append-only'); END;
CREATE TRIGGER flows_no_delete BEFORE DELETE ON flows
BEGIN SELECT RAISE(ABORT, 'flows are append-only'); END;
