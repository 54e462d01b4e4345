// Package safefile opens and writes the files of a run without trusting
// what is at their paths. A submittal can put a symbolic link, a FIFO, a
// socket or a device where a model, a policy or a baseline is expected;
// reading one must neither hang, nor read a file outside the checked tree,
// nor replace anything but a regular file.
package safefile

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
)

// Sentinel errors. The messages read well after "cannot read PATH: ".
var (
	// ErrNotRegular is a path that is a directory, FIFO, socket or device.
	ErrNotRegular = errors.New("not a regular file")
	// ErrTooLarge is a file beyond the size limit of its reader.
	ErrTooLarge = errors.New("file too large")
	// ErrOutside is a symbolic link that leads outside the tree it may
	// read from.
	ErrOutside = errors.New("a symbolic link that leads outside the checked directory")
	// ErrInput is a write target that is one of the run's inputs.
	ErrInput = errors.New("the target is an input of this run")
)

// kind names the type of a non-regular file for messages.
func kind(m fs.FileMode) string {
	switch {
	case m.IsDir():
		return "a directory"
	case m&fs.ModeNamedPipe != 0:
		return "a FIFO"
	case m&fs.ModeSocket != 0:
		return "a socket"
	case m&fs.ModeDevice != 0, m&fs.ModeCharDevice != 0:
		return "a device"
	case m&fs.ModeSymlink != 0:
		return "a symbolic link"
	}
	return "not a regular file"
}

// notRegular wraps ErrNotRegular with the kind of file found.
func notRegular(m fs.FileMode) error {
	if k := kind(m); k != "not a regular file" {
		return fmt.Errorf("%w: %s", ErrNotRegular, k)
	}
	return ErrNotRegular
}

// Read reads the regular file at path, at most limit bytes. Anything else
// at the path is refused before it is opened: a FIFO, socket or device is
// never opened for reading, so a read cannot block. The file is opened
// without blocking and checked again after opening, so a file swapped for
// a FIFO between the two checks is refused too. Symbolic links are
// followed; confine them with Within first where that matters.
func Read(path string, limit int64) ([]byte, error) {
	st, err := os.Stat(path)
	if err != nil {
		return nil, err
	}
	if !st.Mode().IsRegular() {
		return nil, notRegular(st.Mode())
	}
	f, err := os.OpenFile(path, os.O_RDONLY|syscall.O_NONBLOCK, 0)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	fst, err := f.Stat()
	if err != nil {
		return nil, err
	}
	if !fst.Mode().IsRegular() || !os.SameFile(st, fst) {
		return nil, notRegular(fst.Mode())
	}
	if fst.Size() > limit {
		return nil, ErrTooLarge
	}
	src, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(src)) > limit {
		return nil, ErrTooLarge
	}
	return src, nil
}

// Within reports whether path lies in or below dir (both clean, absolute).
func Within(dir, path string) bool {
	rel, err := filepath.Rel(dir, path)
	if err != nil {
		return false
	}
	return rel == "." || (rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator)))
}

// Confine checks that path, once its symbolic links are resolved, still
// lies in or below root (itself resolved). A path without links below root
// passes whatever root is; a path that names a link leading elsewhere is
// ErrOutside. It returns the resolved path.
func Confine(path, root string) (string, error) {
	real, err := filepath.EvalSymlinks(path)
	if err != nil {
		return "", err
	}
	if real == filepath.Clean(path) {
		return real, nil // no link on the way
	}
	rootReal, err := filepath.EvalSymlinks(root)
	if err != nil {
		rootReal = root
	}
	if !Within(rootReal, real) {
		return "", ErrOutside
	}
	return real, nil
}

// checkTarget refuses a write target that exists and is not a regular
// file (a symbolic link, a FIFO, a device, a directory).
func checkTarget(path string) error {
	st, err := os.Lstat(path)
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	if !st.Mode().IsRegular() {
		return fmt.Errorf("refusing to replace %s: %w", kind(st.Mode()), ErrNotRegular)
	}
	return nil
}

// File is one file of a group written by WriteAll.
type File struct {
	Path string
	Data []byte
	// Parts follow Data in the file, in order: a page assembled from
	// pieces is written without first being copied into one buffer.
	Parts [][]byte
}

// Write replaces path with data: the bytes go to a temporary file in the
// target's directory, which is then renamed into place, so that a failed
// write leaves the previous file intact. An existing target that is not a
// regular file is refused.
func Write(path string, data []byte) error {
	return WriteAll([]File{{Path: path, Data: data}})
}

// WriteParts is Write of the parts one after another.
func WriteParts(path string, parts [][]byte) error {
	return WriteAll([]File{{Path: path, Parts: parts}})
}

// WriteAll replaces a group of files together: every target is checked and
// every temporary file written before the first rename, so a failure
// before the renames changes none of them. The renames follow one another
// (a rename is atomic for one file, not for a group).
func WriteAll(files []File) error {
	for _, f := range files {
		if err := checkTarget(f.Path); err != nil {
			return err
		}
	}
	tmps := make([]string, 0, len(files))
	cleanup := func() {
		for _, t := range tmps {
			os.Remove(t)
		}
	}
	for _, f := range files {
		t, err := writeTemp(f)
		if err != nil {
			cleanup()
			return err
		}
		tmps = append(tmps, t)
	}
	for i, f := range files {
		// Check again just before the rename: the target may have been
		// replaced by a link or a FIFO while the temporary files were
		// written.
		if err := checkTarget(f.Path); err != nil {
			cleanup()
			return err
		}
		if err := os.Rename(tmps[i], f.Path); err != nil {
			cleanup()
			return err
		}
	}
	return nil
}

func writeTemp(f File) (string, error) {
	tmp, err := os.CreateTemp(filepath.Dir(f.Path), "."+filepath.Base(f.Path)+".tmp-*")
	if err != nil {
		return "", err
	}
	_, err = tmp.Write(f.Data)
	for _, p := range f.Parts {
		if err == nil {
			_, err = tmp.Write(p)
		}
	}
	if err == nil {
		err = tmp.Chmod(0o644)
	}
	if cerr := tmp.Close(); err == nil {
		err = cerr
	}
	if err != nil {
		os.Remove(tmp.Name())
		return "", err
	}
	return tmp.Name(), nil
}

// SameFile reports whether the two paths name one existing file.
func SameFile(a, b string) bool {
	sa, err := os.Stat(a)
	if err != nil {
		return false
	}
	sb, err := os.Stat(b)
	if err != nil {
		return false
	}
	return os.SameFile(sa, sb)
}
