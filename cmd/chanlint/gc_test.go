package main

import (
	"os"
	"path/filepath"
	"runtime/debug"
	"testing"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/stretchr/testify/require"

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
	tuned := gcLimitTuned.Load()
	t.Cleanup(func() {
		debug.SetGCPercent(pct)
		debug.SetMemoryLimit(lim)
		gcLimitTuned.Store(tuned)
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

// TestMemoryLimitScalesWithInput: the soft limit grows with the model
// text a run holds (the largest files in flight for check, every file for
// report, plus kept sources), and stays the user's when GOMEMLIMIT is set.
//
// Source: common practice (no published source): the Go runtime
// documents GOMEMLIMIT as the user's control of the soft limit.
func TestMemoryLimitScalesWithInput(t *testing.T) {
	pct := debug.SetGCPercent(100)
	lim := debug.SetMemoryLimit(-1)
	tuned := gcLimitTuned.Load()
	t.Cleanup(func() {
		debug.SetGCPercent(pct)
		debug.SetMemoryLimit(lim)
		gcLimitTuned.Store(tuned)
	})
	dir := t.TempDir()
	var files []modelFile
	for i, n := range []int{1000, 5000, 3000} {
		p := filepath.Join(dir, string(rune('a'+i))+".chan.hcl")
		require.NoError(t, os.WriteFile(p, make([]byte, n), 0o644))
		files = append(files, modelFile{abs: p})
	}
	solving, kept := heldBytes(files, 2, pipeline.Keep{})
	assert.Equal(t, int64(8000), solving, "the two largest in flight")
	assert.Zero(t, kept)
	solving, kept = heldBytes(files, 2, pipeline.Keep{Source: true})
	assert.Equal(t, int64(8000), solving)
	assert.Equal(t, int64(9000), kept)
	solving, _ = heldBytes(files, 1, pipeline.Keep{Solved: true})
	assert.Equal(t, int64(9000), solving, "report keeps every model")

	tuneGC(func(string) string { return "" })
	scaleMemoryLimit(1<<20, 1<<20)
	assert.Equal(t, int64(memoryLimit+heapPerInputByte<<20+1<<20), debug.SetMemoryLimit(-1))

	gcLimitTuned.Store(false)
	debug.SetMemoryLimit(1 << 40)
	tuneGC(func(k string) string { return map[string]string{"GOMEMLIMIT": "1GiB"}[k] })
	scaleMemoryLimit(1<<20, 0)
	assert.Equal(t, int64(1<<40), debug.SetMemoryLimit(-1), "GOMEMLIMIT set: limit untouched")
}
