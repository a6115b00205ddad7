package gen

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/dave/jennifer/jen"

	"github.com/thalweg-go/thalweg/rules"
)

// TraceRow is the state after the first gradient (iteration 0, the start)
// and after every accepted step. The fields after X are derived from the
// row and the one before it; they are NaN where they do not apply (at the
// start).
type TraceRow struct {
	Iteration     int
	Evaluations   int     // objective calls so far
	Trials        int     // trial points this step's line search evaluated (0 at the start)
	GradientCalls int     // objective calls for finite differences in this step (at the start, the first gradient's)
	F             float64 // f(x)
	Gradient      float64 // the gradient test's measure as the kernel's stationarity computes it (relative or largest |∂f/∂xᵢ|, projected with bounds), error bounds of differences left out
	Step          float64 // the accepted step t along d (0 at the start)
	Slope         float64 // ∇fᵀd where this step's search began (0 at the start)
	X             []float64

	Decrease    float64 // f before the step minus f after it
	Predicted   float64 // −t·∇fᵀd: the decrease the line model predicted
	StepMeasure float64 // largest |Δxᵢ|/(|xᵢ| + 1): the step test's measure
}

// DecreaseRatio is the decrease achieved over the decrease predicted: at
// least c1 under the Armijo rule, near 1 where f is nearly linear along d
// over the step, ½ at the exact minimizer along d of a quadratic.
func (r TraceRow) DecreaseRatio() float64 { return r.Decrease / r.Predicted }

// TraceLimits are the stop limits the traced run used.
type TraceLimits struct {
	Gradient, Step          float64
	Iterations, Evaluations int
}

// TracePoint is one trial of a line search, recorded for objectives of
// two unknowns: Iteration is the move the search was for, so the search
// left from row Iteration−1 (and one more than the last row for a search
// that ended the run).
type TracePoint struct {
	Iteration int
	F         float64
	X         []float64
}

// TraceGrid is the objective on a regular grid over a box around the
// path, for objectives of two unknowns: F[j][i] = f(X[i], Y[j]), NaN or
// ±Inf where f is.
type TraceGrid struct {
	X, Y []float64
	F    [][]float64
}

// TraceResult is one traced run.
type TraceResult struct {
	Rows        []TraceRow
	Limits      TraceLimits
	Status      string
	Converged   bool
	Iterations  int
	Evaluations int
	F           float64
	// LastTrials counts the trials made after the last row: those of a
	// line search that ended the run without a step.
	LastTrials int
	Trials     []TracePoint // two unknowns only
	Grid       *TraceGrid   // two unknowns only
	// Scale is the spec's scale, nil without one: the step test then
	// measures the scaled unknowns xᵢ/sᵢ.
	Scale []float64
	// Relative reports that Gradient is the relative gradient (the spec's
	// stop.gradient_test), not the largest |∂f/∂xᵢ|.
	Relative bool
	// OwnScale reports a residual objective's step test, which measures
	// |Δxᵢ| against |xᵢ| (1 at 0) instead of |xᵢ| + 1.
	OwnScale bool
}

// Names of the hooks in the instrumented copy and of the harness's helpers.
const (
	traceHook     = "thalwegTraceObserve" // observe, after the start and each accepted step
	traceTrial    = "thalwegTraceTrial"   // wraps each trial's objective call
	traceGridFunc = "thalwegTraceGrid"
	traceGridSize = 80 // grid cells per side of the box
)

// Trace compiles an instrumented copy of the minimizer with its package,
// without writing into the package (go test -overlay), runs it once from
// the spec's start and returns one row per iteration; for two unknowns
// also every trial point and the objective on a grid around the path.
func Trace(p *Plan) (*TraceResult, error) {
	choice := p.kernelChoice()
	choice.trace, choice.traceHook, choice.traceTrial = true, traceHook, traceTrial
	var minimizer, harness bytes.Buffer
	if _, err := emitMinimizer(&minimizer, p, choice); err != nil {
		return nil, err
	}
	if err := emitTraceHarness(&harness, p); err != nil {
		return nil, err
	}
	out, err := runOverlay(p, map[string][]byte{
		p.Output: minimizer.Bytes(),
		filepath.Join(p.Spec.PackageDir, "thalweg_trace_harness_test.go"): harness.Bytes(),
	}, "^TestThalwegTrace$")
	if err != nil {
		return nil, err
	}
	res, err := parseTrace(out)
	if err != nil {
		return nil, err
	}
	res.Relative = p.M.Test == rules.Relative
	res.OwnScale = p.Shape.Residuals > 0
	if p.Scaled() {
		res.Scale = p.M.Scale
		res.derive()
	}
	return res, nil
}

// emitTraceHarness writes the recorders and the test that runs the
// minimizer once; they print tab-separated lines that parseTrace reads:
//
//	thalweg-limits  gradient step iterations evaluations      (the limits of the run)
//	thalweg-trial   f x₁ x₂                                   (two unknowns: each trial)
//	thalweg-trace   iteration evaluations trials f |g|max t slope x…
//	thalweg-result  status converged iterations evaluations f trials-since-the-last-row
//	thalweg-grid    cells x-low x-high y-low y-high           (two unknowns)
//	thalweg-gridrow f…                                        (cells+1 lines of cells+1 values)
func emitTraceHarness(w io.Writer, p *Plan) error {
	s := p.Shape
	plane := s.Dim == 2
	f := jen.NewFile(s.Package)
	f.HeaderComment("Code generated by thalweg trace for a temporary build; DO NOT EDIT.")
	vec := jen.Op("*").Index(jen.Lit(s.Dim)).Id(s.Elem)
	float := func(c jen.Code) *jen.Statement { return jen.Float64().Call(c) }
	appendFloat := func(buf string, v jen.Code) jen.Code {
		return jen.Id(buf).Op("=").Qual("strconv", "AppendFloat").Call(jen.Append(jen.Id(buf), jen.LitRune('\t')), v, jen.LitRune('g'), jen.Lit(-1), jen.Lit(64))
	}

	vars := []jen.Code{
		jen.Id("thalwegTraceTrials").Int().Comment("trials since the last row"),
		jen.Id("thalwegTraceRows").Int(),
	}
	if plane {
		vars = append(vars, jen.List(jen.Id("thalwegTraceLow"), jen.Id("thalwegTraceHigh")).Index(jen.Lit(2)).Float64().Comment("the iterates' bounding box"))
	}
	f.Var().Defs(vars...)

	// func thalwegTraceTrial(x *[N]T, fx T) T: counts (and for two
	// unknowns prints) a trial, and hands its value back.
	// With scale, the kernels hand over their z; rows show the user's x.
	point, unscale := "x", []jen.Code(nil)
	if p.Scaled() {
		point, unscale = "z", []jen.Code{jen.Id("x").Op(":=").Id(p.Prefix + "Unscaled").Call(jen.Id("z"))}
	}
	trialBody := []jen.Code{jen.Id("thalwegTraceTrials").Op("++")}
	if plane {
		trialBody = append(trialBody, unscale...)
	}
	if plane {
		trialBody = append(trialBody, jen.Qual("fmt", "Printf").Call(jen.Lit("thalweg-trial\t%v\t%v\t%v\n"), float(jen.Id("fx")), float(jen.Id("x").Index(jen.Lit(0))), float(jen.Id("x").Index(jen.Lit(1)))))
	}
	trialBody = append(trialBody, jen.Return(jen.Id("fx")))
	f.Func().Id(traceTrial).Params(jen.Id(point).Add(vec.Clone()), jen.Id("fx").Id(s.Elem)).Id(s.Elem).Block(trialBody...)

	// func thalwegTraceObserve(iteration, evaluations int, x *[N]T, fx T, g *[N]T, step, slope T)
	xLoop := []jen.Code{appendFloat("row", float(jen.Id("v")))}
	index := jen.Id("_")
	if plane {
		index = jen.Id("i")
		xLoop = append(xLoop,
			jen.If(jen.Id("thalwegTraceRows").Op("==").Lit(0).Op("||").Float64().Call(jen.Id("v")).Op("<").Id("thalwegTraceLow").Index(jen.Id("i"))).Block(jen.Id("thalwegTraceLow").Index(jen.Id("i")).Op("=").Float64().Call(jen.Id("v"))),
			jen.If(jen.Id("thalwegTraceRows").Op("==").Lit(0).Op("||").Float64().Call(jen.Id("v")).Op(">").Id("thalwegTraceHigh").Index(jen.Id("i"))).Block(jen.Id("thalwegTraceHigh").Index(jen.Id("i")).Op("=").Float64().Call(jen.Id("v"))),
		)
	}
	// The gradient test's measure as the kernel computes it (its own
	// stationarity: relative or absolute, projected with bounds, in the
	// scaled unknowns with a scale), without the differences' error bound.
	measure := []jen.Code{
		jen.Var().Id("noError").Index(jen.Lit(s.Dim)).Id(s.Elem),
		jen.Id("b").Op(":=").Add(kernelBoxValue(p)),
		jen.List(jen.Id("measure"), jen.Id("_")).Op(":=").Id(p.Prefix+"Stationarity").Call(jen.Id("g"), jen.Op("&").Id("noError"), jen.Id(point), jen.Id("fx"), jen.Op("&").Id("b")),
	}
	f.Func().Id(traceHook).Params(
		jen.List(jen.Id("iteration"), jen.Id("evaluations")).Int(),
		jen.Id(point).Add(vec.Clone()), jen.Id("fx").Id(s.Elem), jen.Id("g").Add(vec.Clone()),
		jen.List(jen.Id("step"), jen.Id("slope")).Id(s.Elem),
	).Block(append(append(unscale, measure...),
		jen.Id("row").Op(":=").Index().Byte().Call(jen.Qual("fmt", "Sprintf").Call(jen.Lit("thalweg-trace\t%d\t%d\t%d"), jen.Id("iteration"), jen.Id("evaluations"), jen.Id("thalwegTraceTrials"))),
		appendFloat("row", float(jen.Id("fx"))),
		appendFloat("row", float(jen.Id("measure"))),
		appendFloat("row", float(jen.Id("step"))),
		appendFloat("row", float(jen.Id("slope"))),
		jen.For(jen.List(index, jen.Id("v")).Op(":=").Range().Id("x")).Block(xLoop...),
		jen.Qual("fmt", "Println").Call(jen.String().Call(jen.Id("row"))),
		jen.Id("thalwegTraceTrials").Op("=").Lit(0),
		jen.Id("thalwegTraceRows").Op("++"),
	)...)

	var recvParam, recvArg []jen.Code
	if s.Receiver != "" {
		emitTestReceiver(f, p, "thalwegTraceReceiver")
		t := jen.Id(s.Receiver)
		if s.Pointer {
			t = jen.Op("*").Id(s.Receiver)
		}
		recvParam, recvArg = []jen.Code{jen.Id("recv").Add(t)}, []jen.Code{jen.Id("recv")}
	}
	if plane {
		emitTraceGrid(f, p, recvParam)
	}

	test := []jen.Code{}
	if s.Receiver != "" {
		test = append(test, jen.Id("recv").Op(":=").Id("thalwegTraceReceiver").Call())
	}
	test = append(test,
		jen.Id("lim").Op(":=").Id(p.M.Name+"DefaultLimits").Call(),
		jen.Qual("fmt", "Printf").Call(jen.Lit("thalweg-limits\t%v\t%v\t%d\t%d\n"), float(jen.Id("lim").Dot("Gradient")), float(jen.Id("lim").Dot("Step")), jen.Id("lim").Dot("Iterations"), jen.Id("lim").Dot("Evaluations")),
		jen.Id("r").Op(":=").Id(p.M.Name+"WithLimits").Call(append(append(recvArg, literal(p, p.M.Start)), jen.Id("lim"))...),
		jen.Qual("fmt", "Printf").Call(jen.Lit("thalweg-result\t%s\t%v\t%d\t%d\t%v\t%d\n"), jen.Id("r").Dot("Status"), jen.Id("r").Dot("Status").Dot("Converged").Call(), jen.Id("r").Dot("Iterations"), jen.Id("r").Dot("Evaluations"), float(jen.Id("r").Dot("F")), jen.Id("thalwegTraceTrials")),
	)
	if plane {
		test = append(test, jen.If(jen.Id("thalwegTraceRows").Op(">").Lit(0)).Block(jen.Id(traceGridFunc).Call(recvArg...)))
	}
	f.Func().Id("TestThalwegTrace").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(test...)
	return f.Render(w)
}

// emitTraceGrid writes the function that evaluates the objective on a
// grid of traceGridSize cells a side over the iterates' bounding box,
// padded by a fifth of its size on each side, each side at least 0.4
// times the longer one (so that a path along one axis still shows the
// valley it follows), and ±0.1·(|x|+1) around a start that never moved.
func emitTraceGrid(f *jen.File, p *Plan, recvParam []jen.Code) {
	s := p.Shape
	var arg jen.Code
	switch s.Arg {
	case ArgArray:
		arg = jen.Id("x")
	case ArgPointer:
		arg = jen.Op("&").Id("x")
	default:
		arg = jen.Id("x").Index(jen.Op(":"))
	}
	args := []jen.Code{arg}
	var scratch []jen.Code
	if s.Combined {
		// A combined objective writes its gradient too, here into a
		// scratch g that the grid ignores.
		scratch = []jen.Code{jen.Var().Id("g").Index(jen.Lit(2)).Id(s.Elem)}
		if s.Arg == ArgSlice {
			args = append(args, jen.Id("g").Index(jen.Op(":")))
		} else {
			args = append(args, jen.Op("&").Id("g"))
		}
	}
	objective := jen.Id(s.Objective)
	if s.Receiver != "" {
		objective = jen.Id("recv").Dot(s.Objective)
	}
	if s.Residuals > 0 {
		// A residual objective's value is ½‖r‖², computed by a closure
		// on the grid point.
		scratch = []jen.Code{jen.Id("half").Op(":=").Func().Params(jen.Id("x").Index(jen.Lit(2)).Id(s.Elem)).Id(s.Elem).Block(halfSquaresBody(p, userCall(s))...)}
		objective, args = jen.Id("half"), []jen.Code{jen.Id("x")}
	}
	low := func(i jen.Code) *jen.Statement { return jen.Id("thalwegTraceLow").Index(i) }
	high := func(i jen.Code) *jen.Statement { return jen.Id("thalwegTraceHigh").Index(i) }
	f.Func().Id(traceGridFunc).Params(recvParam...).Block(
		jen.Const().Id("n").Op("=").Lit(traceGridSize),
		jen.Id("longest").Op(":=").Qual("math", "Max").Call(high(jen.Lit(0)).Op("-").Add(low(jen.Lit(0))), high(jen.Lit(1)).Op("-").Add(low(jen.Lit(1)))),
		jen.Var().List(jen.Id("lo"), jen.Id("hi")).Index(jen.Lit(2)).Float64(),
		jen.For(jen.Id("i").Op(":=").Range().Id("lo")).Block(
			jen.Id("mid").Op(":=").Parens(low(jen.Id("i")).Op("+").Add(high(jen.Id("i")))).Op("/").Lit(2),
			jen.Id("half").Op(":=").Qual("math", "Max").Call(jen.Lit(0.7).Op("*").Parens(high(jen.Id("i")).Op("-").Add(low(jen.Id("i")))), jen.Lit(0.2).Op("*").Id("longest")),
			jen.If(jen.Id("half").Op("==").Lit(0)).Block(jen.Id("half").Op("=").Lit(0.1).Op("*").Parens(jen.Qual("math", "Abs").Call(jen.Id("mid")).Op("+").Lit(1))),
			jen.List(jen.Id("lo").Index(jen.Id("i")), jen.Id("hi").Index(jen.Id("i"))).Op("=").List(jen.Id("mid").Op("-").Id("half"), jen.Id("mid").Op("+").Id("half")),
		),
		jen.Qual("fmt", "Printf").Call(jen.Lit("thalweg-grid\t%d\t%v\t%v\t%v\t%v\n"), jen.Id("n"), jen.Id("lo").Index(jen.Lit(0)), jen.Id("hi").Index(jen.Lit(0)), jen.Id("lo").Index(jen.Lit(1)), jen.Id("hi").Index(jen.Lit(1))),
		jen.For(jen.Id("j").Op(":=").Lit(0), jen.Id("j").Op("<=").Id("n"), jen.Id("j").Op("++")).Block(
			jen.Id("row").Op(":=").Index().Byte().Call(jen.Lit("thalweg-gridrow")),
			jen.For(jen.Id("i").Op(":=").Lit(0), jen.Id("i").Op("<=").Id("n"), jen.Id("i").Op("++")).Block(append(scratch,
				jen.Var().Id("x").Index(jen.Lit(2)).Id(s.Elem),
				jen.Id("x").Index(jen.Lit(0)).Op("=").Id(s.Elem).Call(jen.Id("lo").Index(jen.Lit(0)).Op("+").Parens(jen.Id("hi").Index(jen.Lit(0)).Op("-").Id("lo").Index(jen.Lit(0))).Op("*").Float64().Call(jen.Id("i")).Op("/").Id("n")),
				jen.Id("x").Index(jen.Lit(1)).Op("=").Id(s.Elem).Call(jen.Id("lo").Index(jen.Lit(1)).Op("+").Parens(jen.Id("hi").Index(jen.Lit(1)).Op("-").Id("lo").Index(jen.Lit(1))).Op("*").Float64().Call(jen.Id("j")).Op("/").Id("n")),
				jen.Id("row").Op("=").Qual("strconv", "AppendFloat").Call(jen.Append(jen.Id("row"), jen.LitRune('\t')), jen.Float64().Call(objective.Clone().Call(args...)), jen.LitRune('g'), jen.Lit(-1), jen.Lit(64)),
			)...),
			jen.Qual("fmt", "Println").Call(jen.String().Call(jen.Id("row"))),
		),
	)
}

// parseTrace reads the lines the harness printed and derives each row's
// measures from the row before it.
func parseTrace(out []byte) (*TraceResult, error) {
	res := &TraceResult{}
	found := false
	var gridCells int
	var box [4]float64
	sc := bufio.NewScanner(bytes.NewReader(out))
	sc.Buffer(make([]byte, 1<<20), 1<<28)
	for sc.Scan() {
		fields := strings.Split(sc.Text(), "\t")
		bad := func() error { return fmt.Errorf("malformed trace line %q", sc.Text()) }
		switch fields[0] {
		case "thalweg-limits":
			if len(fields) != 5 {
				return nil, bad()
			}
			l := &res.Limits
			if err := parseAll(fields[1:], &l.Gradient, &l.Step, &l.Iterations, &l.Evaluations); err != nil {
				return nil, bad()
			}
		case "thalweg-trial":
			pt := TracePoint{Iteration: len(res.Rows)}
			x, err := parseFloats(fields[1:])
			if err != nil || len(x) < 2 {
				return nil, bad()
			}
			pt.F, pt.X = x[0], x[1:]
			res.Trials = append(res.Trials, pt)
		case "thalweg-trace":
			if len(fields) < 9 {
				return nil, bad()
			}
			var row TraceRow
			if err := parseAll(fields[1:8], &row.Iteration, &row.Evaluations, &row.Trials, &row.F, &row.Gradient, &row.Step, &row.Slope); err != nil {
				return nil, bad()
			}
			x, err := parseFloats(fields[8:])
			if err != nil {
				return nil, bad()
			}
			row.X = x
			res.Rows = append(res.Rows, row)
		case "thalweg-result":
			if len(fields) != 7 {
				return nil, bad()
			}
			found = true
			res.Status = fields[1]
			res.Converged = fields[2] == "true"
			if err := parseAll(fields[3:], &res.Iterations, &res.Evaluations, &res.F, &res.LastTrials); err != nil {
				return nil, bad()
			}
		case "thalweg-grid":
			if len(fields) != 6 {
				return nil, bad()
			}
			if err := parseAll(fields[1:], &gridCells, &box[0], &box[1], &box[2], &box[3]); err != nil || gridCells < 1 {
				return nil, bad()
			}
			res.Grid = &TraceGrid{}
			for i := 0; i <= gridCells; i++ {
				res.Grid.X = append(res.Grid.X, box[0]+(box[1]-box[0])*float64(i)/float64(gridCells))
				res.Grid.Y = append(res.Grid.Y, box[2]+(box[3]-box[2])*float64(i)/float64(gridCells))
			}
		case "thalweg-gridrow":
			v, err := parseFloats(fields[1:])
			if err != nil || res.Grid == nil || len(v) != gridCells+1 || len(res.Grid.F) > gridCells {
				return nil, bad()
			}
			res.Grid.F = append(res.Grid.F, v)
		}
	}
	if err := sc.Err(); err != nil {
		return nil, err
	}
	if !found {
		return nil, fmt.Errorf("the traced run printed no result:\n%s", out)
	}
	if res.Grid != nil && len(res.Grid.F) != gridCells+1 {
		return nil, fmt.Errorf("the traced run printed %d grid rows, want %d", len(res.Grid.F), gridCells+1)
	}
	res.derive()
	return res, nil
}

// derive fills in each row's calls for differences, decrease, predicted
// decrease and step measure. The start's one objective call precedes the
// first gradient.
func (res *TraceResult) derive() {
	nan := math.NaN()
	for i := range res.Rows {
		r := &res.Rows[i]
		r.Decrease, r.Predicted, r.StepMeasure = nan, nan, nan
		if i == 0 {
			r.GradientCalls = r.Evaluations - 1
			continue
		}
		prev := &res.Rows[i-1]
		r.GradientCalls = r.Evaluations - prev.Evaluations - r.Trials
		r.Decrease = prev.F - r.F
		r.Predicted = -r.Step * r.Slope
		r.StepMeasure = stepMeasure(scaled(prev.X, res.Scale), scaled(r.X, res.Scale), res.OwnScale, res.typical())
	}
}

// stepMeasure is what the step test compares with its limit: the largest
// |xᵢ − previousᵢ|/(|xᵢ| + 1), x being the new point, or with own (a
// residual objective) |xᵢ − previousᵢ|/max(|xᵢ|, typicalᵢ), typical the
// start's sizes (1 where 0).
func stepMeasure(previous, x []float64, own bool, typical []float64) float64 {
	largest := 0.0
	for i := range x {
		if i < len(previous) {
			scale := math.Abs(x[i]) + 1
			if own {
				scale = math.Max(math.Abs(x[i]), typical[i])
			}
			largest = math.Max(largest, math.Abs(x[i]-previous[i])/scale)
		}
	}
	return largest
}

// typical is each unknown's size at the start, 1 where it is 0: the scale
// a residual objective's step test measures against (templates'
// typicalScale).
func (res *TraceResult) typical() []float64 {
	if len(res.Rows) == 0 {
		return nil
	}
	out := make([]float64, len(res.Rows[0].X))
	for i, v := range res.Rows[0].X {
		out[i] = math.Abs(v)
		if v == 0 {
			out[i] = 1
		}
	}
	return out
}

// scaled is x divided by scale, or x without a scale.
func scaled(x, scale []float64) []float64 {
	if scale == nil {
		return x
	}
	z := make([]float64, len(x))
	for i := range x {
		z[i] = x[i] / scale[i]
	}
	return z
}

// CallsLeft is the evaluation cap less the calls made up to row r.
func (res *TraceResult) CallsLeft(r TraceRow) int { return res.Limits.Evaluations - r.Evaluations }

// parseAll parses each field into the int or float64 its target points to.
func parseAll(fields []string, targets ...any) error {
	if len(fields) != len(targets) {
		return fmt.Errorf("%d fields for %d values", len(fields), len(targets))
	}
	for i, t := range targets {
		var err error
		switch t := t.(type) {
		case *int:
			*t, err = strconv.Atoi(fields[i])
		case *float64:
			*t, err = strconv.ParseFloat(fields[i], 64)
		}
		if err != nil {
			return err
		}
	}
	return nil
}

func parseFloats(fields []string) ([]float64, error) {
	v := make([]float64, len(fields))
	for i, s := range fields {
		var err error
		if v[i], err = strconv.ParseFloat(s, 64); err != nil {
			return nil, err
		}
	}
	return v, nil
}
