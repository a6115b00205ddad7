package gen

import (
	"fmt"
	"io"
	"sort"
	"strings"

	"github.com/thalweg-go/thalweg/rules"
)

// Version is thalweg's version.
const Version = "0.1.0"

// WriteRules renders the registry: every choice with its entries' math,
// parameters, own defaults and references, then the stop limits.
func WriteRules(w io.Writer) {
	for _, c := range rules.Choices() {
		fmt.Fprintf(w, "%s: %s (default %q)\n\n", c.Path(), c.Doc, c.Default)
		for _, e := range c.Entries {
			fmt.Fprintf(w, "  %s — %s\n", e.Name, e.Summary)
			fmt.Fprintf(w, "      %s\n", e.Math)
			for _, p := range e.Params {
				writeParam(w, p)
			}
			var own []string
			for p, v := range e.Defaults {
				own = append(own, fmt.Sprintf("%s %s", p.Path(), rules.FormatValue(p, v)))
			}
			sort.Strings(own)
			if len(own) > 0 {
				fmt.Fprintf(w, "      own defaults: %s\n", strings.Join(own, ", "))
			}
			for _, r := range e.References {
				fmt.Fprintf(w, "      ref: %s\n", r)
			}
			fmt.Fprintln(w)
		}
	}
	b := rules.Bounds
	fmt.Fprintf(w, "%s: [minimizer.%s] lower and upper, optional\n\n", b.Table, b.Table)
	fmt.Fprintf(w, "  %s\n", b.Summary)
	fmt.Fprintf(w, "      %s\n", b.Math)
	for _, e := range rules.Direction.Entries {
		if e.NoBounds != "" {
			fmt.Fprintf(w, "      not with direction %s: %s\n", e.Name, e.NoBounds)
		}
	}
	for _, r := range b.References {
		fmt.Fprintf(w, "      ref: %s\n", r)
	}
	fmt.Fprintln(w)
	sc := rules.Scaling
	fmt.Fprintf(w, "%s: [[minimizer]] %s, optional (a number for scalar objectives, else one per unknown, each > 0)\n\n", sc.Table, sc.Table)
	fmt.Fprintf(w, "  %s\n", sc.Summary)
	fmt.Fprintf(w, "      %s\n", sc.Math)
	for _, r := range sc.References {
		fmt.Fprintf(w, "      ref: %s\n", r)
	}
	fmt.Fprintln(w)
	c := rules.Combined
	fmt.Fprintln(w, "combined objective: one that writes its gradient through g, with derivative = \"analytic\" and no gradient key")
	fmt.Fprintln(w)
	fmt.Fprintf(w, "  %s\n", c.Summary)
	fmt.Fprintf(w, "      %s\n", c.Math)
	for _, r := range c.References {
		fmt.Fprintf(w, "      ref: %s\n", r)
	}
	fmt.Fprintln(w)
	res := rules.Residuals
	fmt.Fprintln(w, "residual objective: one that writes residuals r(x) instead of returning a value (f = ½‖r‖²); keys residuals (M, for slices) and jacobian (with derivative = \"analytic\")")
	fmt.Fprintln(w)
	fmt.Fprintf(w, "  %s\n", res.Summary)
	fmt.Fprintf(w, "      %s\n", res.Math)
	fmt.Fprintln(w, "      default: direction levenberg-marquardt with step.rule damping; no scale; the step test is every |Δxᵢ| ≤ stop.step·max(|xᵢ|, |x0ᵢ|)")
	for _, r := range res.References {
		fmt.Fprintf(w, "      ref: %s\n", r)
	}
	fmt.Fprintln(w)
	fmt.Fprintln(w, "stop: limits every minimizer reads ([minimizer.stop])")
	fmt.Fprintln(w)
	for _, p := range rules.Params() {
		if p.Table == "stop" {
			writeParam(w, p)
		}
	}
}

// writeParam prints one parameter's line: key, default, range, doc.
func writeParam(w io.Writer, p *rules.Param) {
	def := "derived"
	if p.DefaultFor == nil {
		def = rules.FormatValue(p, p.Default)
	}
	fmt.Fprintf(w, "      %-12s default %-8s range %-12s %s\n", p.Key, def, p.Range(), p.Doc)
}
