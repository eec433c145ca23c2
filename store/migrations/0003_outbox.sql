-- Daemon tables: the mail outbox, the job execution log and the log of
-- HTTP fetches. Times are UTC text "YYYY-MM-DDTHH:MM:SS.ffffffZ" (fixed
-- width, so text order is time order).

-- One e-mail per row. A row is written in the same transaction as the run
-- it announces and is never deleted: sent_at marks delivery. Delivery is
-- at least once: a daemon claims a row with a lease (claimed_by,
-- claimed_until) before talking to the SMTP server and records sent_at
-- after the server accepted the message; if it dies in between, the lease
-- expires and the row is sent again with the same Message-ID header
-- (message_id), which lets receiving systems drop the duplicate.
CREATE TABLE outbox (
    id                INTEGER PRIMARY KEY,
    run_id            INTEGER NOT NULL REFERENCES runs(id),
    recipients        TEXT NOT NULL,          -- JSON array of addresses
    subject           TEXT NOT NULL,
    text_body         TEXT NOT NULL,
    html_body         TEXT NOT NULL,
    attachment_name   TEXT,                   -- NULL: no attachment
    attachment_sha256 TEXT,                   -- hex sha256 of run_pdfs.pdf
    created_at        TEXT NOT NULL,
    message_id        TEXT UNIQUE,            -- "<...@domain>", fixed at the first claim
    attempts          INTEGER NOT NULL DEFAULT 0,
    next_attempt_at   TEXT NOT NULL,
    last_error        TEXT NOT NULL DEFAULT '',
    smtp_reply        TEXT NOT NULL DEFAULT '', -- server's final reply (its queue id)
    sent_at           TEXT,
    claimed_by        TEXT,
    claimed_until     TEXT,
    CHECK ((attachment_name IS NULL) = (attachment_sha256 IS NULL))
) STRICT;
CREATE INDEX outbox_due ON outbox(sent_at, next_attempt_at);
CREATE INDEX outbox_run ON outbox(run_id);

-- One row per job execution of `plumbline serve`. outcome is NULL while
-- the job runs; a row left open longer than the job timeout belongs to a
-- process that died.
CREATE TABLE job_runs (
    id            INTEGER PRIMARY KEY,
    job           TEXT NOT NULL,              -- ingest | pack | outbox
    scheduled_for TEXT,                       -- the schedule time served, NULL for interval jobs
    started_at    TEXT NOT NULL,
    ended_at      TEXT,
    outcome       TEXT CHECK (outcome IN ('ok', 'error', 'skipped')),
    error         TEXT NOT NULL DEFAULT '',
    holder        TEXT NOT NULL,              -- the daemon instance
    CHECK ((ended_at IS NULL) = (outcome IS NULL))
) STRICT;
CREATE INDEX job_runs_job ON job_runs(job, started_at);
CREATE INDEX job_runs_slot ON job_runs(job, scheduled_for);

-- One row per file fetched by an HTTP source.
CREATE TABLE fetches (
    id         INTEGER PRIMARY KEY,
    source     TEXT NOT NULL,
    url        TEXT NOT NULL,
    fetched_at TEXT NOT NULL,
    file       TEXT NOT NULL,                 -- name saved in the drop folder; '' when unchanged
    bytes      INTEGER NOT NULL,
    sha256     TEXT NOT NULL
) STRICT;
CREATE INDEX fetches_source ON fetches(source, fetched_at);
