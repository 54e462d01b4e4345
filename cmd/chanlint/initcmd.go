package main

import (
	_ "embed"
	"errors"
	"flag"
	"fmt"
	iofs "io/fs"
	"os"
	"path/filepath"
	"strings"
	"text/template"

	"github.com/chanlint/chanlint/model"
	"github.com/chanlint/chanlint/model/safefile"
	"github.com/chanlint/chanlint/policies"
)

// starterTemplate is the starter model of `chanlint init`: a simple
// invented channel that passes the baseline packs, with a comment on every
// block. starterValues fill it for each unit system; the US figures are the
// SI channel in round feet and cubic feet per second.
//
//go:embed starter/starter.chan.hcl.tmpl
var starterTemplate string

type starterFigures struct {
	Units, Pack                          string
	Width, Height, Length, Minor, Design string
}

var starterValues = map[string]starterFigures{
	"si": {Units: "si", Pack: "baseline", Width: "1.5", Height: "1.2", Length: "300", Minor: "1.2", Design: "3.0"},
	"us": {Units: "us", Pack: "baseline-us", Width: "5.0", Height: "4.0", Length: "1000", Minor: "42", Design: "106"},
}

// starterModel is the starter model in units ("si" or "us").
func starterModel(units string) string {
	var b strings.Builder
	if err := template.Must(template.New("starter").Parse(starterTemplate)).Execute(&b, starterValues[units]); err != nil {
		panic("chanlint: starter template: " + err.Error()) // the embedded template is wrong
	}
	return b.String()
}

func initCommand() *command {
	return &command{
		name:    "init",
		summary: "write a starter model (and optionally a " + configName + ") to begin from",
		run:     func(a *app, args []string) int { return a.runInit(args) },
		help:    func(*app) string { return initUsage() },
	}
}

type initFlags struct {
	name   string
	units  *choice
	config string
	force  bool
}

func newInitFlags() (*initFlags, *flag.FlagSet) {
	f := &initFlags{units: newChoice("si", "si", "us")}
	fs := newFlagSet("init")
	fs.StringVar(&f.name, "name", "channel"+model.Suffix, "file name of the starter model")
	fs.Var(f.units, "units", "unit system of the starter model")
	fs.StringVar(&f.config, "config", "", "also write "+configName+", a policy extending built-in `PACK` (baseline, baseline-us, strict)")
	fs.BoolVar(&f.force, "force", false, "replace files that exist")
	return f, fs
}

func initUsage() string {
	_, fs := newInitFlags()
	return `usage: chanlint init [DIR] [options]

Writes a starter model into DIR (default: the current directory): a simple
invented channel that passes the built-in baseline pack, with a comment on
every block saying what it means. With --config PACK it also writes
` + configName + `, the repository's policy, extending that pack, for
'chanlint check' to find. Existing files are kept unless --force is given.

options:
` + flagUsage(fs) + `
exit status: 0 files written; 2 a file exists, cannot be written, or a wrong
command line.
`
}

func (a *app) runInit(args []string) int {
	c := findCommand("init")
	f, fs := newInitFlags()
	pos, err := parseFlags(fs, args)
	if err != nil {
		return a.flagError(c, fs, err)
	}
	if len(pos) > 1 {
		return a.usageError(c, "expected at most one DIR, got %d arguments", len(pos))
	}
	dir := a.cwd
	if len(pos) == 1 {
		dir = a.abs(pos[0])
	}
	name := f.name
	if filepath.Base(name) != name || name == "." || name == ".." {
		return a.usageError(c, "--name must be a file name, not a path: %q", name)
	}
	if !strings.HasSuffix(name, model.Suffix) {
		name += model.Suffix
	}
	src := starterModel(f.units.value)
	files := []struct{ path, data string }{{filepath.Join(dir, name), src}}
	if f.config != "" {
		if _, ok := policies.PackSource(f.config); !ok {
			msg := fmt.Sprintf("--config: unknown pack %q", f.config)
			if s := suggest(f.config, policies.PackNames()); s != "" {
				msg += fmt.Sprintf("; did you mean %q?", s)
			}
			return a.usageError(c, "%s (chanlint policy list shows the packs)", msg)
		}
		files = append(files, struct{ path, data string }{filepath.Join(dir, configName), starterPolicy(f.config, f.units.value)})
	}
	if !f.force {
		for _, file := range files {
			if _, err := os.Lstat(file.path); err == nil {
				fmt.Fprintf(a.stderr, "chanlint init: %s exists; pass --force to replace it\n", a.display(file.path))
				return exitInvalid
			} else if !errors.Is(err, iofs.ErrNotExist) {
				fmt.Fprintf(a.stderr, "chanlint init: %s: %v\n", a.display(file.path), describePathError(err))
				return exitInvalid
			}
		}
	}
	if err := os.MkdirAll(dir, 0o755); err != nil {
		fmt.Fprintf(a.stderr, "chanlint init: %v\n", describePathError(err))
		return exitInvalid
	}
	for _, file := range files {
		if err := safefile.Write(file.path, []byte(file.data)); err != nil {
			fmt.Fprintf(a.stderr, "chanlint init: cannot write %s: %v\n", a.display(file.path), describePathError(err))
			return exitInvalid
		}
		fmt.Fprintf(a.stdout, "wrote %s\n", a.display(file.path))
	}
	fmt.Fprintf(a.stdout, "next: edit it to your channel, then run 'chanlint check %s'\n", a.display(dir))
	return exitOK
}

// starterPolicy is the .chanlint.hcl of `chanlint init --config PACK`.
func starterPolicy(pack, units string) string {
	return `# The design policy of this repository: 'chanlint check' run anywhere
# below this directory uses it. It extends a built-in pack; write a block of
# a rule to replace the pack's settings for that rule ('chanlint policy show
# ` + configName + `' prints the result, 'chanlint explain RULE' a rule's basis).
policy "project" {
  units     = "` + units + `"
  extends   = "` + pack + `"
  reference = "Project design criteria (edit: name your governing manual)"

  # For example, a freeboard of at least 0.5 (in the units above) or a
  # quarter of the flow depth, whichever is larger:
  #
  # freeboard {
  #   minimum  = 0.5
  #   fraction = 0.25
  # }
}
`
}
