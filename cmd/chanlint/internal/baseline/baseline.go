// Package baseline records the findings of a model set on one day so that
// later runs of `chanlint check --baseline FILE` fail only on findings that
// are new.
//
// A finding is identified by its key: rule, model file, reach, event, the
// station span rounded to 0.1 of the model's length unit, and a fingerprint
// of its message with every number taken out. Line and column are kept in
// the file for the reader only: an edit elsewhere in the model that moves a
// block up or down does not make its findings new, while a violation that
// spreads to other stations, or moves to another reach or event, does.
// Matching is a multiset: two identical findings need two entries.
package baseline

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"path"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/chanlint/chanlint/internal/safefile"
	"github.com/chanlint/chanlint/rules"
)

// Version is the format version written to, and required in, a baseline
// file.
const Version = 1

// MaxSize bounds the baseline file Read accepts (bytes).
const MaxSize = 64 << 20

// stationStep is the rounding of stations in a key, in the model's length
// unit: finer than any sensible station spacing, coarser than the noise of
// re-solving an unchanged model.
const stationStep = 0.1

// File is the JSON document of a baseline.
type File struct {
	Version int     `json:"version"`
	Tool    string  `json:"tool"`
	Entries []Entry `json:"entries"`
}

// Entry is one recorded finding. The fields tagged "informational" are not
// part of the key.
type Entry struct {
	Rule        string   `json:"rule"`
	File        string   `json:"file"`
	Reach       string   `json:"reach,omitempty"`
	Event       string   `json:"event,omitempty"`
	FromStation *float64 `json:"from_station,omitempty"` // rounded to 0.1
	ToStation   *float64 `json:"to_station,omitempty"`   // rounded to 0.1
	Fingerprint string   `json:"fingerprint"`            // of the number-free message
	// Informational.
	Severity string `json:"severity,omitempty"`
	Line     int    `json:"line,omitempty"`
	Message  string `json:"message,omitempty"`
}

// Baseline is a loaded baseline file, ready to filter findings.
type Baseline struct {
	Path    string
	Entries []Entry
	counts  map[string]int // key → number of entries
}

// Key is the identity of a finding in a baseline: rule, file (as given,
// cleaned to forward slashes), reach, event, rounded span and the message
// fingerprint, joined with a separator that cannot occur in them.
func Key(f rules.Finding) string {
	return keyOf(entryOf(f))
}

func keyOf(e Entry) string {
	span := "-"
	if e.FromStation != nil && e.ToStation != nil {
		span = formatStation(*e.FromStation) + ".." + formatStation(*e.ToStation)
	}
	return strings.Join([]string{e.Rule, e.File, e.Reach, e.Event, span, e.Fingerprint}, "\x00")
}

// entryOf builds the entry recorded for a finding.
func entryOf(f rules.Finding) Entry {
	e := Entry{
		Rule:        f.Rule,
		File:        CleanPath(f.File),
		Reach:       f.Reach,
		Event:       f.Event,
		Fingerprint: MessageFingerprint(f.Message),
		Severity:    string(f.Severity),
		Line:        f.Range.Start.Line,
		Message:     f.Message,
	}
	if f.HasSpan {
		from, to := RoundStation(f.FromStation), RoundStation(f.ToStation)
		e.FromStation, e.ToStation = &from, &to
	}
	return e
}

// CleanPath returns p with forward slashes and without "./" or "a/../"
// detours, so that the same file spelled two ways has one key.
func CleanPath(p string) string {
	if p == "" {
		return ""
	}
	return path.Clean(strings.ReplaceAll(p, `\`, "/"))
}

// RoundStation rounds a station to 0.1 of the model's length unit (half away
// from zero); NaN and infinities, which no solver output should contain,
// become 0 so that a key is always a finite number.
func RoundStation(s float64) float64 {
	if math.IsNaN(s) || math.IsInf(s, 0) {
		return 0
	}
	r := math.Round(s/stationStep) * stationStep
	// Print-stable value (0.30000000000000004 → 0.3) and no negative zero.
	r, _ = strconv.ParseFloat(strconv.FormatFloat(r, 'f', 1, 64), 64)
	if r == 0 {
		return 0
	}
	return r
}

func formatStation(s float64) string { return strconv.FormatFloat(s, 'f', 1, 64) }

// MessageFingerprint is a short hash of a message with its numbers removed
// and its spacing and case normalised, so that a measured value that moves
// from 0.18 to 0.17 m keeps the identity of the finding while a different
// kind of message does not.
func MessageFingerprint(msg string) string {
	sum := sha256.Sum256([]byte(normalizeMessage(msg)))
	return hex.EncodeToString(sum[:8])
}

// number matches a decimal number with optional grouping and exponent.
var number = regexp.MustCompile(`(?:\d+(?:[.,]\d+)*|\.\d+)(?:[eE][-+]?\d+)?`)

// normalizeMessage replaces each number with '#', lower-cases the letters
// and collapses white space.
func normalizeMessage(msg string) string {
	return strings.Join(strings.Fields(strings.ToLower(number.ReplaceAllString(msg, "#"))), " ")
}

// Write records findings as a baseline file: entries sorted by key so that
// the file is the same whatever order the findings came in.
func Write(w io.Writer, findings []rules.Finding) error {
	doc := File{Version: Version, Tool: "chanlint", Entries: make([]Entry, 0, len(findings))}
	for _, f := range findings {
		doc.Entries = append(doc.Entries, entryOf(f))
	}
	sort.SliceStable(doc.Entries, func(i, j int) bool {
		ki, kj := keyOf(doc.Entries[i]), keyOf(doc.Entries[j])
		if ki != kj {
			return ki < kj
		}
		return doc.Entries[i].Line < doc.Entries[j].Line
	})
	enc := json.NewEncoder(w)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(doc); err != nil {
		return fmt.Errorf("baseline: %w", err)
	}
	return nil
}

// Read loads a baseline file. The error names the file and says what is
// wrong with it: not JSON, another format version, or an entry without a
// rule, file or fingerprint.
func Read(p string) (*Baseline, error) {
	data, err := safefile.Read(p, MaxSize)
	switch {
	case errors.Is(err, safefile.ErrTooLarge):
		return nil, fmt.Errorf("baseline %s: larger than %d MiB", p, MaxSize>>20)
	case err != nil:
		return nil, fmt.Errorf("baseline: %w", err)
	}
	return parse(p, data)
}

func parse(p string, data []byte) (*Baseline, error) {
	var doc File
	if err := json.Unmarshal(data, &doc); err != nil {
		return nil, fmt.Errorf("baseline %s: not a chanlint baseline file: %v", p, err)
	}
	if doc.Version != Version {
		return nil, fmt.Errorf("baseline %s: format version %d, this chanlint reads version %d; write it again with --write-baseline", p, doc.Version, Version)
	}
	b := &Baseline{Path: p, Entries: doc.Entries, counts: make(map[string]int, len(doc.Entries))}
	for i, e := range doc.Entries {
		if e.Rule == "" || e.File == "" || e.Fingerprint == "" {
			return nil, fmt.Errorf("baseline %s: entry %d lacks a rule, file or fingerprint", p, i+1)
		}
		if (e.FromStation == nil) != (e.ToStation == nil) {
			return nil, fmt.Errorf("baseline %s: entry %d has only one of from_station and to_station", p, i+1)
		}
		b.counts[keyOf(e)]++
	}
	return b, nil
}

// Filter splits findings into those the baseline does not record (fresh,
// in their original order) and the number it does. Each entry absorbs at
// most one finding. Filter does not change the baseline; it can be called
// again with other findings.
func (b *Baseline) Filter(findings []rules.Finding) (fresh []rules.Finding, known int) {
	left := make(map[string]int, len(b.counts))
	for k, n := range b.counts {
		left[k] = n
	}
	for _, f := range findings {
		k := Key(f)
		if left[k] > 0 {
			left[k]--
			known++
			continue
		}
		fresh = append(fresh, f)
	}
	return fresh, known
}
