package jobs

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"net"
	"net/http"
	"time"

	"plumbline/store"
)

// Status is the JSON document served at /status.
type Status struct {
	Now        time.Time            `json:"now"`
	Holder     string               `json:"holder"`
	TimeZone   string               `json:"time_zone"`
	Jobs       []JobStatus          `json:"jobs"`
	Outbox     store.OutboxStats    `json:"outbox"`
	Portfolios []store.PortfolioRun `json:"portfolios"`
}

// JobStatus is the last and next execution of one job.
type JobStatus struct {
	Name string           `json:"name"`
	Last *store.JobRecord `json:"last"` // latest execution on this database, any daemon
	// LastOK is the end of the latest successful execution.
	LastOK  time.Time `json:"last_ok,omitzero"`
	NextRun time.Time `json:"next_run,omitzero"` // in this daemon
}

// Status gathers the daemon's status from the database and the scheduler.
func (d *Daemon) Status(ctx context.Context) (*Status, error) {
	now := d.clock.Now()
	st := &Status{Now: now.UTC(), Holder: d.holder, TimeZone: d.loc.String(), Jobs: []JobStatus{}}
	for _, name := range []string{JobIngest, JobPack, JobOutbox} {
		js := JobStatus{Name: name}
		recs, err := d.db.JobRuns(ctx, name, 50)
		if err != nil {
			return nil, err
		}
		if len(recs) > 0 {
			js.Last = &recs[0]
		}
		for _, r := range recs {
			if r.Outcome == store.JobOK {
				js.LastOK = r.EndedAt
				break
			}
		}
		if j, ok := d.gjobs[name]; ok {
			if t, err := j.NextRun(); err == nil && !t.IsZero() {
				js.NextRun = t.UTC()
			}
		} else if name == JobIngest {
			continue // no drop folder: the job is not scheduled
		}
		st.Jobs = append(st.Jobs, js)
	}
	var err error
	if st.Outbox, err = d.db.OutboxStats(ctx, now); err != nil {
		return nil, err
	}
	if st.Portfolios, err = d.db.LatestRuns(ctx); err != nil {
		return nil, err
	}
	if st.Portfolios == nil {
		st.Portfolios = []store.PortfolioRun{}
	}
	return st, nil
}

// StatusHandler serves /healthz (200 "ok" while the database answers) and
// /status (the Status document as JSON).
func (d *Daemon) StatusHandler() http.Handler {
	mux := http.NewServeMux()
	mux.HandleFunc("GET /healthz", func(w http.ResponseWriter, r *http.Request) {
		ctx, cancel := context.WithTimeout(r.Context(), 5*time.Second)
		defer cancel()
		if _, err := d.db.OutboxStats(ctx, d.clock.Now()); err != nil {
			http.Error(w, "database unavailable", http.StatusServiceUnavailable)
			return
		}
		w.Header().Set("Content-Type", "text/plain; charset=utf-8")
		fmt.Fprintln(w, "ok")
	})
	mux.HandleFunc("GET /status", func(w http.ResponseWriter, r *http.Request) {
		st, err := d.Status(r.Context())
		if err != nil {
			d.log.Error("status", "err", err)
			http.Error(w, "status unavailable", http.StatusInternalServerError)
			return
		}
		w.Header().Set("Content-Type", "application/json")
		enc := json.NewEncoder(w)
		enc.SetIndent("", "  ")
		enc.Encode(st)
	})
	return mux
}

// startStatus listens on [status] listen, if set.
func (d *Daemon) startStatus() error {
	addr := d.cfg.Status.Listen
	if addr == "" {
		return nil
	}
	ln, err := net.Listen("tcp", addr)
	if err != nil {
		return fmt.Errorf("daemon: status endpoint: %w", err)
	}
	d.status = ln
	srv := &http.Server{Handler: d.StatusHandler(), ReadHeaderTimeout: 10 * time.Second}
	go func() {
		if err := srv.Serve(ln); err != nil && !errors.Is(err, http.ErrServerClosed) && !errors.Is(err, net.ErrClosed) {
			d.log.Error("status endpoint", "err", err)
		}
	}()
	d.statusSrv = srv
	d.log.Info("status endpoint listening", "addr", ln.Addr().String())
	return nil
}

func (d *Daemon) stopStatus() {
	if d.statusSrv == nil {
		return
	}
	ctx, cancel := context.WithTimeout(context.Background(), 5*time.Second)
	defer cancel()
	d.statusSrv.Shutdown(ctx)
}

// StatusAddr is the address the status endpoint listens on, or "".
func (d *Daemon) StatusAddr() string {
	if d.status == nil {
		return ""
	}
	return d.status.Addr().String()
}
