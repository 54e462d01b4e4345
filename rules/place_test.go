package rules

import (
	"slices"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"pgregory.net/rapid"
)

// TestCheckPlacesCatchesTwoNames: each way a finding could name two files
// for one place is reported, and a finding whose places are in its file
// or in another file (a policy) is not.
func TestCheckPlacesCatchesTwoNames(t *testing.T) {
	good := Finding{Rule: "freeboard", Range: InFile("m.chan.hcl", rng(5)), Focus: InFile("m.chan.hcl", rng(6)),
		Excepted: true, ExceptionRange: InFile("m.chan.hcl", rng(9)),
		Related: []Related{{Label: "limit freeboard.minimum", Range: InFile("team.policy.hcl", rng(3))}, {Label: "exception", Range: InFile("m.chan.hcl", rng(9))}}}
	require.NoError(t, good.CheckPlaces())
	noPos := Finding{Rule: "model", Range: hcl.Range{Filename: "gone.chan.hcl"}}
	require.NoError(t, noPos.CheckPlaces(), "a file without a position is one place")

	for name, spoil := range map[string]func(f *Finding){
		"no file":                  func(f *Finding) { f.Range.Filename = "" },
		"focus elsewhere":          func(f *Finding) { f.Focus.Filename = "other.chan.hcl" },
		"exception spelt twice":    func(f *Finding) { f.ExceptionRange.Filename = "./m.chan.hcl" },
		"exception without a file": func(f *Finding) { f.ExceptionRange.Filename = "" },
		"related spelt twice":      func(f *Finding) { f.Related[1].Range.Filename = "x/../m.chan.hcl" },
		"related without a file":   func(f *Finding) { f.Related[0].Range.Filename = "" },
	} {
		f := good
		f.Related = slices.Clone(good.Related)
		spoil(&f)
		assert.Error(t, f.CheckPlaces(), name)
	}
}

// TestPosNamesTheFindingsFile: the printed position is the focus's line
// and column in the finding's one file, whatever file name the focus
// range carries.
func TestPosNamesTheFindingsFile(t *testing.T) {
	f := Finding{Range: InFile("a.chan.hcl", rng(5)), Focus: InFile("b.chan.hcl", rng(7))}
	assert.Equal(t, InFile("a.chan.hcl", rng(7)), f.Pos())
	f.Focus = hcl.Range{}
	assert.Equal(t, f.Range, f.Pos())
	assert.Equal(t, "a.chan.hcl", f.File())
}

// TestRenameMovesEveryPlace: renaming a finding (as SARIF, baselines and
// revision diffs do) moves every range in its file, its place, focus,
// exception and related places, and nothing in other files; the finding
// still names its places one way, and the original's related places are
// not changed through the shared slice.
func TestRenameMovesEveryPlace(t *testing.T) {
	files := []string{"m.chan.hcl", "team.policy.hcl", "pack:baseline", ""}
	rangeIn := func(t *rapid.T, label string, files []string) hcl.Range {
		line := rapid.IntRange(0, 40).Draw(t, label+" line")
		r := hcl.Range{Start: hcl.Pos{Line: line, Column: 1}, End: hcl.Pos{Line: line, Column: 4}}
		if line > 0 {
			r.Filename = rapid.SampledFrom(files).Draw(t, label+" file")
		}
		return r
	}
	rapid.Check(t, func(t *rapid.T) {
		f := Finding{Rule: "freeboard", Range: InFile("m.chan.hcl", rangeIn(t, "range", files))}
		f.Focus = rangeIn(t, "focus", []string{"m.chan.hcl", ""})
		if rapid.Bool().Draw(t, "excepted") {
			f.Excepted, f.ExceptionRange = true, rangeIn(t, "exception", []string{"m.chan.hcl", ""})
		}
		for i := range rapid.IntRange(0, 3).Draw(t, "related") {
			f.Related = append(f.Related, Related{Label: "r", Range: rangeIn(t, "related "+string(rune('a'+i)), files)})
		}
		before := slices.Clone(f.Related)
		g := f
		g.Rename("/srv/models/m.chan.hcl")

		assert.Equal(t, before, f.Related, "the original keeps its related places")
		assert.Equal(t, "/srv/models/m.chan.hcl", g.File())
		moved := func(was, now hcl.Range) {
			switch {
			case was.Filename == "m.chan.hcl" || (was.Filename == "" && was.Start.Line > 0):
				assert.Equal(t, "/srv/models/m.chan.hcl", now.Filename)
			default:
				assert.Equal(t, was.Filename, now.Filename, "a range in another file keeps it")
			}
			assert.Equal(t, was.Start, now.Start)
			assert.Equal(t, was.End, now.End)
		}
		moved(f.Focus, g.Focus)
		moved(f.ExceptionRange, g.ExceptionRange)
		for i := range f.Related {
			moved(f.Related[i].Range, g.Related[i].Range)
		}
		assert.Equal(t, g.File(), g.Pos().Filename)
		assert.NoError(t, g.CheckPlaces())
	})
}
