// Command chanlint screens open-channel hydraulic models written in the
// chanlint model language (*.chan.hcl) against a local design policy.
//
// It finds the models, solves steady gradually-varied flow for every flow
// event, checks the solved profiles against the policy and prints findings
// with their file positions, stations and measured values. Run
// `chanlint help` for the commands.
//
// Exit codes (every command):
//
//	0  nothing at or above the failure threshold (check), or the command did its job
//	1  check: a finding that is not excepted is at or above --fail-on
//	2  an input could not be read or is not a valid model or policy, or the
//	   command line is wrong (the other files are still checked and reported)
//
// Behaviour the design documents leave open, as built:
//
//   - Discovery: a PATH that is a file is checked whatever its name; a
//     directory is searched recursively for *.chan.hcl, skipping .git, .hg,
//     .svn, vendor and node_modules below it. Symbolic links are followed
//     only when their target stays inside the directory being searched; a
//     file reached twice is checked once. Files are checked in sorted order
//     of their printed path. Finding no model is said on stderr, exit 0.
//   - Policy: --policy (an existing file, else a pack name), else the
//     nearest .chanlint.hcl from the working directory up to the repository
//     root (the nearest directory holding .git); outside a repository only
//     the working directory itself is looked at. Else the baseline pack.
//     `extends` paths may not leave the repository root (or, for a policy
//     file outside the repository, the policy's own directory).
//   - Text output: a first line per finding in the GNU FILE:LINE:COLUMN:
//     layout with the place (reach, event, stations) before the message,
//     the remedy and an exception's reason on indented continuation lines;
//     a finding covered by a design exception says "excepted" where the
//     severity stands, so that editors do not flag it; invalid models get a
//     source snippet under each diagnostic.
//   - Baselines: --baseline hides the findings the file records (invalid
//     models are never hidden); --write-baseline records today's findings
//     of the valid models and exits 0 unless some input is invalid.
//   - SARIF artifact URIs are relative to the repository root (else the
//     working directory); all other output paths are relative to the
//     working directory, with forward slashes.
//   - report exits 0 once the report is written, whatever it finds; 2 when
//     a model is invalid (the report is still written and lists it).
package main

import (
	"fmt"
	"github.com/chanlint/chanlint/cmd/chanlint/internal/pipeline"
	"io"
	"os"
	"runtime"
	"runtime/debug"
	"strings"
	"sync/atomic"

	"github.com/mattn/go-isatty"
)

// version is the release of this build; release builds set it with
// -ldflags "-X main.version=v1.2.3". Otherwise the module version recorded
// by the Go toolchain is used, or "devel".
var version = ""

// Exit codes.
const (
	exitOK       = 0
	exitFindings = 1
	exitInvalid  = 2
)

// Garbage-collector settings of the binary (see tuneGC).
const (
	gcPercent   = 400
	memoryLimit = 100 << 20 // bytes
)

// tuneGC trades memory the collector would keep small for time: parsing
// and solving allocate briefly-lived objects at a high rate and keep little
// alive, so the default (collect when the heap has doubled) spends a
// fifth of a large run collecting. The heap may grow to five times the
// live data, but the soft memory limit makes the collector work harder as
// the whole heap nears 100 MiB, which keeps the peak of a large run near
// that; scaleMemoryLimit raises it for a run that holds more. A GOGC or
// GOMEMLIMIT environment variable set by the user wins.
func tuneGC(getenv func(string) string) {
	if getenv("GOGC") == "" {
		debug.SetGCPercent(gcPercent)
	}
	if getenv("GOMEMLIMIT") == "" {
		debug.SetMemoryLimit(memoryLimit)
		gcLimitTuned.Store(true)
	}
}

// gcLimitTuned says that tuneGC set the soft memory limit (the user did
// not), so that scaleMemoryLimit may move it.
var gcLimitTuned atomic.Bool

// heapPerInputByte is the soft memory limit added per byte of model text
// a run holds at once. A chain of 10,000 reaches (1.15 MB of HCL) keeps
// about 55 MB alive while it is checked; under the fixed 100 MiB limit
// the collector ran almost continuously and the check cost 1.2 s of CPU,
// against 0.7 s with the limit this gives (330 MB; the heap peaked at
// 245 MB) and 0.68 s with none (BenchmarkMemoryLimit10k).
const heapPerInputByte = 200

// scaleMemoryLimit sets the soft memory limit of a run that decodes and
// solves solving bytes of model text at once and keeps kept bytes of
// source: 100 MiB, plus heapPerInputByte for each byte solved and one for
// each byte kept, when tuneGC set the limit.
func scaleMemoryLimit(solving, kept int64) {
	if gcLimitTuned.Load() {
		debug.SetMemoryLimit(memoryLimit + heapPerInputByte*max(solving, 0) + max(kept, 0))
	}
}

func main() {
	tuneGC(os.Getenv)
	cwd, err := os.Getwd()
	if err != nil {
		fmt.Fprintf(os.Stderr, "chanlint: cannot determine the current directory: %v\n", err)
		os.Exit(exitInvalid)
	}
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr, cwd))
}

// run executes one chanlint command line in-process and returns the exit
// code. cwd is the directory relative paths are resolved against and
// printed relative to; stdout and stderr receive the output.
func run(args []string, stdout, stderr io.Writer, cwd string) int {
	a := newApp(stdout, stderr, cwd, os.Getenv)
	a.stdin = os.Stdin
	return a.run(args)
}

// app is the environment one invocation runs in. Tests build it directly
// to set the environment variables and the worker count.
type app struct {
	stdout, stderr io.Writer
	// stdin is read for the PATH "-"; stdinName (--stdin-name) names it.
	stdin     io.Reader
	stdinName string
	// vary is the sensitivity run asked on the command line (--vary); nil
	// leaves it to the policy's sensitivity block.
	vary   *pipeline.Sensitivity
	cwd    string
	getenv func(string) string
	// stdoutTTY and stderrTTY say whether the streams are terminals; they
	// decide automatic colour and the progress line.
	stdoutTTY, stderrTTY bool
	// defaultJobs is the worker count when --jobs is not given.
	defaultJobs int
	// discovered is the absolute path of the .chanlint.hcl that
	// loadPolicy applied ("" when --policy was given or none was found).
	discovered string
}

func newApp(stdout, stderr io.Writer, cwd string, getenv func(string) string) *app {
	return &app{
		stdout:      stdout,
		stderr:      stderr,
		cwd:         cwd,
		getenv:      getenv,
		stdoutTTY:   isTerminal(stdout),
		stderrTTY:   isTerminal(stderr),
		defaultJobs: runtime.GOMAXPROCS(0),
	}
}

// isTerminal reports whether w is a terminal device.
func isTerminal(w io.Writer) bool {
	f, ok := w.(*os.File)
	if !ok {
		return false
	}
	fd := f.Fd()
	return isatty.IsTerminal(fd) || isatty.IsCygwinTerminal(fd)
}

// command is one subcommand of the tool.
type command struct {
	name    string
	summary string // one line for the command list
	run     func(a *app, args []string) int
	help    func(a *app) string // full usage text
}

func commands() []*command {
	return []*command{
		checkCommand(),
		diffCommand(),
		initCommand(),
		solveCommand(),
		reportCommand(),
		explainCommand(),
		policyCommand(),
		{
			name:    "version",
			summary: "print the version of this build",
			run:     func(a *app, args []string) int { return a.runVersion(args) },
			help: func(*app) string {
				return "usage: chanlint version\n\nPrints the chanlint release and the Go toolchain it was built with.\n"
			},
		},
	}
}

func findCommand(name string) *command {
	for _, c := range commands() {
		if c.name == name {
			return c
		}
	}
	return nil
}

func (a *app) run(args []string) int {
	if a.cwd == "" {
		wd, err := os.Getwd()
		if err != nil {
			fmt.Fprintf(a.stderr, "chanlint: cannot determine the current directory: %v\n", err)
			return exitInvalid
		}
		a.cwd = wd
	}
	if len(args) == 0 {
		fmt.Fprint(a.stderr, mainUsage())
		return exitInvalid
	}
	switch args[0] {
	case "help", "-h", "-help", "--help":
		return a.runHelp(args[1:])
	case "-version", "--version":
		return a.runVersion(nil)
	}
	c := findCommand(args[0])
	if c == nil {
		fmt.Fprintf(a.stderr, "chanlint: unknown command %q", args[0])
		if s := suggest(args[0], commandNames()); s != "" {
			fmt.Fprintf(a.stderr, "; did you mean %q?", s)
		}
		fmt.Fprint(a.stderr, "\nrun 'chanlint help' for the list of commands\n")
		return exitInvalid
	}
	return c.run(a, args[1:])
}

func commandNames() []string {
	var names []string
	for _, c := range commands() {
		names = append(names, c.name)
	}
	return append(names, "help")
}

func mainUsage() string {
	var b strings.Builder
	b.WriteString(`chanlint screens open-channel hydraulic models against local design criteria.

It solves steady gradually-varied flow for every flow event of each *.chan.hcl
model and reports where the profiles break the policy's rules (freeboard,
velocity, Froude number, hydraulic jumps, ...).

usage: chanlint COMMAND [ARGUMENTS]

commands:
`)
	for _, c := range commands() {
		fmt.Fprintf(&b, "  %-9s %s\n", c.name, c.summary)
	}
	fmt.Fprintf(&b, "  %-9s %s\n", "help", "show the usage of a command")
	b.WriteString(`
'chanlint help COMMAND' or 'chanlint COMMAND -h' shows the options of a command.

exit status: 0 clean, 1 findings at or above --fail-on, 2 invalid input or
command line.
`)
	return b.String()
}

func (a *app) runHelp(args []string) int {
	if len(args) == 0 {
		fmt.Fprint(a.stdout, mainUsage())
		return exitOK
	}
	c := findCommand(args[0])
	if c == nil {
		if args[0] == "help" || args[0] == "-h" || args[0] == "--help" || args[0] == "-help" {
			fmt.Fprint(a.stdout, "usage: chanlint help [COMMAND]\n\nShows the list of commands, or the usage of one command.\n")
			return exitOK
		}
		fmt.Fprintf(a.stderr, "chanlint help: unknown command %q", args[0])
		if s := suggest(args[0], commandNames()); s != "" {
			fmt.Fprintf(a.stderr, "; did you mean %q?", s)
		}
		fmt.Fprintln(a.stderr)
		return exitInvalid
	}
	fmt.Fprint(a.stdout, c.help(a))
	return exitOK
}

// toolVersion is the version string printed by `chanlint version` and
// recorded in SARIF logs and reports.
func toolVersion() string {
	if version != "" {
		return version
	}
	if bi, ok := debug.ReadBuildInfo(); ok && bi.Main.Version != "" && bi.Main.Version != "(devel)" {
		return bi.Main.Version
	}
	return "devel"
}

func (a *app) runVersion(args []string) int {
	if len(args) > 0 {
		if args[0] == "-h" || args[0] == "--help" || args[0] == "-help" {
			fmt.Fprint(a.stdout, findCommand("version").help(a))
			return exitOK
		}
		fmt.Fprintf(a.stderr, "chanlint version: unexpected argument %q\n", args[0])
		return exitInvalid
	}
	fmt.Fprintf(a.stdout, "chanlint %s (%s, %s/%s)\n", toolVersion(), runtime.Version(), runtime.GOOS, runtime.GOARCH)
	return exitOK
}
