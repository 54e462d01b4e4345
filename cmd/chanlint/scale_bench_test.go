package main

// Benchmarks at scale (issue 6). Inputs are generated here, not stored:
//
//	go test ./cmd/chanlint -run '^$' -bench 'Scale' -benchmem -cpu 1
//	go test ./cmd/chanlint -run '^$' -bench 'ScaleFiles' -benchmem -cpu 2
//
// BenchmarkScaleChain checks one model of a long chain of reaches end to
// end (parse the HCL text, solve, apply the rules); BenchmarkScaleFiles
// runs `chanlint check` in-process on a tree of many small models and
// reports the process's peak resident memory.

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"runtime/debug"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
)

// chainModel is an invented drainage trunk of n reaches, each length
// long, in one trapezoidal concrete section on alternating mild slopes,
// with a tributary inflow every tenth reach and a normal-depth outlet.
// spacing > 0 sets max_spacing on every reach.
func chainModel(n int, length, spacing float64) []byte {
	var b bytes.Buffer
	b.WriteString(`units = "si"
title = "Scale test trunk (generated)"
section "trunk" {
  shape        = "trapezoid"
  bottom_width = 4.0
  side_slope   = 2.0
  height       = 3.0
  roughness    = 0.015
  lining       = "concrete"
}
`)
	for i := range n {
		slope := 0.0008
		if i%2 == 1 {
			slope = 0.0012
		}
		fmt.Fprintf(&b, "reach \"r%04d\" {\n  from    = \"n%04d\"\n  to      = \"n%04d\"\n  length  = %g\n  section = \"trunk\"\n  slope   = %g\n", i, i, i+1, length, slope)
		if spacing > 0 {
			fmt.Fprintf(&b, "  max_spacing = %g\n", spacing)
		}
		b.WriteString("}\n")
	}
	b.WriteString("event \"q10\" {\n  inflow = {")
	for i := 0; i < n; i += 10 {
		if i > 0 {
			b.WriteString(",")
		}
		fmt.Fprintf(&b, " r%04d = %g", i, 0.5)
	}
	b.WriteString(" }\n  outlet = { condition = \"normal\" }\n}\n")
	return b.Bytes()
}

// checkChain is one end-to-end check of a model text; it returns the
// number of computed points.
func checkChain(b *testing.B, src []byte, pol *policies.Policy) int {
	m, diags := model.Parse("trunk.chan.hcl", src)
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	res, err := solver.Solve(m, solver.Options{})
	if err != nil {
		b.Fatal(err)
	}
	_ = rules.Check(m, res, pol)
	points := 0
	for _, er := range res.Events {
		for _, rr := range er.Reaches {
			points += len(rr.Points)
		}
	}
	return points
}

// binaryGC puts the collector settings of the binary (tuneGC) in force
// for the benchmark b, so that the figures are those of `chanlint check`.
func binaryGC(b *testing.B) {
	pct := debug.SetGCPercent(100)
	lim := debug.SetMemoryLimit(-1) // a negative limit only reads it
	tuned := gcLimitTuned.Load()
	tuneGC(os.Getenv)
	b.Cleanup(func() {
		debug.SetGCPercent(pct)
		debug.SetMemoryLimit(lim)
		gcLimitTuned.Store(tuned)
	})
}

// BenchmarkScaleChain: a 1,000-reach chain of 3 km reaches checked end to
// end (target: under 30 ms on one core) under the binary's collector
// settings, and the same chain with ten
// times the computed points, by max_spacing or by reaches ten times
// longer, to show that the cost grows linearly with computed points. The
// ns/point metric should stay about constant across the cases.
func BenchmarkScaleChain(b *testing.B) {
	binaryGC(b)
	pol, diags := rules.Language().Pack("baseline")
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	base := chainModel(1000, 3000, 0)
	points1 := checkChain(b, base, pol)
	// max_spacing for ten times the points of the plain chain: each
	// double step puts two points at most max_spacing apart.
	spacing := 3000 * 1000 / float64(10*points1)
	cases := []struct {
		name string
		src  []byte
	}{
		{"1000x3km", base},
		{"1000x3km-spacing10x", chainModel(1000, 3000, spacing)},
		{"1000x30km-spacing", chainModel(1000, 30000, spacing*10)},
	}
	for _, c := range cases {
		b.Run(c.name, func(b *testing.B) {
			b.ReportAllocs()
			b.SetBytes(int64(len(c.src)))
			points := 0
			for b.Loop() {
				points = checkChain(b, c.src, pol)
			}
			b.ReportMetric(float64(points), "points/op")
			b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(points), "ns/point")
		})
	}
}

// demoSized writes n model files of the demo's size and make-up into dir:
// copies of the demo with the flows scaled a little per file, so that no
// two files are solved alike.
func demoSized(b *testing.B, dir string, n int) {
	src, err := os.ReadFile(filepath.Join(repoDir(b), "testdata", "demo", "kestrel-ridge.chan.hcl"))
	if err != nil {
		b.Fatal(err)
	}
	text := string(src)
	for i := range n {
		sub := filepath.Join(dir, fmt.Sprintf("d%02d", i/100))
		if err := os.MkdirAll(sub, 0o755); err != nil {
			b.Fatal(err)
		}
		scale := 1 + float64(i%50)/500
		out := scaleInflows(text, scale)
		if err := os.WriteFile(filepath.Join(sub, fmt.Sprintf("m%04d.chan.hcl", i)), []byte(out), 0o644); err != nil {
			b.Fatal(err)
		}
	}
}

// scaleInflows multiplies the numbers of every `inflow = { ... }` line.
func scaleInflows(text string, f float64) string {
	lines := strings.Split(text, "\n")
	for i, l := range lines {
		if !strings.Contains(l, "inflow") || !strings.Contains(l, "{") {
			continue
		}
		fields := strings.Fields(l)
		for j, w := range fields {
			w2 := strings.TrimSuffix(w, ",")
			if v, err := strconv.ParseFloat(w2, 64); err == nil && j > 0 && fields[j-1] == "=" {
				fields[j] = strconv.FormatFloat(v*f, 'g', 6, 64) + w[len(w2):]
			}
		}
		lines[i] = "  " + strings.Join(fields, " ")
	}
	return strings.Join(lines, "\n")
}

// peakRSS is the process's peak resident set size in bytes (VmHWM of
// /proc/self/status), or 0 where that file does not exist.
func peakRSS() float64 {
	data, err := os.ReadFile("/proc/self/status")
	if err != nil {
		return 0
	}
	for _, l := range strings.Split(string(data), "\n") {
		if rest, ok := strings.CutPrefix(l, "VmHWM:"); ok {
			kb, err := strconv.ParseFloat(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(rest), "kB")), 64)
			if err == nil {
				return kb * 1024
			}
		}
	}
	return 0
}

// BenchmarkScaleFiles: 1,000 demo-sized model files checked by `chanlint
// check` in-process with two workers in each output format (target: under
// 1 s on two cores, peak memory under 150 MB). peak-MB is the whole test
// process's high-water mark, so run one format on its own (-bench
// ScaleFiles/sarif) for a figure that means something. SARIF is written
// by one goroutine after the check and costs most of a second by itself.
func BenchmarkScaleFiles(b *testing.B) {
	binaryGC(b)
	dir := b.TempDir()
	demoSized(b, dir, 1000)
	for _, format := range []string{"text", "json", "sarif"} {
		b.Run(format, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				code, out, errOut := runIn(dir, runOpts{jobs: 2}, "check", "--format", format, "--color", "never")
				if code == exitInvalid {
					b.Fatalf("invalid input: %s %s", errOut, out[:min(len(out), 2000)])
				}
			}
			b.ReportMetric(peakRSS()/1e6, "peak-MB")
		})
	}
}

// BenchmarkScaleChainStages splits the 1,000-reach check into its stages
// (parse, solve, rules) to show where the time goes.
func BenchmarkScaleChainStages(b *testing.B) {
	binaryGC(b)
	pol, diags := rules.Language().Pack("baseline")
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	src := chainModel(1000, 3000, 0)
	m, diags := model.Parse("trunk.chan.hcl", src)
	if diags.HasErrors() {
		b.Fatal(diags.Error())
	}
	res, err := solver.Solve(m, solver.Options{})
	if err != nil {
		b.Fatal(err)
	}
	b.Run("parse", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, diags := model.Parse("trunk.chan.hcl", src); diags.HasErrors() {
				b.Fatal(diags.Error())
			}
		}
	})
	b.Run("solve", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := solver.Solve(m, solver.Options{}); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("rules", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			_ = rules.Check(m, res, pol)
		}
	})
}

// BenchmarkScaleReport: `chanlint report` of 100 demo-sized files against
// `chanlint check` of the same files, both with two workers (target: the
// report within 2× of the check). Every iteration runs both, so the
// report/check ratio is measured under the same load.
func BenchmarkScaleReport(b *testing.B) {
	binaryGC(b)
	dir := b.TempDir()
	demoSized(b, dir, 100)
	out := filepath.Join(b.TempDir(), "review.html")
	b.ReportAllocs()
	var check, report, checkCPU, reportCPU time.Duration
	for b.Loop() {
		t0, c0 := time.Now(), cpuTime()
		if code, _, errOut := runIn(dir, runOpts{jobs: 2}, "check", "--color", "never"); code == exitInvalid {
			b.Fatal(errOut)
		}
		t1, c1 := time.Now(), cpuTime()
		if code, _, errOut := runIn(dir, runOpts{jobs: 2}, "report", "--out", out, "--color", "never"); code != exitOK {
			b.Fatal(errOut)
		}
		check, report = check+t1.Sub(t0), report+time.Since(t1)
		checkCPU, reportCPU = checkCPU+c1-c0, reportCPU+cpuTime()-c1
	}
	b.ReportMetric(float64(check.Milliseconds())/float64(b.N), "check-ms")
	b.ReportMetric(float64(report.Milliseconds())/float64(b.N), "report-ms")
	b.ReportMetric(float64(report)/float64(check), "report/check")
	if checkCPU > 0 {
		b.ReportMetric(float64(reportCPU)/float64(checkCPU), "report/check-cpu")
	}
	if st, err := os.Stat(out); err == nil {
		b.ReportMetric(float64(st.Size()), "bytes/report")
	}
}

// BenchmarkOutputFormats10k: the output stage alone for one model of
// 10,000 reaches whose every reach fails freeboard (the section is too
// shallow for the flow): 10,000 and more findings in one file, written as
// text, JSON and SARIF from the same checked run (target: SARIF within 3×
// of text; a position conversion that rescans the file makes it
// quadratic).
func BenchmarkOutputFormats10k(b *testing.B) {
	binaryGC(b)
	dir := b.TempDir()
	src := bytes.Replace(chainModel(10000, 300, 0), []byte("height       = 3.0"), []byte("height       = 0.5"), 1)
	if err := os.WriteFile(filepath.Join(dir, "trunk.chan.hcl"), src, 0o644); err != nil {
		b.Fatal(err)
	}
	var stdout, stderr bytes.Buffer
	a := newApp(&stdout, &stderr, dir, func(string) string { return "" })
	pol, ok := a.loadPolicy("", newPalette(false))
	if !ok {
		b.Fatal(stderr.String())
	}
	results := a.checkPaths([]string{"."}, pol, 2, pipeline.Keep{Source: true})
	view := pipeline.ApplyBaseline(results, nil, dir)
	run := checkRun{app: a, results: results, shown: view.Shown, policy: pol, view: view}
	n := 0
	for _, fs := range view.Shown {
		n += len(fs)
	}
	if n < 10000 {
		b.Fatalf("%d findings, want at least 10,000", n)
	}
	pal := newPalette(false)
	formats := []struct {
		name  string
		write func(w io.Writer) error
	}{
		{"text", func(w io.Writer) error { run.writeText(w, pal); return nil }},
		{"json", run.writeJSON},
		{"sarif", run.writeSARIF},
	}
	for _, f := range formats {
		b.Run(f.name, func(b *testing.B) {
			b.ReportAllocs()
			var cw countingWriter
			cpu0 := cpuTime()
			for b.Loop() {
				cw = 0
				w := bufio.NewWriterSize(&cw, 64<<10)
				if err := f.write(w); err != nil {
					b.Fatal(err)
				}
				if err := w.Flush(); err != nil {
					b.Fatal(err)
				}
			}
			b.ReportMetric(float64((cpuTime()-cpu0).Microseconds())/1e3/float64(b.N), "cpu-ms/op")
			b.ReportMetric(float64(n), "findings")
			b.ReportMetric(float64(cw), "bytes/op")
		})
	}
}

// countingWriter counts and discards what is written.
type countingWriter int

func (c *countingWriter) Write(p []byte) (int, error) {
	*c += countingWriter(len(p))
	return len(p), nil
}

// BenchmarkMemoryLimit10k: `chanlint check` of one 10,000-reach chain
// (1.15 MB) as a process, under the fixed 100 MiB soft limit, the limit
// scaled with the input (the binary's default) and no limit: wall and
// CPU time and the peak resident set of the process.
func BenchmarkMemoryLimit10k(b *testing.B) {
	dir := b.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "trunk.chan.hcl"), chainModel(10000, 3000, 0), 0o644); err != nil {
		b.Fatal(err)
	}
	bin := cliBinary(b)
	for _, c := range []struct{ name, limit string }{{"fixed-100MiB", "100MiB"}, {"scaled", ""}, {"none", "off"}} {
		b.Run(c.name, func(b *testing.B) {
			var cpu time.Duration
			peak := 0.0
			for b.Loop() {
				cmd := exec.Command(bin, "check", "--color", "never", "trunk.chan.hcl")
				cmd.Dir = dir
				// An empty GOMEMLIMIT is no setting of the user's.
				cmd.Env = append(os.Environ(), "GOMEMLIMIT="+c.limit)
				if err := cmd.Run(); err != nil {
					if _, ok := err.(*exec.ExitError); !ok {
						b.Fatal(err)
					}
				}
				cpu += cmd.ProcessState.UserTime() + cmd.ProcessState.SystemTime()
				peak = max(peak, childPeakRSS(cmd.ProcessState))
			}
			b.ReportMetric(float64(cpu.Milliseconds())/float64(b.N), "cpu-ms/op")
			b.ReportMetric(peak/1e6, "peak-MB")
		})
	}
}
