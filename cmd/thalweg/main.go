// Command thalweg writes allocation-free minimizers from TOML specs.
//
//	thalweg gen SPEC...     write the generated files
//	thalweg check SPEC...   exit 1 when a generated file is missing, stale or an orphan
//	thalweg init OBJECTIVE  write a starter spec for an objective
//	thalweg tune SPEC       rank every sensible direction × step rule
//	thalweg trace SPEC      run a minimizer once and print its iterations
//	thalweg rules           list directions, step rules and derivative sources
//	thalweg version         print the version
//	thalweg help [COMMAND]  print the overview, or a command's usage and flags
//
// Exit status: 0 on success (help included), 1 when check names a file,
// 2 on any spec, objective or usage error. Errors read path:line:col:
// message. The commands' texts are in usage.go.
package main

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"os"
	"path/filepath"

	"github.com/spf13/pflag"

	"github.com/thalweg-go/thalweg/gen"
)

func main() {
	gen.RoomyHeap() // a short run: fewer collections, as the benchmarks measure it
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	flags := pflag.NewFlagSet("thalweg", pflag.ContinueOnError)
	flags.SetOutput(io.Discard)
	flags.Usage = func() {}
	flags.SetInterspersed(false) // flags after the command belong to the command
	help := new(bool)
	switchFlag(flags, help, "help", "h", "print the overview")
	if err := flags.Parse(args); err != nil {
		fmt.Fprintf(stderr, "thalweg: %v\n", err)
		writeOverview(stderr)
		return 2
	}
	if flags.NArg() == 0 {
		if *help {
			writeOverview(stdout)
			return 0
		}
		writeOverview(stderr)
		return 2
	}
	c := lookupCommand(flags.Arg(0))
	if c == nil {
		fmt.Fprintf(stderr, "thalweg: unknown command %q\n", flags.Arg(0))
		writeOverview(stderr)
		return 2
	}
	if *help { // thalweg --help COMMAND
		writeHelp(stdout, c)
		return 0
	}
	var o options
	verbFlags, verbHelp := c.flagSet(&o)
	if err := verbFlags.Parse(flags.Args()[1:]); err != nil {
		return usageError(stderr, c, "%v", err)
	}
	if *verbHelp {
		writeHelp(stdout, c)
		return 0
	}
	return c.run(c, verbFlags.Args(), &o, stdout, stderr)
}

// runHelp prints the overview, or one command's usage.
func runHelp(c *command, args []string, _ *options, stdout, stderr io.Writer) int {
	switch {
	case len(args) == 0:
		writeOverview(stdout)
		return 0
	case len(args) > 1:
		return usageError(stderr, c, "name at most one command")
	}
	about := lookupCommand(args[0])
	if about == nil {
		return usageError(stderr, c, "unknown command %q", args[0])
	}
	writeHelp(stdout, about)
	return 0
}

func runRules(c *command, args []string, _ *options, stdout, stderr io.Writer) int {
	if len(args) != 0 {
		return usageError(stderr, c, "takes no arguments")
	}
	gen.WriteRules(stdout)
	return 0
}

func runVersion(c *command, args []string, _ *options, stdout, stderr io.Writer) int {
	if len(args) != 0 {
		return usageError(stderr, c, "takes no arguments")
	}
	fmt.Fprintln(stdout, "thalweg", gen.Version)
	return 0
}

// runGenCheck runs gen and check: both generate every output and find the
// orphans; check names what is to be done, gen does it.
func runGenCheck(c *command, specs []string, o *options, stdout, stderr io.Writer) int {
	if len(specs) == 0 {
		return usageError(stderr, c, "name at least one spec file")
	}
	outs, err := gen.Generate(specs)
	if err != nil {
		return report(stderr, err)
	}
	if err := gen.CheckTargets(outs); err != nil {
		return report(stderr, err)
	}
	orphans, err := gen.Orphans(outs)
	if err != nil {
		return report(stderr, err)
	}
	if c.name == "check" {
		stale := gen.Stale(outs)
		for _, s := range stale {
			fmt.Fprintln(stderr, s)
		}
		for _, orphan := range orphans {
			fmt.Fprintln(stderr, orphan)
		}
		switch {
		case len(orphans) > 0 && len(stale) > 0:
			fmt.Fprintln(stderr, "run thalweg gen --delete-orphans to regenerate and delete the orphans")
		case len(orphans) > 0:
			fmt.Fprintln(stderr, "run thalweg gen --delete-orphans to delete the orphans")
		case len(stale) > 0:
			fmt.Fprintln(stderr, "run thalweg gen to regenerate")
		default:
			return 0
		}
		return 1
	}
	written, err := gen.WriteChanged(outs)
	for _, path := range written {
		fmt.Fprintln(stdout, "wrote", path)
	}
	if err != nil {
		return report(stderr, err)
	}
	if !o.deleteOrphans {
		for _, orphan := range orphans {
			fmt.Fprintln(stderr, orphan)
		}
		if len(orphans) > 0 {
			fmt.Fprintln(stderr, "thalweg gen: orphans kept; run again with --delete-orphans to delete them")
		}
		return 0
	}
	for _, orphan := range orphans {
		if err := orphan.Remove(); err != nil {
			return report(stderr, err)
		}
		fmt.Fprintln(stdout, "deleted", orphan.Path)
	}
	return 0
}

// runInit writes a starter spec; it never overwrites a file.
func runInit(c *command, args []string, o *options, stdout, stderr io.Writer) int {
	if len(args) != 1 {
		return usageError(stderr, c, "name one objective, \"Func\" or \"Type.Method\"")
	}
	ref := args[0]
	path := o.out
	if path == "" {
		path = gen.StarterPath(ref)
	}
	if _, err := os.Stat(path); err == nil {
		fmt.Fprintf(stderr, "%s:1:1: refusing to overwrite an existing file\n", path)
		return 2
	}
	var spec bytes.Buffer
	if err := gen.WriteStarter(&spec, filepath.Dir(path), ref, o.start); err != nil {
		return report(stderr, err)
	}
	// O_EXCL: never overwrite, even a file created since the check above.
	f, err := os.OpenFile(path, os.O_WRONLY|os.O_CREATE|os.O_EXCL, 0o644)
	if err != nil {
		fmt.Fprintf(stderr, "%s:1:1: %v\n", path, err)
		return 2
	}
	if _, err := f.Write(spec.Bytes()); err != nil {
		f.Close()
		fmt.Fprintf(stderr, "%s:1:1: %v\n", path, err)
		return 2
	}
	if err := f.Close(); err != nil {
		fmt.Fprintf(stderr, "%s:1:1: %v\n", path, err)
		return 2
	}
	fmt.Fprintln(stdout, "wrote", path)
	return 0
}

// runTune ranks the sensible policies on the spec's objective and start;
// the package itself is not written to.
func runTune(c *command, args []string, o *options, stdout, stderr io.Writer) int {
	plan, code := choosePlan(c, args, o, stderr)
	if plan == nil {
		return code
	}
	rows, err := gen.Tune(plan)
	if err != nil {
		return report(stderr, err)
	}
	if err := gen.WriteTuneTable(stdout, plan, rows); err != nil {
		return report(stderr, err)
	}
	return 0
}

// choosePlan resolves the minimizer of SPEC that --name names; on failure
// it reports and returns the exit code.
func choosePlan(c *command, args []string, o *options, stderr io.Writer) (*gen.Plan, int) {
	if len(args) != 1 {
		return nil, usageError(stderr, c, "name one spec")
	}
	plan, err := gen.SelectPlan(args[0], o.name)
	if err != nil {
		return nil, report(stderr, err)
	}
	return plan, 0
}

// runTrace runs one minimizer from its start and prints its iterations;
// the package itself is not written to.
func runTrace(c *command, args []string, o *options, stdout, stderr io.Writer) int {
	plan, code := choosePlan(c, args, o, stderr)
	if plan == nil {
		return code
	}
	res, err := gen.Trace(plan)
	if err != nil {
		return report(stderr, err)
	}
	if err := gen.WriteTraceTable(stdout, plan, res); err != nil {
		return report(stderr, err)
	}
	for _, out := range []struct {
		path  string
		write func(io.Writer) error
	}{
		{o.csv, func(w io.Writer) error { return gen.WriteTraceCSV(w, res) }},
		{o.svg, func(w io.Writer) error { return gen.WriteTraceSVG(w, plan, res) }},
	} {
		if out.path == "" {
			continue
		}
		var buf bytes.Buffer
		if err := out.write(&buf); err != nil {
			return report(stderr, err)
		}
		if err := os.WriteFile(out.path, buf.Bytes(), 0o644); err != nil {
			return report(stderr, err)
		}
	}
	return 0
}

// report prints every problem on its own line and returns exit status 2.
func report(stderr io.Writer, err error) int {
	var probs gen.Problems
	if errors.As(err, &probs) {
		for _, p := range probs {
			fmt.Fprintln(stderr, p.Error())
		}
		return 2
	}
	fmt.Fprintln(stderr, "thalweg:", err)
	return 2
}
