//go:build unix

package main

import (
	"os"
	"syscall"
	"time"
)

// cpuTime is the CPU time (user and system) the process has used so far.
// On a shared machine it is steadier than wall time for comparing stages.
func cpuTime() time.Duration {
	var ru syscall.Rusage
	if err := syscall.Getrusage(syscall.RUSAGE_SELF, &ru); err != nil {
		return 0
	}
	return time.Duration(ru.Utime.Nano() + ru.Stime.Nano())
}

// childPeakRSS is the peak resident set size in bytes of a finished child
// process (ru_maxrss is in kilobytes on Linux).
func childPeakRSS(ps *os.ProcessState) float64 {
	if ru, ok := ps.SysUsage().(*syscall.Rusage); ok {
		return float64(ru.Maxrss) * 1024
	}
	return 0
}
