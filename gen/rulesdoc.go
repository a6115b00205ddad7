package gen

import (
	"fmt"
	"io"

	"github.com/thalweg-go/thalweg/rules"
)

// Version is thalweg's version.
const Version = "0.1.0"

// WriteRules renders the rules tables: every direction, step rule and
// derivative source with its math, parameters and references.
func WriteRules(w io.Writer) {
	section := func(title, key string, list []rules.Entry, def string) {
		fmt.Fprintf(w, "%s (spec key %s, default %q)\n\n", title, key, def)
		for _, e := range list {
			fmt.Fprintf(w, "  %s — %s\n", e.Name, e.Summary)
			fmt.Fprintf(w, "      %s\n", e.Math)
			for _, p := range e.Params {
				fmt.Fprintf(w, "      %-12s default %-8v range %-12s %s\n", p.Key, paramDefault(p), paramRange(p), p.Doc)
			}
			for _, r := range e.References {
				fmt.Fprintf(w, "      ref: %s\n", r)
			}
			fmt.Fprintln(w)
		}
	}
	section("Directions", "direction", rules.Directions(), rules.DefaultDirection)
	section("Step rules", "step.rule", rules.StepRules(), rules.DefaultStepRule)
	section("Derivative sources", "derivative", rules.Derivatives(), rules.DefaultDerivative)
	fmt.Fprintln(w, "Stop limits ([minimizer.stop])")
	fmt.Fprintln(w)
	for _, p := range []rules.Param{rules.StopGradient, rules.StopStep, rules.StopIterations, rules.StopEvaluations} {
		fmt.Fprintf(w, "  %-12s default %-8v range %-12s %s\n", p.Key, p.Default, p.Range(), p.Doc)
	}
}

// paramRange shows a switch as its two values.
func paramRange(p rules.Param) string {
	if p.Key == "interpolate" {
		return "true|false"
	}
	return p.Range()
}

func paramDefault(p rules.Param) any {
	if p.Key == "interpolate" {
		return p.Default != 0
	}
	return p.Default
}
