package main

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/spf13/pflag"
)

// command is one verb of the CLI: how it is called, what it does, its
// flags and the function that runs it.
type command struct {
	name     string
	synopsis string      // what follows "thalweg NAME": arguments, then flags
	summary  string      // one line: what the command does
	args     [][2]string // each argument and what it is
	notes    string      // more to know, after the flags; may be ""
	flags    func(*pflag.FlagSet, *options)
	run      func(c *command, args []string, o *options, stdout, stderr io.Writer) int
}

// options holds every command's flags; each command defines its own.
type options struct {
	deleteOrphans bool
	out           string
	name          string
	csv, svg      string
	start         []float64
}

// commands lists the verbs in the order the overview shows them; init
// fills it, since the help command refers back to it.
var commands []*command

func init() {
	nameFlag := func(f *pflag.FlagSet, o *options) {
		f.StringVar(&o.name, "name", "", "the `NAME` of the minimizer to use; needed when the spec has several")
	}
	commands = []*command{{
		name:     "gen",
		synopsis: "SPEC... [--delete-orphans]",
		summary:  "write the minimizers each spec names, and their tests",
		args:     [][2]string{{"SPEC...", "spec files (TOML); all are checked before any file is written"}},
		flags: func(f *pflag.FlagSet, o *options) {
			switchFlag(f, &o.deleteOrphans, "delete-orphans", "", "delete the files a spec generated before but no longer produces")
		},
		notes: `gen prints "wrote PATH" for each file it writes. A file that already
holds the right bytes is left untouched and not mentioned. On any spec
or objective error nothing is written. gen never overwrites a file that
lacks thalweg's header, or one generated from another spec.

An orphan is a file whose header names one of the specs but which that
spec no longer produces, after a minimizer or its output was renamed.
gen names orphans on stderr and keeps them; with --delete-orphans it
deletes them and prints "deleted PATH". Files without the header are
never deleted.`,
		run: runGenCheck,
	}, {
		name:     "check",
		synopsis: "SPEC...",
		summary:  "write nothing; exit 1 naming each missing, stale or orphaned file",
		args:     [][2]string{{"SPEC...", "spec files (TOML)"}},
		notes: `check compares every file with what gen would write and prints, on
stderr, "PATH: missing", "PATH: stale" or "PATH: orphan (generated from
SPEC, no longer produced)". Exit status: 0 when nothing is to be done,
1 when a file is named, 2 on any spec, objective or usage error.`,
		run: runGenCheck,
	}, {
		name:     "init",
		synopsis: "OBJECTIVE [--out FILE] [--start VALUES]",
		summary:  "write a starter spec for an objective",
		args:     [][2]string{{"OBJECTIVE", `"Func" or "Type.Method" of the Go package in FILE's directory`}},
		flags: func(f *pflag.FlagSet, o *options) {
			f.StringVar(&o.out, "out", "", "the spec `FILE` to write (default ./<objective_in_snake_case>.toml)")
			f.Float64SliceVar(&o.start, "start", nil, "a typical starting point, comma-separated `VALUES` (one per unknown); scale is proposed from it")
		},
		notes: `The starter spec has every key with its default and a one-line comment;
a gradient named <Objective>Grad or <Objective>Gradient that fits is
proposed as the analytic one (an objective that writes its gradient
through g gets derivative = "analytic" without one), and New<Type> as
the instance. Without --start, start is written as nan, which gen
refuses until you replace it; with --start, scale is proposed as |start|
where that is nonzero (1 elsewhere). init never overwrites a file.`,
		run: runInit,
	}, {
		name:     "tune",
		synopsis: "SPEC [--name NAME]",
		summary:  "rank every sensible direction × step rule on the spec's objective, best first",
		args:     [][2]string{{"SPEC", "a spec file (TOML)"}},
		flags:    nameFlag,
		notes: `Each variant is compiled with your package through go test -overlay
(nothing is written into the package) and run from start; the table
shows status, objective calls, iterations, final f and time per solve,
and marks the recommended row and the spec's own choice.`,
		run: runTune,
	}, {
		name:     "trace",
		synopsis: "SPEC [--name NAME] [--csv FILE] [--svg FILE]",
		summary:  "run a minimizer once from start and print one row per accepted step",
		args:     [][2]string{{"SPEC", "a spec file (TOML)"}},
		flags: func(f *pflag.FlagSet, o *options) {
			nameFlag(f, o)
			f.StringVar(&o.csv, "csv", "", "also write the rows, with x, to this CSV `FILE`")
			f.StringVar(&o.svg, "svg", "", "also draw the convergence chart to this SVG `FILE`")
		},
		notes: `The minimizer is compiled with your package through go test -overlay
(nothing is written into the package). Each row shows the line search's
trials, the calls left, f, the decrease against the line model's
prediction, the step, and the step and gradient against their limits;
--svg adds, for two unknowns, contours of f under the path.`,
		run: runTrace,
	}, {
		name:    "rules",
		summary: "list directions, step rules and derivative sources with their math, parameters, defaults, ranges and references, and the bounds, scale and combined-objective features",
		run:     runRules,
	}, {
		name:    "version",
		summary: "print thalweg's version",
		run:     runVersion,
	}, {
		name:     "help",
		synopsis: "[COMMAND]",
		summary:  "print this overview, or a command's usage, arguments and flags",
		run:      runHelp,
	}}
	var names []string
	for _, c := range commands {
		names = append(names, c.name)
	}
	help := lookupCommand("help")
	help.args = [][2]string{{"COMMAND", "one of " + strings.Join(names, ", ")}}
}

func lookupCommand(name string) *command {
	for _, c := range commands {
		if c.name == name {
			return c
		}
	}
	return nil
}

// flagSet returns the command's flags, its own first, then -h/--help.
func (c *command) flagSet(o *options) (*pflag.FlagSet, *bool) {
	f := pflag.NewFlagSet("thalweg "+c.name, pflag.ContinueOnError)
	f.SetOutput(io.Discard)
	f.Usage = func() {}
	f.SortFlags = false
	if c.flags != nil {
		c.flags(f, o)
	}
	help := new(bool)
	switchFlag(f, help, "help", "h", "print this help")
	return f, help
}

// switchFlag defines a bool flag that its name alone sets, listed as a
// plain "--name" (pflag writes its own bool flags as
// "--name[=true|false]").
func switchFlag(f *pflag.FlagSet, p *bool, name, short, usage string) {
	f.VarPF((*switchValue)(p), name, short, usage).NoOptDefVal = "true"
}

type switchValue bool

func (s *switchValue) Set(v string) error {
	b, err := strconv.ParseBool(v)
	*s = switchValue(b)
	return err
}

func (s *switchValue) String() string { return strconv.FormatBool(bool(*s)) }
func (s *switchValue) Type() string   { return "bool" }

// usageLine is "thalweg NAME SYNOPSIS".
func (c *command) usageLine() string {
	return strings.TrimSpace("thalweg " + c.name + " " + c.synopsis)
}

// writeHelp prints the command's full usage: synopsis, what it does, its
// arguments, its flags and notes.
func writeHelp(w io.Writer, c *command) {
	fmt.Fprintf(w, "usage: %s\n\n%s.\n", c.usageLine(), upperFirst(c.summary))
	if len(c.args) > 0 {
		width := 0
		for _, a := range c.args {
			width = max(width, len(a[0]))
		}
		fmt.Fprintf(w, "\narguments:\n")
		for _, a := range c.args {
			fmt.Fprintf(w, "  %-*s   %s\n", width, a[0], a[1])
		}
	}
	f, _ := c.flagSet(&options{})
	fmt.Fprintf(w, "\nflags:\n%s", f.FlagUsages())
	if c.notes != "" {
		fmt.Fprintf(w, "\n%s\n", c.notes)
	}
}

// writeShortUsage prints the synopsis and where to read more, after a
// usage error.
func writeShortUsage(w io.Writer, c *command) {
	fmt.Fprintf(w, "usage: %s\nRun \"thalweg help %s\" for its arguments and flags.\n", c.usageLine(), c.name)
}

// writeOverview prints every command with its one-line summary.
func writeOverview(w io.Writer) {
	fmt.Fprint(w, "thalweg writes allocation-free minimizers from TOML specs.\n\nusage:\n")
	for _, c := range commands {
		fmt.Fprintf(w, "  %s\n      %s\n", c.usageLine(), c.summary)
	}
	fmt.Fprint(w, `
"thalweg help COMMAND" or "thalweg COMMAND -h" prints a command's
arguments and flags.

Exit status: 0 on success, 1 when check names a file to write or delete,
2 on any spec, objective or usage error. Errors read path:line:col: message.
`)
}

// usageError reports a misuse of the command and returns exit status 2.
func usageError(stderr io.Writer, c *command, format string, args ...any) int {
	fmt.Fprintf(stderr, "thalweg %s: %s\n", c.name, fmt.Sprintf(format, args...))
	writeShortUsage(stderr, c)
	return 2
}

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}
