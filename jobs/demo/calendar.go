package demo

import (
	"sort"
	"time"
)

// calendar is the weekdays of the history. The scenario has no holidays:
// every weekday is a business day.
type calendar struct {
	days []time.Time
}

func newCalendar(end time.Time, years int) calendar {
	start := end.AddDate(-years, 0, 0)
	var days []time.Time
	for d := start; !d.After(end); d = d.AddDate(0, 0, 1) {
		if wd := d.Weekday(); wd != time.Saturday && wd != time.Sunday {
			days = append(days, d)
		}
	}
	return calendar{days: days}
}

func (c calendar) n() int { return len(c.days) }

// onOrAfter is the index of the first day not before t, or n() if none.
func (c calendar) onOrAfter(t time.Time) int {
	return sort.Search(len(c.days), func(i int) bool { return !c.days[i].Before(t) })
}

// atFraction is the day index a fraction f of the way through the history.
func (c calendar) atFraction(f float64) int {
	i := int(f * float64(len(c.days)-1))
	return min(max(i, 0), len(c.days)-1)
}

// snapshotDays are the indexes of the last business day of each ISO week.
func (c calendar) snapshotDays() []int {
	var out []int
	for i, d := range c.days {
		if i == len(c.days)-1 {
			out = append(out, i)
			break
		}
		y1, w1 := d.ISOWeek()
		y2, w2 := c.days[i+1].ISOWeek()
		if y1 != y2 || w1 != w2 {
			out = append(out, i)
		}
	}
	return out
}

// yearBefore is the index of the first day after t minus one year.
func (c calendar) yearBefore(i int) int {
	return sort.Search(len(c.days), func(j int) bool { return c.days[j].After(c.days[i].AddDate(-1, 0, 0)) })
}
