package checklist

import (
	"bytes"
	"encoding/csv"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/chanlint/chanlint/solver"
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

// Under exceptions = "approved" a failure the model claims an exception
// for says so; an excepted finding is "excepted (approved)" there and
// "excepted (claimed)" under report.
func TestRowsClaimedAndExcepted(t *testing.T) {
	sec := &model.Section{Name: "s", Shape: model.Rectangle, BottomWidth: 3, Height: 1, Lining: "concrete"}
	r := &model.Reach{Name: "main", Section: sec, Length: 100}
	ev := &model.Event{Name: "q"}
	m := &model.Model{File: "m.chan.hcl", Units: model.SI, Reaches: []*model.Reach{r}, Events: []*model.Event{ev},
		Exceptions: []*model.Exception{{Rule: "freeboard", ReachName: "main", FromStation: 0, ToStation: 100, Reason: "r"}}}
	p := &policies.Policy{Units: model.SI, Exceptions: policies.Approved, Rules: map[string]*policies.RuleConfig{
		"freeboard": {Rule: "freeboard"}}}
	f := rules.Finding{Rule: "freeboard", Reach: "main", Event: "q", HasSpan: true, FromStation: 10, ToStation: 20, Message: "low"}
	rows := Build(m, &solver.Result{}, p, []rules.Finding{f})
	require.Len(t, rows, 2) // capacity, freeboard
	assert.Equal(t, Pass, rows[0].Status)
	assert.Equal(t, Fail, rows[1].Status)
	assert.Equal(t, "claimed, not approved: low", rows[1].Detail)
	f.Excepted, f.ExceptionReason = true, "r (approved 2026-01-01: ok)"
	rows = Build(m, &solver.Result{}, p, []rules.Finding{f})
	assert.Equal(t, ExceptedApproved, rows[1].Status)
	p.Exceptions = "report"
	rows = Build(m, &solver.Result{}, p, []rules.Finding{f})
	assert.Equal(t, ExceptedClaimed, rows[1].Status)
}
