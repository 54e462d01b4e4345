package policies

import (
	"bytes"
	"errors"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/hclkit"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/hashicorp/hcl/v2"
	"github.com/hashicorp/hcl/v2/hclsyntax"
)

// Suffix is the file-name suffix of policy files.
const Suffix = ".policy.hcl"

// MaxFileSize bounds the size of a policy file (a built-in pack is about
// 6 KiB), which also bounds the work of parsing a hostile one.
const MaxFileSize = 256 << 10

// packPrefix starts the File of a built-in pack: "pack:NAME".
const packPrefix = "pack:"

// Loader reads policy files and built-in packs and resolves `extends`. It
// keeps every parsed file for rendering diagnostics with source snippets.
// A Loader is safe for concurrent use.
type Loader struct {
	lang   *Language
	mu     sync.Mutex
	root   string                // as given to NewLoader
	parsed map[string]parsedFile // by file name
}

// parsedFile is one parse, kept while the text stays the same.
type parsedFile struct {
	src   []byte
	file  *hcl.File // nil when the text was refused before parsing
	diags hcl.Diagnostics
}

// NewLoader returns a loader whose `extends` paths may not leave root, the
// repository root (after symbolic links are resolved). With root "", each
// file given to Load or Resolve confines its own chain to its directory.
func (l *Language) NewLoader(root string) *Loader {
	return &Loader{lang: l, root: root, parsed: map[string]parsedFile{}}
}

// Files returns the files parsed so far by name (a path, or "pack:NAME"),
// for hcl.NewDiagnosticTextWriter.
func (l *Loader) Files() map[string]*hcl.File {
	l.mu.Lock()
	defer l.mu.Unlock()
	out := make(map[string]*hcl.File, len(l.parsed))
	for name, p := range l.parsed {
		if p.file != nil {
			out[name] = p.file
		}
	}
	return out
}

// Resolve loads a built-in pack by name, or else a policy file by path. A
// file whose name equals a pack's is reached with a path such as "./strict".
func (l *Loader) Resolve(arg string) (*Policy, hcl.Diagnostics) {
	if name, ok := strings.CutPrefix(arg, packPrefix); ok {
		return l.loadPack(name)
	}
	if _, ok := packSources[arg]; ok {
		return l.loadPack(arg)
	}
	if _, err := os.Stat(arg); err != nil && errors.Is(err, fs.ErrNotExist) && !strings.ContainsAny(arg, `/\`) && !strings.HasSuffix(arg, ".hcl") {
		detail := fmt.Sprintf("%q is neither a built-in pack (%s) nor an existing policy file.", arg, strings.Join(PackNames(), ", ")) +
			hclkit.DidYouMean(suggestWord(arg, PackNames()))
		return nil, hcl.Diagnostics{{Severity: hcl.DiagError, Summary: "Unknown policy", Detail: detail}}
	}
	return l.Load(arg)
}

// Load reads the policy file at path and every policy it extends, and
// returns the effective policy. The policy is nil when the diagnostics hold
// an error; every problem of every file in the chain is reported.
func (l *Loader) Load(path string) (*Policy, hcl.Diagnostics) {
	l.mu.Lock()
	defer l.mu.Unlock()
	display := filepath.ToSlash(filepath.Clean(path))
	real, err := realPath(path)
	if err != nil {
		return nil, hcl.Diagnostics{readError(display, err, nil)}
	}
	return l.top(node{display: display, key: real})
}

// LoadSource is Load for a policy text that is not read from disk (standard
// input, an editor buffer): filename names it in ranges and Policy.File,
// and its extends paths are relative to filename's directory.
func (l *Loader) LoadSource(filename string, src []byte) (*Policy, hcl.Diagnostics) {
	l.mu.Lock()
	defer l.mu.Unlock()
	display := filepath.ToSlash(filepath.Clean(filename))
	key, err := filepath.Abs(filename)
	if err != nil {
		return nil, hcl.Diagnostics{readError(display, err, nil)}
	}
	if dir, err := filepath.EvalSymlinks(filepath.Dir(key)); err == nil {
		key = filepath.Join(dir, filepath.Base(key))
	}
	if len(src) > MaxFileSize {
		// At the top of the file: every diagnostic of a file has a place.
		start := &hcl.Range{Filename: display, Start: hcl.InitialPos, End: hcl.InitialPos}
		return nil, hcl.Diagnostics{readError(display, fmt.Errorf("larger than the limit of %d bytes", MaxFileSize), start)}
	}
	if src == nil {
		src = []byte{}
	}
	return l.top(node{display: display, key: key, src: src})
}

// top loads a file given by the caller: its chain is confined to the
// loader's root, or to the file's own directory when the root is "".
func (l *Loader) top(n node) (*Policy, hcl.Diagnostics) {
	root := filepath.Dir(n.key)
	if l.root != "" {
		var err error
		if root, err = realPath(l.root); err != nil {
			return nil, hcl.Diagnostics{{Severity: hcl.DiagError, Summary: "Cannot resolve the repository root",
				Detail: fmt.Sprintf("%s: %s.", l.root, plainError(err))}}
		}
	}
	return checked(l.load(n, root, nil, nil))
}

func (l *Loader) loadPack(name string) (*Policy, hcl.Diagnostics) {
	if p, ok := l.lang.packs.Load(name); ok {
		return p.(*Policy).clone(), nil
	}
	l.mu.Lock()
	defer l.mu.Unlock()
	p, diags := checked(l.load(node{display: packPrefix + name, key: packPrefix + name, pack: true}, "", nil, nil))
	if p != nil && len(diags) == 0 {
		l.lang.packs.Store(name, p.clone())
	}
	return p, diags
}

// checked adds the warnings about the effective policy as a whole.
func checked(p *Policy, diags hcl.Diagnostics) (*Policy, hcl.Diagnostics) {
	if p != nil {
		diags = append(diags, ties(p)...)
		diags = append(diags, crossCheck(p)...)
		if diags.HasErrors() {
			return nil, diags
		}
	}
	return p, diags
}

// node is one policy of an extends chain.
type node struct {
	display string // Policy.File and the file name in ranges
	key     string // identity for cycle detection: real path or "pack:NAME"
	pack    bool
	src     []byte // the text, when it is not to be read from key
}

// realPath is the absolute path with symbolic links resolved.
func realPath(p string) (string, error) {
	abs, err := filepath.Abs(p)
	if err != nil {
		return "", err
	}
	return filepath.EvalSymlinks(abs)
}

func readError(display string, err error, from *hcl.Range) *hcl.Diagnostic {
	summary := "Cannot read policy file"
	if errors.Is(err, fs.ErrNotExist) {
		summary = "Policy file not found"
	}
	return &hcl.Diagnostic{Severity: hcl.DiagError, Summary: summary,
		Detail: fmt.Sprintf("%s: %s.", display, plainError(err)), Subject: from}
}

// plainError drops the path an *fs.PathError repeats.
func plainError(err error) string {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err.Error()
	}
	return err.Error()
}

// readBounded reads a regular file of at most MaxFileSize bytes; a FIFO,
// socket or device is refused without being opened.
func readBounded(path string) ([]byte, error) {
	src, err := safefile.Read(path, MaxFileSize)
	if errors.Is(err, safefile.ErrTooLarge) {
		return nil, fmt.Errorf("larger than the limit of %d bytes", MaxFileSize)
	}
	return src, err
}

// parse parses a file, or returns the earlier parse of the same text.
func (l *Loader) parse(name string, src []byte) (*hcl.File, hcl.Diagnostics) {
	if p, seen := l.parsed[name]; seen && bytes.Equal(p.src, src) {
		return p.file, p.diags
	}
	p := parsedFile{src: src}
	// The model package's pre-scan bounds the recursion of the HCL parser
	// for every untrusted file, models and policies alike.
	if p.diags = model.CheckNesting(name, src); !p.diags.HasErrors() {
		p.file, p.diags = hclsyntax.ParseConfig(src, name, hcl.InitialPos)
	}
	l.parsed[name] = p
	return p.file, p.diags
}

// MaxNesting is how deeply brackets, strings, signs and conditionals may
// nest in a policy file: the same bound as for models.
const MaxNesting = model.MaxNesting

// load decodes n, then what it extends, and merges them. stack holds the
// policies that led to n (top-level file first); from is the extends value that
// led to n. root confines file paths ("" for packs).
func (l *Loader) load(n node, root string, stack []node, from *hcl.Range) (*Policy, hcl.Diagnostics) {
	var src []byte
	if n.pack {
		s, ok := packSources[strings.TrimPrefix(n.display, packPrefix)]
		if !ok {
			return nil, hcl.Diagnostics{{Severity: hcl.DiagError, Summary: "Unknown pack",
				Detail: fmt.Sprintf("There is no built-in pack %q; the packs are %s.", strings.TrimPrefix(n.display, packPrefix), strings.Join(PackNames(), ", ")), Subject: from}}
		}
		src = s
	} else if src = n.src; src == nil {
		var err error
		if src, err = readBounded(n.key); err != nil {
			return nil, hcl.Diagnostics{readError(n.display, err, from)}
		}
	}
	file, diags := l.parse(n.display, src)
	if diags.HasErrors() {
		return nil, diags
	}
	d := &decoder{lang: l.lang, Diagnostics: hclkit.Diagnostics{Diags: diags}}
	p, parent := l.decodeAndExtend(d, file, n, root, stack)
	hclkit.SortByPosition(d.Diags)
	return p, append(hclkit.Bound(d.Diags, model.DiagnosticLimits), parent...)
}

// decodeAndExtend decodes the parsed file of n into d and loads what it
// extends; parentDiags are the diagnostics of the rest of the chain.
func (l *Loader) decodeAndExtend(d *decoder, file *hcl.File, n node, root string, stack []node) (p *Policy, parentDiags hcl.Diagnostics) {
	o := d.decodeFile(file, n.display)
	if o == nil {
		return nil, nil
	}
	o.policy.Chain = []string{n.display}
	if !o.hasExtends {
		if d.Diags.HasErrors() {
			return nil, nil
		}
		return o.policy, nil
	}
	parentNode, ok := l.extendsTarget(d, n, o, root)
	if !ok {
		return nil, nil
	}
	stack = append(stack, n)
	for i, below := range stack {
		if below.key == parentNode.key {
			var names []string
			for _, s := range stack[i:] {
				names = append(names, s.display)
			}
			d.Errorf(o.extendsRange, "Cycle in extends",
				"The chain %s → %s comes back to a policy already in it; a policy cannot extend itself, even indirectly.",
				strings.Join(names, " → "), parentNode.display)
			return nil, nil
		}
	}
	if len(stack) >= MaxExtendsDepth {
		d.Errorf(o.extendsRange, "Extends chain too long",
			"A policy may stack at most %d files and packs through extends.", MaxExtendsDepth)
		return nil, nil
	}
	parent, pdiags := l.load(parentNode, root, stack, o.extendsRange.Ptr())
	if d.Diags.HasErrors() || pdiags.HasErrors() || parent == nil {
		return nil, pdiags
	}
	return merge(parent, o), pdiags
}

// extendsTarget resolves the extends value of o, written in n.
func (l *Loader) extendsTarget(d *decoder, n node, o *own, root string) (node, bool) {
	v := strings.TrimPrefix(o.extends, packPrefix)
	if _, ok := packSources[v]; ok {
		return node{display: packPrefix + v, key: packPrefix + v, pack: true}, true
	}
	if n.pack {
		d.Errorf(o.extendsRange, "Unknown pack", "A built-in pack extends only another pack (%s).", strings.Join(PackNames(), ", "))
		return node{}, false
	}
	if filepath.IsAbs(v) || strings.HasPrefix(v, "/") || strings.HasPrefix(v, `\`) {
		d.Errorf(o.extendsRange, "Absolute path in extends",
			"extends takes a built-in pack name or a path relative to this policy file, so that the repository can move.")
		return node{}, false
	}
	joined := filepath.Join(filepath.Dir(filepath.FromSlash(n.display)), filepath.FromSlash(v))
	display := filepath.ToSlash(joined)
	real, err := realPath(joined)
	if err != nil {
		diag := readError(display, err, o.extendsRange.Ptr())
		if errors.Is(err, fs.ErrNotExist) && !strings.ContainsAny(v, `/\.`) {
			diag.Summary = "Unknown pack or policy file"
			diag.Detail = fmt.Sprintf("%q is not a built-in pack (%s) and %s does not exist.", v, strings.Join(PackNames(), ", "), display) +
				hclkit.DidYouMean(suggestWord(v, PackNames()))
		}
		d.Diags = append(d.Diags, diag)
		return node{}, false
	}
	rel, err := filepath.Rel(root, real)
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) || filepath.IsAbs(rel) {
		d.Errorf(o.extendsRange, "Extends leaves the repository",
			"%s resolves to %s, outside %s; a policy may only extend packs and files inside the repository.", display, real, root)
		return node{}, false
	}
	return node{display: display, key: real}, true
}
