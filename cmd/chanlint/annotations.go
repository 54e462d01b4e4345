package main

import (
	"fmt"
	"io"
	"path/filepath"
	"strings"

	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/safetext"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
)

// writeAnnotations renders the findings as GitHub Actions workflow
// commands, one per finding, which the runner turns into annotations on
// the changed files:
//
//	::error file=F,line=L,col=C,endLine=L2,endColumn=C2,title=chanlint freeboard::place: message%0Aremedy: ...
//
// Errors and warnings keep their level; info and findings covered by a
// design exception become notices. File names are relative to the
// repository root (else the working directory), as the runner expects.
// The summary, the policy line and the caution follow as plain lines.
func (c *checkRun) writeAnnotations(w io.Writer) {
	root := repoRoot(c.app.cwd)
	for _, r := range c.results {
		for i := range c.shown[r.File.Name] {
			f := &c.shown[r.File.Name][i]
			writeAnnotation(w, c.annotationFile(root, r, f.File()), f, r.Unit())
		}
	}
	c.writeClosing(w, newPalette(false))
}

// annotationFile is the name of the file a finding of r is in (the model,
// or another file such as an approvals file) relative to the repository
// root, else as given (also for a model not read from disk).
func (c *checkRun) annotationFile(root string, r *pipeline.Result, file string) string {
	abs := r.File.Path
	if file != r.File.Name {
		abs = c.app.abs(filepath.FromSlash(file))
	}
	if root == "" || abs == "" {
		return file
	}
	if rel, err := filepath.Rel(root, abs); err == nil && !strings.HasPrefix(rel, "..") {
		return filepath.ToSlash(rel)
	}
	return file
}

func writeAnnotation(w io.Writer, file string, f *rules.Finding, unit string) {
	level := "notice"
	switch {
	case f.Excepted:
	case f.Severity == policies.Error:
		level = "error"
	case f.Severity == policies.Warning:
		level = "warning"
	}
	title := "chanlint " + f.Rule
	if f.Excepted {
		title += " (excepted " + string(f.Severity) + ")"
	}
	// Names, messages, reasons and file names carry a submittal's text,
	// which the Actions log would render as it stands.
	props := []string{"file=" + annotationProperty(safetext.Text(file))}
	if pos := f.Pos(); pos.Start.Line > 0 {
		props = append(props, fmt.Sprintf("line=%d", pos.Start.Line), fmt.Sprintf("col=%d", max(pos.Start.Column, 1)))
		if pos.End.Line >= pos.Start.Line {
			props = append(props, fmt.Sprintf("endLine=%d", pos.End.Line), fmt.Sprintf("endColumn=%d", max(pos.End.Column, 1)))
		}
	}
	props = append(props, "title="+annotationProperty(title))
	msg := safetext.Text(f.Message)
	if where := f.Where(unit); where != "" {
		msg = safetext.Text(where) + ": " + msg
	}
	if f.Excepted {
		msg += "\nexception: " + safetext.Text(f.ExceptionReason)
	}
	if f.Remedy != "" {
		msg += "\nremedy: " + safetext.Text(f.Remedy)
	}
	fmt.Fprintf(w, "::%s %s::%s\n", level, strings.Join(props, ","), annotationData(msg))
}

// annotationData escapes the message of a workflow command: "%", carriage
// returns and newlines, which would end it.
func annotationData(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A").Replace(s)
}

// annotationProperty escapes a property value of a workflow command, where
// ":" and "," also have a meaning.
func annotationProperty(s string) string {
	return strings.NewReplacer("%", "%25", "\r", "%0D", "\n", "%0A", ":", "%3A", ",", "%2C").Replace(s)
}
