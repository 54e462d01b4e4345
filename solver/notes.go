package solver

import (
	"fmt"
	"sort"

	"github.com/chanlint/chanlint/model/numfmt"
)

// num formats a number for a note: four significant figures by the rule
// of every output (numfmt.Sig), never NaN or Inf in the text.
func num(v float64) string { return numfmt.Sig(v, 4) }

// noteControl is a NoteControl at a station.
func noteControl(station float64, format string, args ...any) Note {
	return Note{Kind: NoteControl, Station: station, Message: fmt.Sprintf(format, args...)}
}

// noteInfo is a NoteInfo at a station.
func noteInfo(station float64, format string, args ...any) Note {
	return Note{Kind: NoteInfo, Station: station, Message: fmt.Sprintf(format, args...)}
}

// fallbackNotes turns each run of neighbouring points where critical
// depth was taken for want of a solution of the energy equation into one
// NoteCriticalFallback at the run's first station.
func fallbackNotes(final []pt, pieces []piece, dst []Note) []Note {
	for i := 0; i < len(final); {
		if !final[i].fallback {
			i++
			continue
		}
		j := i
		for j+1 < len(final) && final[j+1].fallback {
			j++
		}
		branch := "subcritical"
		if final[i].super {
			branch = "supercritical"
		}
		a, b := final[i].x, final[j].x
		p := &pieces[final[i].piece]
		taken := "critical depth " + num(p.yc)
		if num(p.yc) != num(p.ycF) {
			taken = fmt.Sprintf("the depth of least specific energy %s (critical depth %s)", num(p.yc), num(p.ycF))
		}
		var msg string
		if b > a {
			msg = fmt.Sprintf("the energy equation has no %s solution from station %s to %s: %s is taken",
				branch, num(a), num(b), taken)
		} else {
			msg = fmt.Sprintf("the energy equation has no %s solution at station %s: %s is taken",
				branch, num(a), taken)
		}
		dst = append(dst, Note{Kind: NoteCriticalFallback, Station: a, Message: msg})
		i = j + 1
	}
	return dst
}

// sortNotes orders notes by station, keeping the order of equal stations.
func sortNotes(n []Note) {
	sort.SliceStable(n, func(i, j int) bool { return n[i].Station < n[j].Station })
}
