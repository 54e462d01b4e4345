package main

import (
	"encoding/json"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model/want"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// workspace copies the demo, the test models and a broken model into a
// fresh directory, replicated n times so that the worker pool has work.
func workspace(t testing.TB, n int) string {
	t.Helper()
	dir := t.TempDir()
	repo := repoDir(t)
	for i := range n {
		sub := filepath.Join(dir, fmt.Sprintf("set%02d", i))
		copyTree(t, filepath.Join(repo, "testdata", "demo"), filepath.Join(sub, "demo"))
		copyTree(t, filepath.Join("testdata", "models"), filepath.Join(sub, "models"))
	}
	return dir
}

// Parallel output must equal serial output byte for byte, in every format.
// Twenty files, more than twice the eight workers, finish out of order.
func TestParallelEqualsSerial(t *testing.T) {
	t.Parallel()
	dir := workspace(t, 4)
	for _, format := range []string{"text", "json", "sarif"} {
		t.Run(format, func(t *testing.T) {
			serialCode, serialOut, serialErr := runIn(dir, runOpts{jobs: 1}, "check", "--format", format, "--color", "never")
			parCode, parOut, parErr := runIn(dir, runOpts{jobs: 8}, "check", "--format", format, "--color", "never")
			require.Equal(t, serialCode, parCode)
			require.Equal(t, serialErr, parErr)
			require.Equal(t, serialOut, parOut)
			// The flag gives the same result as the default worker count.
			flagCode, flagOut, _ := runIn(dir, runOpts{}, "check", "-j", "1", "--format", format, "--color", "never")
			require.Equal(t, serialCode, flagCode)
			require.Equal(t, serialOut, flagOut)
			require.Equal(t, exitInvalid, serialCode, "the broken model makes the run invalid")
		})
	}
}

// The progress line goes to stderr only when stderr is a terminal and there
// are many files; it is erased at the end and never touches stdout.
func TestProgressLine(t *testing.T) {
	dir := workspace(t, 5) // 25 files
	_, quietOut, quietErr := runIn(dir, runOpts{}, "check", "--color", "never")
	assert.Empty(t, quietErr)
	_, out, errOut := runIn(dir, runOpts{stderrTTY: true}, "check", "--color", "never")
	assert.Contains(t, errOut, "\rchecked 25/25 files")
	assert.True(t, strings.HasSuffix(errOut, "\r\x1b[K"), "%q", errOut)
	assert.Equal(t, quietOut, out)

	// Few files: no progress line even on a terminal.
	_, _, errOut = runIn(dir, runOpts{stderrTTY: true}, "check", "set00", "--color", "never")
	assert.Empty(t, errOut)
}

// No model found: said on stderr, exit 2 (nothing checked is no pass).
func TestNoModels(t *testing.T) {
	dir := t.TempDir()
	code, out, errOut := runIn(dir, runOpts{}, "check", "--color", "never")
	assert.Equal(t, exitInvalid, code)
	assert.Equal(t, "chanlint check: no *.chan.hcl files found under .; nothing was checked\n", errOut)
	assert.Contains(t, out, "0 files, 0 errors, 0 warnings, 0 info, 0 excepted\n")
}

// The JSON document of check has exactly the documented fields, and every
// finding's file and position point into the checked tree.
func TestCheckJSONShape(t *testing.T) {
	dir := workspace(t, 1)
	code, out, _ := runIn(dir, runOpts{}, "check", "set00/demo", "set00/models/overtop.chan.hcl", "--format", "json")
	require.Equal(t, exitFindings, code)

	var doc map[string]json.RawMessage
	require.NoError(t, json.Unmarshal([]byte(out), &doc))
	assert.ElementsMatch(t, []string{"findings", "summary", "policy", "caution", "tool", "not_evaluated"}, keys(doc))

	var findings []map[string]any
	require.NoError(t, json.Unmarshal(doc["findings"], &findings))
	require.NotEmpty(t, findings)
	// Source: outputs.md, the fields of a finding.
	required := []string{"rule", "severity", "message", "file", "line", "column", "reach", "event",
		"from_station", "to_station", "value", "limit", "excepted"}
	for _, f := range findings {
		for _, k := range required {
			assert.Contains(t, f, k)
		}
		assert.Contains(t, []any{"error", "warning", "info"}, f["severity"])
		file := f["file"].(string)
		assert.False(t, filepath.IsAbs(file), file)
		assert.NotContains(t, file, `\`)
		_, err := os.Stat(filepath.Join(dir, file))
		assert.NoError(t, err)
		assert.Greater(t, f["line"].(float64), 0.0)
	}

	var summary map[string]float64
	require.NoError(t, json.Unmarshal(doc["summary"], &summary))
	for _, k := range []string{"files", "errors", "warnings", "infos", "excepted"} {
		assert.Contains(t, summary, k)
	}
	assert.Equal(t, 2.0, summary["files"])
	// The summary counts what the list holds.
	var e, w, i, x float64
	for _, f := range findings {
		switch {
		case f["excepted"] == true:
			x++
		case f["severity"] == "error":
			e++
		case f["severity"] == "warning":
			w++
		default:
			i++
		}
	}
	assert.Equal(t, []float64{e, w, i, x}, []float64{summary["errors"], summary["warnings"], summary["infos"], summary["excepted"]})

	var caution string
	require.NoError(t, json.Unmarshal(doc["caution"], &caution))
	assert.Contains(t, caution, "licensed professional engineer")
}

func keys(m map[string]json.RawMessage) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	sort.Strings(out)
	return out
}

// The exit code does not depend on the output format.
func TestExitCodeIndependentOfFormat(t *testing.T) {
	t.Parallel()
	dir := workspace(t, 1)
	for _, target := range []string{"set00/models/clean.chan.hcl", "set00/models/overtop.chan.hcl", "set00/models/slow.chan.hcl", "set00"} {
		for _, failOn := range []string{"error", "warning", "info"} {
			want, _, _ := runIn(dir, runOpts{}, "check", target, "--fail-on", failOn)
			for _, format := range []string{"json", "sarif"} {
				got, _, _ := runIn(dir, runOpts{}, "check", target, "--fail-on", failOn, "--format", format)
				assert.Equal(t, want, got, "%s --fail-on %s --format %s", target, failOn, format)
			}
		}
	}
}

// solve --format json: points ordered by station, every number finite,
// normal_depth a number or null.
func TestSolveJSON(t *testing.T) {
	dir := workspace(t, 1)
	code, out, errOut := runIn(dir, runOpts{}, "solve", "set00/demo/kestrel-ridge.chan.hcl", "--format", "json")
	require.Equal(t, exitOK, code, errOut)
	var doc struct {
		Units  string `json:"units"`
		Events []struct {
			Name    string `json:"name"`
			Reaches []struct {
				Name       string           `json:"name"`
				Discharge  float64          `json:"discharge"`
				SlopeClass string           `json:"slope_class"`
				Profiles   []string         `json:"profiles"`
				Points     []map[string]any `json:"points"`
				Jumps      []map[string]any `json:"jumps"`
			} `json:"reaches"`
		} `json:"events"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc))
	assert.Equal(t, "si", doc.Units)
	require.NotEmpty(t, doc.Events)
	for _, ev := range doc.Events {
		require.NotEmpty(t, ev.Reaches)
		for _, r := range ev.Reaches {
			require.NotEmpty(t, r.Points, "%s/%s", ev.Name, r.Name)
			assert.Contains(t, []string{"mild", "steep", "critical", "horizontal", "adverse"}, r.SlopeClass)
			prev := math.Inf(-1)
			for _, p := range r.Points {
				for _, k := range []string{"station", "invert", "depth", "wse", "velocity", "froude", "energy", "critical_depth"} {
					v, ok := p[k].(float64)
					require.True(t, ok, "%s/%s %s is %v", ev.Name, r.Name, k, p[k])
					require.False(t, math.IsNaN(v) || math.IsInf(v, 0))
				}
				if p["normal_depth"] != nil {
					_, ok := p["normal_depth"].(float64)
					assert.True(t, ok)
				}
				st := p["station"].(float64)
				assert.GreaterOrEqual(t, st, prev, "points ordered by station")
				prev = st
				assert.Contains(t, []any{"subcritical", "supercritical", "critical"}, p["regime"])
			}
			for _, j := range r.Jumps {
				for _, k := range []string{"station", "upstream_depth", "downstream_depth", "froude", "length", "type"} {
					assert.Contains(t, j, k)
				}
			}
		}
	}
}

// solve --format csv: one row per point of the JSON document, in the same
// order, with the same numbers.
func TestSolveCSVMatchesJSON(t *testing.T) {
	dir := workspace(t, 1)
	model := "set00/demo/kestrel-ridge.chan.hcl"
	_, jsonOut, _ := runIn(dir, runOpts{}, "solve", model, "--format", "json")
	code, csvOut, _ := runIn(dir, runOpts{}, "solve", model, "--format", "csv")
	require.Equal(t, exitOK, code)
	var doc struct {
		Events []struct {
			Name    string `json:"name"`
			Reaches []struct {
				Name   string `json:"name"`
				Points []struct {
					Station float64 `json:"station"`
					Depth   float64 `json:"depth"`
				} `json:"points"`
			} `json:"reaches"`
		} `json:"events"`
	}
	require.NoError(t, json.Unmarshal([]byte(jsonOut), &doc))
	rows := strings.Split(strings.TrimSpace(csvOut), "\n")[1:]
	i := 0
	for _, ev := range doc.Events {
		for _, r := range ev.Reaches {
			for _, p := range r.Points {
				require.Less(t, i, len(rows))
				cells := strings.Split(rows[i], ",")
				assert.Equal(t, ev.Name, cells[0])
				assert.Equal(t, r.Name, cells[1])
				st, _ := strconv.ParseFloat(cells[2], 64)
				d, _ := strconv.ParseFloat(cells[4], 64)
				assert.Equal(t, p.Station, st)
				assert.Equal(t, p.Depth, d)
				i++
			}
		}
	}
	assert.Equal(t, len(rows), i)
}

// Every file of the bad corpus is invalid (exit 2) and its diagnostics
// point at the lines its `# want` comments mark, in the GNU layout.
func TestBadCorpus(t *testing.T) {
	t.Parallel()
	files, err := filepath.Glob(filepath.Join(repoDir(t), "testdata", "bad", "*.chan.hcl"))
	require.NoError(t, err)
	require.NotEmpty(t, files)
	for _, path := range files {
		name := filepath.Base(path)
		t.Run(name, func(t *testing.T) {
			dir := t.TempDir()
			copyTree(t, path, filepath.Join(dir, name))
			code, out, _ := runIn(dir, runOpts{}, "check", name, "--color", "never")
			require.Equal(t, exitInvalid, code, out)
			src, err := os.ReadFile(path)
			require.NoError(t, err)
			// The expectations of the corpus (see model/want): each
			// `# want model "REGEXP"` names a line the text output must
			// point at with a model error whose message matches.
			ws, err := want.Parse(src)
			require.NoError(t, err)
			wants := 0
			for _, w := range ws {
				if w.Rule != "model" {
					continue
				}
				wants++
				for _, p := range w.Patterns {
					re := regexp.MustCompile(fmt.Sprintf(`(?m)^%s:%d:\d+: error: \[model\] .*%s`, regexp.QuoteMeta(name), w.Line, p))
					assert.Regexp(t, re, out, "line %d", w.Line)
				}
			}
			assert.NotZero(t, wants, "the corpus file marks no expected line")
			assert.Contains(t, out, "1 file (1 invalid)")
		})
	}
}

// A baseline written today hides today's findings tomorrow: the run passes
// and says how many it hid; a new finding still fails.
func TestBaselineRoundTrip(t *testing.T) {
	dir := workspace(t, 1)
	target := "set00/models/overtop.chan.hcl"
	code, _, errOut := runIn(dir, runOpts{}, "check", target, "--write-baseline", "known.json")
	require.Equal(t, exitOK, code, errOut)
	_, err := os.Stat(filepath.Join(dir, "known.json"))
	require.NoError(t, err)

	code, out, _ := runIn(dir, runOpts{}, "check", target, "--baseline", "known.json", "--color", "never")
	assert.Equal(t, exitOK, code, out)
	assert.Regexp(t, `(?m)^1 file, 0 errors, 0 warnings, 0 info, 0 excepted$`, out)
	assert.Regexp(t, `(?m)^baseline: [1-9]\d* known findings? recorded in known\.json not shown$`, out)

	// Run from another directory, the baseline still matches: its file
	// names are relative to the baseline's own directory.
	code, out, _ = runIn(filepath.Join(dir, "set00"), runOpts{}, "check", "models/overtop.chan.hcl", "--baseline", "../known.json", "--color", "never")
	assert.Equal(t, exitOK, code, out)
	assert.Regexp(t, `(?m)^baseline: [1-9]\d* known findings? recorded in \.\./known\.json not shown$`, out)
	data, err := os.ReadFile(filepath.Join(dir, "known.json"))
	require.NoError(t, err)
	assert.Contains(t, string(data), `"file": "set00/models/overtop.chan.hcl"`)

	// Another model's findings are not in the baseline.
	code, out, _ = runIn(dir, runOpts{}, "check", target, "set00/demo", "--baseline", "known.json", "--color", "never")
	assert.Equal(t, exitFindings, code, out)
	assert.Contains(t, out, "set00/demo/kestrel-ridge.chan.hcl:")
	assert.NotContains(t, out, "overtop.chan.hcl:")

	// A broken baseline file is invalid input.
	require.NoError(t, os.WriteFile(filepath.Join(dir, "junk.json"), []byte("not json"), 0o644))
	code, _, errOut = runIn(dir, runOpts{}, "check", target, "--baseline", "junk.json")
	assert.Equal(t, exitInvalid, code)
	assert.Regexp(t, `^chanlint check: baseline junk\.json: not a chanlint baseline file`, errOut)
	assert.NotContains(t, errOut, dir, "paths are printed as given")
}

// SARIF output is a 2.1.0 log with one result per finding of the JSON
// output, with artifact URIs relative to the repository root.
func TestCheckSARIF(t *testing.T) {
	dir := workspace(t, 1)
	require.NoError(t, os.Mkdir(filepath.Join(dir, ".git"), 0o755))
	target := "set00/demo"
	code, out, _ := runIn(dir, runOpts{}, "check", target, "--format", "sarif")
	require.Equal(t, exitFindings, code)
	var log struct {
		Version string `json:"version"`
		Runs    []struct {
			Results []struct {
				RuleID    string `json:"ruleId"`
				Locations []struct {
					PhysicalLocation struct {
						ArtifactLocation struct {
							URI string `json:"uri"`
						} `json:"artifactLocation"`
					} `json:"physicalLocation"`
				} `json:"locations"`
			} `json:"results"`
		} `json:"runs"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &log))
	assert.Equal(t, "2.1.0", log.Version)
	require.Len(t, log.Runs, 1)

	_, jsonOut, _ := runIn(dir, runOpts{}, "check", target, "--format", "json")
	var doc struct {
		Findings []struct {
			Rule string `json:"rule"`
		} `json:"findings"`
	}
	require.NoError(t, json.Unmarshal([]byte(jsonOut), &doc))
	require.Len(t, log.Runs[0].Results, len(doc.Findings))
	for i, r := range log.Runs[0].Results {
		assert.Equal(t, doc.Findings[i].Rule, r.RuleID)
		require.NotEmpty(t, r.Locations)
		assert.Equal(t, "set00/demo/kestrel-ridge.chan.hcl", r.Locations[0].PhysicalLocation.ArtifactLocation.URI)
	}

	// From a subdirectory the URIs stay relative to the repository root.
	_, subOut, _ := runIn(filepath.Join(dir, "set00"), runOpts{}, "check", "demo", "--format", "sarif")
	assert.Contains(t, subOut, `"uri": "set00/demo/kestrel-ridge.chan.hcl"`)
}

// Discovery: sorted, recursive, skips vendored and VCS trees, does not follow
// a link that leaves the checked tree, follows one that stays inside, and
// checks a file reached twice once.
func TestDiscovery(t *testing.T) {
	base := t.TempDir()
	tree := filepath.Join(base, "tree")
	outside := filepath.Join(base, "outside")
	clean, err := os.ReadFile(filepath.Join("testdata", "models", "clean.chan.hcl"))
	require.NoError(t, err)
	write := func(p string) {
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, clean, 0o644))
	}
	write(filepath.Join(tree, "b", "two.chan.hcl"))
	write(filepath.Join(tree, "a", "one.chan.hcl"))
	write(filepath.Join(tree, "a", "notes.hcl"))
	write(filepath.Join(tree, "vendor", "v.chan.hcl"))
	write(filepath.Join(tree, "node_modules", "n.chan.hcl"))
	write(filepath.Join(tree, ".git", "g.chan.hcl"))
	write(filepath.Join(outside, "secret.chan.hcl"))
	require.NoError(t, os.Symlink(outside, filepath.Join(tree, "escape")))
	require.NoError(t, os.Symlink(filepath.Join(outside, "secret.chan.hcl"), filepath.Join(tree, "leak.chan.hcl")))
	require.NoError(t, os.Symlink(filepath.Join(tree, "b"), filepath.Join(tree, "c-link")))
	require.NoError(t, os.Symlink(tree, filepath.Join(tree, "a", "loop")))

	a := newApp(nil, nil, tree, func(string) string { return "" })
	files, problems := a.discover([]string{"."})
	assert.Empty(t, problems)
	var got []string
	for _, f := range files {
		got = append(got, f.display)
	}
	assert.Equal(t, []string{"a/one.chan.hcl", "b/two.chan.hcl"}, got)

	// A vendored directory named on the command line is searched; an
	// explicit file is checked whatever its name.
	files, _ = a.discover([]string{"vendor", "a/notes.hcl", "a/one.chan.hcl", "a"})
	got = nil
	for _, f := range files {
		got = append(got, f.display)
	}
	assert.Equal(t, []string{"a/notes.hcl", "a/one.chan.hcl", "vendor/v.chan.hcl"}, got)
}

// Flags may follow positional arguments; "--" ends the flags.
func TestParseFlagsInterspersed(t *testing.T) {
	cf, fs := newCheckFlags()
	pos, err := parseFlags(fs, []string{"models", "--format", "json", "more", "--fail-on=warning", "--", "--odd-name"})
	require.NoError(t, err)
	assert.Equal(t, []string{"models", "more", "--odd-name"}, pos)
	assert.Equal(t, "json", cf.format.value)
	assert.Equal(t, "warning", cf.failOn.value)

	cf, fs = newCheckFlags()
	pos, err = parseFlags(fs, []string{"--policy", "--", "x"})
	require.NoError(t, err)
	assert.Equal(t, "--", cf.policy)
	assert.Equal(t, []string{"x"}, pos)
}

// Suggestions: abbreviations and small typing mistakes find their word,
// unrelated words find none.
func TestSuggest(t *testing.T) {
	ids := []string{"capacity", "freeboard", "froude_band", "warning"}
	assert.Equal(t, "freeboard", suggest("frebord", ids))
	assert.Equal(t, "warning", suggest("warn", ids))
	assert.Equal(t, "froude_band", suggest("froude-band", ids))
	assert.Equal(t, "", suggest("xyz", ids))
	assert.Equal(t, "", suggest("", ids))
}

// BenchmarkCheckDemo runs `chanlint check` on the demo in-process: load,
// solve, check and render.
func BenchmarkCheckDemo(b *testing.B) {
	dir := b.TempDir()
	copyTree(b, filepath.Join(repoDir(b), "testdata", "demo"), filepath.Join(dir, "demo"))
	b.ReportAllocs()
	for b.Loop() {
		code, _, _ := runIn(dir, runOpts{}, "check", "demo", "--color", "never")
		if code == exitInvalid {
			b.Fatal("the demo is invalid")
		}
	}
}

// BenchmarkCheckDemoEnvelope is BenchmarkCheckDemo with the full
// sensitivity envelope (three parameters: 14 more solves of every event);
// the target is under ten times BenchmarkCheckDemo.
func BenchmarkCheckDemoEnvelope(b *testing.B) {
	dir := b.TempDir()
	copyTree(b, filepath.Join(repoDir(b), "testdata", "demo"), filepath.Join(dir, "demo"))
	b.ReportAllocs()
	for b.Loop() {
		code, _, _ := runIn(dir, runOpts{}, "check", "demo", "--color", "never", "--vary", "roughness=0.2,tailwater=0.3,discharge=0.1")
		if code == exitInvalid {
			b.Fatal("the demo is invalid")
		}
	}
}

// BenchmarkCheckTree checks 60 models (the demo and the test models, twelve
// times over) with the default worker pool.
func BenchmarkCheckTree(b *testing.B) {
	dir := workspace(b, 12)
	b.ReportAllocs()
	for b.Loop() {
		runIn(dir, runOpts{}, "check", "--color", "never")
	}
}
