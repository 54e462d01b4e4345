package model

import (
	"fmt"
	"testing"

	"github.com/stretchr/testify/assert"
	"pgregory.net/rapid"
)

// TestQuotedMatchesFmt requires quoted to format every name as fmt's %q
// verb does, the form the messages used before.
//
// Source: common practice (no published source): the Go fmt package
// defines %q; it is the independent reference here.
func TestQuotedMatchesFmt(t *testing.T) {
	for _, name := range []string{"main", "", `a"b`, `a\b`, "tab\there", "Übergang", "x\x7f", "~ok~"} {
		assert.Equal(t, fmt.Sprintf("reach %q", name), quoted("reach", name))
	}
	rapid.Check(t, func(t *rapid.T) {
		name := rapid.String().Draw(t, "name")
		if got, want := quoted("gate", name), fmt.Sprintf("gate %q", name); got != want {
			t.Fatalf("quoted(%q) = %s, want %s", name, got, want)
		}
	})
}
