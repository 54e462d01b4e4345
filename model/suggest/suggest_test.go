package suggest

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
)

func TestDistance(t *testing.T) {
	// Source: the classic Levenshtein example, kitten → sitting is 3
	// (common practice, no published source).
	assert.Equal(t, 3, Distance("kitten", "sitting"))
	assert.Equal(t, 0, Distance(strings.Repeat("a", 70), strings.Repeat("a", 70)))
	assert.Equal(t, 64, Distance(strings.Repeat("a", 70), strings.Repeat("b", 70)))
	assert.Equal(t, 1, Distance("bäsin", "basin"), "by runes, not bytes")
}

func TestClosest(t *testing.T) {
	words := []string{"freeboard", "froude_band", "jump_type"}
	assert.Equal(t, "freeboard", Closest("frebaord", words, 3, nil))
	assert.Equal(t, "jump_type", Closest("Jump-Type", words, 2, nil), "case is ignored")
	assert.Equal(t, "", Closest("culvert_inlet", words, 4, nil))
	budget := 10
	assert.Equal(t, "", Closest("freebord", words, 3, &budget), "the budget stops the search")
	assert.Negative(t, budget)
}

func TestPrefix(t *testing.T) {
	assert.Equal(t, "warning", Prefix("WARN", []string{"error", "warning"}))
	assert.Equal(t, "", Prefix("wa", []string{"warning"}))
}
