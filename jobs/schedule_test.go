package jobs

import (
	"context"
	"testing"
	"time"

	"github.com/jonboulle/clockwork"

	"plumbline/store"
)

func mustZone(t *testing.T, name string) *time.Location {
	t.Helper()
	loc, err := time.LoadLocation(name)
	if err != nil {
		t.Fatal(err)
	}
	return loc
}

// Daylight-saving dates used below, from the rules in force (from memory):
// in the United States clocks go forward on the second Sunday of March
// (2026-03-08) and back on the first Sunday of November (2026-11-01); in
// the European Union forward on the last Sunday of March (2026-03-29) and
// back on the last Sunday of October (2026-10-25).
func TestWeeklyAcrossDaylightSaving(t *testing.T) {
	ny := mustZone(t, "America/New_York")
	paris := mustZone(t, "Europe/Paris")
	utc := func(s string) time.Time {
		v, err := time.Parse(time.RFC3339, s)
		if err != nil {
			t.Fatal(err)
		}
		return v
	}
	fri1900 := func(loc *time.Location) Weekly {
		return Weekly{Days: []time.Weekday{time.Friday}, Hour: 19, Minute: 0, Loc: loc}
	}
	for _, tc := range []struct {
		name      string
		w         Weekly
		from      string // UTC
		wantNexts []string
	}{
		// 19:00 EST is 00:00 UTC next day (UTC-5); 19:00 EDT is 23:00 UTC (UTC-4).
		{"New York, spring forward", fri1900(ny), "2026-03-05T12:00:00Z",
			[]string{"2026-03-07T00:00:00Z", "2026-03-13T23:00:00Z", "2026-03-20T23:00:00Z"}},
		{"New York, fall back", fri1900(ny), "2026-10-29T12:00:00Z",
			[]string{"2026-10-30T23:00:00Z", "2026-11-07T00:00:00Z"}},
		// 19:00 CET is 18:00 UTC (UTC+1); 19:00 CEST is 17:00 UTC (UTC+2).
		{"Paris, spring forward", fri1900(paris), "2026-03-26T00:00:00Z",
			[]string{"2026-03-27T18:00:00Z", "2026-04-03T17:00:00Z"}},
		{"Paris, fall back", fri1900(paris), "2026-10-22T00:00:00Z",
			[]string{"2026-10-23T17:00:00Z", "2026-10-30T18:00:00Z"}},
		// Exactly at an occurrence, Next is the following one.
		{"at an occurrence", fri1900(time.UTC), "2026-03-06T19:00:00Z",
			[]string{"2026-03-13T19:00:00Z"}},
		{"weekdays", Weekly{Days: []time.Weekday{time.Monday, time.Tuesday, time.Wednesday, time.Thursday, time.Friday}, Hour: 18, Minute: 30, Loc: ny},
			"2026-03-06T23:31:00Z", []string{"2026-03-09T22:30:00Z", "2026-03-10T22:30:00Z"}},
	} {
		t.Run(tc.name, func(t *testing.T) {
			at := utc(tc.from)
			for _, want := range tc.wantNexts {
				next := tc.w.Next(at)
				if !next.Equal(utc(want)) {
					t.Fatalf("Next(%v) = %v, want %s", at, next.UTC(), want)
				}
				if l := next.In(tc.w.Loc); l.Hour() != tc.w.Hour || l.Minute() != tc.w.Minute {
					t.Fatalf("occurrence %v is not at %02d:%02d local", l, tc.w.Hour, tc.w.Minute)
				}
				if p := tc.w.Prev(next); !p.Equal(next) {
					t.Fatalf("Prev(%v) = %v, want the same instant", next, p)
				}
				if p := tc.w.Prev(next.Add(-time.Second)); !p.Before(next) {
					t.Fatalf("Prev just before an occurrence = %v", p)
				}
				at = next
			}
		})
	}
}

func TestMissedPacks(t *testing.T) {
	ny := mustZone(t, "America/New_York")
	w := Weekly{Days: []time.Weekday{time.Friday}, Hour: 19, Loc: ny}
	served := time.Date(2026, 2, 27, 19, 0, 0, 0, ny)
	now := time.Date(2026, 3, 17, 9, 0, 0, 0, ny) // Tuesday, two Fridays missed
	mar6, mar13 := time.Date(2026, 3, 6, 19, 0, 0, 0, ny), time.Date(2026, 3, 13, 19, 0, 0, 0, ny)
	for _, tc := range []struct {
		name  string
		since time.Time
		max   int
		want  []time.Time
	}{
		{"latest only", served, 1, []time.Time{mar13}},
		{"all, oldest first", served, 4, []time.Time{mar6, mar13}},
		{"disabled", served, 0, nil},
		{"nothing missed", mar13, 4, nil},
		{"never ran", time.Time{}, 4, nil},
	} {
		t.Run(tc.name, func(t *testing.T) {
			got := missedPacks(w, tc.since, now, tc.max)
			if len(got) != len(tc.want) {
				t.Fatalf("missedPacks = %v, want %v", got, tc.want)
			}
			for i := range got {
				if !got[i].Equal(tc.want[i]) {
					t.Fatalf("missedPacks = %v, want %v", got, tc.want)
				}
			}
		})
	}
}

// TestSchedulerWeeklyPackWithFakeClock drives gocron with a fake clock in
// New York across the 2026 spring-forward change: the pack runs on
// Friday at 19:00 local both before (UTC-5) and after (UTC-4), with the
// as-of date of that Friday, and the job is recorded.
func TestSchedulerWeeklyPackWithFakeClock(t *testing.T) {
	dir := t.TempDir()
	cfg := testConfig(dir)
	cfg.Sources.DropDir = "" // no ingest job in this test
	db := openDB(t, cfg.Database)
	ny := mustZone(t, "America/New_York")
	clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 5, 12, 0, 0, 0, ny))
	calls := make(chan packCall, 10)
	d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock, Pack: fakePack(clock, calls)})
	stop := runDaemon(t, d)

	for _, want := range []time.Time{
		time.Date(2026, 3, 6, 19, 0, 0, 0, ny),
		time.Date(2026, 3, 13, 19, 0, 0, 0, ny),
		time.Date(2026, 3, 20, 19, 0, 0, 0, ny),
	} {
		// gocron must have scheduled exactly this time next.
		waitFor(t, "next pack run "+want.String(), func() bool {
			next, err := d.gjobs[JobPack].NextRun()
			return err == nil && next.Equal(want)
		})
		clock.Advance(want.Sub(clock.Now()) - time.Second)
		select {
		case c := <-calls:
			t.Fatalf("pack ran early at %v", c.at)
		case <-time.After(20 * time.Millisecond):
		}
		clock.Advance(time.Second)
		select {
		case c := <-calls:
			if !c.at.Equal(want) {
				t.Fatalf("pack ran at %v, want %v", c.at, want)
			}
			if wantDate := time.Date(want.Year(), want.Month(), want.Day(), 0, 0, 0, 0, time.UTC); !c.asOf.Equal(wantDate) {
				t.Fatalf("pack as of %v, want %v", c.asOf, wantDate)
			}
		case <-time.After(10 * time.Second):
			t.Fatalf("pack did not run at %v", want)
		}
	}
	if err := stop(); err != nil {
		t.Fatal(err)
	}
	recs, err := db.JobRuns(context.Background(), JobPack, 10)
	if err != nil || len(recs) != 3 {
		t.Fatalf("pack records = %+v, %v", recs, err)
	}
	for _, r := range recs {
		if r.Outcome != store.JobOK || r.ScheduledFor.In(ny).Hour() != 19 || r.ScheduledFor.In(ny).Weekday() != time.Friday {
			t.Errorf("record %+v", r)
		}
	}
}

// TestCatchUpAfterDowntime: the last pack built was for 2026-02-27; the
// daemon starts on Tuesday 2026-03-17 and builds the packs of the Fridays
// it missed, oldest first, up to catch_up_max.
func TestCatchUpAfterDowntime(t *testing.T) {
	ny := mustZone(t, "America/New_York")
	for _, tc := range []struct {
		max  int
		want []string
	}{{1, []string{"2026-03-13"}}, {4, []string{"2026-03-06", "2026-03-13"}}, {0, nil}} {
		dir := t.TempDir()
		cfg := testConfig(dir)
		cfg.Sources.DropDir = ""
		cfg.Schedule.CatchUpMax = tc.max
		db := openDB(t, cfg.Database)
		ctx := context.Background()
		served := time.Date(2026, 2, 27, 19, 0, 0, 0, ny)
		id, _, _, err := db.StartJobOnce(ctx, JobPack, served, "earlier", served, served.Add(-time.Hour))
		if err != nil {
			t.Fatal(err)
		}
		db.FinishJob(ctx, id, served.Add(time.Minute), store.JobOK, "")

		clock := clockwork.NewFakeClockAt(time.Date(2026, 3, 17, 9, 0, 0, 0, ny))
		calls := make(chan packCall, 10)
		d := newDaemon(t, DaemonOptions{Config: cfg, DB: db, Clock: clock, Pack: fakePack(clock, calls)})
		stop := runDaemon(t, d)
		var got []string
		for range tc.want {
			select {
			case c := <-calls:
				got = append(got, c.asOf.Format(time.DateOnly))
			case <-time.After(10 * time.Second):
				t.Fatalf("max %d: catch-up built %v, want %v", tc.max, got, tc.want)
			}
		}
		stop()
		select {
		case c := <-calls:
			t.Fatalf("max %d: extra pack as of %v", tc.max, c.asOf)
		default:
		}
		for i := range tc.want {
			if got[i] != tc.want[i] {
				t.Fatalf("max %d: catch-up built %v, want %v", tc.max, got, tc.want)
			}
		}
		last, _, _ := db.LastServed(ctx, JobPack)
		if tc.max > 0 && !last.Equal(time.Date(2026, 3, 13, 19, 0, 0, 0, ny)) {
			t.Fatalf("max %d: last served %v", tc.max, last)
		}
	}
}
