package templates

import (
	"bufio"
	"bytes"
	"strings"
	"testing"
	"time"
)

// TestSystemdUnit reads plumbline.service as systemd does (systemd.syntax(7):
// sections in brackets, Key=Value lines, '#' comments) and checks the
// settings the README promises, with the keys systemd.service(5) and
// systemd.exec(5) define.
func TestSystemdUnit(t *testing.T) {
	unit := SystemdUnit()
	values := map[string][]string{}
	section := ""
	sc := bufio.NewScanner(bytes.NewReader(unit))
	for n := 1; sc.Scan(); n++ {
		line := strings.TrimSpace(sc.Text())
		switch {
		case line == "" || strings.HasPrefix(line, "#") || strings.HasPrefix(line, ";"):
		case strings.HasPrefix(line, "[") && strings.HasSuffix(line, "]"):
			section = strings.Trim(line, "[]")
		default:
			k, v, ok := strings.Cut(line, "=")
			if !ok || section == "" {
				t.Fatalf("line %d: %q is not Key=Value inside a section", n, line)
			}
			values[section+"."+k] = append(values[section+"."+k], v)
		}
	}
	one := func(key string) string {
		v := values[key]
		if len(v) != 1 {
			t.Fatalf("%s set %d times, want once", key, len(v))
		}
		return v[0]
	}
	if got := one("Service.ExecStart"); !strings.HasSuffix(got, "plumbline serve --config /etc/plumbline/plumbline.toml") {
		t.Errorf("ExecStart = %q", got)
	}
	if one("Service.User") != "plumbline" || one("Service.Restart") != "on-failure" || one("Install.WantedBy") != "multi-user.target" {
		t.Errorf("user %q restart %q", one("Service.User"), one("Service.Restart"))
	}
	for _, k := range []string{"NoNewPrivileges", "ProtectSystem", "PrivateTmp", "ProtectHome"} {
		if len(values["Service."+k]) == 0 {
			t.Errorf("hardening option %s missing", k)
		}
	}
	if len(values["Service.EnvironmentFile"]) == 0 {
		t.Error("no EnvironmentFile for the SMTP password")
	}
	// systemd sends SIGKILL after TimeoutStopSec; it must exceed the
	// default [schedule] shutdown_grace (60s) so a job can finish.
	stop, err := time.ParseDuration(one("Service.TimeoutStopSec"))
	if err != nil || stop <= 60*time.Second {
		t.Errorf("TimeoutStopSec = %v (%v), want more than 60s", stop, err)
	}
}
