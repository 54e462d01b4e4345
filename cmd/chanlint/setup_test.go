package main

import (
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
)

// readmeBlock returns the fenced code block that follows the marker
// `<!-- setup-test: NAME -->` in README.md.
func readmeBlock(t *testing.T, readme, name string) string {
	t.Helper()
	re := regexp.MustCompile("(?s)<!-- setup-test: " + regexp.QuoteMeta(name) + " -->\n```[a-z]*\n(.*?)```")
	m := re.FindStringSubmatch(readme)
	require.NotNil(t, m, "README.md has no setup-test block %q", name)
	return m[1]
}

// TestReadmeSetups walks the README's install and pre-commit steps on a
// fresh clone of this repository, as a new user would: the install block
// builds chanlint from the clone; a repository of models made with
// `chanlint init --config` then runs both documented pre-commit setups
// (the hook of this repository pinned to the clone's commit, and the
// `language: system` variant), which pass, and fail once a change of
// .chanlint.hcl alone makes the model fail. The GitHub URL of the README
// is replaced by the local clone, and the example commit by its own.
//
// It needs git and pre-commit (Debian's package; .ci/run installs it): it
// is skipped without them, except under CI, where it fails instead.
func TestReadmeSetups(t *testing.T) {
	t.Parallel()
	if testing.Short() || raceEnabled {
		// It runs no goroutines of chanlint's own: the plain run covers it.
		t.Skip("walks the README's setups with git, go install and pre-commit; skipped with -short and -race")
	}
	for _, tool := range []string{"git", "pre-commit", "go"} {
		if _, err := exec.LookPath(tool); err != nil {
			if os.Getenv("CI") != "" {
				t.Fatalf("%s is not installed, and CI must walk the README's setups (.ci/run installs Debian's pre-commit)", tool)
			}
			t.Skipf("%s is not installed: the README's install and pre-commit steps were NOT walked (apt-get install pre-commit)", tool)
		}
	}
	readme, err := os.ReadFile(filepath.Join(repoDir(t), "README.md"))
	require.NoError(t, err)
	const url = "https://github.com/chanlint/chanlint"
	tmp := t.TempDir()
	bin := filepath.Join(tmp, "bin")
	// The module cache of this build is shared, so that pre-commit's
	// `go install` of the hook does not download the dependencies again.
	modcache, err := exec.Command("go", "env", "GOMODCACHE").Output()
	require.NoError(t, err)
	env := append(os.Environ(),
		"GOMODCACHE="+strings.TrimSpace(string(modcache)),
		"GOBIN="+bin, "PATH="+bin+string(os.PathListSeparator)+os.Getenv("PATH"),
		// Builds from the clone, which lies in a new directory every
		// run, hit the build cache only when paths are trimmed: a warm
		// run then links instead of compiling chanlint again (14 s of
		// CPU down to 5 s). The two links (the install, the hook) leave
		// out the DWARF tables, which no step reads: 1.6 s of CPU each
		// down to 1.0 s.
		"GOFLAGS="+strings.TrimSpace(os.Getenv("GOFLAGS")+" -trimpath -ldflags=-w"),
		// One store for both variants: pre-commit locks it.
		"PRE_COMMIT_HOME="+filepath.Join(tmp, "pre-commit-cache"),
		"GIT_CONFIG_GLOBAL="+filepath.Join(tmp, "gitconfig"), "GIT_CONFIG_NOSYSTEM=1",
		"GIT_AUTHOR_NAME=chanlint test", "GIT_AUTHOR_EMAIL=test@example.invalid",
		"GIT_COMMITTER_NAME=chanlint test", "GIT_COMMITTER_EMAIL=test@example.invalid",
	)
	sh := func(t *testing.T, dir, script string, wantOK bool) string {
		t.Helper()
		cmd := exec.Command("bash", "-euo", "pipefail", "-c", script)
		cmd.Dir, cmd.Env = dir, env
		out, err := cmd.CombinedOutput()
		if wantOK {
			require.NoError(t, err, "in %s:\n%s\n---\n%s", dir, script, out)
		} else {
			require.Error(t, err, "in %s:\n%s\n---\n%s", dir, script, out)
		}
		return string(out)
	}

	// Install, from a fresh clone (the repository as committed), reached
	// under a path that ends in "chanlint" as the URL does.
	src := filepath.Join(tmp, "src", "chanlint")
	require.NoError(t, os.MkdirAll(filepath.Dir(src), 0o755))
	require.NoError(t, os.Symlink(repoDir(t), src))
	install := strings.ReplaceAll(readmeBlock(t, string(readme), "install"), url, src)
	require.Contains(t, install, "go install ./cmd/chanlint")
	out := sh(t, tmp, install, true)
	require.Contains(t, out, "chanlint ")
	clone := filepath.Join(tmp, "chanlint")
	commit := strings.TrimSpace(sh(t, clone, "git rev-parse HEAD", true))

	sha := regexp.MustCompile(`\b[0-9a-f]{40}\b`)
	for _, variant := range []string{"pre-commit", "pre-commit-system"} {
		t.Run(variant, func(t *testing.T) {
			// They wait on git, pre-commit and the hook's build more
			// than they compute: side by side, each in a repository of
			// models of its own.
			t.Parallel()
			design := filepath.Join(tmp, "design-"+variant)
			require.NoError(t, os.Mkdir(design, 0o755))
			sh(t, design, "git init -q . && chanlint init --config baseline && git add -A && git commit -qm models", true)
			cfg := readmeBlock(t, string(readme), variant)
			cfg = strings.ReplaceAll(cfg, url, clone)
			cfg = sha.ReplaceAllString(cfg, commit)
			require.NoError(t, os.WriteFile(filepath.Join(design, ".pre-commit-config.yaml"), []byte(cfg), 0o644))
			sh(t, design, "git checkout -q HEAD -- .chanlint.hcl && git add -A && git commit -qm config --allow-empty", true)
			out := sh(t, design, "pre-commit run --all-files", true)
			require.Regexp(t, `chanlint\.+Passed`, out)

			// Only the policy changes, and the unchanged model now fails.
			policy, err := os.ReadFile(filepath.Join(design, ".chanlint.hcl"))
			require.NoError(t, err)
			stricter := strings.Replace(string(policy), "  # freeboard {\n  #   minimum  = 0.5\n  #   fraction = 0.25\n  # }",
				"  freeboard {\n    minimum  = 0.9\n  }", 1)
			require.NotEqual(t, string(policy), stricter)
			require.NoError(t, os.WriteFile(filepath.Join(design, ".chanlint.hcl"), []byte(stricter), 0o644))
			out = sh(t, design, "git add .chanlint.hcl && pre-commit run --files .chanlint.hcl", false)
			require.Regexp(t, `chanlint\.+Failed`, out)
			require.Contains(t, out, "error: [freeboard]")
		})
	}
}
