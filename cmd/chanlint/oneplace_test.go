package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// place is a position as an output prints it.
type place struct {
	File      string
	Line, Col int
}

func (p place) String() string { return fmt.Sprintf("%s:%d:%d", p.File, p.Line, p.Col) }

// jsonPlaces are the positions of the findings of `check --format json`,
// after checking that every related place in the finding's file spells
// it as the finding does.
func jsonPlaces(t *testing.T, out string) []place {
	t.Helper()
	var doc struct {
		Findings []struct {
			Rule    string `json:"rule"`
			File    string `json:"file"`
			Line    int    `json:"line"`
			Column  int    `json:"column"`
			Related []struct {
				Label string `json:"label"`
				File  string `json:"file"`
				Line  int    `json:"line"`
			} `json:"related"`
		} `json:"findings"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &doc))
	var ps []place
	for _, f := range doc.Findings {
		require.NotEmpty(t, f.File, "%s finding without a file", f.Rule)
		for _, r := range f.Related {
			if r.Line > 0 {
				require.NotEmpty(t, r.File, "%s finding in %s: related %q without a file", f.Rule, f.File, r.Label)
			}
			if path.Clean(r.File) == path.Clean(f.File) {
				assert.Equal(t, f.File, r.File, "%s finding: related %q names its file another way", f.Rule, r.Label)
			}
		}
		ps = append(ps, place{f.File, f.Line, f.Column})
	}
	return ps
}

var (
	// textPlace matches the GNU prefix of a finding's first line in text.
	textPlace = regexp.MustCompile(`^(\S[^:]*):(?:(\d+):(\d+):)? (?:error|warning|info|excepted):? `)
	// annotationPlace matches the file, line and column of a workflow
	// command.
	annotationPlace = regexp.MustCompile(`^::(?:error|warning|notice) file=([^,]*)(?:,line=(\d+),col=(\d+))?`)
)

// linePlaces are the positions of the lines of out that re matches (file,
// line and column as its three groups; no line is 0).
func linePlaces(out string, re *regexp.Regexp) []place {
	var ps []place
	for line := range strings.SplitSeq(out, "\n") {
		m := re.FindStringSubmatch(line)
		if m == nil {
			continue
		}
		ln, _ := strconv.Atoi(m[2])
		col, _ := strconv.Atoi(m[3])
		ps = append(ps, place{m[1], ln, col})
	}
	return ps
}

var (
	// markdownFinding is a row of a model's findings table in the Markdown
	// report, its location in the last cell; markdownInvalid a row of the
	// invalid files, its location in the first.
	markdownFinding = regexp.MustCompile("^\\| \\d+ \\| .* \\| `([^`]+)` \\|$")
	markdownInvalid = regexp.MustCompile("^\\| `([^`]+)` \\| (?:error|warning|info) \\|")
	// fileLineCol splits "file:line:col".
	fileLineCol = regexp.MustCompile(`^(.*):(\d+):(\d+)$`)
)

// markdownPlaces are the locations of the findings of a Markdown report:
// the rows of each "Findings" table and of the "Invalid files" one.
func markdownPlaces(out string) []place {
	var ps []place
	var row *regexp.Regexp // the rows of the table being read; nil: none
	for line := range strings.SplitSeq(out, "\n") {
		switch {
		case line == "### Findings":
			row = markdownFinding
			continue
		case line == "## Invalid files":
			row = markdownInvalid
			continue
		case strings.HasPrefix(line, "#"):
			row = nil
		}
		if row == nil {
			continue
		}
		m := row.FindStringSubmatch(line)
		if m == nil {
			continue
		}
		p := place{File: m[1]}
		if fl := fileLineCol.FindStringSubmatch(m[1]); fl != nil {
			p.File = fl[1]
			p.Line, _ = strconv.Atoi(fl[2])
			p.Col, _ = strconv.Atoi(fl[3])
		}
		ps = append(ps, p)
	}
	return ps
}

// sarifPlaces are the positions of the results of a SARIF log (URI
// relative to the repository root, start line and column), after
// checking that every location, related location and suppression names a
// file that exists under root, that those in a result's artifact refer to
// it by the same index and, where the source is known, with its byte
// offsets: the same file under one name.
func sarifPlaces(t *testing.T, root, out string) []place {
	t.Helper()
	type location struct {
		PhysicalLocation struct {
			ArtifactLocation struct {
				URI   string `json:"uri"`
				Index int    `json:"index"`
			} `json:"artifactLocation"`
			Region *struct {
				StartLine   int  `json:"startLine"`
				StartColumn int  `json:"startColumn"`
				ByteOffset  *int `json:"byteOffset"`
			} `json:"region"`
		} `json:"physicalLocation"`
	}
	var log struct {
		Runs []struct {
			Artifacts []struct {
				Length int `json:"length"`
			} `json:"artifacts"`
			Results []struct {
				RuleID           string     `json:"ruleId"`
				Locations        []location `json:"locations"`
				RelatedLocations []location `json:"relatedLocations"`
				Suppressions     []struct {
					Location *location `json:"location"`
				} `json:"suppressions"`
			} `json:"results"`
		} `json:"runs"`
	}
	require.NoError(t, json.Unmarshal([]byte(out), &log))
	require.Len(t, log.Runs, 1)
	run := log.Runs[0]
	var ps []place
	for _, r := range run.Results {
		require.Len(t, r.Locations, 1, "%s result", r.RuleID)
		own := r.Locations[0].PhysicalLocation
		p := place{File: own.ArtifactLocation.URI}
		if own.Region != nil {
			p.Line, p.Col = own.Region.StartLine, own.Region.StartColumn
		}
		ps = append(ps, p)
		others := r.RelatedLocations
		for _, s := range r.Suppressions {
			if s.Location != nil {
				others = append(others, *s.Location)
			}
		}
		for _, o := range append(others, r.Locations[0]) {
			al := o.PhysicalLocation.ArtifactLocation
			_, err := os.Stat(filepath.Join(root, filepath.FromSlash(al.URI)))
			assert.NoError(t, err, "%s result at %s: a place in a file that is not there", r.RuleID, p)
			if al.URI == p.File {
				assert.Equal(t, own.ArtifactLocation.Index, al.Index, "%s result at %s: one file, two artifacts", r.RuleID, p)
			}
			if reg := o.PhysicalLocation.Region; reg != nil && al.Index >= 0 && run.Artifacts[al.Index].Length > 0 {
				require.NotNil(t, reg.ByteOffset, "%s result at %s", r.RuleID, p)
				assert.GreaterOrEqual(t, *reg.ByteOffset, 0, "%s result at %s: a place in %s read without its source", r.RuleID, p, al.URI)
			}
		}
	}
	return ps
}

// absApprovals is args with the --approvals file given by its absolute
// path in dir.
func absApprovals(args []string, dir string) []string {
	out := slices.Clone(args)
	for i := range out[:len(out)-1] {
		if out[i] == "--approvals" {
			out[i+1] = filepath.Join(dir, filepath.FromSlash(out[i+1]))
		}
	}
	return out
}

// TestOnePlacePerFinding: over the corpus (every model of testdata under
// the baseline pack and under a policy file, a sensitivity run of the
// demo, and reviewer approvals with a stale one, a finding that lies in
// the approvals file rather than its model, the file given as it is
// relative to the working directory and by its absolute path) every output prints each
// finding at the one position it carries: JSON, text, SARIF and the
// workflow annotations name the same file, line and column, finding by
// finding, the Markdown report the same places in its own order, and no
// related place names the finding's file another way.
func TestOnePlacePerFinding(t *testing.T) {
	dir := t.TempDir()
	require.NoError(t, os.Mkdir(filepath.Join(dir, ".git"), 0o755)) // the repository root of SARIF and annotations
	copyTree(t, filepath.Join(repoDir(t), "testdata"), filepath.Join(dir, "corpus"))
	s := parseScript(t, filepath.Join("testdata", "scripts", "check_approvals.txtar"))
	for _, f := range s.files {
		p := filepath.Join(dir, "approvals", filepath.FromSlash(f.Name))
		require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
		require.NoError(t, os.WriteFile(p, f.Data, 0o644))
	}
	setups := []struct {
		name, cd string
		args     []string
	}{
		{"baseline pack", "corpus", []string{"."}},
		{"policy file", "corpus", []string{".", "--policy", "rules/golden.policy.hcl"}},
		{"sensitivity", "corpus", []string{"demo", "--vary", "roughness=0.2,discharge=0.1,tailwater=0.3"}},
		{"approvals", "approvals", s.args[1:]},
		{"approvals by absolute path", "approvals", absApprovals(s.args[1:], filepath.Join(dir, "approvals"))},
	}
	for _, su := range setups {
		t.Run(su.name, func(t *testing.T) {
			cwd := filepath.Join(dir, su.cd)
			run := func(format string) string {
				_, out, _ := runIn(cwd, runOpts{}, append([]string{"check", "--color", "never", "--format", format}, su.args...)...)
				return out
			}
			want := jsonPlaces(t, run("json"))
			require.NotEmpty(t, want)
			// SARIF and annotations name files relative to the root.
			rooted := make([]place, len(want))
			for i, p := range want {
				rooted[i] = p
				rooted[i].File = path.Join(su.cd, p.File)
			}
			assert.Equal(t, want, linePlaces(run("text"), textPlace), "text")
			assert.Equal(t, rooted, linePlaces(run("annotations"), annotationPlace), "annotations")
			assert.Equal(t, rooted, sarifPlaces(t, dir, run("sarif")), "sarif")

			// The report lists the findings per model and the invalid
			// files apart: the same places, in its own order.
			args := []string{"report", "--color", "never", "--format", "markdown", "--out", "-"}
			for i := 0; i < len(su.args); i++ {
				if su.args[i] == "--fail-on" {
					i++
					continue
				}
				args = append(args, su.args[i])
			}
			_, md, _ := runIn(cwd, runOpts{}, args...)
			sorted := func(ps []place) []place {
				return slices.SortedFunc(slices.Values(ps), func(a, b place) int { return strings.Compare(a.String(), b.String()) })
			}
			assert.Equal(t, sorted(want), sorted(markdownPlaces(md)), "report")
		})
	}
}
