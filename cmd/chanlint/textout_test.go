package main

import (
	"regexp"
	"strings"
	"testing"
	"unicode/utf8"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// The demo's text reads at a glance on a 120-column terminal: after the
// GNU prefix come the rule and the place (reach, event, stations), then a
// message that fits 120 columns by itself; remedies and exception reasons
// sit on continuation lines that fit too. Excepted findings never say
// "note".
func TestTextLayoutWidth(t *testing.T) {
	dir := workspace(t, 1)
	_, out, _ := runIn(dir, runOpts{}, "check", "set00/demo", "--color", "never")
	first := regexp.MustCompile(`^\S+:\d+:\d+: (error|warning|info|excepted): \[\w+\] `)
	place := regexp.MustCompile(`^((error|warning|info), )?(reach [^,]+, )?(event [^,]+, )?(stations? [0-9.–]+ m: )?`)
	findings, continuations := 0, 0
	for _, line := range strings.Split(strings.TrimSpace(out), "\n") {
		if strings.HasPrefix(line, "    ") {
			continuations++
			assert.LessOrEqual(t, utf8.RuneCountInString(line), textWidth, "continuation line: %s", line)
			continue
		}
		loc := first.FindStringIndex(line)
		if loc == nil {
			continue
		}
		findings++
		rest := line[loc[1]:]
		require.NotEmpty(t, place.FindString(rest), "place first: %s", line)
		msg := rest[len(place.FindString(rest)):]
		assert.LessOrEqual(t, utf8.RuneCountInString(msg), textWidth, "message: %s", msg)
		assert.NotContains(t, line, ": note:")
	}
	assert.Greater(t, findings, 5)
	assert.GreaterOrEqual(t, continuations, findings)
}

func TestWrapWords(t *testing.T) {
	assert.Equal(t, []string{"raise the", "bank by", "0.3 m"}, wrapWords("raise the bank by 0.3 m", 9))
	assert.Equal(t, []string{"unbreakable-word", "x"}, wrapWords("unbreakable-word x", 5))
	assert.Empty(t, wrapWords("  ", 10))
}
