// Command nadir writes allocation-free minimizers from TOML specs.
//
//	nadir gen SPEC...     write the generated files
//	nadir check SPEC...   exit 1 when a generated file is missing or stale
//	nadir rules           list directions, step rules and derivative sources
//	nadir version         print the version
//
// Exit status: 0 on success, 1 when check finds stale files, 2 on any
// spec, objective or usage error. Errors read path:line:col: message.
package main

import (
	"errors"
	"fmt"
	"io"
	"os"

	"github.com/spf13/pflag"

	"github.com/nadir-opt/nadir/gen"
)

const usage = `usage:
  nadir gen SPEC...     write the minimizers each spec names, and their tests
  nadir check SPEC...   write nothing; exit 1 naming each missing or stale file
  nadir rules           list directions, step rules and derivative sources
  nadir version         print nadir's version
`

func main() {
	os.Exit(run(os.Args[1:], os.Stdout, os.Stderr))
}

func run(args []string, stdout, stderr io.Writer) int {
	flags := pflag.NewFlagSet("nadir", pflag.ContinueOnError)
	flags.SetOutput(stderr)
	flags.Usage = func() {}
	if err := flags.Parse(args); err != nil {
		if errors.Is(err, pflag.ErrHelp) {
			fmt.Fprint(stdout, usage)
			return 0
		}
		fmt.Fprintf(stderr, "nadir: %v\n%s", err, usage)
		return 2
	}
	if flags.NArg() == 0 {
		fmt.Fprint(stderr, usage)
		return 2
	}
	verb, rest := flags.Arg(0), flags.Args()[1:]
	switch verb {
	case "gen", "check":
		if len(rest) == 0 {
			fmt.Fprintf(stderr, "nadir %s: name at least one spec file\n%s", verb, usage)
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
				fmt.Fprintln(stderr, "run nadir gen to regenerate")
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
		fmt.Fprintln(stdout, "nadir", gen.Version)
		return 0
	case "init", "tune", "trace":
		fmt.Fprintf(stderr, "nadir %s: not available in this version\n", verb)
		return 2
	}
	fmt.Fprintf(stderr, "nadir: unknown command %q\n%s", verb, usage)
	return 2
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
	fmt.Fprintln(stderr, "nadir:", err)
	return 2
}
