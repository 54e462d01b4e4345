package sarifout

import (
	"math"
	"slices"
	"strconv"
	"unicode/utf8"

	"github.com/chanlint/chanlint/model/numfmt"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
)

// appendResult appends the result of a finding as Write lays out the
// go-sarif result of (*builder).result inside a log (encoding/json without
// empty arrays, indented by two spaces after resultIndent), without
// reflection, maps or further passes: a result is most of a large log, and encoding it through
// encoding/json cost several times the text output. TestStreamedResults
// holds the two encodings byte-identical.
func (b *builder) appendResult(dst []byte, f *rules.Finding, i int, fp string) []byte {
	e := jsonWriter{b: dst}
	e.open('{')
	e.key("partialFingerprints")
	e.open('{')
	e.key(FingerprintKey)
	e.str(fp)
	e.close('}')
	if st := b.baselineState(i); st != "" {
		e.key("baselineState")
		e.str(st)
	}
	e.key("kind")
	e.str("fail")
	e.key("level")
	e.str(Level(f.Severity))
	if f.File() != "" {
		e.key("locations")
		e.open('[')
		e.elem()
		b.appendLocation(&e, f.File(), f.Pos())
		e.close(']')
	}
	e.key("message")
	e.open('{')
	e.key("text")
	e.str(b.message(f, i))
	e.close('}')
	e.key("properties")
	appendProperties(&e, f)
	e.key("rank")
	e.raw("-1")
	if b.hasRelated(f) {
		e.key("relatedLocations")
		e.open('[')
		for i, r := range f.Related {
			if file, ok := relatedFile(f, r); ok {
				e.elem()
				b.appendLocationAs(&e, file, r.Range, i, &r.Label)
			}
		}
		e.close(']')
	}
	e.key("ruleId")
	e.str(f.Rule)
	e.key("ruleIndex")
	e.int(b.ruleIndex[f.Rule])
	if f.Excepted {
		e.key("suppressions")
		e.open('[')
		e.elem()
		e.open('{')
		e.key("justification")
		e.str(f.ExceptionReason)
		e.key("kind")
		e.str("inSource")
		if file, ok := b.exceptionFile(f); ok {
			e.key("location")
			b.appendLocation(&e, file, f.ExceptionRange)
		}
		e.key("status")
		e.str("accepted")
		e.close('}')
		e.close(']')
	}
	e.close('}')
	return e.b
}

// hasRelated reports whether f has a related place that is a location.
func (b *builder) hasRelated(f *rules.Finding) bool {
	for _, r := range f.Related {
		if _, ok := relatedFile(f, r); ok {
			return true
		}
	}
	return false
}

// appendLocation writes the physical location of a range in a file.
func (b *builder) appendLocation(e *jsonWriter, file string, r hcl.Range) {
	b.appendLocationAs(e, file, r, -1, nil)
}

// appendLocationAs writes a location with its id and, when label is not
// nil, a message (a related location), in go-sarif's field order.
func (b *builder) appendLocationAs(e *jsonWriter, file string, r hcl.Range, id int, label *string) {
	art := b.artifacts[file]
	e.open('{')
	e.key("id")
	e.int(id)
	if label != nil {
		e.key("message")
		e.open('{')
		e.key("text")
		e.str(*label)
		e.close('}')
	}
	e.key("physicalLocation")
	e.open('{')
	e.key("artifactLocation")
	e.open('{')
	e.key("index")
	e.int(art.index)
	e.key("uri")
	e.str(art.uri)
	if art.base {
		e.key("uriBaseId")
		e.str(BaseID)
	}
	e.close('}')
	if start, end, ok := b.span(file, r); ok {
		exact := start.exact && end.exact
		e.key("region")
		e.open('{')
		if exact {
			e.key("byteLength")
			e.int(r.End.Byte - r.Start.Byte)
			e.key("byteOffset")
			e.int(r.Start.Byte)
			e.key("charLength")
			e.int(end.char - start.char)
			e.key("charOffset")
			e.int(start.char)
		} else {
			e.key("byteOffset")
			e.raw("-1")
			e.key("charOffset")
			e.raw("-1")
		}
		e.key("endColumn")
		e.int(end.col)
		e.key("endLine")
		e.int(end.line)
		e.key("startColumn")
		e.int(start.col)
		e.key("startLine")
		e.int(start.line)
		e.close('}')
	}
	e.close('}')
	e.close('}')
}

// appendProperties writes the property bag of a result, keys sorted as
// encoding/json sorts a map's.
func appendProperties(e *jsonWriter, f *rules.Finding) {
	type prop struct {
		key string
		s   string
		x   float64
		num bool
	}
	var buf [8]prop
	ps := buf[:0]
	if f.Reach != "" {
		ps = append(ps, prop{key: "reach", s: f.Reach})
	}
	if f.Event != "" {
		ps = append(ps, prop{key: "event", s: f.Event})
	}
	if f.HasSpan {
		ps = append(ps, prop{key: "from_station", x: f.FromStation, num: true}, prop{key: "to_station", x: f.ToStation, num: true})
	}
	if f.HasValue {
		ps = append(ps, prop{key: "value", x: f.Value, num: true}, prop{key: "limit", x: f.Limit, num: true})
	}
	if f.Reference != "" {
		ps = append(ps, prop{key: "reference", s: f.Reference})
	}
	ps = append(ps, prop{key: "severity", s: string(f.Severity)})
	slices.SortFunc(ps, func(a, b prop) int {
		if a.key < b.key {
			return -1
		}
		return 1
	})
	e.open('{')
	for _, p := range ps {
		e.key(p.key)
		if p.num {
			e.float(p.x)
		} else {
			e.str(p.s)
		}
	}
	e.close('}')
}

// jsonWriter appends indented JSON as json.MarshalIndent(v, resultIndent,
// "  ") lays it out: a member or element on its own line, an empty object
// or array as "{}" or "[]".
type jsonWriter struct {
	b      []byte
	filled []bool // per open container: it has a member already
}

func (e *jsonWriter) newline() {
	e.b = append(e.b, '\n')
	e.b = append(e.b, resultIndent...)
	for range len(e.filled) {
		e.b = append(e.b, ' ', ' ')
	}
}

// open starts an object or array.
func (e *jsonWriter) open(c byte) {
	e.b = append(e.b, c)
	e.filled = append(e.filled, false)
}

// close ends the innermost container.
func (e *jsonWriter) close(c byte) {
	filled := e.filled[len(e.filled)-1]
	e.filled = e.filled[:len(e.filled)-1]
	if filled {
		e.newline()
	}
	e.b = append(e.b, c)
}

// elem starts an element of the innermost array.
func (e *jsonWriter) elem() {
	i := len(e.filled) - 1
	if e.filled[i] {
		e.b = append(e.b, ',')
	}
	e.filled[i] = true
	e.newline()
}

// key starts a member of the innermost object.
func (e *jsonWriter) key(k string) {
	e.elem()
	e.str(k)
	e.b = append(e.b, ':', ' ')
}

func (e *jsonWriter) raw(s string) { e.b = append(e.b, s...) }

func (e *jsonWriter) int(n int) { e.b = strconv.AppendInt(e.b, int64(n), 10) }

// float writes a number as encoding/json does, but a negative zero as 0;
// a non-finite one, which no finding should hold, as null (see finite).
func (e *jsonWriter) float(x float64) {
	if !numfmt.Finite(x) {
		e.raw("null")
		return
	}
	if x == 0 {
		x = 0 // no output prints "-0"
	}
	f := byte('f')
	if a := math.Abs(x); a != 0 && (a < 1e-6 || a >= 1e21) {
		f = 'e'
	}
	n0 := len(e.b)
	e.b = strconv.AppendFloat(e.b, x, f, -1, 64)
	if f == 'e' {
		// e-09 → e-9, as encoding/json writes it.
		if n := len(e.b); n-n0 >= 4 && e.b[n-4] == 'e' && e.b[n-3] == '-' && e.b[n-2] == '0' {
			e.b[n-2] = e.b[n-1]
			e.b = e.b[:n-1]
		}
	}
}

const hexDigits = "0123456789abcdef"

// str writes a JSON string escaped as encoding/json escapes it by default:
// quotes, backslashes and control characters, '<', '>' and '&' (HTML-safe),
// U+2028 and U+2029, and each invalid UTF-8 byte as U+FFFD.
func (e *jsonWriter) str(s string) {
	b := append(e.b, '"')
	start := 0
	for i := 0; i < len(s); {
		if c := s[i]; c < utf8.RuneSelf {
			if c >= 0x20 && c != '"' && c != '\\' && c != '<' && c != '>' && c != '&' {
				i++
				continue
			}
			b = append(b, s[start:i]...)
			switch c {
			case '\\', '"':
				b = append(b, '\\', c)
			case '\b':
				b = append(b, '\\', 'b')
			case '\f':
				b = append(b, '\\', 'f')
			case '\n':
				b = append(b, '\\', 'n')
			case '\r':
				b = append(b, '\\', 'r')
			case '\t':
				b = append(b, '\\', 't')
			default:
				b = append(b, '\\', 'u', '0', '0', hexDigits[c>>4], hexDigits[c&0xF])
			}
			i++
			start = i
			continue
		}
		r, size := utf8.DecodeRuneInString(s[i:])
		if r == utf8.RuneError && size == 1 {
			b = append(b, s[start:i]...)
			b = append(b, `\ufffd`...)
			i += size
			start = i
			continue
		}
		if r == '\u2028' || r == '\u2029' {
			b = append(b, s[start:i]...)
			b = append(b, '\\', 'u', '2', '0', '2', hexDigits[r&0xF])
			i += size
			start = i
			continue
		}
		i += size
	}
	b = append(b, s[start:]...)
	e.b = append(b, '"')
}
