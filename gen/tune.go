package gen

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"text/tabwriter"

	"github.com/dave/jennifer/jen"

	"github.com/thalweg-go/thalweg/rules"
)

// TunePolicies are the direction × step-rule pairs tune tries: every
// direction with every rule the registry marks for tuning that suits it
// (a direction that needs a curvature condition only with a rule that
// enforces one; Nocedal & Wright 2006, §5.2), each switch the rule reads
// both ways. Fixed steps need a hand-picked step and simple decrease
// guarantees nothing (§3.1), so the registry leaves them out; they are
// tried only when the spec itself uses them. With bounds, directions
// that cannot take them are left out. For a residual objective the
// least-squares directions join, each with the rules it goes with; for
// any other objective they, and the rules only they take, are left out.
func TunePolicies(bounded, residual bool) []Policy {
	var out []Policy
	for _, d := range rules.Direction.Entries {
		if bounded && d.NoBounds != "" || d.Residual && !residual {
			continue
		}
		for _, r := range rules.StepRule.Entries {
			if !r.Tune || d.NeedsCurvature && !r.Curvature || !rules.Suits(d, r) {
				continue
			}
			out = append(out, Policy{Direction: d, Rule: r})
			for _, p := range r.Params {
				if p.Kind == rules.Switch {
					out = append(out, Policy{Direction: d, Rule: r, On: p})
				}
			}
		}
	}
	return out
}

// Policy is one direction and step rule, with at most one switch on.
type Policy struct {
	Direction, Rule *rules.Entry
	On              *rules.Param
}

func (p Policy) String() string {
	s := p.Direction.Name + " + " + p.Rule.Name
	if p.On != nil {
		s += " (" + p.On.Key + ")"
	}
	return s
}

// TuneRow is one policy's run from the spec's start.
type TuneRow struct {
	Policy      Policy
	Spec        bool // the spec's own choice
	Recommended bool
	Status      string
	Converged   bool
	Iterations  int
	Evaluations int
	F           float64
	Nanoseconds float64 // per solve
}

// Tune compiles one minimizer per sensible policy with the spec's package
// (through an overlay, writing nothing into it), runs each from the
// spec's start, and returns the rows best first: converged runs before the
// others, the gradient test before the step test, then fewer objective
// calls, then less time.
func Tune(p *Plan) ([]TuneRow, error) {
	own := Policy{Direction: p.Direction, Rule: p.Rule}
	for _, q := range p.Rule.Params {
		if q.Kind == rules.Switch && p.Switch(q) {
			own.On = q
		}
	}
	policies := []Policy{own}
	for _, pol := range TunePolicies(p.Bounded, p.Shape.Residuals > 0) {
		if pol != own {
			policies = append(policies, pol)
		}
	}
	var current bytes.Buffer
	if err := EmitMinimizer(&current, p); err != nil {
		return nil, err
	}
	files := map[string][]byte{
		p.Output: current.Bytes(), // the spec's own minimizer as it is now, in case the file is stale
	}
	var names []string
	var kept []Policy
	for i, pol := range policies {
		variant := p.variant(pol, fmt.Sprintf("ThalwegTune%d", i))
		if variant == nil {
			continue // over the stack limit for this direction
		}
		var buf bytes.Buffer
		if err := EmitMinimizer(&buf, variant); err != nil {
			return nil, err
		}
		files[filepath.Join(p.Spec.PackageDir, fmt.Sprintf("thalweg_tune_%d.go", i))] = buf.Bytes()
		names = append(names, variant.M.Name)
		kept = append(kept, pol)
	}
	var harness bytes.Buffer
	if err := emitTuneHarness(&harness, p, names); err != nil {
		return nil, err
	}
	files[filepath.Join(p.Spec.PackageDir, "thalweg_tune_harness_test.go")] = harness.Bytes()
	out, err := runOverlay(p, files, "^TestThalwegTune$")
	if err != nil {
		return nil, err
	}
	rows, err := parseTune(out, kept)
	if err != nil {
		return nil, err
	}
	rows[0].Spec = true
	sort.SliceStable(rows, func(i, j int) bool {
		a, b := rows[i], rows[j]
		if a.Converged != b.Converged {
			return a.Converged
		}
		if small := "gradient small"; (a.Status == small) != (b.Status == small) {
			return a.Status == small // the gradient test is the stronger evidence
		}
		if a.Evaluations != b.Evaluations {
			return a.Evaluations < b.Evaluations
		}
		return a.Nanoseconds < b.Nanoseconds
	})
	rows[0].Recommended = rows[0].Converged
	return rows, nil
}

// variant is the plan with another policy under another name. Values the
// spec set are kept, except those the new direction has its own default
// for (cg's curvature constant) when the direction changes; nil when the
// variant's state would not fit on the stack or its constants conflict.
func (p *Plan) variant(pol Policy, name string) *Plan {
	m := *p.M
	m.Name, m.Direction, m.Rule = name, pol.Direction, pol.Rule
	m.Given = map[*rules.Param]float64{}
	for q, v := range p.M.Given {
		if _, own := pol.Direction.Defaults[q]; own && pol.Direction != p.Direction {
			continue
		}
		if q.Kind != rules.Switch {
			m.Given[q] = v
		}
	}
	if pol.On != nil {
		m.Given[pol.On] = 1
	}
	m.Output = "thalweg_tune_" + name + ".go"
	m.Expect = nil
	var probs Problems
	checkStackSize(&m, p.Shape, p.Spec.pos, &probs)
	if len(probs) > 0 {
		return nil
	}
	v := *p
	v.M = &m
	v.Prefix = lowerFirst(name)
	if d := p.Shape.Derived; d != nil {
		// the spec's own file declares the derived code's names: the
		// variant's copy takes its own
		v.Shape.Derived = d.renamed(v.Prefix)
		if v.Shape.Gradient != "" {
			v.Shape.Gradient = v.Shape.Derived.Gradient
		}
		if v.Shape.Jacobian != "" {
			v.Shape.Jacobian = v.Shape.Derived.Jacobian
		}
	}
	v.Context = resolveContext(&m, p.Shape.Elem, p.Shape.Dim)
	for _, q := range rules.Params() {
		if q.Exceeds != nil && v.Reads(q) && v.Reads(q.Exceeds) && !(v.Value(q) > v.Value(q.Exceeds)) {
			return nil // the spec's c1 is not below this direction's c2
		}
	}
	return &v
}

// emitTuneHarness writes a test that runs every variant once for its
// outcome, then repeatedly for about 20 ms to time a solve, and prints a
// tab-separated line per variant.
func emitTuneHarness(w io.Writer, p *Plan, names []string) error {
	f := jen.NewFile(p.Shape.Package)
	f.HeaderComment("Code generated by thalweg tune for a temporary build; DO NOT EDIT.")
	if p.Shape.Receiver != "" {
		emitTestReceiver(f, p, "thalwegTuneReceiver")
	}
	// The receiver and the start are built once, outside the timing.
	var body []jen.Code
	args := []jen.Code{}
	if p.Shape.Receiver != "" {
		body = append(body, jen.Id("recv").Op(":=").Id("thalwegTuneReceiver").Call())
		args = append(args, jen.Id("recv"))
	}
	body = append(body, jen.Id("x0").Op(":=").Add(literal(p, p.M.Start)))
	args = append(args, jen.Id("x0"))
	for i, name := range names {
		// r := NAME(…); n, start := 0, time.Now(); for … { NAME(…) }; print
		body = append(body, jen.Block(
			jen.Id("r").Op(":=").Id(name).Call(args...),
			jen.List(jen.Id("n"), jen.Id("start")).Op(":=").List(jen.Lit(0), jen.Qual("time", "Now").Call()),
			jen.For(jen.Id("n").Op("==").Lit(0).Op("||").Qual("time", "Since").Call(jen.Id("start")).Op("<").Lit(20).Op("*").Qual("time", "Millisecond")).Block(
				jen.Id(name).Call(args...),
				jen.Id("n").Op("++"),
			),
			jen.Id("ns").Op(":=").Float64().Call(jen.Qual("time", "Since").Call(jen.Id("start")).Dot("Nanoseconds").Call()).Op("/").Float64().Call(jen.Id("n")),
			jen.Qual("fmt", "Printf").Call(jen.Lit("thalweg-tune\t%d\t%s\t%v\t%d\t%d\t%v\t%v\n"), jen.Lit(i), jen.Id("r").Dot("Status"), jen.Id("r").Dot("Status").Dot("Converged").Call(),
				jen.Id("r").Dot("Iterations"), jen.Id("r").Dot("Evaluations"), jen.Float64().Call(jen.Id("r").Dot("F")), jen.Id("ns")),
		))
	}
	f.Func().Id("TestThalwegTune").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(body...)
	return f.Render(w)
}

func parseTune(out []byte, policies []Policy) ([]TuneRow, error) {
	rows := make([]TuneRow, len(policies))
	seen := 0
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		fields := strings.Split(sc.Text(), "\t")
		if fields[0] != "thalweg-tune" || len(fields) != 8 {
			continue
		}
		i, err := strconv.Atoi(fields[1])
		if err != nil || i < 0 || i >= len(rows) {
			return nil, fmt.Errorf("malformed tune line %q", sc.Text())
		}
		r := &rows[i]
		r.Policy = policies[i]
		r.Status = fields[2]
		r.Converged = fields[3] == "true"
		r.Iterations, _ = strconv.Atoi(fields[4])
		r.Evaluations, _ = strconv.Atoi(fields[5])
		r.F, _ = strconv.ParseFloat(fields[6], 64)
		r.Nanoseconds, _ = strconv.ParseFloat(fields[7], 64)
		seen++
	}
	if seen != len(rows) {
		return nil, fmt.Errorf("the tuning runs printed %d of %d results:\n%s", seen, len(rows), out)
	}
	return rows, nil
}

// WriteTuneTable prints the rows, best first, marking the spec's choice
// and the recommended one.
func WriteTuneTable(w io.Writer, p *Plan, rows []TuneRow) error {
	fmt.Fprintf(w, "%s from start %s, derivative %s, each policy with the spec's step constants and stop limits:\n\n", p.M.Name, formatNumbers(p.M.Start), p.Derivative.Name)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "policy\tstatus\tobjective calls\titerations\tfinal f\ttime per solve\t")
	// With an analytic gradient the objective calls leave out gradient
	// calls: Wolfe rules make one at most trials, backtracking one per step.
	// A combined objective's calls include its gradients.
	for _, r := range rows {
		var marks []string
		if r.Recommended {
			marks = append(marks, "recommended")
		}
		if r.Spec {
			marks = append(marks, "the spec's choice")
		}
		mark := ""
		if len(marks) > 0 {
			mark = "  ← " + strings.Join(marks, ", ")
		}
		fmt.Fprintf(tw, "%s\t%s\t%d\t%d\t%s\t%s\t%s\n", r.Policy, r.Status, r.Evaluations, r.Iterations,
			strconv.FormatFloat(r.F, 'g', 8, 64), formatDuration(r.Nanoseconds), mark)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	if !rows[0].Recommended {
		_, err := fmt.Fprintln(w, "\nNo policy converged from start: check the objective, the start and the stop limits.")
		return err
	}
	note := ""
	switch {
	case p.Shape.Combined:
		note = " Each objective call gives the value and the gradient together, so the counts compare the policies fully."
	case p.Derivative.Exact:
		note = " Objective calls leave out gradient calls, which the Wolfe rules make at more trials than backtracking does; the time includes both."
	}
	_, err := fmt.Fprintln(w, "\nRanked by convergence (the gradient test first), then objective calls, then time; times are for this machine, so validate on the target."+note)
	return err
}

func formatDuration(ns float64) string {
	switch {
	case ns >= 1e6:
		return strconv.FormatFloat(ns/1e6, 'f', 2, 64) + " ms"
	case ns >= 1e3:
		return strconv.FormatFloat(ns/1e3, 'f', 2, 64) + " µs"
	}
	return strconv.FormatFloat(ns, 'f', 0, 64) + " ns"
}
