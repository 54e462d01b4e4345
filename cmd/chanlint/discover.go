package main

import (
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"sort"
	"strings"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/safefile"
)

// configName is the per-repository policy file that `check`, `report` and
// `policy show` use when --policy is not given.
const configName = ".chanlint.hcl"

// skippedDirs are directory names never searched for models below a PATH:
// version-control metadata and vendored third-party trees. A directory
// named on the command line is always searched, whatever its name.
var skippedDirs = map[string]bool{
	".git":         true,
	".hg":          true,
	".svn":         true,
	"vendor":       true,
	"node_modules": true,
}

// modelFile is one model found by discovery.
type modelFile struct {
	abs     string // absolute path used to read the file
	display string // path printed in output: relative to cwd, forward slashes
}

// pathProblem is a PATH argument that could not be searched.
type pathProblem struct {
	display string
	err     error
}

// discover finds the model files under the given paths (default "."),
// sorted by display path and without duplicates.
//
// A PATH that is a file is checked whatever its name. A directory is
// searched recursively for files ending in model.Suffix, skipping
// skippedDirs. Symbolic links below a directory are followed only when
// their target lies inside that directory (the checked tree); a link that
// leads outside, or back into a directory already searched, is ignored.
// The same file reached twice (through a link, or two overlapping PATHs)
// is checked once, under its first name in sorted order.
func (a *app) discover(paths []string) ([]modelFile, []pathProblem) {
	if len(paths) == 0 {
		paths = []string{"."}
	}
	var (
		found    []modelFile
		problems []pathProblem
	)
	for _, p := range paths {
		abs := a.abs(p)
		info, err := os.Stat(abs)
		if err != nil {
			problems = append(problems, pathProblem{display: a.display(abs), err: describePathError(err)})
			continue
		}
		if !info.IsDir() {
			// A file named on the command line (or by a shell glob) is
			// read only when it is, or a link leads to, a regular file
			// inside its own tree; anything else is refused unopened.
			if err := confineInput(abs); err != nil {
				problems = append(problems, pathProblem{display: a.display(abs), err: err})
				continue
			}
			found = append(found, modelFile{abs: abs, display: a.display(abs)})
			continue
		}
		real, err := filepath.EvalSymlinks(abs)
		if err != nil {
			problems = append(problems, pathProblem{display: a.display(abs), err: describePathError(err)})
			continue
		}
		w := walker{app: a, root: real, visited: map[string]bool{}}
		w.walk(abs, real)
		found = append(found, w.found...)
		problems = append(problems, w.problems...)
	}
	sort.SliceStable(found, func(i, j int) bool { return found[i].display < found[j].display })
	seen := map[string]bool{}
	out := found[:0]
	for _, f := range found {
		key := f.abs
		if real, err := filepath.EvalSymlinks(f.abs); err == nil {
			key = real
		}
		if seen[key] {
			continue
		}
		seen[key] = true
		out = append(out, f)
	}
	return out, problems
}

type walker struct {
	app      *app
	root     string // real path of the directory named on the command line
	visited  map[string]bool
	found    []modelFile
	problems []pathProblem
}

// walk searches the directory dir, whose real (link-free) path is real.
func (w *walker) walk(dir, real string) {
	if w.visited[real] {
		return
	}
	w.visited[real] = true
	entries, err := os.ReadDir(dir)
	if err != nil {
		w.problems = append(w.problems, pathProblem{display: w.app.display(dir), err: describePathError(err)})
		return
	}
	for _, e := range entries {
		name := e.Name()
		p := filepath.Join(dir, name)
		switch {
		case e.Type()&fs.ModeSymlink != 0:
			target, err := filepath.EvalSymlinks(p)
			if err != nil {
				continue // dangling, or a loop
			}
			if !within(w.root, target) {
				// Say so, naming the link but not where it leads: a
				// submittal must not learn about the reviewer's files.
				if w.app.stderr != nil {
					fmt.Fprintf(w.app.stderr, "chanlint: not following %s: the link leads outside the checked directory\n", w.app.display(p))
				}
				continue
			}
			info, err := os.Stat(target)
			if err != nil {
				continue
			}
			if info.IsDir() {
				if !skippedDirs[name] {
					w.walk(p, target)
				}
			} else if info.Mode().IsRegular() && strings.HasSuffix(name, model.Suffix) {
				w.found = append(w.found, modelFile{abs: p, display: w.app.display(p)})
			}
		case e.IsDir():
			if !skippedDirs[name] {
				w.walk(p, filepath.Join(real, name))
			}
		case e.Type().IsRegular() && strings.HasSuffix(name, model.Suffix):
			w.found = append(w.found, modelFile{abs: p, display: w.app.display(p)})
		}
	}
}

// within reports whether path lies in or below dir (both clean, absolute).
func within(dir, path string) bool { return safefile.Within(dir, path) }

// inputTree is the tree a file named on the command line may be read
// from: the repository that holds it, else its own directory.
func inputTree(abs string) string {
	dir := filepath.Dir(abs)
	if root := repoRoot(dir); root != "" {
		return root
	}
	return dir
}

// confineInput refuses an input path (a model, policy or baseline named on
// the command line) that is a symbolic link leading outside its tree (see
// inputTree), or that is not a regular file: a FIFO, socket or device is
// refused here, before anything opens it. The error never names the
// link's target.
func confineInput(abs string) error {
	if _, err := safefile.Confine(abs, inputTree(abs)); err != nil {
		return describePathError(err)
	}
	info, err := os.Stat(abs)
	if err != nil {
		return describePathError(err)
	}
	if !info.Mode().IsRegular() {
		return notRegularError(info.Mode())
	}
	return nil
}

// notRegularError says what kind of non-regular file was found.
func notRegularError(m fs.FileMode) error {
	switch {
	case m.IsDir():
		return errors.New("is a directory")
	case m&fs.ModeNamedPipe != 0:
		return fmt.Errorf("is a FIFO, %w", safefile.ErrNotRegular)
	case m&fs.ModeSocket != 0:
		return fmt.Errorf("is a socket, %w", safefile.ErrNotRegular)
	case m&(fs.ModeDevice|fs.ModeCharDevice) != 0:
		return fmt.Errorf("is a device, %w", safefile.ErrNotRegular)
	}
	return safefile.ErrNotRegular
}

// describePathError shortens an *fs.PathError to its cause: the path is
// printed in front of it anyway.
func describePathError(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}

// abs resolves p against the invocation's working directory.
func (a *app) abs(p string) string {
	if filepath.IsAbs(p) {
		return filepath.Clean(p)
	}
	return filepath.Join(a.cwd, p)
}

// display is the form of an absolute path printed in output: relative to
// the working directory, with forward slashes.
func (a *app) display(abs string) string {
	rel, err := filepath.Rel(a.cwd, abs)
	if err != nil {
		return filepath.ToSlash(abs)
	}
	return filepath.ToSlash(rel)
}

// repoRoot returns the nearest directory at or above dir that holds a
// `.git` entry (a directory, or the file of a worktree), or "" when there
// is none.
func repoRoot(dir string) string {
	for d := dir; ; {
		if _, err := os.Lstat(filepath.Join(d, ".git")); err == nil {
			return d
		}
		parent := filepath.Dir(d)
		if parent == d {
			return ""
		}
		d = parent
	}
}

// findConfig looks for .chanlint.hcl in dir and then in each parent up to
// and including the repository root, and no further. Outside a repository
// only dir itself is looked at, so a stray file in a home directory never
// changes a check. It returns "" when there is none, and an error for one
// that cannot be used: not a regular file, or a symbolic link that leads
// outside the repository (outside dir when there is no repository).
func findConfig(dir string) (string, error) {
	root := repoRoot(dir)
	tree := root
	if tree == "" {
		tree = dir
	}
	for d := dir; ; {
		p := filepath.Join(d, configName)
		if info, err := os.Lstat(p); err == nil && !info.IsDir() {
			if _, err := safefile.Confine(p, tree); err != nil {
				return p, describePathError(err)
			}
			if st, err := os.Stat(p); err == nil && !st.Mode().IsRegular() {
				return p, notRegularError(st.Mode())
			}
			return p, nil
		}
		if root == "" || d == root {
			return "", nil
		}
		parent := filepath.Dir(d)
		if parent == d {
			return "", nil
		}
		d = parent
	}
}
