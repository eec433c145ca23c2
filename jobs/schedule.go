package jobs

import (
	"fmt"
	"slices"
	"time"

	"github.com/go-co-op/gocron/v2"

	"plumbline/jobs/config"
)

// Weekly is a wall-clock schedule: at Hour:Minute local time in Loc on
// each of Days. A local time that does not exist on a spring-forward day
// falls where time.Date puts it (one hour later for a one-hour gap), as
// gocron's default daylight-saving policy does for weekly jobs.
type Weekly struct {
	Days         []time.Weekday
	Hour, Minute int
	Loc          *time.Location
}

// weeklyFromConfig builds a schedule from config day names and "HH:MM".
func weeklyFromConfig(days []string, at string, loc *time.Location) (Weekly, error) {
	wd, err := config.ParseWeekdays(days)
	if err != nil {
		return Weekly{}, err
	}
	h, m, err := config.ParseTimeOfDay(at)
	if err != nil {
		return Weekly{}, err
	}
	return Weekly{Days: wd, Hour: h, Minute: m, Loc: loc}, nil
}

// at returns the occurrence on the local calendar day of t shifted by
// dayOffset days, and whether that day is a scheduled weekday.
func (w Weekly) at(t time.Time, dayOffset int) (time.Time, bool) {
	l := t.In(w.Loc)
	day := time.Date(l.Year(), l.Month(), l.Day()+dayOffset, 12, 0, 0, 0, w.Loc)
	if !slices.Contains(w.Days, day.Weekday()) {
		return time.Time{}, false
	}
	return time.Date(day.Year(), day.Month(), day.Day(), w.Hour, w.Minute, 0, 0, w.Loc), true
}

// Next returns the first occurrence strictly after t.
func (w Weekly) Next(t time.Time) time.Time {
	for off := -1; off <= 8; off++ {
		if o, ok := w.at(t, off); ok && o.After(t) {
			return o
		}
	}
	return time.Time{} // unreachable with at least one weekday
}

// Prev returns the latest occurrence at or before t.
func (w Weekly) Prev(t time.Time) time.Time {
	for off := 1; off >= -8; off-- {
		if o, ok := w.at(t, off); ok && !o.After(t) {
			return o
		}
	}
	return time.Time{}
}

// Between returns the occurrences in (after, upTo], oldest first.
func (w Weekly) Between(after, upTo time.Time) []time.Time {
	var out []time.Time
	for t := w.Next(after); !t.IsZero() && !t.After(upTo); t = w.Next(t) {
		out = append(out, t)
	}
	return out
}

// definition returns the gocron job definition of the schedule. The
// scheduler must run in w.Loc (gocron.WithLocation).
func (w Weekly) definition() gocron.JobDefinition {
	days := make([]time.Weekday, len(w.Days))
	copy(days, w.Days)
	return gocron.WeeklyJob(1,
		gocron.NewWeekdays(days[0], days[1:]...),
		gocron.NewAtTimes(gocron.NewAtTime(uint(w.Hour), uint(w.Minute), 0)))
}

func (w Weekly) String() string {
	return fmt.Sprintf("%v at %02d:%02d %s", w.Days, w.Hour, w.Minute, w.Loc)
}

// packDate is the as-of date of the pack served by schedule time t: its
// local calendar date in loc, as UTC midnight (the project's date form).
func packDate(t time.Time, loc *time.Location) time.Time {
	l := t.In(loc)
	return time.Date(l.Year(), l.Month(), l.Day(), 0, 0, 0, 0, time.UTC)
}
