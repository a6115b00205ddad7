package gen

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/thalweg-go/thalweg/rules"
)

// SelectPlan resolves the spec and returns the minimizer called name, or
// its only minimizer when name is empty.
func SelectPlan(specPath, name string) (*Plan, error) {
	plans, err := Plans([]string{specPath})
	if err != nil {
		return nil, err
	}
	var names []string
	for _, p := range plans {
		if p.M.Name == name || name == "" && len(plans) == 1 {
			return p, nil
		}
		names = append(names, p.M.Name)
	}
	if name == "" {
		return nil, Problems{{Pos{specPath, 1, 1}, "the spec has several minimizers; choose one with --name: " + strings.Join(names, ", ")}}
	}
	return nil, Problems{{Pos{specPath, 1, 1}, fmt.Sprintf("no minimizer %s in the spec; it has %s", name, strings.Join(names, ", "))}}
}

// traceColumns are the columns of the trace table and of the CSV: our
// own names, each the answer to one question about a step (see the
// README's section on trace). The table leaves out "difference calls"
// for an analytic gradient, where it is always 0.
var traceColumns = []struct {
	table, csv string
}{
	{"move", "move"},                          // 0 is the start, then each accepted step
	{"trials", "trials"},                      // points the line search evaluated for this move
	{"difference calls", "difference_calls"},  // objective calls for finite-difference gradients in this move
	{"calls left", "calls_left"},              // evaluation cap − calls so far
	{"f", "f"},                                // the objective after the move
	{"decrease/predicted", "decrease_ratio"},  // (f before − f after) / (−t·∇fᵀd)
	{"step t", "step_t"},                      // the accepted step along d
	{"step/limit", "step_over_limit"},         // largest |Δxᵢ|/(|xᵢ|+1) over the step limit; ≤ 1 stops
	{"gradient/limit", "gradient_over_limit"}, // the gradient test's measure over its limit; ≤ 1 stops
}

// traceCells is one row's values in traceColumns order; cells that do not
// apply to the start are empty. format renders the ratios and the step.
func traceCells(res *TraceResult, r TraceRow, format func(float64) string, fFormat func(float64) string) []string {
	cells := []string{strconv.Itoa(r.Iteration), "", strconv.Itoa(r.GradientCalls), strconv.Itoa(res.CallsLeft(r)), fFormat(r.F), "", "", "", format(ratio(r.Gradient, res.Limits.Gradient))}
	if r.Iteration > 0 {
		cells[1] = strconv.Itoa(r.Trials)
		cells[5] = format(r.DecreaseRatio())
		cells[6] = format(r.Step)
		cells[7] = format(ratio(r.StepMeasure, res.Limits.Step))
	}
	return cells
}

// measureWords names the gradient test's measure as the kernel computes
// it: in the scaled unknowns zᵢ = xᵢ/sᵢ with a scale, where ∂f/∂zᵢ =
// sᵢ·∂f/∂xᵢ.
func (res *TraceResult) measureWords() string {
	partial, unknown := "∂f/∂xᵢ", "xᵢ"
	if res.Scale != nil {
		partial, unknown = "sᵢ·∂f/∂xᵢ", "zᵢ"
	}
	if res.Relative {
		return fmt.Sprintf("the relative gradient max |%s|·max(|%s|, 1)/max(|f|, 1)", partial, unknown)
	}
	return fmt.Sprintf("the largest |%s|", partial)
}

// ratio is measure/limit, +Inf for a positive measure over a zero limit.
func ratio(measure, limit float64) float64 {
	if limit == 0 && measure == 0 {
		return 0
	}
	return measure / limit
}

// WriteTraceTable prints what the run was asked to do, one row per move
// and the outcome.
func WriteTraceTable(w io.Writer, p *Plan, res *TraceResult) error {
	source := p.Derivative.Name + " gradient"
	if p.Shape.Combined {
		source = "gradient with each value (combined objective)"
	}
	fmt.Fprintf(w, "%s: %s direction, %s step rule, %s, from %s\n", p.M.Name, p.Direction.Name, p.Rule.Name, source, formatNumbers(p.M.Start))
	l := res.Limits
	if res.Scale != nil {
		fmt.Fprintf(w, "in the scaled unknowns zᵢ = xᵢ/sᵢ, s = %s: stops when %s ≤ %s or every |Δzᵢ| ≤ %s·(|zᵢ| + 1), after at most %d moves and %d objective calls\n\n",
			formatNumbers(res.Scale), res.measureWords(), compactFloat(l.Gradient, 3), compactFloat(l.Step, 3), l.Iterations, l.Evaluations)
	} else {
		scale := "(|xᵢ| + 1)"
		if res.OwnScale {
			scale = "max(|xᵢ|, |x0ᵢ|)"
		}
		fmt.Fprintf(w, "stops when %s ≤ %s or every |Δxᵢ| ≤ %s·%s, after at most %d moves and %d objective calls\n\n",
			res.measureWords(), compactFloat(l.Gradient, 3), compactFloat(l.Step, 3), scale, l.Iterations, l.Evaluations)
	}
	differences := !p.Derivative.Exact
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	var header []string
	for i, c := range traceColumns {
		if i == 2 && !differences {
			continue
		}
		header = append(header, c.table)
	}
	fmt.Fprintln(tw, strings.Join(header, "\t")+"\t")
	short := func(v float64) string { return compactFloat(v, 3) }
	long := func(v float64) string { return strconv.FormatFloat(v, 'g', 10, 64) }
	u := rules.Roundoff(p.Shape.Elem)
	for i, r := range res.Rows {
		cells := traceCells(res, r, short, long)
		if i > 0 && math.Abs(r.Decrease) <= 64*u*math.Max(math.Abs(r.F), math.Abs(res.Rows[i-1].F)) {
			cells[5] = "rounding" // the change in f is rounding noise: the ratio says nothing
		}
		for i := range cells {
			if cells[i] == "" {
				cells[i] = "—"
			}
		}
		if !differences {
			cells = append(cells[:2], cells[3:]...)
		}
		fmt.Fprintln(tw, strings.Join(cells, "\t")+"\t")
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintf(w, "\n%s (%s) after %d iterations and %d objective calls; f = %s\n", res.Status, verdict(res.Converged), res.Iterations, res.Evaluations, strconv.FormatFloat(res.F, 'g', 17, 64))
	if note := traceEnding(res); note != "" {
		fmt.Fprintln(w, note)
	}
	return nil
}

func verdict(converged bool) string {
	if converged {
		return "converged"
	}
	return "not converged"
}

// traceEnding says what happened after the last row, when something did.
func traceEnding(res *TraceResult) string {
	if len(res.Rows) == 0 {
		return "no rows: the run ended before its first gradient"
	}
	last := res.Rows[len(res.Rows)-1]
	switch {
	case res.Iterations > last.Iteration:
		return fmt.Sprintf("move %d (%s) was taken without its gradient: the evaluation cap came first", res.Iterations, plural(res.LastTrials, "trial"))
	case res.LastTrials > 0:
		return fmt.Sprintf("the last line search spent %s and accepted none", plural(res.LastTrials, "trial"))
	case res.Evaluations > last.Evaluations:
		return fmt.Sprintf("%s after the last move accepted no step", plural(res.Evaluations-last.Evaluations, "objective call"))
	}
	return ""
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return strconv.Itoa(n) + " " + word + "s"
}

// compactFloat renders v with the given significant digits and a short
// exponent: 0.0123, 4.5e-9, 1.2e13.
func compactFloat(v float64, digits int) string {
	s := strconv.FormatFloat(v, 'g', digits, 64)
	if i := strings.IndexByte(s, 'e'); i >= 0 {
		mant, exp := s[:i], s[i+1:]
		sign := ""
		if exp[0] == '-' {
			sign = "-"
		}
		exp = strings.TrimLeft(exp, "+-0")
		if exp == "" {
			exp = "0"
		}
		s = mant + "e" + sign + exp
	}
	return s
}

// WriteTraceCSV writes the table's columns, with full precision and the
// difference calls always present, then x₁…x_N; cells that do not apply
// to the start are empty.
func WriteTraceCSV(w io.Writer, res *TraceResult) error {
	cw := csv.NewWriter(w)
	var header []string
	for _, c := range traceColumns {
		header = append(header, c.csv)
	}
	if len(res.Rows) > 0 {
		for i := range res.Rows[0].X {
			header = append(header, "x"+strconv.Itoa(i+1))
		}
	}
	cw.Write(header)
	for _, r := range res.Rows {
		rec := traceCells(res, r, fmtFloat, fmtFloat)
		for _, v := range r.X {
			rec = append(rec, fmtFloat(v))
		}
		cw.Write(rec)
	}
	cw.Flush()
	return cw.Error()
}

func fmtFloat(v float64) string { return strconv.FormatFloat(v, 'g', -1, 64) }

func formatNumbers(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = fmtFloat(x)
	}
	if len(s) == 1 {
		return s[0]
	}
	return "[" + strings.Join(s, ", ") + "]"
}

func xmlEscape(s string) string {
	return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&quot;").Replace(s)
}
