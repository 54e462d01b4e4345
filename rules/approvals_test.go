package rules

import (
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Under exceptions = "approved" a model's exception covers a finding only
// when a reviewer's approval matches it; an unmatched claim is listed as
// "claimed, not approved" and the finding stands; an approval that matches
// no excepted finding is reported as stale, at the approval.
func TestApprovalsModes(t *testing.T) {
	src := []byte(`approval {
  rule         = "freeboard"
  model        = "designs/hand.chan.hcl"
  reach        = "main"
  from_station = 90
  to_station   = 210
  event        = "q"
  note         = "Parapet wall under a separate contract"
  date         = "2026-11-30"
}
approval {
  rule         = "freeboard"
  model        = "hand.chan.hcl"
  reach        = "main"
  from_station = 600
  to_station   = 700
  class        = "major"
  note         = "Old approval for a reach since regraded"
  date         = "2025-01-15"
}
`)
	approvals, diags := policies.ParseApprovals("review/approvals.hcl", src)
	require.False(t, diags.HasErrors(), "%v", diags)
	require.Len(t, approvals, 2)

	m, r, res, p := freeboardCase()
	p.Exceptions = policies.Approved
	m.Exceptions = []*model.Exception{
		{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 100, ToStation: 200, Reason: "reviewed"},
		{Src: model.Src{DefRange: rng(52)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 390, ToStation: 410, Reason: "accepted by the owner"},
	}

	// No approvals at all: both claims stand unapproved.
	fs := Check(m, res, p)
	fb := byRule(fs, "freeboard")
	require.Len(t, fb, 2)
	for _, f := range fb {
		assert.False(t, f.Excepted, "a claim without an approval does not count")
	}
	claims := byRule(fs, unusedExceptionID)
	require.Len(t, claims, 2)
	for _, c := range claims {
		assert.Equal(t, policies.Info, c.Severity)
		assert.Contains(t, c.Message, "claimed, not approved")
		assert.Contains(t, c.Message, "none was given with --approvals")
	}

	// With the approvals: the first claim is approved, the second still
	// claimed only, and the second approval is stale.
	p.Approvals, p.ApprovalsFile = approvals, "review/approvals.hcl"
	fs = Check(m, res, p)
	fb = byRule(fs, "freeboard")
	require.Len(t, fb, 2)
	assert.True(t, fb[0].Excepted)
	assert.Equal(t, "reviewed (approved 2026-11-30: Parapet wall under a separate contract)", fb[0].ExceptionReason)
	assert.False(t, fb[1].Excepted, "no approval covers station 400")
	others := byRule(fs, unusedExceptionID)
	require.Len(t, others, 2)
	var claimed, stale *Finding
	for i := range others {
		switch others[i].Severity {
		case policies.Info:
			claimed = &others[i]
		case policies.Warning:
			stale = &others[i]
		}
	}
	require.NotNil(t, claimed)
	require.NotNil(t, stale)
	assert.Contains(t, claimed.Message, `claimed, not approved: the exception for rule "freeboard" on reach "main" covers the freeboard finding at station 400 m`)
	assert.Contains(t, claimed.Message, "no approval in review/approvals.hcl matches it")
	assert.Equal(t, "review/approvals.hcl", stale.File())
	assert.Equal(t, 11, stale.Range.Start.Line)
	assert.Contains(t, stale.Message, "stale approval")

	// The approval must match the event: another event's claim is not
	// approved.
	p.Approvals[0].Event = "q100"
	fs = Check(m, res, p)
	assert.False(t, byRule(fs, "freeboard")[0].Excepted)

	// Report mode ignores approvals: every claim counts.
	p.Exceptions = "report"
	fs = Check(m, res, p)
	for _, f := range byRule(fs, "freeboard") {
		assert.True(t, f.Excepted)
	}
	assert.Empty(t, byRule(fs, unusedExceptionID))
}

// A storm-class approval matches the events of that class.
func TestApprovalByClass(t *testing.T) {
	m, r, res, p := freeboardCase()
	m.Events[0].Class = "major"
	p.Exceptions = policies.Approved
	m.Exceptions = []*model.Exception{{Src: model.Src{DefRange: rng(50)}, Rule: "freeboard", ReachName: "main", Reach: r, FromStation: 0, ToStation: 1000, Reason: "reviewed"}}
	p.Approvals = []policies.Approval{{Rule: "freeboard", Model: "hand.chan.hcl", Reach: "main", FromStation: 0, ToStation: 1000, Class: "major", Note: "n", Date: "2026-01-01"}}
	for _, f := range byRule(Check(m, res, p), "freeboard") {
		assert.True(t, f.Excepted)
	}
	p.Approvals[0].Class = "minor"
	for _, f := range byRule(Check(m, res, p), "freeboard") {
		assert.False(t, f.Excepted)
	}
}

func TestApprovalsDiagnostics(t *testing.T) {
	for _, c := range []struct{ src, summary string }{
		{`approval {
  rule = "freeboard"
}`, "Missing required argument"},
		{`approval {
  rule = "freeboard"
  model = "m.chan.hcl"
  reach = "r"
  from_station = 10
  to_station = 5
  note = "n"
  date = "2026-01-01"
}`, "Invalid station span"},
		{`approval {
  rule = "freeboard"
  model = "m.chan.hcl"
  reach = "r"
  from_station = 0
  to_station = 5
  event = "q"
  class = "major"
  note = "n"
  date = "30/11/2026"
}`, "Both event and class"},
		{`approval {
  rule = "freeboard"
  model = "m.chan.hcl"
  reach = "r"
  from_station = 0
  to_station = 5
  note = "n"
  date = "30/11/2026"
}`, "Invalid date"},
		{`approval {
  rule = "freeboard"
  model = "m.chan.hcl"
  reach = "r"
  from_station = 0
  to_station = 5
  note = "${file("/etc/passwd")}"
  date = "2026-01-01"
}`, "Function calls not allowed"},
	} {
		a, diags := policies.ParseApprovals("a.hcl", []byte(c.src))
		assert.Nil(t, a)
		require.True(t, diags.HasErrors(), c.summary)
		found := false
		for _, d := range diags {
			found = found || d.Summary == c.summary
		}
		assert.True(t, found, "want %q in %v", c.summary, diags)
	}
}
