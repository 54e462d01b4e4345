package policies_test

import (
	"fmt"
	"os"
	"path/filepath"
	"testing"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/policies"
	"github.com/chanlint/chanlint/rules"
	"github.com/hashicorp/hcl/v2"
	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
	"gonum.org/v1/gonum/floats/scalar"
)

func TestExtendsChildReplacesParentBlock(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"shared/base.policy.hcl": `policy "base" {
  units      = "si"
  reference  = "Base manual"
  exceptions = "deny"
  freeboard {
    minimum  = 0.5
    fraction = 0.25
    events   = ["q100"]
  }
  min_velocity {
    limit  = 0.6
    events = ["q10"]
  }
  jump_containment {}
}`,
		"team/child.policy.hcl": `policy "child" {
  units   = "si"
  extends = "../shared/base.policy.hcl"
  freeboard {
    minimum = 0.3
  }
  min_velocity { enabled = false }
  jump_type { avoid = [[2.5, 4.5]] }
}`,
	})
	path := filepath.Join(dir, "team", "child.policy.hcl")
	p, diags := rules.Language().NewLoader(dir).Load(path)
	require.Empty(t, diags)

	assert.Equal(t, "child", p.Name)
	assert.Equal(t, "Base manual", p.Reference, "inherited when the child does not write it")
	assert.Equal(t, "deny", p.Exceptions, "inherited")
	parentFile := filepath.ToSlash(filepath.Join(dir, "team", "../shared/base.policy.hcl"))
	assert.Equal(t, []string{filepath.ToSlash(path), parentFile}, p.Chain)
	assert.Equal(t, filepath.ToSlash(path), p.File)

	fb := p.Rules["freeboard"]
	assert.Equal(t, 0.3, fb.Number("minimum"))
	assert.Equal(t, 0.0, fb.Number("fraction"), "the child's block replaces the parent's entirely")
	assert.Nil(t, fb.Events, "the parent's events do not leak into the child's block")
	assert.Equal(t, filepath.ToSlash(path), fb.File)

	assert.NotContains(t, p.Rules, "min_velocity", "enabled = false removes the parent's block")
	require.Contains(t, p.Rules, "jump_containment")
	assert.Equal(t, parentFile, p.Rules["jump_containment"].File, "an inherited block points at the parent")
	assert.Equal(t, 14, p.Rules["jump_containment"].DefRange.Start.Line)
	assert.Contains(t, p.Rules, "jump_type")
}

func TestExtendsChildOverridesTopLevel(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"base.policy.hcl": `policy "base" {
  units      = "si"
  reference  = "Base manual"
  exceptions = "deny"
}`,
		"child.policy.hcl": `policy "child" {
  units      = "si"
  extends    = "base.policy.hcl"
  reference  = "Child manual"
  exceptions = "report"
}`,
	})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "child.policy.hcl"))
	require.Empty(t, diags)
	assert.Equal(t, "Child manual", p.Reference)
	assert.Equal(t, "report", p.Exceptions)
}

// A parent in US units under a child in SI: the effective policy is in SI.
func TestExtendsConvertsParentUnits(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"us.policy.hcl": `policy "county" {
  units = "us"
  freeboard {
    minimum  = 1.0
    fraction = 0.2
  }
  max_velocity { limit = { concrete = 20.0, default = 3.0 } }
  shear_stress { limit = 1.0 }
  superelevation { minimum = 0.5 }
  froude_band { avoid = [[0.86, 1.13]] }
}`,
		"si.policy.hcl": `policy "site" {
  units   = "si"
  extends = "us.policy.hcl"
  min_velocity {
    limit  = 0.6
    events = ["q10"]
  }
}`,
	})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "si.policy.hcl"))
	require.Empty(t, diags)
	assert.Equal(t, model.SI, p.Units)
	const tol = 1e-12 // a product of two doubles: rounding only
	// Source: 1 ft = 0.3048 m exactly (international yard and pound agreement, 1959).
	assert.True(t, scalar.EqualWithinAbsOrRel(p.Rules["freeboard"].Number("minimum"), 0.3048, tol, tol))
	assert.Equal(t, 0.2, p.Rules["freeboard"].Number("fraction"), "a fraction has no units")
	v, _ := p.Rules["max_velocity"].Table("limit").For("concrete")
	assert.True(t, scalar.EqualWithinAbsOrRel(v, 6.096, tol, tol)) // Source: 20 ft/s × 0.3048 (exact definition)
	v, _ = p.Rules["max_velocity"].Table("limit").For("grass")
	assert.True(t, scalar.EqualWithinAbsOrRel(v, 0.9144, tol, tol)) // Source: 3 ft/s × 0.3048 (exact definition)
	v, _ = p.Rules["shear_stress"].Table("limit").For("earth")
	// Source: NIST SP 811 (2008) Appendix B: 1 lbf/ft² = 4.788026 E+01 Pa.
	assert.InDelta(t, 47.88026, v, 5e-6)
	assert.True(t, scalar.EqualWithinAbsOrRel(p.Rules["superelevation"].Number("minimum"), 0.1524, tol, tol))
	assert.Equal(t, []policies.Band{{0.86, 1.13}}, p.Rules["froude_band"].Bands("avoid"), "Froude numbers have no units")
	v, _ = p.Rules["min_velocity"].Table("limit").For("")
	assert.Equal(t, 0.6, v, "the child's own numbers are not converted")
}

func TestExtendsPack(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"county.policy.hcl": `policy "county" {
  units   = "us"
  extends = "baseline"
  min_velocity {
    limit         = { sand = null, default = 2.2 }
    return_period = [null, 2]
  }
}`,
	})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "county.policy.hcl"))
	require.Empty(t, diags)
	assert.Equal(t, model.US, p.Units)
	assert.Equal(t, []string{filepath.ToSlash(filepath.Join(dir, "county.policy.hcl")), "pack:baseline"}, p.Chain)
	assert.Equal(t, "pack:baseline", p.Rules["freeboard"].File)
	// Source: 0.3 m / 0.3048 m/ft (exact definition of the foot).
	assert.InDelta(t, 0.3/0.3048, p.Rules["freeboard"].Number("minimum"), 1e-12)
	assert.Len(t, p.Rules, len(rules.Language().Criteria())-len(manualRules)+1, "the baseline's rules and the child's min_velocity")
}

func TestExtendsPackPrefix(t *testing.T) {
	p, diags, _ := loadSource(t, `policy "x" {
  units   = "si"
  extends = "pack:strict"
}`)
	require.Empty(t, diags)
	assert.Equal(t, "pack:strict", p.Chain[1])
}

func TestExtendsOutsideRepository(t *testing.T) {
	outer := writeTree(t, map[string]string{
		"outside.policy.hcl": `policy "o" { units = "si" }`,
	})
	repo := writeTree(t, map[string]string{
		"sub/p.policy.hcl": `policy "p" {
  units   = "si"
  extends = "../../outside.policy.hcl"
}`,
	})
	// Put the outer file where ../../ from sub/ lands: beside the repo.
	require.NoError(t, os.WriteFile(filepath.Join(filepath.Dir(repo), "outside.policy.hcl"),
		[]byte(`policy "o" { units = "si" }`), 0o644))
	require.NoError(t, os.Symlink(filepath.Join(outer, "outside.policy.hcl"), filepath.Join(repo, "link.policy.hcl")))
	require.NoError(t, os.WriteFile(filepath.Join(repo, "via-link.policy.hcl"), []byte(`policy "v" {
  units   = "si"
  extends = "link.policy.hcl"
}`), 0o644))

	for _, tc := range []struct{ file, marker string }{
		{"sub/p.policy.hcl", `"../../outside.policy.hcl"`},
		{"via-link.policy.hcl", `"link.policy.hcl"`},
	} {
		t.Run(tc.file, func(t *testing.T) {
			path := filepath.Join(repo, filepath.FromSlash(tc.file))
			src, err := os.ReadFile(path)
			require.NoError(t, err)
			p, diags := rules.Language().NewLoader(repo).Load(path)
			require.Len(t, diags, 1)
			assert.Nil(t, p)
			assert.Equal(t, "Extends leaves the repository", diags[0].Summary)
			start, end := span(t, string(src), tc.marker)
			assert.Equal(t, start.Line, diags[0].Subject.Start.Line)
			assert.Equal(t, start.Column, diags[0].Subject.Start.Column)
			assert.Equal(t, end.Column, diags[0].Subject.End.Column)
		})
	}
}

func TestSymlinkInsideRepositoryIsFine(t *testing.T) {
	repo := writeTree(t, map[string]string{
		"real/base.policy.hcl": `policy "b" {
  units = "si"
  jump_containment {}
}`,
		"p.policy.hcl": `policy "p" {
  units   = "si"
  extends = "base.policy.hcl"
}`,
	})
	require.NoError(t, os.Symlink(filepath.Join(repo, "real", "base.policy.hcl"), filepath.Join(repo, "base.policy.hcl")))
	p, diags := rules.Language().NewLoader(repo).Load(filepath.Join(repo, "p.policy.hcl"))
	require.Empty(t, diags)
	assert.Contains(t, p.Rules, "jump_containment")
}

func TestEmptyRootConfinesToTheFilesDirectory(t *testing.T) {
	repo := writeTree(t, map[string]string{
		"base.policy.hcl": `policy "b" { units = "si" }`,
		"sub/p.policy.hcl": `policy "p" {
  units   = "si"
  extends = "../base.policy.hcl"
}`,
	})
	_, diags := rules.Language().NewLoader("").Load(filepath.Join(repo, "sub", "p.policy.hcl"))
	require.Len(t, diags, 1)
	assert.Equal(t, "Extends leaves the repository", diags[0].Summary)
	_, diags = rules.Language().NewLoader(repo).Load(filepath.Join(repo, "sub", "p.policy.hcl"))
	assert.Empty(t, diags)
}

func TestExtendsCycle(t *testing.T) {
	bSrc := `policy "b" {
  units   = "si"
  extends = "a.policy.hcl"
}`
	dir := writeTree(t, map[string]string{
		"a.policy.hcl": `policy "a" {
  units   = "si"
  extends = "b.policy.hcl"
}`,
		"b.policy.hcl": bSrc,
		"self.policy.hcl": `policy "self" {
  units   = "si"
  extends = "self.policy.hcl"
}`,
	})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "a.policy.hcl"))
	assert.Nil(t, p)
	require.Len(t, diags, 1)
	d := diags[0]
	assert.Equal(t, "Cycle in extends", d.Summary)
	assert.Equal(t, filepath.ToSlash(filepath.Join(dir, "b.policy.hcl")), d.Subject.Filename, "reported where the chain closes")
	start, end := span(t, bSrc, `"a.policy.hcl"`)
	assert.Equal(t, start.Line, d.Subject.Start.Line)
	assert.Equal(t, start.Column, d.Subject.Start.Column)
	assert.Equal(t, end.Column, d.Subject.End.Column)
	assert.Contains(t, d.Detail, "a.policy.hcl → ")

	_, diags = rules.Language().NewLoader(dir).Load(filepath.Join(dir, "self.policy.hcl"))
	require.Len(t, diags, 1)
	assert.Equal(t, "Cycle in extends", diags[0].Summary)
}

func TestExtendsDepthIsBounded(t *testing.T) {
	files := map[string]string{}
	n := policies.MaxExtendsDepth + 4
	for i := 0; i < n; i++ {
		ext := ""
		if i+1 < n {
			ext = fmt.Sprintf("\n  extends = \"p%d.policy.hcl\"", i+1)
		}
		files[fmt.Sprintf("p%d.policy.hcl", i)] = fmt.Sprintf("policy \"p%d\" {\n  units = \"si\"%s\n}\n", i, ext)
	}
	dir := writeTree(t, files)
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "p0.policy.hcl"))
	assert.Nil(t, p)
	require.Len(t, diags, 1)
	assert.Equal(t, "Extends chain too long", diags[0].Summary)
	assert.Equal(t, 3, diags[0].Subject.Start.Line)

	// A chain of exactly MaxExtendsDepth policies loads.
	ok := writeTree(t, map[string]string{})
	for i := 0; i < policies.MaxExtendsDepth; i++ {
		ext := ""
		if i+1 < policies.MaxExtendsDepth {
			ext = fmt.Sprintf("\n  extends = \"p%d.policy.hcl\"", i+1)
		}
		require.NoError(t, os.WriteFile(filepath.Join(ok, fmt.Sprintf("p%d.policy.hcl", i)),
			[]byte(fmt.Sprintf("policy \"p%d\" {\n  units = \"si\"%s\n}\n", i, ext)), 0o644))
	}
	p, diags = rules.Language().NewLoader(ok).Load(filepath.Join(ok, "p0.policy.hcl"))
	require.Empty(t, diags)
	assert.Len(t, p.Chain, policies.MaxExtendsDepth)
}

func TestMissingFiles(t *testing.T) {
	dir := writeTree(t, map[string]string{})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "nope.policy.hcl"))
	assert.Nil(t, p)
	require.Len(t, diags, 1)
	assert.Equal(t, "Policy file not found", diags[0].Summary)
	assert.Contains(t, diags[0].Detail, "nope.policy.hcl")

	_, diags = rules.Language().NewLoader(dir).Load(dir)
	require.Len(t, diags, 1)
	assert.Contains(t, diags[0].Detail, "not a regular file")
}

func TestOversizedFile(t *testing.T) {
	dir := writeTree(t, map[string]string{})
	path := filepath.Join(dir, "big.policy.hcl")
	big := make([]byte, policies.MaxFileSize+1)
	for i := range big {
		big[i] = '#'
	}
	require.NoError(t, os.WriteFile(path, big, 0o644))
	_, diags := rules.Language().NewLoader(dir).Load(path)
	require.Len(t, diags, 1)
	assert.Contains(t, diags[0].Detail, "larger than the limit")
}

// Errors of a parent are reported with the child's own.
func TestParentErrorsAreReported(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"base.policy.hcl": `policy "b" {
  units = "si"
  freeboard { minimum = -1 }
}`,
		"child.policy.hcl": `policy "c" {
  units   = "si"
  extends = "base.policy.hcl"
  jump_type { avoid = [[3, 2]] }
}`,
	})
	p, diags := rules.Language().NewLoader(dir).Load(filepath.Join(dir, "child.policy.hcl"))
	assert.Nil(t, p)
	require.Len(t, diags, 2)
	files := []string{diags[0].Subject.Filename, diags[1].Subject.Filename}
	assert.ElementsMatch(t, []string{
		filepath.ToSlash(filepath.Join(dir, "child.policy.hcl")),
		filepath.ToSlash(filepath.Join(dir, "base.policy.hcl")),
	}, files)
}

func TestResolve(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"strict": `policy "file-named-strict" { units = "us" }`,
		"my.policy.hcl": `policy "mine" {
  units = "us"
  extends = "strict"
}`,
	})
	l := rules.Language().NewLoader(dir)
	p, diags := l.Resolve("strict")
	require.Empty(t, diags)
	assert.Equal(t, "pack:strict", p.File)
	assert.Equal(t, []string{"pack:strict", "pack:baseline"}, p.Chain)
	assert.Contains(t, l.Files(), "pack:strict", "parsed packs are kept for snippets")
	assert.Contains(t, l.Files(), "pack:baseline")

	p, diags = l.Resolve(filepath.Join(dir, "strict"))
	require.Empty(t, diags)
	assert.Equal(t, "file-named-strict", p.Name)

	p, diags = l.Resolve(filepath.Join(dir, "my.policy.hcl"))
	require.Empty(t, diags)
	assert.Equal(t, "pack:strict", p.Chain[1], "extends prefers the pack name")
	assert.Contains(t, l.Files(), filepath.ToSlash(filepath.Join(dir, "my.policy.hcl")))

	_, diags = l.Resolve("stirct")
	require.Len(t, diags, 1)
	assert.Equal(t, "Unknown policy", diags[0].Summary)
	assert.Contains(t, diags[0].Detail, `Did you mean "strict"?`)
}

// A second load of a broken file reports its problems again.
func TestReloadKeepsDiagnostics(t *testing.T) {
	dir := writeTree(t, map[string]string{"p.policy.hcl": `policy "p" {
  units = "si"
  freeboard { minimum = }
}`})
	l := rules.Language().NewLoader(dir)
	_, first := l.Load(filepath.Join(dir, "p.policy.hcl"))
	_, second := l.Load(filepath.Join(dir, "p.policy.hcl"))
	require.True(t, first.HasErrors())
	assert.Equal(t, first.Error(), second.Error())
}

func TestLoaderIsSafeForConcurrentUse(t *testing.T) {
	l := rules.Language().NewLoader("")
	done := make(chan hcl.Diagnostics)
	for i := 0; i < 8; i++ {
		go func() {
			_, d := l.Resolve(policies.PackNames()[i%len(policies.PackNames())])
			done <- d
		}()
	}
	for i := 0; i < 8; i++ {
		assert.Empty(t, <-done)
	}
}

// The example policies under testdata/policies load cleanly.
func TestTestdataPolicies(t *testing.T) {
	root, err := filepath.Abs("..")
	require.NoError(t, err)
	matches, err := filepath.Glob(filepath.Join(root, "testdata", "policies", "*"+policies.Suffix))
	require.NoError(t, err)
	require.NotEmpty(t, matches)
	l := rules.Language().NewLoader(root)
	for _, m := range matches {
		p, diags := l.Load(m)
		assert.Empty(t, diags, m)
		assert.NotNil(t, p, m)
	}
}

func TestLoadSource(t *testing.T) {
	dir := writeTree(t, map[string]string{
		"base.policy.hcl": `policy "b" {
  units = "si"
  jump_containment {}
}`,
	})
	l := rules.Language().NewLoader(dir)
	name := filepath.Join(dir, "buffer.policy.hcl") // does not exist on disk
	p, diags := l.LoadSource(name, []byte(`policy "buf" {
  units   = "si"
  extends = "base.policy.hcl"
}`))
	require.Empty(t, diags)
	assert.Equal(t, "buf", p.Name)
	assert.Contains(t, p.Rules, "jump_containment")
	assert.Contains(t, l.Files(), filepath.ToSlash(name))

	_, diags = rules.Language().NewLoader(dir).LoadSource(filepath.Join(dir, "empty.policy.hcl"), nil)
	require.Len(t, diags, 1)
	assert.Equal(t, "Missing policy block", diags[0].Summary)
}

// A Loader sees a file's new text: an editor may load one buffer many times.
func TestLoadSourceSeesNewText(t *testing.T) {
	l := rules.Language().NewLoader("")
	name := filepath.Join(t.TempDir(), "buf.policy.hcl")
	_, diags := l.LoadSource(name, []byte(`policy "a" { units = "metric" }`))
	require.True(t, diags.HasErrors())
	p, diags := l.LoadSource(name, []byte(`policy "a" { units = "si" }`))
	require.Empty(t, diags)
	assert.Equal(t, model.SI, p.Units)
	assert.Equal(t, []byte(`policy "a" { units = "si" }`), l.Files()[filepath.ToSlash(name)].Bytes)
}
