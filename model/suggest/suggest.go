// Package suggest finds the word a misspelt one probably meant, for the
// "did you mean" hints of every diagnostic: model, policy, rule ids and
// the command line. Distances are Levenshtein distances between the
// lower-cased words, by runes, computed by github.com/agext/levenshtein
// (the library HCL uses for its own hints).
package suggest

import (
	"strings"
	"unicode/utf8"

	"github.com/agext/levenshtein"
)

// maxRunes bounds the words compared: a longer word is only ever equal or
// far from another, so it is not compared letter by letter.
const maxRunes = 64

// Closest returns the first candidate nearest to got whose distance is at
// most maxDist, or "" when there is none. budget, when not nil, bounds the
// work on hostile input: each comparison costs the product of the two
// lengths in runes (each at most maxRunes), and the search stops when the
// budget runs out.
func Closest(got string, candidates []string, maxDist int, budget *int) string {
	low := strings.ToLower(got)
	n := utf8.RuneCountInString(low)
	best, bestD := "", maxDist+1
	for _, c := range candidates {
		// The distance is at least the difference in length, a cheap
		// filter that skips most names of a large model.
		m := utf8.RuneCountInString(c)
		if n-m >= bestD || m-n >= bestD {
			continue
		}
		if budget != nil {
			if *budget -= min(n, maxRunes) * min(m, maxRunes); *budget < 0 {
				break
			}
		}
		if d := Distance(low, strings.ToLower(c)); d < bestD {
			best, bestD = c, d
		}
	}
	return best
}

// Distance is the Levenshtein distance between a and b by runes; words
// longer than 64 runes are 0 apart when equal and 64 apart otherwise.
func Distance(a, b string) int {
	if utf8.RuneCountInString(a) > maxRunes || utf8.RuneCountInString(b) > maxRunes {
		if a == b {
			return 0
		}
		return maxRunes
	}
	return levenshtein.Distance(a, b, nil)
}

// Prefix returns the first candidate that got abbreviates (at least three
// letters, any case), or "".
func Prefix(got string, candidates []string) string {
	if utf8.RuneCountInString(got) < 3 {
		return ""
	}
	low := strings.ToLower(got)
	for _, c := range candidates {
		if strings.HasPrefix(strings.ToLower(c), low) {
			return c
		}
	}
	return ""
}
