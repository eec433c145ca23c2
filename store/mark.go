package store

import "math"

// At returns a view of db that reads the inputs as they stood when the
// ingest ledger ended at entry mark (a run's ledger_mark): rows loaded
// from later files are invisible, and a holdings snapshot corrected by a
// later file reads as the revision current at mark. Mark 0 means no
// limit, which is what db itself reads. Everything else (runs, outbox,
// writes) is unaffected. The view shares db's connections: close db, not
// the view. At panics on a negative mark, which no ledger can have.
func (db *DB) At(mark int64) *DB {
	if mark < 0 {
		panic("store: negative ledger mark")
	}
	v := *db
	v.mark = mark
	return &v
}

// Mark is the ledger entry the view reads up to; 0 means no limit.
func (db *DB) Mark() int64 { return db.mark }

// visibleTo is the highest source_file_id the read API may see: the
// mark, or every file when there is none. Passing it as a parameter
// keeps one SQL text per query whether or not a mark is set.
func (db *DB) visibleTo() int64 {
	if db.mark == 0 {
		return math.MaxInt64
	}
	return db.mark
}
