package main

import (
	"runtime/debug"
	"testing"

	"github.com/stretchr/testify/assert"
)

// TestTuneGCLeavesUserSettings requires tuneGC to set the binary's
// collector settings, and to leave them alone when the user set GOGC or
// GOMEMLIMIT.
//
// Source: common practice (no published source): the Go runtime documents
// GOGC and GOMEMLIMIT as the user's controls of the collector.
func TestTuneGCLeavesUserSettings(t *testing.T) {
	pct := debug.SetGCPercent(100)
	lim := debug.SetMemoryLimit(-1)
	t.Cleanup(func() {
		debug.SetGCPercent(pct)
		debug.SetMemoryLimit(lim)
	})

	debug.SetGCPercent(100)
	debug.SetMemoryLimit(1 << 40)
	tuneGC(func(string) string { return "" })
	assert.Equal(t, gcPercent, debug.SetGCPercent(100))
	assert.Equal(t, int64(memoryLimit), debug.SetMemoryLimit(1<<40))

	user := map[string]string{"GOGC": "50", "GOMEMLIMIT": "1GiB"}
	tuneGC(func(k string) string { return user[k] })
	assert.Equal(t, 100, debug.SetGCPercent(100), "GOGC set: percent untouched")
	assert.Equal(t, int64(1<<40), debug.SetMemoryLimit(1<<40), "GOMEMLIMIT set: limit untouched")
}
