// Package hclkit is the HCL plumbing that the model and policy decoders
// share: accumulating one file's diagnostics, ordering and bounding them,
// the hint that closes a diagnostic about a misspelt word, and the walker
// that keeps untrusted files to literal values (literal.go).
//
// It is a leaf: it imports nothing of the project. The words of every
// diagnostic stay with the decoder that reports it; this package decides
// what is reported, not how it reads.
package hclkit

import (
	"cmp"
	"fmt"
	"slices"
	"unicode/utf8"

	"github.com/hashicorp/hcl/v2"
)

// Diagnostics accumulates the diagnostics of one file. The zero value is
// ready to use; a decoder embeds it.
type Diagnostics struct {
	Diags hcl.Diagnostics
}

// Add appends a diagnostic at rng whose detail is format filled with args
// (fmt.Sprintf).
func (d *Diagnostics) Add(sev hcl.DiagnosticSeverity, rng hcl.Range, summary, format string, args ...any) {
	d.Diags = append(d.Diags, &hcl.Diagnostic{
		Severity: sev,
		Summary:  summary,
		Detail:   fmt.Sprintf(format, args...),
		Subject:  rng.Ptr(),
	})
}

// Errorf appends an error at rng.
func (d *Diagnostics) Errorf(rng hcl.Range, summary, format string, args ...any) {
	d.Add(hcl.DiagError, rng, summary, format, args...)
}

// Warnf appends a warning at rng.
func (d *Diagnostics) Warnf(rng hcl.Range, summary, format string, args ...any) {
	d.Add(hcl.DiagWarning, rng, summary, format, args...)
}

// Append appends diagnostics found elsewhere (by the HCL parser, by
// Content or Value) and reports whether they hold an error.
func (d *Diagnostics) Append(diags hcl.Diagnostics) bool {
	d.Diags = append(d.Diags, diags...)
	return diags.HasErrors()
}

// HasErrors reports whether an error has been added.
func (d *Diagnostics) HasErrors() bool { return d.Diags.HasErrors() }

// SortByPosition orders one file's diagnostics from top to bottom by the
// start of their subject, those without a subject first; diagnostics at
// the same place keep the order in which they were found.
func SortByPosition(diags hcl.Diagnostics) {
	slices.SortStableFunc(diags, func(a, b *hcl.Diagnostic) int {
		return cmp.Compare(offset(a), offset(b))
	})
}

func offset(d *hcl.Diagnostic) int {
	if d.Subject == nil {
		return -1
	}
	return d.Subject.Start.Byte
}

// Limits bound the text of one file's diagnostics, so that a hostile file
// cannot make an output of gigabytes: each summary and detail is clipped to
// Summary and Detail bytes, and past Count diagnostics, or past Bytes of
// summaries and details in all, the rest are counted in one last
// diagnostic.
type Limits struct {
	Count   int
	Summary int
	Detail  int
	Bytes   int
}

// Bound applies lim to diags (sorted by position), clipping their texts
// in place. The diagnostic that stands for the rest is at the first one
// left out, an error if any of those is one and a warning otherwise.
func Bound(diags hcl.Diagnostics, lim Limits) hcl.Diagnostics {
	total := 0
	for i, d := range diags {
		d.Summary = Clip(d.Summary, lim.Summary)
		d.Detail = Clip(d.Detail, lim.Detail)
		total += len(d.Summary) + len(d.Detail)
		if i < lim.Count && total <= lim.Bytes {
			continue
		}
		// The note is as severe as the worst problem it hides: a file
		// whose hidden problems are all warnings stays valid, and one
		// that hides an error is invalid.
		severity := hcl.DiagWarning
		if diags[i:].HasErrors() {
			severity = hcl.DiagError
		}
		more := &hcl.Diagnostic{
			Severity: severity,
			Summary:  "Too many problems",
			Detail:   fmt.Sprintf("%d more problems from here on are not shown; fix the ones above and check again.", len(diags)-i),
			Subject:  d.Subject,
		}
		return append(diags[:i:i], more)
	}
	return diags
}

// Clip shortens s to at most n bytes (n of 40 or more), on a rune
// boundary, marking the cut with an ellipsis and the number of bytes left
// out.
func Clip(s string, n int) string {
	if len(s) <= n {
		return s
	}
	cut := n - 40
	for cut > 0 && !utf8.RuneStart(s[cut]) {
		cut--
	}
	return fmt.Sprintf("%s… (%d more bytes)", s[:cut], len(s)-cut)
}

// DidYouMean is the sentence that closes a diagnostic about a misspelt
// word, ` Did you mean "word"?` (with its leading space), or "" when no
// word was found (word == "").
func DidYouMean(word string) string {
	if word == "" {
		return ""
	}
	return fmt.Sprintf(" Did you mean %q?", word)
}
