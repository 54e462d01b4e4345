package main

import (
	"bytes"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"github.com/stretchr/testify/require"
	"golang.org/x/tools/txtar"
)

var update = flag.Bool("update", false, "rewrite the stdout and stderr sections of the CLI scripts with the actual output")

// A CLI script (testdata/scripts/*.txtar) is one invocation of chanlint,
// run in-process in a fresh directory:
//
//	# free text
//	env NAME=VALUE            environment variable seen by the command
//	copy SRC DST              copy a file or tree of the repository into the work directory
//	cd DIR                    working directory, relative to the work directory
//	tty stdout|stderr         make the command see that stream as a terminal
//	chanlint ARGS...          the command line (single or double quotes group words)
//	exit N                    the expected exit code
//	-- stdout --              exact expected standard output (-update rewrites it)
//	-- stderr --              exact expected standard error (-update rewrites it)
//	-- stdout.grep --         regular expressions, one per line, each matching some line
//	-- stderr.grep --         the same for standard error
//	-- stdout.nogrep --       regular expressions no line may match
//	-- any/other/file --      a file written into the work directory
type script struct {
	env     map[string]string
	copies  [][2]string
	cd      string
	tty     map[string]bool
	args    []string
	exit    int
	expect  map[string]string // stdout, stderr, *.grep, *.nogrep
	files   []txtar.File
	archive *txtar.Archive
}

var expectSections = map[string]bool{
	"stdout": true, "stderr": true,
	"stdout.grep": true, "stderr.grep": true,
	"stdout.nogrep": true, "stderr.nogrep": true,
}

func parseScript(t *testing.T, path string) *script {
	t.Helper()
	ar, err := txtar.ParseFile(path)
	require.NoError(t, err)
	s := &script{env: map[string]string{}, tty: map[string]bool{}, expect: map[string]string{}, exit: -1, archive: ar}
	for n, line := range strings.Split(string(ar.Comment), "\n") {
		line = strings.TrimSpace(line)
		if line == "" || strings.HasPrefix(line, "#") {
			continue
		}
		words, err := splitWords(line)
		require.NoError(t, err, "%s:%d", path, n+1)
		switch words[0] {
		case "env":
			for _, kv := range words[1:] {
				k, v, ok := strings.Cut(kv, "=")
				require.True(t, ok, "%s:%d: env wants NAME=VALUE", path, n+1)
				s.env[k] = v
			}
		case "copy":
			require.Len(t, words, 3, "%s:%d: copy SRC DST", path, n+1)
			s.copies = append(s.copies, [2]string{words[1], words[2]})
		case "cd":
			require.Len(t, words, 2, "%s:%d: cd DIR", path, n+1)
			s.cd = words[1]
		case "tty":
			for _, w := range words[1:] {
				require.Contains(t, []string{"stdout", "stderr"}, w, "%s:%d", path, n+1)
				s.tty[w] = true
			}
		case "chanlint":
			s.args = words[1:]
		case "exit":
			require.Len(t, words, 2, "%s:%d: exit N", path, n+1)
			s.exit, err = strconv.Atoi(words[1])
			require.NoError(t, err)
		default:
			t.Fatalf("%s:%d: unknown directive %q", path, n+1, words[0])
		}
	}
	require.NotNil(t, s.args, "%s: no chanlint command line", path)
	require.GreaterOrEqual(t, s.exit, 0, "%s: no exit line", path)
	for _, f := range ar.Files {
		if expectSections[f.Name] {
			s.expect[f.Name] = string(f.Data)
		} else {
			s.files = append(s.files, f)
		}
	}
	return s
}

// splitWords splits a command line on blanks; single or double quotes group
// words (no escapes inside).
func splitWords(line string) ([]string, error) {
	var words []string
	var cur strings.Builder
	inWord := false
	quote := rune(0)
	for _, r := range line {
		switch {
		case quote != 0:
			if r == quote {
				quote = 0
			} else {
				cur.WriteRune(r)
			}
		case r == '\'' || r == '"':
			quote, inWord = r, true
		case r == ' ' || r == '\t':
			if inWord {
				words = append(words, cur.String())
				cur.Reset()
				inWord = false
			}
		default:
			cur.WriteRune(r)
			inWord = true
		}
	}
	if quote != 0 {
		return nil, fmt.Errorf("unclosed quote in %q", line)
	}
	if inWord {
		words = append(words, cur.String())
	}
	return words, nil
}

// repoDir is the repository root, two levels above this package.
func repoDir(t testing.TB) string {
	t.Helper()
	wd, err := os.Getwd()
	require.NoError(t, err)
	return filepath.Join(wd, "..", "..")
}

// copyTree copies a file or directory from src to dst.
func copyTree(t testing.TB, src, dst string) {
	t.Helper()
	err := filepath.WalkDir(src, func(p string, d os.DirEntry, err error) error {
		if err != nil {
			return err
		}
		rel, err := filepath.Rel(src, p)
		if err != nil {
			return err
		}
		target := filepath.Join(dst, rel)
		if d.IsDir() {
			return os.MkdirAll(target, 0o755)
		}
		data, err := os.ReadFile(p)
		if err != nil {
			return err
		}
		if err := os.MkdirAll(filepath.Dir(target), 0o755); err != nil {
			return err
		}
		return os.WriteFile(target, data, 0o644)
	})
	require.NoError(t, err)
}

// runOpts tune an in-process run.
type runOpts struct {
	env                  map[string]string
	jobs                 int // 0: the default
	stdoutTTY, stderrTTY bool
	stdin                string // standard input; none when empty
}

// runIn runs chanlint in-process in dir.
func runIn(dir string, o runOpts, args ...string) (int, string, string) {
	var stdout, stderr bytes.Buffer
	a := newApp(&stdout, &stderr, dir, func(k string) string { return o.env[k] })
	if o.jobs > 0 {
		a.defaultJobs = o.jobs
	}
	a.stdoutTTY, a.stderrTTY = o.stdoutTTY, o.stderrTTY
	if o.stdin != "" {
		a.stdin = strings.NewReader(o.stdin)
	}
	code := a.run(args)
	return code, stdout.String(), stderr.String()
}

func TestScripts(t *testing.T) {
	t.Parallel()
	paths, err := filepath.Glob(filepath.Join("testdata", "scripts", "*.txtar"))
	require.NoError(t, err)
	require.NotEmpty(t, paths)
	for _, path := range paths {
		name := strings.TrimSuffix(filepath.Base(path), ".txtar")
		t.Run(name, func(t *testing.T) {
			s := parseScript(t, path)
			work := t.TempDir()
			for _, c := range s.copies {
				copyTree(t, filepath.Join(repoDir(t), filepath.FromSlash(c[0])), filepath.Join(work, filepath.FromSlash(c[1])))
			}
			for _, f := range s.files {
				p := filepath.Join(work, filepath.FromSlash(f.Name))
				require.NoError(t, os.MkdirAll(filepath.Dir(p), 0o755))
				require.NoError(t, os.WriteFile(p, f.Data, 0o644))
			}
			dir := filepath.Join(work, filepath.FromSlash(s.cd))
			code, stdout, stderr := runIn(dir, runOpts{env: s.env, stdoutTTY: s.tty["stdout"], stderrTTY: s.tty["stderr"]}, s.args...)
			got := map[string]string{"stdout": stdout, "stderr": stderr}

			if *update {
				changed := false
				for i, f := range s.archive.Files {
					if f.Name == "stdout" || f.Name == "stderr" {
						s.archive.Files[i].Data = []byte(got[f.Name])
						changed = true
					}
				}
				if changed {
					require.NoError(t, os.WriteFile(path, txtar.Format(s.archive), 0o644))
				}
			}

			require.Equal(t, s.exit, code, "exit code\nstdout:\n%s\nstderr:\n%s", stdout, stderr)
			for _, stream := range []string{"stdout", "stderr"} {
				if want, ok := s.expect[stream]; ok && !*update {
					require.Equal(t, want, got[stream], stream)
				}
				for _, re := range lines(s.expect[stream+".grep"]) {
					require.Regexp(t, regexp.MustCompile("(?m)"+re), got[stream], "%s should match %q", stream, re)
				}
				for _, re := range lines(s.expect[stream+".nogrep"]) {
					require.NotRegexp(t, regexp.MustCompile("(?m)"+re), got[stream], "%s should not match %q", stream, re)
				}
			}
		})
	}
}

// lines returns the non-blank lines of s.
func lines(s string) []string {
	var out []string
	for _, l := range strings.Split(s, "\n") {
		if strings.TrimSpace(l) != "" {
			out = append(out, l)
		}
	}
	return out
}
