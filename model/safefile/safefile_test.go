package safefile

import (
	"os"
	"path/filepath"
	"syscall"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

func mkfifo(t *testing.T, path string) {
	t.Helper()
	if err := syscall.Mkfifo(path, 0o600); err != nil {
		t.Skipf("no FIFOs here: %v", err)
	}
}

// A FIFO with no writer would block an open for reading forever; Read
// must refuse it without opening it (the test would hang otherwise).
func TestReadRefusesFIFOAndDevice(t *testing.T) {
	dir := t.TempDir()
	fifo := filepath.Join(dir, "m.chan.hcl")
	mkfifo(t, fifo)
	_, err := Read(fifo, 1<<20)
	require.ErrorIs(t, err, ErrNotRegular)
	assert.Contains(t, err.Error(), "a FIFO")

	if _, err := os.Stat("/dev/zero"); err == nil {
		_, err := Read("/dev/zero", 1<<20)
		require.ErrorIs(t, err, ErrNotRegular)
		assert.Contains(t, err.Error(), "a device")
	}
	_, err = Read(dir, 1<<20)
	require.ErrorIs(t, err, ErrNotRegular)

	ok := filepath.Join(dir, "ok")
	require.NoError(t, os.WriteFile(ok, []byte("abc"), 0o600))
	b, err := Read(ok, 3)
	require.NoError(t, err)
	assert.Equal(t, "abc", string(b))
	_, err = Read(ok, 2)
	require.ErrorIs(t, err, ErrTooLarge)
}

func TestConfine(t *testing.T) {
	outside := t.TempDir()
	secret := filepath.Join(outside, "secret")
	require.NoError(t, os.WriteFile(secret, []byte("x"), 0o600))
	tree := t.TempDir()
	inside := filepath.Join(tree, "in")
	require.NoError(t, os.WriteFile(inside, []byte("x"), 0o600))
	out := filepath.Join(tree, "out")
	require.NoError(t, os.Symlink(secret, out))
	in := filepath.Join(tree, "alias")
	require.NoError(t, os.Symlink(inside, in))

	_, err := Confine(out, tree)
	require.ErrorIs(t, err, ErrOutside)
	assert.NotContains(t, err.Error(), outside, "the target is never named")
	real, err := Confine(in, tree)
	require.NoError(t, err)
	assert.Equal(t, "in", filepath.Base(real))
	// A plain file is fine whatever the root.
	_, err = Confine(secret, tree)
	require.NoError(t, err)
}

func TestWriteRefusesNonRegularTargetsAndKeepsOldFile(t *testing.T) {
	dir := t.TempDir()
	victim := filepath.Join(t.TempDir(), "victim")
	require.NoError(t, os.WriteFile(victim, []byte("keep"), 0o600))
	link := filepath.Join(dir, "report.html")
	require.NoError(t, os.Symlink(victim, link))
	require.ErrorIs(t, Write(link, []byte("new")), ErrNotRegular)
	b, _ := os.ReadFile(victim)
	assert.Equal(t, "keep", string(b))

	fifo := filepath.Join(dir, "fifo.html")
	mkfifo(t, fifo)
	require.ErrorIs(t, Write(fifo, []byte("new")), ErrNotRegular)

	// A group with one bad target replaces none of the others.
	good := filepath.Join(dir, "a.md")
	require.NoError(t, os.WriteFile(good, []byte("old"), 0o600))
	err := WriteAll([]File{{Path: good, Data: []byte("new")}, {Path: fifo, Data: []byte("x")}})
	require.Error(t, err)
	b, _ = os.ReadFile(good)
	assert.Equal(t, "old", string(b))

	// A write into a directory that cannot take the temporary file leaves
	// the old file intact.
	ro := t.TempDir()
	prev := filepath.Join(ro, "r.html")
	require.NoError(t, os.WriteFile(prev, []byte("old"), 0o644))
	require.NoError(t, os.Chmod(ro, 0o500))
	t.Cleanup(func() { os.Chmod(ro, 0o700) })
	if os.Geteuid() != 0 { // root writes anywhere
		require.Error(t, Write(prev, []byte("new")))
		b, _ = os.ReadFile(prev)
		assert.Equal(t, "old", string(b))
	}

	require.NoError(t, WriteAll([]File{{Path: good, Data: []byte("new")}, {Path: filepath.Join(dir, "b.svg"), Data: []byte("svg")}}))
	b, _ = os.ReadFile(good)
	assert.Equal(t, "new", string(b))
	entries, _ := os.ReadDir(dir)
	for _, e := range entries {
		assert.NotContains(t, e.Name(), ".tmp-", "no temporary file is left behind")
	}
}

// TestWritePartsInOrder: WriteParts writes its parts one after another,
// empty ones included, and a File's Parts follow its Data.
func TestWritePartsInOrder(t *testing.T) {
	dir := t.TempDir()
	p := filepath.Join(dir, "page.html")
	require.NoError(t, os.WriteFile(p, []byte("old page"), 0o644))
	require.NoError(t, WriteParts(p, [][]byte{[]byte("<head>"), nil, []byte("a"), []byte("b</html>")}))
	b, err := os.ReadFile(p)
	require.NoError(t, err)
	assert.Equal(t, "<head>ab</html>", string(b))
	require.NoError(t, WriteAll([]File{{Path: p, Data: []byte("1"), Parts: [][]byte{[]byte("2"), []byte("3")}}}))
	b, err = os.ReadFile(p)
	require.NoError(t, err)
	assert.Equal(t, "123", string(b))
}
