//go:build unix

package model

import (
	"syscall"
	"time"
)

// processCPU is the CPU time (user and system, every thread, so the
// collector's too) the test process has used so far: on a shared
// machine it leaves out the time spent waiting for a core.
func processCPU() time.Duration {
	var ru syscall.Rusage
	if syscall.Getrusage(syscall.RUSAGE_SELF, &ru) != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}
