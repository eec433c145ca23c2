//go:build unix

package pack

import (
	"syscall"
	"time"
)

// On a shared machine wall time varies with other load; the process's CPU
// time (user + system, all threads, GC included) does much less.
func init() {
	processCPU = func() time.Duration {
		var ru syscall.Rusage
		if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
			return 0
		}
		return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
	}
}
