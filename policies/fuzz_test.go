package policies

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/hashicorp/hcl/v2"
	"gonum.org/v1/gonum/floats/scalar"
)

// FuzzPolicy feeds arbitrary bytes to the policy loader as the top policy
// of a small repository that also holds the example policies of
// testdata/policies (so `extends` between files is exercised) and, outside
// the repository, a policy that must never be reached. It is seeded with
// the built-in packs and the example policies. Properties:
//   - no panic; a policy exactly when there is no error;
//   - every diagnostic of the fuzzed file has a position in a file of the
//     repository or a pack;
//   - the chain holds only packs and files inside the repository;
//   - every number is finite, every severity known, in both unit systems;
//   - Format's text loads back to the same settings (within the 5e-6
//     relative rounding Format documents).
//
// Run: go test ./policies -run '^$' -fuzz '^FuzzPolicy$' -fuzztime 4m
func FuzzPolicy(f *testing.F) {
	for _, n := range PackNames() {
		src, _ := PackSource(n)
		f.Add(src)
	}
	examples, err := filepath.Glob(filepath.Join("..", "testdata", "policies", "*"+Suffix))
	if err != nil || len(examples) == 0 {
		f.Fatalf("no example policies: %v", err)
	}
	outer, err := filepath.EvalSymlinks(f.TempDir())
	if err != nil {
		f.Fatal(err)
	}
	repo := filepath.Join(outer, "repo")
	if err := os.MkdirAll(repo, 0o755); err != nil {
		f.Fatal(err)
	}
	for _, e := range examples {
		src, err := os.ReadFile(e)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(src)
		if err := os.WriteFile(filepath.Join(repo, filepath.Base(e)), src, 0o644); err != nil {
			f.Fatal(err)
		}
	}
	// Reachable only by leaving the repository.
	outside := "policy \"outside\" {\n  units = \"si\"\n  jump_containment {}\n}\n"
	if err := os.WriteFile(filepath.Join(outer, "outside.policy.hcl"), []byte(outside), 0o644); err != nil {
		f.Fatal(err)
	}
	if err := os.Symlink(filepath.Join(outer, "outside.policy.hcl"), filepath.Join(repo, "link.policy.hcl")); err != nil {
		f.Fatal(err)
	}
	f.Add([]byte("policy \"x\" {\n  units = \"us\"\n  extends = \"../outside.policy.hcl\"\n}\n"))
	f.Add([]byte("policy \"x\" {\n  units = \"us\"\n  extends = \"link.policy.hcl\"\n}\n"))
	f.Add([]byte("policy \"x\" {\n  units = \"si\"\n  extends = \"reviewer.policy.hcl\"\n  max_velocity { limit = { grass = 1.2, default = null } }\n}\n"))

	name := filepath.Join(repo, "fuzz.policy.hcl")
	f.Fuzz(func(t *testing.T, src []byte) {
		l := NewLoader(repo)
		p, diags := l.LoadSource(name, src)
		if (p == nil) != diags.HasErrors() {
			t.Fatalf("policy %v with errors %v: %s", p != nil, diags.HasErrors(), diags.Error())
		}
		for _, d := range diags {
			if d.Subject == nil {
				t.Fatalf("diagnostic without a position: %s: %s", d.Summary, d.Detail)
			}
			if f := d.Subject.Filename; !strings.HasPrefix(f, packPrefix) && !strings.HasPrefix(filepath.FromSlash(f), repo) {
				t.Fatalf("diagnostic in %q, outside the repository", f)
			}
		}
		if p == nil {
			return
		}
		for _, c := range p.Chain {
			if !strings.HasPrefix(c, packPrefix) && !strings.HasPrefix(filepath.FromSlash(c), repo+string(filepath.Separator)) {
				t.Fatalf("chain %v leaves the repository", p.Chain)
			}
		}
		for _, u := range []model.Units{p.Units, model.SI, model.US} {
			checkPolicyValues(t, p.In(u))
		}
		text := Format(p)
		back, bdiags := NewLoader(repo).LoadSource(filepath.Join(repo, "back.policy.hcl"), text)
		if bdiags.HasErrors() || back == nil {
			t.Fatalf("Format's text does not load back: %s\n%s", bdiags.Error(), text)
		}
		samePolicy(t, p, back, text)
	})
}

func checkPolicyValues(t *testing.T, p *Policy) {
	t.Helper()
	for id, rc := range p.Rules {
		if specFor(id) == nil {
			t.Fatalf("rule %q is not configurable", id)
		}
		if rc.Severity.Rank() == 0 {
			t.Fatalf("%s: unknown severity %q", id, rc.Severity)
		}
		nums := []float64{rc.Minimum, rc.Fraction, rc.Limit.Default, rc.SubcriticalCoefficient, rc.SupercriticalCoefficient}
		for _, v := range rc.Limit.Values {
			nums = append(nums, v)
		}
		for _, b := range rc.Avoid {
			nums = append(nums, b.Low, b.High)
		}
		for _, v := range nums {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				t.Fatalf("%s in %s: non-finite number %v", id, p.Units, v)
			}
		}
		for _, e := range rc.Events {
			if e == "" {
				t.Fatalf("%s: empty event name", id)
			}
		}
	}
}

// samePolicy compares two policies' settings; Format rounds to six
// significant digits, at most 5e-6 relative.
func samePolicy(t *testing.T, want, got *Policy, text []byte) {
	t.Helper()
	const rel = 5e-6
	near := func(a, b float64) bool { return scalar.EqualWithinAbsOrRel(a, b, 1e-12, rel) }
	fail := func(what string) { t.Fatalf("round trip changes %s:\n%s", what, text) }
	if want.Name != got.Name || want.Units != got.Units || want.Reference != got.Reference || want.Exceptions != got.Exceptions {
		fail("the header")
	}
	if len(want.Rules) != len(got.Rules) {
		fail("the rule set")
	}
	for id, w := range want.Rules {
		g := got.Rules[id]
		if g == nil {
			fail(id)
		}
		if w.Severity != g.Severity || !slices.Equal(w.Events, g.Events) || (w.Events == nil) != (g.Events == nil) {
			fail(id + " severity or events")
		}
		if !near(w.Minimum, g.Minimum) || !near(w.Fraction, g.Fraction) ||
			!near(w.SubcriticalCoefficient, g.SubcriticalCoefficient) || !near(w.SupercriticalCoefficient, g.SupercriticalCoefficient) {
			fail(id + " numbers")
		}
		if w.Limit.HasDefault != g.Limit.HasDefault || !near(w.Limit.Default, g.Limit.Default) || len(w.Limit.Values) != len(g.Limit.Values) {
			fail(id + " limit")
		}
		for k, v := range w.Limit.Values {
			gv, ok := g.Limit.Values[k]
			if !ok || !near(v, gv) {
				fail(id + " limit of " + k)
			}
		}
		for k := range w.Limit.NoLimit {
			if !g.Limit.NoLimit[k] {
				fail(id + " no-limit " + k)
			}
		}
		if len(w.Avoid) != len(g.Avoid) {
			fail(id + " avoid")
		}
		for i := range w.Avoid {
			if !near(w.Avoid[i].Low, g.Avoid[i].Low) || !near(w.Avoid[i].High, g.Avoid[i].High) {
				fail(id + " avoid band")
			}
		}
	}
}

// diagSummaries lists the summaries of diagnostics (for messages).
func diagSummaries(diags hcl.Diagnostics) []string {
	var out []string
	for _, d := range diags {
		out = append(out, d.Summary)
	}
	return out
}
