package checklist

import (
	"bytes"
	"encoding/csv"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Source: FIPS 180-2, Appendix B.1: SHA-256("abc").
func TestHash(t *testing.T) {
	assert.Equal(t, "ba7816bf8f01cfea414140de5dae2223b00361a396177a9cb410ff61f20015ad", Hash([]byte("abc")))
}

// Every CSV cell that a spreadsheet would evaluate is neutralised, and
// the file parses back to the same number of fields per record.
func TestCSVNeutralisesFormulas(t *testing.T) {
	d := &Doc{Policy: "=cmd|' /C calc'!A0", Models: []Model{{File: "m.chan.hcl", Rows: []Row{
		{Reach: "r", Event: "e", Criterion: "freeboard", Status: Fail, Detail: "+1+1", Reference: "@SUM(A1)"},
		{Reach: "r", Event: "e", Criterion: "capacity", Status: Pass, Detail: "-2"},
	}}}}
	var b bytes.Buffer
	require.NoError(t, WriteCSV(&b, d))
	recs, err := csv.NewReader(&b).ReadAll()
	require.NoError(t, err)
	require.Len(t, recs, 4)
	for _, rec := range recs {
		require.Len(t, rec, len(CSVHeader))
		for _, cell := range rec {
			if cell != "" {
				assert.NotContains(t, "=+-@", cell[:1], "cell %q", cell)
			}
		}
	}
}
