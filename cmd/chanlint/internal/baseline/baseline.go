// Package baseline records the findings of a model set on one day so that
// later runs of `chanlint check --baseline FILE` fail only on findings that
// are new.
//
// A finding matches an entry when its identity is the same: rule, model
// file, reach, event, severity (an escalation from warning to error is
// new) and a fingerprint of its message with every number taken out. Its
// station span must also lie close to the recorded one: each end within
// SpanTolerance of the recorded span's length, or MinSpanTolerance length
// units, whichever is larger, so that re-solving after a small change of
// inflow or roughness keeps a finding known while a violation that
// spreads does not. Measured values are not part of the identity, with
// one exception: a finding whose shortfall (how far its value lies past
// its limit) has grown by more than WorseShare of the recorded shortfall
// counts as new ("much worse"). Line and column are kept for the reader
// only. Matching is a multiset: two identical findings need two entries.
//
// Findings covered by a design exception are never recorded: they do not
// fail a run, and once the exception is removed the finding must show.
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
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/chanlint/chanlint/rules"
)

// Version is the format version written to, and required in, a baseline
// file. Version 2 added the severity to the identity and the value and
// limit for the "much worse" rule.
const Version = 2

// Matching tolerances (see the package documentation).
const (
	// SpanTolerance is the share of the recorded span's length each end
	// of a finding's span may move.
	SpanTolerance = 0.10
	// MinSpanTolerance is the least distance, in the model's length unit,
	// each end may move.
	MinSpanTolerance = 2.0
	// WorseShare is the growth of the shortfall, as a share of the
	// recorded one, beyond which a finding counts as new.
	WorseShare = 0.25
)

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
	Severity    string   `json:"severity"`
	// The measured value and limit, for the "much worse" rule; absent
	// for findings without them.
	Value *float64 `json:"value,omitempty"`
	Limit *float64 `json:"limit,omitempty"`
	// Informational.
	Line    int    `json:"line,omitempty"`
	Message string `json:"message,omitempty"`
}

// Baseline is a loaded baseline file, ready to filter findings.
type Baseline struct {
	Path    string
	Entries []Entry
	byID    map[string][]int // identity → indices of its entries
}

// identity is what must be equal for a finding to match an entry: rule,
// file (cleaned to forward slashes), reach, event, severity and the
// message fingerprint, joined with a separator that cannot occur in them.
func identity(e *Entry) string {
	return strings.Join([]string{e.Rule, e.File, e.Reach, e.Event, e.Severity, e.Fingerprint}, "\x00")
}

// keyOf orders entries in a written file: identity, then span.
func keyOf(e Entry) string {
	span := "-"
	if e.FromStation != nil && e.ToStation != nil {
		span = numfmt.Fixed(*e.FromStation, 1) + ".." + numfmt.Fixed(*e.ToStation, 1)
	}
	return identity(&e) + "\x00" + span
}

// entryOf builds the entry recorded for a finding.
func entryOf(f rules.Finding) Entry {
	e := Entry{
		Rule:        f.Rule,
		File:        CleanPath(f.File()),
		Reach:       f.Reach,
		Event:       f.Event,
		Fingerprint: MessageFingerprint(f.Message),
		Severity:    string(f.Severity),
		Line:        f.Pos().Start.Line,
		Message:     f.Message,
	}
	if f.HasSpan {
		from, to := RoundStation(f.FromStation), RoundStation(f.ToStation)
		e.FromStation, e.ToStation = &from, &to
	}
	if f.HasValue && numfmt.Finite(f.Value, f.Limit) {
		v, l := roundValue(f.Value), roundValue(f.Limit)
		e.Value, e.Limit = &v, &l
	}
	return e
}

// roundValue keeps six significant digits of a recorded value: enough for
// the "much worse" rule, short enough to read.
func roundValue(x float64) float64 {
	r, _ := strconv.ParseFloat(strconv.FormatFloat(x, 'g', 6, 64), 64)
	return r
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
	if !numfmt.Finite(s) {
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

// MessageFingerprint is a short hash of a message with its numbers removed
// and its spacing and case normalised, so that a measured value that moves
// from 0.18 to 0.17 m keeps the identity of the finding while a different
// kind of message does not.
func MessageFingerprint(msg string) string {
	sum := sha256.Sum256([]byte(normalizeMessage(msg)))
	return hex.EncodeToString(sum[:8])
}

// normalizeMessage replaces each number with '#', lower-cases the letters
// and collapses white space.
func normalizeMessage(msg string) string {
	s := hashNumbers(msg)
	for i := 0; i < len(s); i++ {
		if s[i] >= utf8.RuneSelf {
			return strings.Join(strings.Fields(strings.ToLower(s)), " ")
		}
	}
	// ASCII: the same in one pass.
	b := make([]byte, 0, len(s))
	space := false
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == ' ' || (c >= '\t' && c <= '\r'):
			space = len(b) > 0
			continue
		case c >= 'A' && c <= 'Z':
			c += 'a' - 'A'
		}
		if space {
			b = append(b, ' ')
			space = false
		}
		b = append(b, c)
	}
	return string(b)
}

// hashNumbers replaces each decimal number of s with '#'. A number is
// ASCII digits with groups joined by '.' or ',' ("1,234.5"), or a '.' and
// digits (".5"), either with an exponent ("e-3") when one follows. It is a
// scanner, not a regular expression, because it runs once per finding of
// every baseline and SARIF log.
func hashNumbers(s string) string {
	isDigit := func(i int) bool { return i < len(s) && s[i] >= '0' && s[i] <= '9' }
	digits := func(i int) int {
		for isDigit(i) {
			i++
		}
		return i
	}
	var b strings.Builder
	last := 0
	for i := 0; i < len(s); {
		var end int
		switch {
		case isDigit(i):
			end = digits(i)
			for end < len(s) && (s[end] == '.' || s[end] == ',') && isDigit(end+1) {
				end = digits(end + 1)
			}
		case s[i] == '.' && isDigit(i+1):
			end = digits(i + 1)
		default:
			i++
			continue
		}
		if end < len(s) && (s[end] == 'e' || s[end] == 'E') {
			j := end + 1
			if j < len(s) && (s[j] == '-' || s[j] == '+') {
				j++
			}
			if isDigit(j) {
				end = digits(j)
			}
		}
		if b.Len() == 0 {
			b.Grow(len(s))
		}
		b.WriteString(s[last:i])
		b.WriteByte('#')
		last, i = end, end
	}
	if last == 0 {
		return s
	}
	b.WriteString(s[last:])
	return b.String()
}

// Write records findings as a baseline file: entries sorted by key so that
// the file is the same whatever order the findings came in. Findings
// covered by a design exception are left out; n is the number recorded.
func Write(w io.Writer, findings []rules.Finding) (n int, err error) {
	doc := File{Version: Version, Tool: "chanlint", Entries: make([]Entry, 0, len(findings))}
	for _, f := range findings {
		if f.Excepted {
			continue
		}
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
		return 0, fmt.Errorf("baseline: %w", err)
	}
	return len(doc.Entries), nil
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
	b := &Baseline{Path: p, Entries: doc.Entries, byID: make(map[string][]int, len(doc.Entries))}
	for i := range doc.Entries {
		e := &doc.Entries[i]
		if e.Rule == "" || e.File == "" || e.Fingerprint == "" || e.Severity == "" {
			return nil, fmt.Errorf("baseline %s: entry %d lacks a rule, file, severity or fingerprint", p, i+1)
		}
		if (e.FromStation == nil) != (e.ToStation == nil) {
			return nil, fmt.Errorf("baseline %s: entry %d has only one of from_station and to_station", p, i+1)
		}
		if (e.Value == nil) != (e.Limit == nil) {
			return nil, fmt.Errorf("baseline %s: entry %d has only one of value and limit", p, i+1)
		}
		e.File = CleanPath(e.File)
		id := identity(e)
		b.byID[id] = append(b.byID[id], i)
	}
	return b, nil
}

// State is how a finding stands against a baseline.
type State int

const (
	// New: no entry records it.
	New State = iota
	// Unchanged: an entry records it (within the tolerances).
	Unchanged
	// Worse: an entry records it, but its shortfall has grown by more
	// than WorseShare; it counts as new.
	Worse
	// Excepted: covered by a design exception, so never matched.
	Excepted
)

// Known reports whether a finding in this state is hidden by the baseline.
func (s State) Known() bool { return s == Unchanged }

// Match is the outcome for one finding: its state and, unless New or
// Excepted, the entry it matched.
type Match struct {
	State State
	Entry *Entry
}

// Compare matches findings against the entries, each entry absorbing at
// most one finding, and returns one Match per finding (in order) and the
// stale entries, which no finding matched. A finding takes the entry of
// its identity whose span is nearest, among those within the tolerance.
// Compare does not change the baseline; it can be called again.
func (b *Baseline) Compare(findings []rules.Finding) (matches []Match, stale []Entry) {
	used := make([]bool, len(b.Entries))
	matches = make([]Match, len(findings))
	for i := range findings {
		f := &findings[i]
		if f.Excepted {
			matches[i] = Match{State: Excepted}
			continue
		}
		e := entryOf(*f)
		best, bestD := -1, math.Inf(1)
		for _, k := range b.byID[identity(&e)] {
			if used[k] {
				continue
			}
			d, ok := spanDistance(&b.Entries[k], &e)
			if ok && d < bestD {
				best, bestD = k, d
			}
		}
		if best < 0 {
			continue // New
		}
		used[best] = true
		m := Match{State: Unchanged, Entry: &b.Entries[best]}
		if muchWorse(m.Entry, f) {
			m.State = Worse
		}
		matches[i] = m
	}
	for k := range b.Entries {
		if !used[k] {
			stale = append(stale, b.Entries[k])
		}
	}
	return matches, stale
}

// spanDistance is the larger move of a span end between the recorded
// entry and the finding's entry, and whether both ends lie within the
// tolerance. Entries without a span match only each other, at distance 0.
func spanDistance(rec, cur *Entry) (float64, bool) {
	if rec.FromStation == nil || cur.FromStation == nil {
		return 0, rec.FromStation == nil && cur.FromStation == nil
	}
	tol := max(MinSpanTolerance, SpanTolerance*math.Abs(*rec.ToStation-*rec.FromStation))
	d := max(math.Abs(*cur.FromStation-*rec.FromStation), math.Abs(*cur.ToStation-*rec.ToStation))
	return d, d <= tol+1e-9
}

// muchWorse reports whether f lies past its limit by more than 1 +
// WorseShare times the recorded entry's shortfall. A shortfall that was
// zero (a value just at its limit) counts as worse once it exceeds one
// per cent of the limit.
func muchWorse(rec *Entry, f *rules.Finding) bool {
	if rec.Value == nil || !f.HasValue || !numfmt.Finite(f.Value, f.Limit) {
		return false
	}
	was := math.Abs(*rec.Value - *rec.Limit)
	now := math.Abs(f.Value - f.Limit)
	floor := 0.01 * math.Abs(f.Limit)
	return now > was*(1+WorseShare) && now-was > floor
}

// Shortfall is how far the recorded value lies past its limit, for
// messages; ok is false when the entry has no value.
func (e *Entry) Shortfall() (float64, bool) {
	if e.Value == nil || e.Limit == nil {
		return 0, false
	}
	return math.Abs(*e.Value - *e.Limit), true
}

// Of is a baseline recording findings in memory, as Write would record
// them (excepted findings are left out), for comparing two runs such as
// two revisions of a model.
func Of(findings []rules.Finding) *Baseline {
	b := &Baseline{byID: map[string][]int{}}
	for _, f := range findings {
		if f.Excepted {
			continue
		}
		e := entryOf(f)
		b.byID[identity(&e)] = append(b.byID[identity(&e)], len(b.Entries))
		b.Entries = append(b.Entries, e)
	}
	return b
}

// Records reports whether entry e is the one Of or Write records for f.
func Records(e *Entry, f *rules.Finding) bool {
	c := entryOf(*f)
	if identity(&c) != identity(e) {
		return false
	}
	d, ok := spanDistance(e, &c)
	return ok && d == 0
}
