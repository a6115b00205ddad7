package gen

import (
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"
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

// WriteTraceTable prints one row per iteration and the outcome.
func WriteTraceTable(w io.Writer, p *Plan, res *TraceResult) error {
	fmt.Fprintf(w, "%s: direction %s, step rule %s, derivative %s, from start %s\n\n", p.M.Name, p.Direction.Name, p.Rule.Name, p.Derivative.Name, formatNumbers(p.M.Start))
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "iteration\tobjective calls\tf\tlargest |gradient|\taccepted step\t")
	for _, r := range res.Rows {
		step := "—"
		if r.Iteration > 0 {
			step = strconv.FormatFloat(r.Step, 'g', 6, 64)
		}
		fmt.Fprintf(tw, "%d\t%d\t%s\t%s\t%s\t\n", r.Iteration, r.Evaluations,
			strconv.FormatFloat(r.F, 'g', 10, 64), strconv.FormatFloat(r.Gradient, 'g', 4, 64), step)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	verdict := "not converged"
	if res.Converged {
		verdict = "converged"
	}
	_, err := fmt.Fprintf(w, "\n%s (%s) after %d iterations and %d objective calls; f = %s\n", res.Status, verdict, res.Iterations, res.Evaluations, strconv.FormatFloat(res.F, 'g', 17, 64))
	return err
}

// WriteTraceCSV writes the rows with a header: iteration, objective
// calls, f, largest gradient component, accepted step, then x.
func WriteTraceCSV(w io.Writer, res *TraceResult) error {
	cw := csv.NewWriter(w)
	header := []string{"iteration", "evaluations", "f", "gradient_max", "step"}
	if len(res.Rows) > 0 {
		for i := range res.Rows[0].X {
			header = append(header, "x"+strconv.Itoa(i+1))
		}
	}
	cw.Write(header)
	for _, r := range res.Rows {
		rec := []string{strconv.Itoa(r.Iteration), strconv.Itoa(r.Evaluations), fmtFloat(r.F), fmtFloat(r.Gradient), fmtFloat(r.Step)}
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

// WriteTraceSVG draws the convergence chart: log10 of the largest
// gradient component and of f − f_final against the iteration.
func WriteTraceSVG(w io.Writer, p *Plan, res *TraceResult) error {
	const width, height, left, right, top, bottom = 720.0, 400.0, 70.0, 20.0, 40.0, 50.0
	final := res.F
	type series struct {
		name, color string
		points      [][2]float64 // iteration, log10 value
	}
	grad := series{name: "log₁₀ largest |gradient|", color: "#1f77b4"}
	gap := series{name: "log₁₀ (f − final f)", color: "#d62728"}
	for _, r := range res.Rows {
		if v := math.Abs(r.Gradient); v > 0 && !math.IsInf(v, 0) && !math.IsNaN(v) {
			grad.points = append(grad.points, [2]float64{float64(r.Iteration), math.Log10(v)})
		}
		if v := r.F - final; v > 0 && !math.IsInf(v, 0) {
			gap.points = append(gap.points, [2]float64{float64(r.Iteration), math.Log10(v)})
		}
	}
	lastIteration, low, high := 1.0, math.Inf(1), math.Inf(-1)
	for _, s := range []series{grad, gap} {
		for _, pt := range s.points {
			lastIteration = math.Max(lastIteration, pt[0])
			low, high = math.Min(low, pt[1]), math.Max(high, pt[1])
		}
	}
	if math.IsInf(low, 0) {
		low, high = -1, 1
	}
	low, high = math.Floor(low), math.Ceil(high)
	if high == low {
		high = low + 1
	}
	x := func(it float64) float64 { return left + (width-left-right)*it/lastIteration }
	y := func(v float64) float64 { return top + (height-top-bottom)*(high-v)/(high-low) }

	var b strings.Builder
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" width="%g" height="%g" viewBox="0 0 %g %g" font-family="sans-serif" font-size="12">`+"\n", width, height, width, height)
	fmt.Fprintf(&b, `<rect width="100%%" height="100%%" fill="white"/>`+"\n")
	fmt.Fprintf(&b, `<text x="%g" y="20" font-size="14">%s: %s (%d iterations, %d objective calls)</text>`+"\n", left, xmlEscape(p.M.Name), xmlEscape(res.Status), res.Iterations, res.Evaluations)
	// Axes with a tick per decade (at most 12) and per iteration step.
	fmt.Fprintf(&b, `<line x1="%g" y1="%g" x2="%g" y2="%g" stroke="black"/>`+"\n", left, top, left, height-bottom)
	fmt.Fprintf(&b, `<line x1="%g" y1="%g" x2="%g" y2="%g" stroke="black"/>`+"\n", left, height-bottom, width-right, height-bottom)
	decade := math.Max(1, math.Ceil((high-low)/12))
	for v := low; v <= high; v += decade {
		fmt.Fprintf(&b, `<line x1="%g" y1="%.1f" x2="%g" y2="%.1f" stroke="#ddd"/><text x="%g" y="%.1f" text-anchor="end">%g</text>`+"\n", left, y(v), width-right, y(v), left-6, y(v)+4, v)
	}
	stepX := math.Max(1, math.Ceil(lastIteration/10))
	for it := 0.0; it <= lastIteration; it += stepX {
		fmt.Fprintf(&b, `<text x="%.1f" y="%g" text-anchor="middle">%g</text>`+"\n", x(it), height-bottom+18, it)
	}
	fmt.Fprintf(&b, `<text x="%g" y="%g" text-anchor="middle">iteration</text>`+"\n", (left+width-right)/2, height-10)
	for i, s := range []series{grad, gap} {
		if len(s.points) > 0 {
			var pts []string
			for _, pt := range s.points {
				pts = append(pts, fmt.Sprintf("%.1f,%.1f", x(pt[0]), y(pt[1])))
			}
			fmt.Fprintf(&b, `<polyline fill="none" stroke="%s" stroke-width="2" points="%s"/>`+"\n", s.color, strings.Join(pts, " "))
		}
		fmt.Fprintf(&b, `<line x1="%g" y1="%d" x2="%g" y2="%d" stroke="%s" stroke-width="2"/><text x="%g" y="%d">%s</text>`+"\n",
			width-right-210, 40+16*i, width-right-190, 40+16*i, s.color, width-right-185, 44+16*i, xmlEscape(s.name))
	}
	b.WriteString("</svg>\n")
	_, err := io.WriteString(w, b.String())
	return err
}

func xmlEscape(s string) string {
	return strings.NewReplacer("&", "&amp;", "<", "&lt;", ">", "&gt;", `"`, "&quot;").Replace(s)
}
