//go:build unix

package fuel

import (
	"syscall"
	"time"
)

// cpuTime is the processor time this process has used so far (user and
// system); 0 when it cannot be read.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
