package pipeline

import (
	"strings"
	"sync"
	"sync/atomic"
	"testing"
	"time"

	"github.com/chanlint/chanlint/model"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// watchParses replaces the parser by one that records the tokens of the
// parses running at once and parses nothing (the result is an invalid
// file); enter, when not nil, is called inside each.
func watchParses(t *testing.T, enter func()) (peak *atomic.Int64) {
	var now atomic.Int64
	peak = new(atomic.Int64)
	old := parseModel
	t.Cleanup(func() { parseModel = old })
	parseModel = func(name string, src []byte) (*model.Model, hcl.Diagnostics) {
		w := int64(model.Tokens(src))
		n := now.Add(w)
		for p := peak.Load(); n > p && !peak.CompareAndSwap(p, n); p = peak.Load() {
		}
		if enter != nil {
			enter()
		}
		time.Sleep(time.Millisecond) // let the other workers try to overlap
		now.Add(-w)
		return nil, nil
	}
	return peak
}

// Dense files on many workers are parsed a budget's worth at a time: the
// tokens being parsed at once never exceed MaxParsingTokens, so peak
// memory does not grow with -j.
func TestDenseFilesParseWithinTheBudget(t *testing.T) {
	peak := watchParses(t, nil)
	// Each file a little over half the budget: two cannot parse together.
	src := []byte(strings.Repeat("# a comment line\n", MaxParsingTokens/2+100))
	require.Greater(t, 2*model.Tokens(src), MaxParsingTokens)
	var wg sync.WaitGroup
	for range 6 {
		wg.Go(func() { Parse(File{Name: "dense.chan.hcl"}, src) })
	}
	wg.Wait()
	assert.LessOrEqual(t, peak.Load(), int64(MaxParsingTokens))
	assert.Greater(t, peak.Load(), int64(0))
}

// Small files still parse in parallel: four of them are inside the
// parser at the same time.
func TestSmallFilesParseInParallel(t *testing.T) {
	const workers = 4
	var arrived sync.WaitGroup
	arrived.Add(workers)
	all := make(chan struct{})
	go func() { arrived.Wait(); close(all) }()
	watchParses(t, func() {
		arrived.Done()
		select {
		case <-all:
		case <-time.After(20 * time.Second):
			t.Error("the small files were not admitted together")
		}
	})
	src := []byte("units = \"si\"\n")
	var wg sync.WaitGroup
	for range workers {
		wg.Go(func() { Parse(File{Name: "small.chan.hcl"}, src) })
	}
	wg.Wait()
}
