//go:build !unix

package main

import (
	"os"
	"time"
)

// cpuTime is not measured here: the benchmarks report 0.
func cpuTime() time.Duration { return 0 }

// childPeakRSS is not measured here: the benchmarks report 0.
func childPeakRSS(*os.ProcessState) float64 { return 0 }
