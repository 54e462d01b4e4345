package pipeline

import (
	"path/filepath"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/baseline"
	"github.com/chanlint/chanlint/rules"
)

// View is a check's findings seen through a baseline: those to show (by
// File.Name), with the match of each (parallel slices; nil without a
// baseline), the match of every finding of each file (parallel to its
// findings, for SARIF's baselineState), how many the baseline hid and the
// entries no finding matched.
type View struct {
	Shown map[string][]rules.Finding
	Marks map[string][]baseline.Match
	Every map[string][]baseline.Match
	Known int
	Stale []baseline.Entry
}

// ApplyBaseline hides the findings the baseline b (nil: none) records.
// Invalid files are never filtered: their diagnostics always show.
// Excepted findings are never matched, so they show as excepted. cwd is
// the directory the file names are relative to.
func ApplyBaseline(results []*Result, b *baseline.Baseline, cwd string) View {
	v := View{Shown: map[string][]rules.Finding{}}
	if b == nil {
		for _, r := range results {
			v.Shown[r.File.Name] = r.Findings
		}
		return v
	}
	v.Marks = map[string][]baseline.Match{}
	v.Every = map[string][]baseline.Match{}
	var all []rules.Finding
	for _, r := range results {
		if r.Invalid {
			v.Shown[r.File.Name] = r.Findings
			v.Marks[r.File.Name] = make([]baseline.Match, len(r.Findings))
			v.Every[r.File.Name] = v.Marks[r.File.Name]
			continue
		}
		all = append(all, r.Findings...)
	}
	rebased := rebase(all, filepath.Dir(absIn(cwd, b.Path)), cwd)
	matches, stale := b.Compare(rebased)
	v.Stale = stale
	i := 0
	for _, r := range results {
		if r.Invalid {
			continue
		}
		d := r.File.Name
		v.Every[d] = matches[i : i+len(r.Findings)]
		for k, f := range r.Findings {
			m := matches[i+k]
			if m.State.Known() {
				v.Known++
				continue
			}
			v.Shown[d] = append(v.Shown[d], f)
			v.Marks[d] = append(v.Marks[d], m)
		}
		i += len(r.Findings)
	}
	return v
}

// BaselineFindings are the findings of the valid files to record in a
// baseline file at path, with file names relative to the baseline's
// directory so that it matches whatever directory chanlint runs in.
func BaselineFindings(results []*Result, path, cwd string) []rules.Finding {
	var all []rules.Finding
	for _, r := range results {
		if !r.Invalid {
			all = append(all, r.Findings...)
		}
	}
	out := rebase(all, filepath.Dir(absIn(cwd, path)), cwd)
	return out
}

// rebase returns copies of findings moved to their file's name relative
// to dir (rules.Finding.Rename).
func rebase(findings []rules.Finding, dir, cwd string) []rules.Finding {
	out := make([]rules.Finding, len(findings))
	for i, f := range findings {
		if rel, err := filepath.Rel(dir, absIn(cwd, filepath.FromSlash(f.File()))); err == nil {
			f.Rename(filepath.ToSlash(rel))
		}
		out[i] = f
	}
	return out
}

// absIn is p made absolute against dir.
func absIn(dir, p string) string {
	if filepath.IsAbs(p) {
		return filepath.Clean(p)
	}
	return filepath.Join(dir, p)
}
