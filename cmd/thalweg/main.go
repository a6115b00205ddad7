// Command thalweg writes allocation-free minimizers from TOML specs.
//
//	thalweg gen SPEC...     write the generated files
//	thalweg check SPEC...   exit 1 when a generated file is missing or stale
//	thalweg init OBJECTIVE  write a starter spec for an objective
//	thalweg tune SPEC       rank every sensible direction × step rule
//	thalweg trace SPEC      run a minimizer once and print its iterations
//	thalweg rules           list directions, step rules and derivative sources
//	thalweg version         print the version
//
// Exit status: 0 on success, 1 when check finds stale files, 2 on any
// spec, objective or usage error. Errors read path:line:col: message.
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

const usage = `usage:
  thalweg gen SPEC...     write the minimizers each spec names, and their tests
  thalweg check SPEC...   write nothing; exit 1 naming each missing or stale file
  thalweg init OBJECTIVE [--out FILE]
                        write a starter spec for "Func" or "Type.Method" of the
                        package in FILE's directory (default ./<objective_in_snake_case>.toml)
  thalweg tune SPEC [--name NAME]
                        run every sensible direction × step rule from start, best first
  thalweg trace SPEC [--name NAME] [--csv FILE] [--svg FILE]
                        run the minimizer once from start, one row per accepted step
  thalweg rules           list directions, step rules and derivative sources
  thalweg version         print thalweg's version
`

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	flags := pflag.NewFlagSet("thalweg", pflag.ContinueOnError)
	flags.SetOutput(stderr)
	flags.Usage = func() {}
	flags.SetInterspersed(false) // flags after the verb belong to the verb
	if err := flags.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			fmt.Fprint(stdout, usage)
			return 0
		}
		fmt.Fprintf(stderr, "thalweg: %v\n%s", err, usage)
		return 2
	}
	if flags.NArg() == 0 {
		fmt.Fprint(stderr, usage)
		return 2
	}
	verb, rest := flags.Arg(0), flags.Args()[1:]
	switch verb {
	case "gen", "check":
		verbFlags := pflag.NewFlagSet("thalweg "+verb, pflag.ContinueOnError)
		verbFlags.SetOutput(io.Discard)
		if err := verbFlags.Parse(rest); err != nil {
			fmt.Fprintf(stderr, "thalweg %s: %v\n%s", verb, err, usage)
			return 2
		}
		rest = verbFlags.Args()
		if len(rest) == 0 {
			fmt.Fprintf(stderr, "thalweg %s: name at least one spec file\n%s", verb, usage)
			return 2
		}
		outs, err := gen.Generate(rest)
		if err != nil {
			return report(stderr, err)
		}
		if err := gen.CheckTargets(outs); err != nil {
			return report(stderr, err)
		}
		if verb == "check" {
			stale := gen.Stale(outs)
			for _, s := range stale {
				fmt.Fprintln(stderr, s)
			}
			if len(stale) > 0 {
				fmt.Fprintln(stderr, "run thalweg gen to regenerate")
				return 1
			}
			return 0
		}
		if err := gen.Write(outs); err != nil {
			return report(stderr, err)
		}
		return 0
	case "rules":
		if len(rest) != 0 {
			fmt.Fprint(stderr, usage)
			return 2
		}
		gen.WriteRules(stdout)
		return 0
	case "version":
		fmt.Fprintln(stdout, "thalweg", gen.Version)
		return 0
	case "init":
		return runInit(rest, stdout, stderr)
	case "trace":
		return runTrace(rest, stdout, stderr)
	case "tune":
		return runTune(rest, stdout, stderr)
	}
	fmt.Fprintf(stderr, "thalweg: unknown command %q\n%s", verb, usage)
	return 2
}

// runInit writes a starter spec; it never overwrites a file.
func runInit(args []string, stdout, stderr io.Writer) int {
	flags := pflag.NewFlagSet("thalweg init", pflag.ContinueOnError)
	flags.SetOutput(io.Discard)
	out := flags.String("out", "", "spec file to write (default ./<objective_in_snake_case>.toml)")
	if err := flags.Parse(args); err != nil || flags.NArg() != 1 {
		fmt.Fprintf(stderr, "thalweg init: name one objective, \"Func\" or \"Type.Method\"\n%s", usage)
		return 2
	}
	ref := flags.Arg(0)
	path := *out
	if path == "" {
		path = gen.StarterPath(ref)
	}
	if _, err := os.Stat(path); err == nil {
		fmt.Fprintf(stderr, "%s:1:1: refusing to overwrite an existing file\n", path)
		return 2
	}
	var spec bytes.Buffer
	if err := gen.WriteStarter(&spec, filepath.Dir(path), ref); err != nil {
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
func runTune(args []string, stdout, stderr io.Writer) int {
	plan, code := choosePlan("tune", args, stderr, nil)
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

// choosePlan parses SPEC [--name NAME] and the verb's own flags, and
// resolves the minimizer; on failure it reports and returns the exit code.
func choosePlan(verb string, args []string, stderr io.Writer, more func(*pflag.FlagSet)) (*gen.Plan, int) {
	flags := pflag.NewFlagSet("thalweg "+verb, pflag.ContinueOnError)
	flags.SetOutput(io.Discard)
	name := flags.String("name", "", "minimizer to use (needed when the spec has several)")
	if more != nil {
		more(flags)
	}
	if err := flags.Parse(args); err != nil || flags.NArg() != 1 {
		fmt.Fprintf(stderr, "thalweg %s: name one spec\n%s", verb, usage)
		return nil, 2
	}
	plan, err := gen.SelectPlan(flags.Arg(0), *name)
	if err != nil {
		return nil, report(stderr, err)
	}
	return plan, 0
}

// runTrace runs one minimizer from its start and prints its iterations;
// the package itself is not written to.
func runTrace(args []string, stdout, stderr io.Writer) int {
	var csvPath, svgPath *string
	plan, code := choosePlan("trace", args, stderr, func(flags *pflag.FlagSet) {
		csvPath = flags.String("csv", "", "also write the rows to this CSV file")
		svgPath = flags.String("svg", "", "also draw the convergence chart to this SVG file")
	})
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
		{*csvPath, func(w io.Writer) error { return gen.WriteTraceCSV(w, res) }},
		{*svgPath, func(w io.Writer) error { return gen.WriteTraceSVG(w, plan, res) }},
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
