package config

import (
	"fmt"
	"net"
	"net/mail"
	"net/url"
	"regexp"
	"strconv"
	"strings"
	"time"
)

// Sources says where end-of-day files come from: a drop folder that
// `plumbline serve` ingests, and HTTP(S) downloads saved into it.
type Sources struct {
	// DropDir is the folder watched by the ingest job; "" disables it.
	DropDir string `toml:"drop_dir" json:"drop_dir"`
	// ProcessedDir and RejectedDir receive the files after ingestion.
	// Empty means DropDir/processed and DropDir/rejected.
	ProcessedDir string `toml:"processed_dir" json:"processed_dir"`
	RejectedDir  string `toml:"rejected_dir" json:"rejected_dir"`
	// StableFor is the wait between the two scans of the drop folder: a
	// file is picked up only when its size and modification time are the
	// same in both. 0 relies on the marker convention alone (names ending
	// in .part or starting with "." are never picked up).
	StableFor Interval `toml:"stable_for" json:"stable_for"`
	// HTTP lists files fetched by the ingest job before the folder scan.
	HTTP []HTTPSource `toml:"http" json:"http"`
}

// HTTPSource is one end-of-day file fetched with GET. A field left out of
// the file (or zero when built in code) takes the default shown.
type HTTPSource struct {
	// Name identifies the source in logs and in the saved file's name
	// (NAME-YYYY-MM-DD.csv); letters, digits, '-' and '_'.
	Name string `toml:"name" json:"name"`
	// URL is http or https; "{date}" is replaced by the run's local date
	// (YYYY-MM-DD in the schedule's time zone).
	URL string `toml:"url" json:"url"`
	// Timeout bounds one attempt, headers and body (default 60s).
	Timeout Interval `toml:"timeout" json:"timeout"`
	// Retries is the number of further attempts after a failure
	// (default 3); a 4xx answer other than 408 and 429 is not retried.
	Retries int `toml:"retries" json:"retries"`
	// Backoff is the wait before the first retry, doubled each time
	// (default 5s).
	Backoff Interval `toml:"backoff" json:"backoff"`
	// MaxBytes caps the body (default 64 MiB); a larger file is refused.
	MaxBytes int64 `toml:"max_bytes" json:"max_bytes"`
}

// HTTP source defaults, applied by validateDaemon to keys not written.
const (
	DefaultHTTPTimeout  = 60 * time.Second
	DefaultHTTPRetries  = 3
	DefaultHTTPBackoff  = 5 * time.Second
	DefaultHTTPMaxBytes = 64 << 20
)

// Schedule sets when the daemon's jobs run, in one IANA time zone.
type Schedule struct {
	// TimeZone is an IANA zone name such as "America/New_York" or "UTC".
	TimeZone string `toml:"time_zone" json:"time_zone"`
	// IngestDays and IngestAt: the ingest job's weekdays and local time.
	IngestDays []string `toml:"ingest_days" json:"ingest_days"`
	IngestAt   string   `toml:"ingest_at" json:"ingest_at"`
	// PackDays and PackAt: the weekly pack's weekdays and local time.
	PackDays []string `toml:"pack_days" json:"pack_days"`
	PackAt   string   `toml:"pack_at" json:"pack_at"`
	// OutboxEvery is the interval of the mail delivery job.
	OutboxEvery Interval `toml:"outbox_every" json:"outbox_every"`
	// CatchUpMax is how many of the most recent pack times missed while
	// the daemon was down are built on start; 0 disables catch-up.
	CatchUpMax int `toml:"catch_up_max" json:"catch_up_max"`
	// JobTimeout bounds one job execution. A job record still open after
	// it belongs to a process that died.
	JobTimeout Interval `toml:"job_timeout" json:"job_timeout"`
	// ShutdownGrace is how long a running job may take to finish after
	// SIGINT or SIGTERM before it is cancelled.
	ShutdownGrace Interval `toml:"shutdown_grace" json:"shutdown_grace"`
}

// Portfolio names who receives a portfolio's pack.
type Portfolio struct {
	ID         string   `toml:"id" json:"id"`
	Recipients []string `toml:"recipients" json:"recipients"`
}

// Mail configures delivery of the packs. The SMTP password is never part
// of the configuration: only where to read it (an environment variable or
// a file), so it is in no stored run, hash or log.
type Mail struct {
	// Delivery is "folder" (write .eml files into Folder) or "smtp".
	Delivery string `toml:"delivery" json:"delivery"`
	Folder   string `toml:"folder" json:"folder"`
	// From is the sender, "Name <addr@domain>" or a bare address. Its
	// domain also names the Message-ID of each message.
	From string `toml:"from" json:"from"`
	Host string `toml:"host" json:"host"`
	Port int    `toml:"port" json:"port"`
	// TLS is "starttls" (required, port 587), "implicit" (port 465) or
	// "none" (plain text: only for a relay on the same host, and tests).
	TLS string `toml:"tls" json:"tls"`
	// Auth is "plain", "login" or "none".
	Auth     string `toml:"auth" json:"auth"`
	Username string `toml:"username" json:"username"`
	// PasswordEnv names the environment variable holding the password;
	// PasswordFile is a file holding it (trailing newline ignored). One of
	// the two when Auth is not "none".
	PasswordEnv  string `toml:"password_env" json:"password_env"`
	PasswordFile string `toml:"password_file" json:"password_file"`
	// Timeout bounds one SMTP conversation.
	Timeout Interval `toml:"timeout" json:"timeout"`
	// RetryBase is the wait after the first failed attempt, doubled after
	// each further one up to RetryMax. A message is retried until sent.
	RetryBase Interval `toml:"retry_base" json:"retry_base"`
	RetryMax  Interval `toml:"retry_max" json:"retry_max"`
	// Lease is how long a daemon holds a message it is sending; another
	// daemon on the same database may take it over only after that.
	Lease Interval `toml:"lease" json:"lease"`
}

// Status configures the local status endpoint.
type Status struct {
	// Listen is host:port for /healthz and /status; "" disables them.
	Listen string `toml:"listen" json:"listen"`
}

// Interval is a length of time written as a Go duration string ("90s",
// "1m30s", "2h"). It is a struct so that a bare number in the file (which
// would otherwise be read as nanoseconds) is refused.
type Interval struct{ d time.Duration }

// Every returns d as an Interval.
func Every(d time.Duration) Interval { return Interval{d} }

// D returns the interval as a time.Duration.
func (i Interval) D() time.Duration { return i.d }

func (i Interval) MarshalText() ([]byte, error) { return []byte(i.d.String()), nil }

func (i *Interval) UnmarshalText(b []byte) error {
	d, err := time.ParseDuration(string(b))
	if err != nil {
		return fmt.Errorf("%q is not a duration: write it as a string with a unit, such as \"90s\" or \"2h\"", string(b))
	}
	i.d = d
	return nil
}

// defaultDaemon sets the daemon sections' defaults.
func defaultDaemon(c *Config) {
	c.Sources = Sources{
		DropDir:   "drop",
		StableFor: Every(5 * time.Second),
	}
	c.Schedule = Schedule{
		TimeZone:      "UTC",
		IngestDays:    []string{"mon", "tue", "wed", "thu", "fri"},
		IngestAt:      "18:30",
		PackDays:      []string{"fri"},
		PackAt:        "19:00",
		OutboxEvery:   Every(time.Minute),
		CatchUpMax:    1,
		JobTimeout:    Every(2 * time.Hour),
		ShutdownGrace: Every(60 * time.Second),
	}
	c.Mail = Mail{
		Delivery:    "folder",
		Folder:      "outbox",
		From:        "Plumbline <plumbline@localhost>",
		Host:        "localhost",
		Port:        587,
		TLS:         "starttls",
		Auth:        "plain",
		PasswordEnv: "PLUMBLINE_SMTP_PASSWORD",
		Timeout:     Every(30 * time.Second),
		RetryBase:   Every(time.Minute),
		RetryMax:    Every(time.Hour),
		Lease:       Every(10 * time.Minute),
	}
	c.Status = Status{Listen: "127.0.0.1:8479"}
}

var (
	sourceNameRE  = regexp.MustCompile(`^[A-Za-z0-9][A-Za-z0-9_-]{0,63}$`)
	portfolioIDRE = regexp.MustCompile(`^[A-Z][A-Z0-9_-]{0,31}$`)
)

// validateDaemon checks the daemon sections. It first gives every HTTP
// source the defaults of the keys the file leaves out.
func (c *Config) validateDaemon() Errors {
	var es Errors
	add := func(e *Error) { es = append(es, e) }

	s := &c.Sources
	if s.StableFor.d < 0 {
		add(c.errAt("sources.stable_for", "%v is negative", s.StableFor.D()))
	}
	if len(s.HTTP) > 0 && s.DropDir == "" {
		add(c.errAt("sources.drop_dir", "HTTP sources need a drop folder to save into"))
	}
	names := map[string]bool{}
	for i := range s.HTTP {
		h := &s.HTTP[i]
		key := func(k string) string { return fmt.Sprintf("sources.http.%d.%s", i, k) }
		c.defaultHTTP(h, key)
		if !sourceNameRE.MatchString(h.Name) {
			add(c.errAt(key("name"), "%q: want letters, digits, '-' or '_' (at most 64)", h.Name))
		} else if names[h.Name] {
			add(c.errAt(key("name"), "%q is used twice", h.Name))
		}
		names[h.Name] = true
		if u, err := url.Parse(strings.ReplaceAll(h.URL, "{date}", "2000-01-01")); err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" {
			add(c.errAt(key("url"), "%q is not an http or https URL", h.URL))
		} else if u.User != nil {
			// The URL is logged, recorded with each fetch and stored with
			// every run's configuration: it must carry no credentials.
			add(c.errAt(key("url"), "a user name or password in the URL would end up in logs and stored runs; remove it"))
		}
		if h.Timeout.d <= 0 {
			add(c.errAt(key("timeout"), "must be positive"))
		}
		if h.Retries < 0 || h.Retries > 20 {
			add(c.errAt(key("retries"), "%d is outside 0..20", h.Retries))
		}
		if h.Backoff.d < 0 {
			add(c.errAt(key("backoff"), "is negative"))
		}
		if h.MaxBytes <= 0 {
			add(c.errAt(key("max_bytes"), "%d must be positive", h.MaxBytes))
		}
	}

	sc := c.Schedule
	if _, err := time.LoadLocation(sc.TimeZone); err != nil || sc.TimeZone == "" || sc.TimeZone == "Local" {
		add(c.errAt("schedule.time_zone", "%q is not an IANA time zone name such as \"Europe/Paris\"", sc.TimeZone))
	}
	for _, d := range []struct {
		key  string
		days []string
	}{{"schedule.ingest_days", sc.IngestDays}, {"schedule.pack_days", sc.PackDays}} {
		if _, err := ParseWeekdays(d.days); err != nil {
			add(c.errAt(d.key, "%v", err))
		}
	}
	for _, t := range []struct{ key, v string }{{"schedule.ingest_at", sc.IngestAt}, {"schedule.pack_at", sc.PackAt}} {
		if _, _, err := ParseTimeOfDay(t.v); err != nil {
			add(c.errAt(t.key, "%v", err))
		}
	}
	if sc.OutboxEvery.d < time.Second {
		add(c.errAt("schedule.outbox_every", "%v is below 1s", sc.OutboxEvery.D()))
	}
	if sc.CatchUpMax < 0 || sc.CatchUpMax > 52 {
		add(c.errAt("schedule.catch_up_max", "%d is outside 0..52", sc.CatchUpMax))
	}
	if sc.JobTimeout.d < time.Second {
		add(c.errAt("schedule.job_timeout", "%v is below 1s", sc.JobTimeout.D()))
	}
	if sc.ShutdownGrace.d <= 0 {
		add(c.errAt("schedule.shutdown_grace", "must be positive"))
	}

	ids := map[string]bool{}
	for i, p := range c.Portfolios {
		key := func(k string) string { return fmt.Sprintf("portfolio.%d.%s", i, k) }
		if !portfolioIDRE.MatchString(p.ID) {
			add(c.errAt(key("id"), "%q is not a portfolio id (^[A-Z][A-Z0-9_-]{0,31}$)", p.ID))
		} else if ids[p.ID] {
			add(c.errAt(key("id"), "%q is listed twice", p.ID))
		}
		ids[p.ID] = true
		if len(p.Recipients) == 0 {
			add(c.errAt(key("recipients"), "at least one address is needed"))
		}
		for _, r := range p.Recipients {
			if _, err := mail.ParseAddress(r); err != nil {
				add(c.errAt(key("recipients"), "%q is not an e-mail address", r))
			}
		}
	}

	es = append(es, c.validateMail()...)

	if c.Status.Listen != "" {
		if _, port, err := net.SplitHostPort(c.Status.Listen); err != nil || port == "" {
			add(c.errAt("status.listen", "%q: want host:port such as \"127.0.0.1:8479\", or \"\" to disable", c.Status.Listen))
		}
	}
	return es
}

func (c *Config) validateMail() Errors {
	var es Errors
	add := func(e *Error) { es = append(es, e) }
	// A password_file written in the file replaces the default
	// password_env rather than conflicting with it.
	if c.Mail.PasswordFile != "" && c.Line("mail.password_file") > 0 && c.Line("mail.password_env") == 0 {
		c.Mail.PasswordEnv = ""
	}
	m := c.Mail
	if _, err := mail.ParseAddress(m.From); err != nil {
		add(c.errAt("mail.from", "%q is not an e-mail address", m.From))
	}
	if m.RetryBase.d <= 0 {
		add(c.errAt("mail.retry_base", "must be positive"))
	}
	if m.RetryMax.d < m.RetryBase.d {
		add(c.errAt("mail.retry_max", "%v is below retry_base", m.RetryMax.D()))
	}
	if m.Timeout.d <= 0 {
		add(c.errAt("mail.timeout", "must be positive"))
	}
	// A lease shorter than a send could let a second daemon send the
	// same message while the first is still talking to the server.
	if m.Lease.d < 2*m.Timeout.d {
		add(c.errAt("mail.lease", "%v must be at least twice mail.timeout", m.Lease.D()))
	}
	switch m.Delivery {
	case "folder":
		if m.Folder == "" {
			add(c.errAt("mail.folder", "delivery = \"folder\" needs a folder"))
		}
		return es
	case "smtp":
	default:
		add(c.errAt("mail.delivery", "%q: want \"folder\" or \"smtp\"", m.Delivery))
		return es
	}
	if m.Host == "" {
		add(c.errAt("mail.host", "delivery = \"smtp\" needs a host"))
	}
	if m.Port < 1 || m.Port > 65535 {
		add(c.errAt("mail.port", "%d is not a TCP port", m.Port))
	}
	switch m.TLS {
	case "starttls", "implicit", "none":
	default:
		add(c.errAt("mail.tls", "%q: want \"starttls\", \"implicit\" or \"none\"", m.TLS))
	}
	switch m.Auth {
	case "none":
	case "plain", "login":
		if m.TLS == "none" {
			add(c.errAt("mail.auth", "%q over tls = \"none\" would send the password in clear", m.Auth))
		}
		if m.Username == "" {
			add(c.errAt("mail.username", "auth = %q needs a username", m.Auth))
		}
		if (m.PasswordEnv == "") == (m.PasswordFile == "") {
			add(c.errAt("mail.password_env", "auth = %q needs exactly one of password_env and password_file", m.Auth))
		}
	default:
		add(c.errAt("mail.auth", "%q: want \"plain\", \"login\" or \"none\"", m.Auth))
	}
	return es
}

// defaultHTTP fills the keys of h that the file leaves out (key gives the
// dotted name of each) with the defaults. A zero written in the file
// stays, so validation can refuse it (or keep retries = 0).
func (c *Config) defaultHTTP(h *HTTPSource, key func(string) string) {
	absent := func(k string) bool { return c.Line(key(k)) == 0 }
	if h.Timeout.d == 0 && absent("timeout") {
		h.Timeout = Every(DefaultHTTPTimeout)
	}
	if h.Retries == 0 && absent("retries") {
		h.Retries = DefaultHTTPRetries
	}
	if h.Backoff.d == 0 && absent("backoff") {
		h.Backoff = Every(DefaultHTTPBackoff)
	}
	if h.MaxBytes == 0 && absent("max_bytes") {
		h.MaxBytes = DefaultHTTPMaxBytes
	}
}

// Recipients returns the addresses configured for a portfolio, or nil when
// the portfolio has no [[portfolio]] entry (its pack is not mailed).
func (c *Config) Recipients(portfolioID string) []string {
	for _, p := range c.Portfolios {
		if p.ID == portfolioID {
			return append([]string(nil), p.Recipients...)
		}
	}
	return nil
}

// ParseWeekdays reads weekday names ("mon" or "monday", any case) into
// time.Weekday values, sorted and without repeats. At least one is needed.
func ParseWeekdays(names []string) ([]time.Weekday, error) {
	if len(names) == 0 {
		return nil, fmt.Errorf("at least one weekday is needed")
	}
	var seen [7]bool
	for _, n := range names {
		d, ok := weekdayByName(strings.ToLower(strings.TrimSpace(n)))
		if !ok {
			return nil, fmt.Errorf("%q is not a weekday (mon, tue, wed, thu, fri, sat, sun)", n)
		}
		seen[d] = true
	}
	var out []time.Weekday
	for d, ok := range seen {
		if ok {
			out = append(out, time.Weekday(d))
		}
	}
	return out, nil
}

func weekdayByName(s string) (time.Weekday, bool) {
	for d := time.Sunday; d <= time.Saturday; d++ {
		full := strings.ToLower(d.String())
		if s == full || s == full[:3] {
			return d, true
		}
	}
	return 0, false
}

// ParseTimeOfDay reads a 24-hour local time "HH:MM".
func ParseTimeOfDay(s string) (hour, minute int, err error) {
	hs, ms, ok := strings.Cut(s, ":")
	if ok && len(hs) == 2 && len(ms) == 2 {
		h, err1 := strconv.Atoi(hs)
		m, err2 := strconv.Atoi(ms)
		if err1 == nil && err2 == nil && h >= 0 && h < 24 && m >= 0 && m < 60 {
			return h, m, nil
		}
	}
	return 0, 0, fmt.Errorf("%q is not a time of day \"HH:MM\" (24-hour)", s)
}
