package report

import (
	"bytes"
	"context"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// chromium is where Debian's chromium package installs the browser
// (apt-get install -y chromium).
const chromium = "/usr/bin/chromium"

// TestHTMLInChromium loads the report in headless Chromium from a file://
// URL, checks the rendered DOM holds the profile plots with their paths and
// that the browser logged no console error, and takes a screenshot, all in
// one start of the browser (its start-up is most of the test's time). Set
// CHANLINT_REPORT_SHOTS to a directory to keep the page and screenshot.
func TestHTMLInChromium(t *testing.T) {
	if _, err := os.Stat(chromium); err != nil {
		t.Skipf("headless browser test skipped: %s not found (install it with: apt-get install -y chromium)", chromium)
	}
	dir := t.TempDir()
	if keep := os.Getenv("CHANLINT_REPORT_SHOTS"); keep != "" {
		require.NoError(t, os.MkdirAll(keep, 0o755))
		dir = keep
	}
	page := filepath.Join(dir, "report.html")
	var buf bytes.Buffer
	// The demo over a sensitivity envelope (verdicts, water-surface
	// bands), then two models without one.
	in := variedInput(t, "roughness=0.2,tailwater=0.3,discharge=0.1", demoModel)
	in.Models = append(in.Models, solvedInput(t, filepath.Join("testdata", "heron-flats.chan.hcl"), filepath.Join("testdata", "inject.chan.hcl")).Models...)
	require.NoError(t, HTML(&buf, in))
	require.NoError(t, os.WriteFile(page, buf.Bytes(), 0o644))
	url := "file://" + filepath.ToSlash(page)

	shot := filepath.Join(dir, "report.png")
	ctx, cancel := context.WithTimeout(context.Background(), 90*time.Second)
	defer cancel()
	cmd := exec.CommandContext(ctx, chromium, "--headless", "--no-sandbox", "--disable-gpu", "--disable-quic", "--no-first-run",
		"--disable-background-networking", "--disable-component-update", "--disable-sync", "--disable-dev-shm-usage",
		"--user-data-dir="+t.TempDir(), "--enable-logging=stderr", "--v=0",
		"--dump-dom", "--screenshot="+shot, "--window-size=1280,2000", "--hide-scrollbars", url)
	var stdout, stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = &stdout, &stderr
	require.NoError(t, cmd.Run(), "chromium failed: %s", stderr.String())
	dom, logs := stdout.String(), stderr.String()
	assert.Contains(t, dom, "Heron Flats outfall channel")
	assert.Contains(t, dom, "Kestrel Ridge")
	assert.GreaterOrEqual(t, strings.Count(dom, "<svg "), 5, "plots in the rendered DOM")
	assert.Greater(t, strings.Count(dom, "<path "), 20, "plot lines in the rendered DOM")
	assert.NotContains(t, dom, "<script", "a model string became markup")
	for _, bad := range []string{"Uncaught", "ERROR:CONSOLE", "CONSOLE("} {
		assert.NotContains(t, logs, bad, "console error in the browser log")
	}
	// The legend names every kind of marker the demo's plots draw, with
	// the hatching that codes severity apart from colour.
	for _, entry := range []string{"water surface", "critical depth", "energy grade", "hydraulic jump", "basin",
		"gate", "bend", "reach boundary", "error span, cross-hatched", "warning span, hatched", "excepted span",
		"water-surface envelope, hatched"} {
		assert.Contains(t, dom, ">"+entry, "legend entry %q", entry)
	}
	// The envelope's band, verdicts and run survive the browser's parse.
	assert.Contains(t, dom, `<g class="envelope"><title>Water-surface envelope over 14 sensitivity cases`)
	assert.Contains(t, dom, "Envelope: knife-edge: fails in ")
	assert.Contains(t, dom, "Sensitivity run, asked by --vary: each event solved in 14 more cases")
	// Every #N tag of a plot links to a findings row that exists.
	links := regexp.MustCompile(`<a href="#(m\d+-f\d+)">`).FindAllStringSubmatch(dom, -1)
	require.NotEmpty(t, links, "plot tags link to the findings rows")
	for _, l := range links {
		assert.Contains(t, dom, `id="`+l[1]+`"`, "link target %s", l[1])
	}

	info, err := os.Stat(shot)
	require.NoError(t, err, "no screenshot written")
	assert.Greater(t, info.Size(), int64(20_000), "the screenshot looks empty")
}
