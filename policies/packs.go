package policies

import (
	"embed"
	"path"
	"slices"
	"strings"

	"github.com/hashicorp/hcl/v2"
)

//go:embed packs/*.policy.hcl
var packFS embed.FS

// packSources maps each built-in pack name to its source text.
var packSources = func() map[string][]byte {
	entries, err := packFS.ReadDir("packs")
	if err != nil {
		panic("policies: embedded packs missing: " + err.Error()) // build-time content
	}
	m := map[string][]byte{}
	for _, e := range entries {
		src, err := packFS.ReadFile(path.Join("packs", e.Name()))
		if err != nil {
			panic("policies: embedded pack unreadable: " + err.Error())
		}
		m[strings.TrimSuffix(e.Name(), Suffix)] = src
	}
	return m
}()

// PackNames returns the names of the built-in packs, sorted.
func PackNames() []string {
	names := make([]string, 0, len(packSources))
	for n := range packSources {
		names = append(names, n)
	}
	slices.Sort(names)
	return names
}

// PackSource returns the HCL text of a built-in pack (for `policy show`).
func PackSource(name string) ([]byte, bool) {
	src, ok := packSources[name]
	return slices.Clone(src), ok
}

// Pack returns the effective policy of a built-in pack, with File
// "pack:NAME". Use a Loader's Resolve to keep the parsed pack for snippets.
func (l *Language) Pack(name string) (*Policy, hcl.Diagnostics) {
	return l.NewLoader("").loadPack(name)
}
