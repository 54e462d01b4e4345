package hclkit

import (
	"strings"
	"testing"

	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// TestScanBounds: the bounds a language sets are the ones applied, with
// the diagnostic at the element beyond them.
func TestScanBounds(t *testing.T) {
	b := ScanBounds{Items: 3, TopItems: 4, Invalid: 2}
	ok := []byte("x = [1, 2, 3]\ny = 1\n")
	assert.Empty(t, CheckNesting("f.hcl", ok, b))
	off, problem, tokens := Scan(ok, b)
	assert.Equal(t, ScanOK, problem)
	assert.Zero(t, off)
	assert.Positive(t, tokens)

	over := "x = [1, 2, 3, 4, 5]\n" // a bound on separators: the fourth comma is one too many
	diags := CheckNesting("f.hcl", []byte(over), b)
	require.Len(t, diags, 1)
	assert.Equal(t, "Too many items", diags[0].Summary)
	assert.Contains(t, diags[0].Detail, "more than 3 elements (the top level more than 4 blocks")
	at := strings.Index(over, ", 5")
	assert.Equal(t, hcl.Pos{Line: 1, Column: at + 1, Byte: at}, diags[0].Subject.Start, "at the separator past the bound")

	_, problem, _ = Scan([]byte(strings.Repeat("a = 1\n", 5)), b)
	assert.Equal(t, ScanItems, problem, "the top level has its own bound")
	_, problem, _ = Scan([]byte(strings.Repeat("a = 1\n", 5)), ScanBounds{Items: 3, TopItems: 10, Invalid: 2})
	assert.Equal(t, ScanOK, problem)

	_, problem, _ = Scan([]byte("x = \"\\q\\q\\q\"\n"), b)
	assert.Equal(t, ScanInvalid, problem)
	_, problem, _ = Scan([]byte(strings.Repeat("[", MaxNesting+2)), b)
	assert.Equal(t, ScanNested, problem)
}

func TestPosAt(t *testing.T) {
	src := []byte("ab\ncé d")
	assert.Equal(t, hcl.Pos{Line: 1, Column: 1, Byte: 0}, PosAt(src, 0))
	assert.Equal(t, hcl.Pos{Line: 2, Column: 1, Byte: 3}, PosAt(src, 3))
	assert.Equal(t, hcl.Pos{Line: 2, Column: 3, Byte: 6}, PosAt(src, 6), "é is one column")
}
