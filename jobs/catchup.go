package jobs

import (
	"context"
	"time"
)

// missedPacks returns the pack schedule times to build on start, oldest
// first: those of sched in (since, now], at most max of them (the most
// recent). since is the latest schedule time whose pack succeeded; when
// no pack ever succeeded, it is the first time any daemon job ran on this
// database, and when no job ever ran, nothing was missed (a new install
// does not build packs for the past).
func missedPacks(sched Weekly, since time.Time, now time.Time, max int) []time.Time {
	if since.IsZero() || max <= 0 {
		return nil
	}
	missed := sched.Between(since, now)
	if len(missed) > max {
		missed = missed[len(missed)-max:]
	}
	return missed
}

// catchUp builds the packs missed while no daemon ran, oldest first.
func (d *Daemon) catchUp(ctx context.Context) {
	since, ok, err := d.db.LastServed(ctx, JobPack)
	if err == nil && !ok {
		since, _, err = d.db.FirstJobStart(ctx)
	}
	if err != nil {
		d.log.Error("catch-up: cannot read the job log", "err", err)
		return
	}
	missed := missedPacks(d.packW, since, d.clock.Now(), d.cfg.Schedule.CatchUpMax)
	if len(missed) == 0 {
		d.log.Debug("catch-up: no pack missed")
		return
	}
	d.log.Info("catch-up: building missed packs", "count", len(missed), "since", since.In(d.loc).Format(time.RFC3339))
	for _, t := range missed {
		if ctx.Err() != nil {
			return
		}
		d.RunPack(ctx, t)
	}
}
