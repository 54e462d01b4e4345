package policies_test

import (
	"math"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
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
	for _, n := range policies.PackNames() {
		src, _ := policies.PackSource(n)
		f.Add(src)
	}
	examples, err := filepath.Glob(filepath.Join("..", "testdata", "policies", "*"+policies.Suffix))
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
		l := rules.Language().NewLoader(repo)
		p, diags := l.LoadSource(name, src)
		if (p == nil) != diags.HasErrors() {
			t.Fatalf("policy %v with errors %v: %s", p != nil, diags.HasErrors(), diags.Error())
		}
		for _, d := range diags {
			if d.Subject == nil {
				t.Fatalf("diagnostic without a position: %s: %s", d.Summary, d.Detail)
			}
			if f := d.Subject.Filename; !strings.HasPrefix(f, policies.PackPrefix) && !strings.HasPrefix(filepath.FromSlash(f), repo) {
				t.Fatalf("diagnostic in %q, outside the repository", f)
			}
		}
		if p == nil {
			return
		}
		for _, c := range p.Chain {
			if !strings.HasPrefix(c, policies.PackPrefix) && !strings.HasPrefix(filepath.FromSlash(c), repo+string(filepath.Separator)) {
				t.Fatalf("chain %v leaves the repository", p.Chain)
			}
		}
		for _, u := range []model.Units{p.Units, model.SI, model.US} {
			checkPolicyValues(t, p.In(u))
		}
		text := policies.Format(p)
		back, bdiags := rules.Language().NewLoader(repo).LoadSource(filepath.Join(repo, "back.policy.hcl"), text)
		if bdiags.HasErrors() || back == nil {
			t.Fatalf("Format's text does not load back: %s\n%s", bdiags.Error(), text)
		}
		samePolicy(t, p, back, text)
	})
}

func checkPolicyValues(t *testing.T, p *policies.Policy) {
	t.Helper()
	for id, rc := range p.Rules {
		if s := rules.Language().Spec(id); s == nil || s.AlwaysOn {
			t.Fatalf("rule %q is not configurable", id)
		}
		if rc.Severity.Rank() == 0 {
			t.Fatalf("%s: unknown severity %q", id, rc.Severity)
		}
		var nums []float64
		for _, v := range rc.Values {
			nums = append(nums, v.Number, v.Table.Default)
			for _, x := range v.Table.Values {
				nums = append(nums, x)
			}
			for _, b := range v.Bands {
				nums = append(nums, b.Low, b.High)
			}
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
func samePolicy(t *testing.T, want, got *policies.Policy, text []byte) {
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
		if len(w.Values) != len(g.Values) {
			fail(id + " settings")
		}
		for name, wv := range w.Values {
			gv, ok := g.Values[name]
			if !ok || !near(wv.Number, gv.Number) {
				fail(id + " " + name)
			}
			wl, gl := wv.Table, gv.Table
			if wl.HasDefault != gl.HasDefault || !near(wl.Default, gl.Default) || len(wl.Values) != len(gl.Values) {
				fail(id + " " + name + " table")
			}
			for k, v := range wl.Values {
				x, ok := gl.Values[k]
				if !ok || !near(v, x) {
					fail(id + " " + name + " of " + k)
				}
			}
			for k := range wl.NoLimit {
				if !gl.NoLimit[k] {
					fail(id + " " + name + " no-limit " + k)
				}
			}
			if len(wv.Bands) != len(gv.Bands) {
				fail(id + " " + name + " bands")
			}
			for i := range wv.Bands {
				if !near(wv.Bands[i].Low, gv.Bands[i].Low) || !near(wv.Bands[i].High, gv.Bands[i].High) {
					fail(id + " " + name + " band")
				}
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

// FuzzPolicyRepeated reaches large policy files: a head, a construct the
// fuzzer chooses repeated until the text reaches size bytes (up to a little
// over the policy size limit), and a tail. A policy is returned exactly
// when there is no error, every diagnostic has a position, and every
// number is finite.
//
// Run: go test ./policies -run '^$' -fuzz '^FuzzPolicyRepeated$' -fuzztime 60s
func FuzzPolicyRepeated(f *testing.F) {
	head := "policy \"x\" {\n  units = \"si\"\n"
	f.Add([]byte(head+"  max_velocity {\n    limit = {\n"), []byte("      l = 1.5\n"), []byte("      default = 3\n    }\n  }\n}\n"), uint32(policies.MaxFileSize))
	f.Add([]byte(head+"  reference = a"), []byte(".*"), []byte("\n}\n"), uint32(policies.MaxFileSize))
	f.Add([]byte(head+"  reference = 1"), []byte("+1"), []byte("\n}\n"), uint32(policies.MaxFileSize))
	f.Add([]byte(head+"  freeboard {\n    events = ["), []byte("\"q\","), []byte("]\n  }\n}\n"), uint32(policies.MaxFileSize))
	f.Add([]byte(head), []byte("  froude_band {}\n"), []byte("}\n"), uint32(1<<16))
	dir := f.TempDir()
	f.Fuzz(func(t *testing.T, h, unit, tail []byte, size uint32) {
		if len(unit) == 0 {
			return
		}
		n := int(size % uint32(policies.MaxFileSize+4096))
		var b strings.Builder
		b.Write(h)
		for b.Len()+len(unit)+len(tail) <= n {
			b.Write(unit)
		}
		b.Write(tail)
		p, diags := rules.Language().NewLoader(dir).LoadSource(filepath.Join(dir, "fuzz.policy.hcl"), []byte(b.String()))
		if (p == nil) != diags.HasErrors() {
			t.Fatalf("policy %v with errors %v", p != nil, diags.HasErrors())
		}
		for _, d := range diags {
			if d.Subject == nil {
				t.Fatalf("diagnostic without a position: %s", d.Summary)
			}
		}
		if p != nil {
			for _, u := range []model.Units{p.Units, model.SI, model.US} {
				checkPolicyValues(t, p.In(u))
			}
		}
	})
}
