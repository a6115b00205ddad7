package gen

import (
	"fmt"
	"io"
	"math"

	"github.com/dave/jennifer/jen"
	"github.com/thalweg-go/thalweg/rules"
)

// EmitTests writes the minimizer's own test file: convergence from the
// spec's start (and expect), zero allocations, the analytic gradient
// against central differences, the evaluation cap, and a benchmark.
func EmitTests(w io.Writer, p *Plan) error {
	f := jen.NewFile(p.Shape.Package)
	f.HeaderComment(headerLine(p.SpecName))
	name := p.M.Name
	helper := p.Prefix + "Test"

	// func prefixTestReceiver() R { … }   (methods only)
	if p.Shape.Receiver != "" {
		emitTestReceiver(f, p, helper+"Receiver")
	}
	// func prefixTestStart() X { return … }
	f.Commentf("%sStart is the spec's start.", helper)
	f.Func().Id(helper + "Start").Params().Add(xType(p)).Block(jen.Return(literal(p, p.M.Start)))

	call := func(limits bool) *jen.Statement {
		args := []jen.Code{}
		if p.Shape.Receiver != "" {
			args = append(args, jen.Id("recv"))
		}
		args = append(args, jen.Id(helper+"Start").Call())
		if limits {
			return jen.Id(name + "WithLimits").Call(append(args, jen.Id("limits"))...)
		}
		return jen.Id(name).Call(args...)
	}
	setup := func() []jen.Code {
		if p.Shape.Receiver == "" {
			return nil
		}
		return []jen.Code{jen.Id("recv").Op(":=").Id(helper + "Receiver").Call()}
	}

	// Convergence from start (or the expected status), and expect.x.
	testName, statusTest, doc := "Test"+name+"Converges", jen.Op("!").Id("r").Dot("Status").Dot("Converged").Call(), "asks for convergence"
	if e := p.M.Expect; e != nil && e.Status != nil {
		testName = "Test" + name + "EndsWith" + e.Status.Suffix
		statusTest = jen.Id("r").Dot("Status").Op("!=").Id(name + e.Status.Suffix)
		doc = fmt.Sprintf("asks for the status %q that expect.status names", e.Status.Text)
	}
	body := append(setup(),
		jen.Id("r").Op(":=").Add(call(false)),
		jen.If(statusTest).Block(
			jen.Id("t").Dot("Fatalf").Call(jen.Lit("status %v after %d iterations and %d evaluations, f = %g, x = %v, gradient measure %g (limit %g)"),
				jen.Id("r").Dot("Status"), jen.Id("r").Dot("Iterations"), jen.Id("r").Dot("Evaluations"), jen.Id("r").Dot("F"), jen.Id("r").Dot("X"), jen.Id("r").Dot("Gradient"), jen.Id("r").Dot("GradientLimit")),
		),
	)
	if p.M.Expect == nil {
		// A run that converges without a single step tests nothing: the
		// start is stationary, or the receiver holds no data.
		doc += ", and fails when the run converges without a step (a stationary start or an empty receiver) unless [minimizer.expect] says so"
		body = append(body, jen.If(jen.Id("r").Dot("Iterations").Op("==").Lit(0)).Block(
			jen.Id("t").Dot("Fatalf").Call(jen.Lit("converged in 0 iterations at x = %v, f = %g: the start is already stationary (or the receiver holds no data), so this test exercises nothing; start elsewhere, set instance, or state the intent with expect.x or expect.status"),
				jen.Id("r").Dot("X"), jen.Id("r").Dot("F")),
		))
	}
	if p.Bounded {
		doc += ", for X within the bounds"
		body = append(body, jen.Id("b").Op(":=").Add(boxValue(p)))
		x := jen.Id("r").Dot("X")
		if p.Shape.Scalar() {
			x = jen.Index(jen.Lit(1)).Id(p.Shape.Elem).Values(jen.Id("r").Dot("X"))
		}
		body = append(body, jen.For(jen.List(jen.Id("i"), jen.Id("v")).Op(":=").Range().Add(x)).Block(
			jen.If(jen.Op("!").Parens(jen.Id("v").Op(">=").Id("b").Dot("lower").Index(jen.Id("i")).Op("&&").Id("v").Op("<=").Id("b").Dot("upper").Index(jen.Id("i")))).Block(
				jen.Id("t").Dot("Errorf").Call(jen.Lit("x[%d] = %v lies outside the bounds [%v, %v]"), jen.Id("i"), jen.Id("v"), jen.Id("b").Dot("lower").Index(jen.Id("i")), jen.Id("b").Dot("upper").Index(jen.Id("i"))),
			),
		))
	}
	if e := p.M.Expect; e != nil && e.X != nil {
		doc += ", then for x within expect.tolerance of expect.x (NaN fails)"
		tol := jen.Op(formatFloat(e.Tolerance))
		body = append(body, jen.Id("want").Op(":=").Add(literal(p, e.X)))
		if p.Scaled() {
			// With scale the tolerance is in the scaled unknowns:
			// |Xᵢ − xᵢ| ≤ tolerance·sᵢ.
			doc += ", in units of scale"
			if p.Shape.Scalar() {
				tol = jen.Op(formatFloat(e.Tolerance * p.M.Scale[0]))
			} else {
				tolerances := make([]float64, len(p.M.Scale))
				for i, v := range p.M.Scale {
					tolerances[i] = e.Tolerance * v
				}
				body = append(body, jen.Id("tolerance").Op(":=").Index(jen.Lit(p.Dim)).Float64().Values(floatItems(tolerances, "float64")...))
				tol = jen.Id("tolerance").Index(jen.Id("i"))
			}
		}
		if p.Shape.Scalar() {
			body = append(body, jen.If(jen.Op("!").Parens(jen.Qual("math", "Abs").Call(jen.Id("float64").Call(jen.Id("r").Dot("X").Op("-").Id("want"))).Op("<=").Add(tol))).Block(
				jen.Id("t").Dot("Errorf").Call(jen.Lit("x = %v, want %v within %g"), jen.Id("r").Dot("X"), jen.Id("want"), tol.Clone()),
			))
		} else {
			body = append(body, jen.For(jen.Id("i").Op(":=").Range().Id("want")).Block(
				jen.If(jen.Op("!").Parens(jen.Qual("math", "Abs").Call(jen.Id("float64").Call(jen.Id("r").Dot("X").Index(jen.Id("i")).Op("-").Id("want").Index(jen.Id("i")))).Op("<=").Add(tol))).Block(
					jen.Id("t").Dot("Errorf").Call(jen.Lit("x[%d] = %v, want %v within %g"), jen.Id("i"), jen.Id("r").Dot("X").Index(jen.Id("i")), jen.Id("want").Index(jen.Id("i")), tol.Clone()),
				),
			))
		}
	}
	f.Commentf("%s runs %s from the spec's start and %s.", testName, name, doc)
	f.Func().Id(testName).Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(body...)

	// Zero allocations.
	f.Commentf("Test%sAllocatesNothing proves a whole run makes no heap allocation.", name)
	f.Func().Id("Test" + name + "AllocatesNothing").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(setup(),
		jen.Var().Id("r").Id(name+"Result"),
		jen.Id("allocs").Op(":=").Qual("testing", "AllocsPerRun").Call(jen.Lit(10), jen.Func().Params().Block(jen.Id("r").Op("=").Add(call(false)))),
		jen.If(jen.Id("allocs").Op("!=").Lit(0)).Block(
			jen.Id("t").Dot("Errorf").Call(jen.Lit("%v allocations per run, want 0 (status %v)"), jen.Id("allocs"), jen.Id("r").Dot("Status")),
		),
	)...)

	// Evaluation cap: a run is deterministic, so every smaller cap stops it
	// on the same path with out-of-evaluations, within the cap. The caps
	// tried are 0–63, each power of two below the need and one short of
	// it, so the test costs about three full runs however long a run is.
	f.Commentf("Test%sRespectsEvaluationCap caps the run below what it needs (0–63, powers of two, and one short) and checks that the cap is never exceeded and that the run says why it stopped.", name)
	f.Func().Id("Test" + name + "RespectsEvaluationCap").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(setup(),
		jen.Id("needed").Op(":=").Add(call(false)).Dot("Evaluations"),
		jen.For(jen.Id("cap").Op(":=").Lit(0), jen.Id("cap").Op("<").Id("needed"), jen.Id("cap").Op("++")).Block(
			jen.If(jen.Id("cap").Op(">=").Lit(64).Op("&&").Id("cap").Op("&").Parens(jen.Id("cap").Op("-").Lit(1)).Op("!=").Lit(0).Op("&&").Id("cap").Op("!=").Id("needed").Op("-").Lit(1)).Block(jen.Continue()),
			jen.Id("limits").Op(":=").Id(name+"DefaultLimits").Call(),
			jen.Id("limits").Dot("Evaluations").Op("=").Id("cap"),
			jen.Id("r").Op(":=").Add(call(true)),
			jen.If(jen.Id("r").Dot("Evaluations").Op(">").Id("cap").Op("||").Id("r").Dot("Status").Op("!=").Id(name+"OutOfEvaluations")).Block(
				jen.Id("t").Dot("Fatalf").Call(jen.Lit("cap %d: %d evaluations, status %v"), jen.Id("cap"), jen.Id("r").Dot("Evaluations"), jen.Id("r").Dot("Status")),
			),
		),
	)...)

	switch {
	case p.Derivative.Exact && p.Shape.Residuals > 0:
		emitJacobianCheck(f, p, helper, setup)
	case p.Derivative.Exact:
		emitGradientCheck(f, p, helper, setup)
	}
	if p.Shape.Residuals > 0 {
		emitUncertaintyTest(f, p, helper, setup, call)
	}

	emitSolverTests(f, p, helper, setup)

	// Benchmark.
	f.Commentf("Benchmark%s measures one whole run from the spec's start.", name)
	f.Func().Id("Benchmark" + name).Params(jen.Id("b").Op("*").Qual("testing", "B")).Block(append(setup(),
		jen.Var().Id("r").Id(name+"Result"),
		jen.Id("b").Dot("ReportAllocs").Call(),
		jen.For(jen.Id("i").Op(":=").Lit(0), jen.Id("i").Op("<").Id("b").Dot("N"), jen.Id("i").Op("++")).Block(jen.Id("r").Op("=").Add(call(false))),
		jen.Id("b").Dot("ReportMetric").Call(jen.Float64().Call(jen.Id("r").Dot("Evaluations")), jen.Lit("evaluations/op")),
	)...)
	return f.Render(w)
}

// literal renders values as X: a number, or an array literal.
func literal(p *Plan, vals []float64) *jen.Statement {
	if p.Shape.Scalar() {
		if p.Shape.Elem == "float32" {
			return jen.Id("float32").Call(jen.Op(formatFloat(vals[0])))
		}
		return jen.Op(formatFloat(vals[0]))
	}
	return xType(p).Values(floatItems(vals, p.Shape.Elem)...)
}

// emitTestReceiver writes the receiver the tests call the objective on:
// the spec's instance, or the zero value.
func emitTestReceiver(f *jen.File, p *Plan, fn string) {
	t := jen.Id(p.Shape.Receiver)
	if p.Shape.Pointer {
		t = jen.Op("*").Id(p.Shape.Receiver)
	}
	inst := p.Shape.Instance
	var body []jen.Code
	switch {
	case inst.Name == "" && p.Shape.Pointer:
		body = []jen.Code{jen.Return(jen.New(jen.Id(p.Shape.Receiver)))}
	case inst.Name == "":
		body = []jen.Code{jen.Var().Id("zero").Id(p.Shape.Receiver), jen.Return(jen.Id("zero"))}
	default:
		src := jen.Id(inst.Name)
		if inst.Call {
			src = jen.Id(inst.Name).Call()
		}
		switch inst.Adjust {
		case "&":
			body = []jen.Code{jen.Id("v").Op(":=").Add(src), jen.Return(jen.Op("&").Id("v"))}
		case "*":
			body = []jen.Code{jen.Return(jen.Op("*").Add(src))}
		default:
			body = []jen.Code{jen.Return(src)}
		}
	}
	what := "the zero value"
	if inst.Name != "" {
		what = "instance " + inst.Name
	}
	f.Commentf("%s is the receiver the tests use: %s.", fn, what)
	f.Func().Id(fn).Params().Add(t).Block(body...)
}

// differenceAt is the gradient check's difference along xᵢ: central, or
// with bounds the three-point endpoint formula on the side with room when
// the box leaves none for ±h,
//
//	f′ ≈ ∓(3f(x) − 4f(x ± h) + f(x ± 2h))/(2h)
//
// (Burden & Faires, Numerical Analysis, §4.1), skipping a component whose
// box is narrower than the stencil.
func differenceAt(p *Plan, recvArg []jen.Code) jen.Code {
	value := func(x string) *jen.Statement {
		return jen.Float64().Call(jen.Id("value").Call(append(append([]jen.Code(nil), recvArg...), jen.Id(x))...))
	}
	raw := func(x string) *jen.Statement {
		return jen.Id("value").Call(append(append([]jen.Code(nil), recvArg...), jen.Id(x))...)
	}
	central := jen.Float64().Call(raw("up").Op("-").Add(raw("down"))).Op("/").Float64().Call(jen.Id("up").Index(jen.Id("i")).Op("-").Id("down").Index(jen.Id("i")))
	if !p.Bounded {
		return jen.Id("approx").Op(":=").Add(central)
	}
	b := func(side string) *jen.Statement { return jen.Id("b").Dot(side).Index(jen.Id("i")) }
	xi := jen.Id("x").Index(jen.Id("i"))
	twoH := jen.Lit(2).Op("*").Id("h")
	return jen.Var().Id("approx").Float64().Line().Switch().Block(
		jen.Case(jen.Id("up").Index(jen.Id("i")).Op("<=").Add(b("upper")).Op("&&").Id("down").Index(jen.Id("i")).Op(">=").Add(b("lower"))).Block(
			jen.Id("approx").Op("=").Add(central),
		),
		jen.Case(xi.Clone().Op("+").Add(twoH.Clone()).Op("<=").Add(b("upper"))).Block(
			jen.Id("far").Op(":=").Id("x"),
			jen.Id("far").Index(jen.Id("i")).Op("+=").Add(twoH.Clone()),
			jen.Id("approx").Op("=").Parens(jen.Lit(-3).Op("*").Add(value("x")).Op("+").Lit(4).Op("*").Add(value("up")).Op("-").Add(value("far"))).Op("/").Parens(jen.Lit(2).Op("*").Float64().Call(jen.Id("h"))),
		),
		jen.Case(xi.Clone().Op("-").Add(twoH.Clone()).Op(">=").Add(b("lower"))).Block(
			jen.Id("far").Op(":=").Id("x"),
			jen.Id("far").Index(jen.Id("i")).Op("-=").Add(twoH.Clone()),
			jen.Id("approx").Op("=").Parens(jen.Lit(3).Op("*").Add(value("x")).Op("-").Lit(4).Op("*").Add(value("down")).Op("+").Add(value("far"))).Op("/").Parens(jen.Lit(2).Op("*").Float64().Call(jen.Id("h"))),
		),
		jen.Default().Block(jen.Continue().Comment("the box is narrower than the stencil along xᵢ")),
	)
}

// emitGradientCheck writes a test comparing the analytic gradient with
// central differences at the start and two nearby points.
func emitGradientCheck(f *jen.File, p *Plan, helper string, setup func() []jen.Code) {
	s := p.Shape
	name := p.M.Name
	recvPrefix := userCall(s)
	// value(x [N]T) T and gradient(x [N]T) [N]T in the user's forms.
	var valueArg, gradBody []jen.Code
	switch s.Arg {
	case ArgScalar:
		valueArg = []jen.Code{jen.Id("x").Index(jen.Lit(0))}
	case ArgArray:
		valueArg = []jen.Code{jen.Id("x")}
	case ArgPointer:
		valueArg = []jen.Code{jen.Op("&").Id("x")}
	case ArgSlice:
		valueArg = []jen.Code{jen.Id("x").Index(jen.Op(":"))}
	}
	gradientName := s.Gradient
	switch {
	case s.Residuals > 0:
		gradientName = "Jᵀr, the gradient of ½‖r‖² from " + s.Jacobian + " and " + s.Objective + ","
		gradBody = residualGradientBody(p, recvPrefix)
	case s.Combined:
		// A combined objective writes the gradient through g: value
		// discards it, gradient discards the value.
		var gArg jen.Code
		switch s.Arg {
		case ArgScalar:
			gArg = jen.Op("&").Id("g").Index(jen.Lit(0))
		case ArgSlice:
			gArg = jen.Id("g").Index(jen.Op(":"))
		default:
			gArg = jen.Op("&").Id("g")
		}
		gradientName = "the gradient " + s.Objective + " writes"
		gradBody = []jen.Code{recvPrefix(s.Objective).Call(append(append([]jen.Code(nil), valueArg...), gArg)...)}
		valueArg = append(valueArg, gArg)
	case s.Grad == GradScalar:
		gradBody = []jen.Code{jen.Id("g").Index(jen.Lit(0)).Op("=").Add(recvPrefix(s.Gradient)).Call(jen.Id("x").Index(jen.Lit(0)))}
	case s.Grad == GradPointer:
		gradBody = []jen.Code{recvPrefix(s.Gradient).Call(jen.Op("&").Id("x"), jen.Op("&").Id("g"))}
	case s.Grad == GradArray:
		gradBody = []jen.Code{jen.Id("g").Op("=").Add(recvPrefix(s.Gradient)).Call(jen.Id("x"))}
	case s.Grad == GradSlice:
		gradBody = []jen.Code{recvPrefix(s.Gradient).Call(jen.Id("x").Index(jen.Op(":")), jen.Id("g").Index(jen.Op(":")))}
	}
	vec := jen.Index(jen.Lit(s.Dim)).Id(s.Elem)
	valueBody := []jen.Code{jen.Return(recvPrefix(s.Objective).Call(valueArg...))}
	if s.Residuals > 0 {
		valueBody = halfSquaresBody(p, recvPrefix)
	}
	if s.Combined {
		valueBody = []jen.Code{jen.Var().Id("g").Add(vec.Clone()), valueBody[0]}
	}
	var recvParam []jen.Code
	var recvArg []jen.Code
	if s.Receiver != "" {
		t := jen.Id(s.Receiver)
		if s.Pointer {
			t = jen.Op("*").Id(s.Receiver)
		}
		recvParam = []jen.Code{jen.Id("recv").Add(t)}
		recvArg = []jen.Code{jen.Id("recv")}
	}
	startVec := jen.Id(helper + "Start").Call()
	if s.Scalar() {
		startVec = vec.Clone().Values(jen.Id(helper + "Start").Call())
	}
	tol := "1e-6"
	if s.Elem == "float32" {
		tol = "2e-2"
	}
	runArgs := append(append([]jen.Code(nil), recvArg...), jen.Id(helper+"Start").Call())
	finalX := jen.Id(name).Call(runArgs...).Dot("X")
	if s.Scalar() {
		finalX = vec.Clone().Values(finalX)
	}
	// With bounds every point is projected into the box, and the
	// differences turn one-sided where the box leaves no room.
	inside, boxed := projectionInto(p, vec)
	boxDoc := ""
	if p.Bounded {
		boxDoc = " With bounds every point is projected into the box and the objective is never evaluated outside it: where the box leaves no room for ±h the three-point endpoint formula on the side with room takes over (Burden & Faires, Numerical Analysis, §4.1), and a component whose box is narrower than 2h is not checked."
	}
	// With scale, every length is in units of sᵢ: h = ∛u·max(sᵢ, |xᵢ|),
	// the nearby points and the steps along −∇f are taken in z = x/s, and
	// the comparison is of the scaled components sᵢ·∂f/∂xᵢ.
	times := func(c *jen.Statement) *jen.Statement { return c }
	scaleDoc := ""
	if p.Scaled() {
		boxed = append(boxed, jen.Id("sc").Op(":=").Index(jen.Lit(p.Dim)).Float64().Values(floatItems(p.M.Scale, "float64")...))
		times = func(c *jen.Statement) *jen.Statement { return c.Op("*").Id("sc").Index(jen.Id("i")) }
		scaleDoc = " With scale, lengths are in units of sᵢ (h = ∛u·max(sᵢ, |xᵢ|), the nearby points and the steps along −∇f in z = x/s) and the scaled components sᵢ·∂f/∂xᵢ are compared."
	}
	over := func(c *jen.Statement) *jen.Statement {
		if !p.Scaled() {
			return c
		}
		return c.Op("/").Id("sc").Index(jen.Id("i"))
	}
	unit := func() *jen.Statement {
		if !p.Scaled() {
			return jen.Lit(1.0)
		}
		return jen.Id("sc").Index(jen.Id("i"))
	}
	nearby := func() jen.Code {
		if !p.Scaled() {
			return jen.Id("x").Index(jen.Id("i")).Op("+=").Id(s.Elem).Call(jen.Id("k")).Op("*").Lit(0.01).Op("*").Id(s.Elem).Call(jen.Id("i").Op("+").Lit(1))
		}
		return jen.Id("x").Index(jen.Id("i")).Op("+=").Id(s.Elem).Call(jen.Float64().Call(jen.Id("k")).Op("*").Lit(0.01).Op("*").Float64().Call(jen.Id("i").Op("+").Lit(1)).Op("*").Id("sc").Index(jen.Id("i")))
	}
	f.Commentf("Test%sGradientMatchesDifferences compares %s with central differences, h = ∛u·max(1, |xᵢ|), at the start, two nearby points, three points along the first search direction −∇f (at 1%%, 10%% and 50%% of max(1, ‖x0‖∞)) and where the run from start ends, so that a gradient wrong only near the minimizer is caught too. It allows %s relative to max(1, |gᵢ|) (common practice), 100 times the rounding bound u·|f|/h (Nocedal & Wright 2006, §8.1), and the change the difference shows between h and 2h, which bounds its truncation error (Richardson's comparison: it is about three times that error). NaN or ±Inf fails at the start and its neighbours; points farther out where f is not finite lie outside the objective's domain and are skipped.%s%s", name, gradientName, tol, boxDoc, scaleDoc)
	f.Func().Id("Test" + name + "GradientMatchesDifferences").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(append(setup(), boxed...),
		jen.Id("value").Op(":=").Func().Params(append(recvParam, jen.Id("x").Add(vec.Clone()))...).Id(s.Elem).Block(valueBody...),
		jen.Id("gradient").Op(":=").Func().Params(append(recvParam, jen.Id("x").Add(vec.Clone()))...).Params(jen.Id("g").Add(vec.Clone())).Block(append(gradBody, jen.Return())...),
		jen.Id("start").Op(":=").Add(inside(startVec)),
		// points: the start and two neighbours, steps along −∇f(start), the run's end.
		jen.Id("points").Op(":=").Index().Add(vec.Clone()).Values(jen.Id("start")),
		jen.For(jen.Id("k").Op(":=").Lit(1), jen.Id("k").Op("<").Lit(3), jen.Id("k").Op("++")).Block(
			jen.Id("x").Op(":=").Id("start"),
			jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
				nearby(),
			),
			jen.Id("points").Op("=").Append(jen.Id("points"), inside(jen.Id("x"))),
		),
		jen.List(jen.Id("g0"), jen.Id("steepest"), jen.Id("size")).Op(":=").List(jen.Id("gradient").Call(append(recvArg, jen.Id("start"))...), jen.Lit(0.0), jen.Lit(1.0)),
		jen.For(jen.Id("i").Op(":=").Range().Id("start")).Block(
			jen.Id("steepest").Op("=").Qual("math", "Max").Call(jen.Id("steepest"), jen.Qual("math", "Abs").Call(times(jen.Float64().Call(jen.Id("g0").Index(jen.Id("i")))))),
			jen.Id("size").Op("=").Qual("math", "Max").Call(jen.Id("size"), jen.Qual("math", "Abs").Call(over(jen.Float64().Call(jen.Id("start").Index(jen.Id("i")))))),
		),
		jen.If(jen.Id("steepest").Op(">").Lit(0).Op("&&").Op("!").Qual("math", "IsInf").Call(jen.Id("steepest"), jen.Lit(0))).Block(
			jen.For(jen.List(jen.Id("_"), jen.Id("part")).Op(":=").Range().Index().Float64().Values(jen.Lit(0.01), jen.Lit(0.1), jen.Lit(0.5))).Block(
				jen.Id("x").Op(":=").Id("start"),
				jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
					jen.Id("x").Index(jen.Id("i")).Op("-=").Id(s.Elem).Call(times(times(jen.Id("part").Op("*").Id("size").Op("*").Float64().Call(jen.Id("g0").Index(jen.Id("i"))))).Op("/").Id("steepest")),
				),
				jen.Id("points").Op("=").Append(jen.Id("points"), inside(jen.Id("x"))),
			),
		),
		jen.Id("points").Op("=").Append(jen.Id("points"), finalX),
		jen.For(jen.List(jen.Id("k"), jen.Id("x")).Op(":=").Range().Id("points")).Block(
			jen.Id("fv").Op(":=").Float64().Call(jen.Id("value").Call(append(recvArg, jen.Id("x"))...)),
			jen.If(jen.Id("k").Op(">=").Lit(3).Op("&&").Parens(jen.Qual("math", "IsNaN").Call(jen.Id("fv")).Op("||").Qual("math", "IsInf").Call(jen.Id("fv"), jen.Lit(0)))).Block(
				jen.Continue(), // outside the objective's domain
			),
			jen.Id("g").Op(":=").Id("gradient").Call(append(recvArg, jen.Id("x"))...),
			jen.Id("fx").Op(":=").Qual("math", "Abs").Call(jen.Id("fv")),
			jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
				jen.Id("h").Op(":=").Id(s.Elem).Call(jen.Op(formatFloat(math.Cbrt(rules.Roundoff(s.Elem)))).Op("*").Qual("math", "Max").Call(unit(), jen.Qual("math", "Abs").Call(jen.Float64().Call(jen.Id("x").Index(jen.Id("i")))))),
				jen.List(jen.Id("up"), jen.Id("down")).Op(":=").List(jen.Id("x"), jen.Id("x")),
				jen.Id("up").Index(jen.Id("i")).Op("+=").Id("h"),
				jen.Id("down").Index(jen.Id("i")).Op("-=").Id("h"),
				differenceAt(p, recvArg),
				wideDifference(p, recvArg),
				jen.Id("exact").Op(":=").Float64().Call(jen.Id("g").Index(jen.Id("i"))),
				scaleComparison(p),
				jen.Id("allowed").Op(":=").Op(tol).Op("*").Qual("math", "Max").Call(jen.Lit(1.0), jen.Qual("math", "Abs").Call(jen.Id("exact"))).Op("+").Lit(100).Op("*").Op(formatFloat(rules.Roundoff(s.Elem))).Op("*").Id("fx").Op("/").Add(times(jen.Float64().Call(jen.Id("h")))).Op("+").Qual("math", "Abs").Call(jen.Id("wide").Op("-").Id("approx")),
				jen.If(jen.Op("!").Parens(jen.Qual("math", "Abs").Call(jen.Id("approx").Op("-").Id("exact")).Op("<=").Id("allowed"))).Block(
					jen.Id("t").Dot("Errorf").Call(jen.Lit("at %v: gradient component %d is %g, central differences give %g"), jen.Id("x"), jen.Id("i"), jen.Id("exact"), jen.Id("approx")),
				),
			),
		),
	)...)
}

// wideDifference is the central difference at 2h, wide, whose change
// from approx (the one at h) is about three times approx's truncation
// error (Richardson's comparison); wide is approx where the box leaves no
// room for ±2h or f is not finite there, so that only a measured
// truncation error widens the check.
func wideDifference(p *Plan, recvArg []jen.Code) jen.Code {
	raw := func(x string) *jen.Statement {
		return jen.Id("value").Call(append(append([]jen.Code(nil), recvArg...), jen.Id(x))...)
	}
	measure := jen.If(jen.Id("w").Op(":=").Float64().Call(raw("farUp").Op("-").Add(raw("farDown"))).Op("/").Float64().Call(jen.Id("farUp").Index(jen.Id("i")).Op("-").Id("farDown").Index(jen.Id("i"))), jen.Op("!").Qual("math", "IsNaN").Call(jen.Id("w")).Op("&&").Op("!").Qual("math", "IsInf").Call(jen.Id("w"), jen.Lit(0))).Block(
		jen.Id("wide").Op("=").Id("w"),
	)
	if p.Bounded {
		// the objective is never evaluated outside the box
		measure = jen.If(jen.Id("farUp").Index(jen.Id("i")).Op("<=").Id("b").Dot("upper").Index(jen.Id("i")).Op("&&").Id("farDown").Index(jen.Id("i")).Op(">=").Id("b").Dot("lower").Index(jen.Id("i"))).Block(measure)
	}
	return jen.List(jen.Id("farUp"), jen.Id("farDown")).Op(":=").List(jen.Id("x"), jen.Id("x")).Line().
		Id("farUp").Index(jen.Id("i")).Op("+=").Lit(2).Op("*").Id("h").Line().
		Id("farDown").Index(jen.Id("i")).Op("-=").Lit(2).Op("*").Id("h").Line().
		Id("wide").Op(":=").Id("approx").Line().
		Add(measure)
}

// scaleComparison, with scale, turns the exact and approximate components
// into scaled ones, sᵢ·∂f/∂xᵢ; nothing otherwise.
func scaleComparison(p *Plan) jen.Code {
	if !p.Scaled() {
		return jen.Null()
	}
	return jen.List(jen.Id("exact"), jen.Id("approx"), jen.Id("wide")).Op("=").List(jen.Id("exact").Op("*").Id("sc").Index(jen.Id("i")), jen.Id("approx").Op("*").Id("sc").Index(jen.Id("i")), jen.Id("wide").Op("*").Id("sc").Index(jen.Id("i")))
}

// residualArgs are the arguments of a residual objective's call (or its
// Jacobian's) on the local array x, writing into the local out.
func residualArgs(s Shape, out string) []jen.Code {
	switch s.Arg {
	case ArgArray:
		return []jen.Code{jen.Id("x"), jen.Op("&").Id(out)}
	case ArgSlice:
		return []jen.Code{jen.Id("x").Index(jen.Op(":")), jen.Id(out).Index(jen.Op(":"))}
	}
	return []jen.Code{jen.Op("&").Id("x"), jen.Op("&").Id(out)}
}

// jacobianArgs are the arguments of a call of the Jacobian: the
// objective's, except that the Jacobian thalweg derives for a residual
// objective on slices takes arrays (x *[N]T, J *[M][N]T).
func jacobianArgs(s Shape, out string) []jen.Code {
	if s.jacobianOnArrays() {
		return []jen.Code{jen.Op("&").Id("x"), jen.Op("&").Id(out)}
	}
	return residualArgs(s, out)
}

// halfSquaresBody is the body of a func(x [N]T) T giving f = ½‖r(x)‖² of
// a residual objective.
func halfSquaresBody(p *Plan, callee func(string) *jen.Statement) []jen.Code {
	s := p.Shape
	return []jen.Code{
		jen.Var().Id("r").Index(jen.Lit(s.Residuals)).Id(s.Elem),
		callee(s.Objective).Call(residualArgs(s, "r")...),
		jen.Var().Id("sum").Id(s.Elem),
		jen.For(jen.List(jen.Id("_"), jen.Id("v")).Op(":=").Range().Id("r")).Block(jen.Id("sum").Op("+=").Id("v").Op("*").Id("v")),
		jen.Return(jen.Id("sum").Op("/").Lit(2)),
	}
}

// residualGradientBody is the body of a func(x [N]T) (g [N]T) giving
// g = Jᵀr from the residual objective and its analytic Jacobian.
func residualGradientBody(p *Plan, callee func(string) *jen.Statement) []jen.Code {
	s := p.Shape
	rows, cols := s.Residuals, s.Dim
	entry := jen.Id("j").Index(jen.Id("k")).Index(jen.Id("i"))
	if s.JacobianColumns {
		rows, cols = s.Dim, s.Residuals
		entry = jen.Id("j").Index(jen.Id("i")).Index(jen.Id("k"))
	}
	return []jen.Code{
		jen.Var().Id("r").Index(jen.Lit(s.Residuals)).Id(s.Elem),
		callee(s.Objective).Call(residualArgs(s, "r")...),
		jen.Var().Id("j").Index(jen.Lit(rows)).Index(jen.Lit(cols)).Id(s.Elem),
		callee(s.Jacobian).Call(jacobianArgs(s, "j")...),
		jen.For(jen.Id("k").Op(":=").Range().Id("r")).Block(
			jen.For(jen.Id("i").Op(":=").Range().Id("g")).Block(
				jen.Id("g").Index(jen.Id("i")).Op("+=").Add(entry).Op("*").Id("r").Index(jen.Id("k")),
			),
		),
	}
}

// emitUncertaintyTest writes, for a residual objective, a test that the
// covariance at the run's end allocates nothing, stays within its calls,
// and, with more residuals than unknowns, is valid: a positive variance
// and positive, finite standard errors (an invalid one means JᵀJ is
// singular there, the fit not identifiable).
func emitUncertaintyTest(f *jen.File, p *Plan, helper string, setup func() []jen.Code, call func(bool) *jen.Statement) {
	name := p.M.Name
	var recvArg []jen.Code
	if p.Shape.Receiver != "" {
		recvArg = []jen.Code{jen.Id("recv")}
	}
	checks := []jen.Code{
		jen.If(jen.Id("allocs").Op("!=").Lit(0)).Block(jen.Id("t").Dot("Errorf").Call(jen.Lit("%v allocations per call, want 0"), jen.Id("allocs"))),
		jen.If(jen.Id("u").Dot("Evaluations").Op(">").Lit(1 + p.GradientCalls())).Block(jen.Id("t").Dot("Errorf").Call(jen.Lit("%d objective calls, want at most %d"), jen.Id("u").Dot("Evaluations"), jen.Lit(1+p.GradientCalls()))),
	}
	doc := ""
	if p.Shape.Residuals > p.Dim {
		doc = ", and with more residuals than unknowns that it is valid there, with a positive variance and positive finite standard errors (otherwise JᵀJ is singular at X and the fit does not determine every unknown)"
		checks = append(checks,
			jen.If(jen.Op("!").Id("u").Dot("Valid").Op("||").Op("!").Parens(jen.Id("u").Dot("ResidualVariance").Op(">=").Lit(0))).Block(
				jen.Id("t").Dot("Fatalf").Call(jen.Lit("not valid at x = %v: variance %g, standard errors %v"), jen.Id("r").Dot("X"), jen.Id("u").Dot("ResidualVariance"), jen.Id("u").Dot("StandardErrors")),
			),
			jen.For(jen.List(jen.Id("i"), jen.Id("e")).Op(":=").Range().Id("u").Dot("StandardErrors")).Block(
				jen.If(jen.Op("!").Parens(jen.Id("e").Op(">=").Lit(0)).Op("||").Qual("math", "IsInf").Call(jen.Float64().Call(jen.Id("e")), jen.Lit(0))).Block(
					jen.Id("t").Dot("Errorf").Call(jen.Lit("standard error %d is %v"), jen.Id("i"), jen.Id("e")),
				),
			),
		)
	}
	f.Commentf("Test%sUncertaintyAtTheFit computes %sUncertaintyAt where the run from start ends and checks that it allocates nothing and makes at most its %d objective calls%s.", name, name, 1+p.GradientCalls(), doc)
	f.Func().Id("Test" + name + "UncertaintyAtTheFit").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(setup(),
		append([]jen.Code{
			jen.Id("r").Op(":=").Add(call(false)),
			jen.Var().Id("u").Id(name + "Uncertainty"),
			jen.Id("allocs").Op(":=").Qual("testing", "AllocsPerRun").Call(jen.Lit(10), jen.Func().Params().Block(jen.Id("u").Op("=").Id(name+"UncertaintyAt").Call(append(recvArg, jen.Id("r").Dot("X"))...))),
		}, checks...)...)...)
}

// emitJacobianCheck writes, for a residual objective with an analytic
// Jacobian, a test comparing every entry Jᵢⱼ with central differences of
// the residuals at the start, two nearby points and where the run from
// start ends. Entries, unlike the gradient Jᵀr, do not vanish at the fit,
// so a Jacobian wrong only there is caught too.
func emitJacobianCheck(f *jen.File, p *Plan, helper string, setup func() []jen.Code) {
	s := p.Shape
	name := p.M.Name
	callee := userCall(s)
	vec := jen.Index(jen.Lit(s.Dim)).Id(s.Elem)
	rvec := jen.Index(jen.Lit(s.Residuals)).Id(s.Elem)
	jac := jen.Index(jen.Lit(s.Residuals)).Add(vec.Clone())
	jacBody := []jen.Code{callee(s.Jacobian).Call(jacobianArgs(s, "j")...)}
	if s.JacobianColumns {
		jacBody = []jen.Code{
			jen.Var().Id("c").Index(jen.Lit(s.Dim)).Add(rvec.Clone()),
			callee(s.Jacobian).Call(jacobianArgs(s, "c")...),
			jen.For(jen.Id("col").Op(":=").Range().Id("c")).Block(
				jen.For(jen.Id("i").Op(":=").Range().Id("c").Index(jen.Id("col"))).Block(
					jen.Id("j").Index(jen.Id("i")).Index(jen.Id("col")).Op("=").Id("c").Index(jen.Id("col")).Index(jen.Id("i")),
				),
			),
		}
	}
	var recvArg []jen.Code
	if s.Receiver != "" {
		recvArg = []jen.Code{jen.Id("recv")}
	}
	tol := "1e-6"
	if s.Elem == "float32" {
		tol = "2e-2"
	}
	inside, boxed := projectionInto(p, vec)
	boxDoc := ""
	if p.Bounded {
		boxDoc = " With bounds every point is projected into the box, and a column whose ±h leaves the box is not checked there."
	}
	skip := jen.Null()
	if p.Bounded {
		skip = jen.If(jen.Id("up").Index(jen.Id("col")).Op(">").Id("b").Dot("upper").Index(jen.Id("col")).Op("||").Id("down").Index(jen.Id("col")).Op("<").Id("b").Dot("lower").Index(jen.Id("col"))).Block(jen.Continue().Comment("the box leaves no room for ±h"))
	}
	runArgs := append(append([]jen.Code(nil), recvArg...), jen.Id(helper+"Start").Call())
	f.Commentf("Test%sJacobianMatchesDifferences compares %s, entry by entry, with central differences of the residuals %s, h = ∛u·|xⱼ| (∛u at 0, relative as for fitted parameters far below 1), at the start, two nearby points and where the run from start ends. It allows %s relative to max(1, |Jᵢⱼ|) (common practice), 100 times the rounding bound u·|rᵢ|/h (Nocedal & Wright 2006, §8.1), and the change the difference shows between h and 2h, which bounds its truncation error (Richardson's comparison: it is about three times that error). Entries, unlike the gradient Jᵀr, do not vanish at the fit, so a Jacobian wrong only there is caught too.%s", name, s.Jacobian, s.Objective, tol, boxDoc)
	f.Func().Id("Test" + name + "JacobianMatchesDifferences").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(append(setup(), boxed...),
		jen.Id("residuals").Op(":=").Func().Params(jen.Id("x").Add(vec.Clone())).Params(jen.Id("r").Add(rvec.Clone())).Block(
			callee(s.Objective).Call(residualArgs(s, "r")...),
			jen.Return(),
		),
		jen.Id("jacobian").Op(":=").Func().Params(jen.Id("x").Add(vec.Clone())).Params(jen.Id("j").Add(jac.Clone())).Block(append(jacBody, jen.Return())...),
		jen.Id("start").Op(":=").Add(inside(jen.Id(helper+"Start").Call())),
		jen.Id("points").Op(":=").Index().Add(vec.Clone()).Values(jen.Id("start")),
		jen.For(jen.Id("k").Op(":=").Lit(1), jen.Id("k").Op("<").Lit(3), jen.Id("k").Op("++")).Block(
			jen.Id("x").Op(":=").Id("start"),
			jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
				jen.Id("x").Index(jen.Id("i")).Op("+=").Id(s.Elem).Call(jen.Id("k")).Op("*").Lit(0.01).Op("*").Id(s.Elem).Call(jen.Id("i").Op("+").Lit(1)),
			),
			jen.Id("points").Op("=").Append(jen.Id("points"), inside(jen.Id("x"))),
		),
		jen.Id("points").Op("=").Append(jen.Id("points"), jen.Id(name).Call(runArgs...).Dot("X")),
		jen.For(jen.List(jen.Id("_"), jen.Id("x")).Op(":=").Range().Id("points")).Block(
			jen.Id("j").Op(":=").Id("jacobian").Call(jen.Id("x")),
			jen.For(jen.Id("col").Op(":=").Range().Id("x")).Block(
				jen.Id("h").Op(":=").Id(s.Elem).Call(jen.Op(formatFloat(math.Cbrt(rules.Roundoff(s.Elem)))).Op("*").Qual("math", "Abs").Call(jen.Float64().Call(jen.Id("x").Index(jen.Id("col"))))),
				jen.If(jen.Id("h").Op("==").Lit(0)).Block(jen.Id("h").Op("=").Op(formatFloat(math.Cbrt(rules.Roundoff(s.Elem))))),
				jen.List(jen.Id("up"), jen.Id("down")).Op(":=").List(jen.Id("x"), jen.Id("x")),
				jen.Id("up").Index(jen.Id("col")).Op("+=").Id("h"),
				jen.Id("down").Index(jen.Id("col")).Op("-=").Id("h"),
				skip,
				jen.List(jen.Id("farUp"), jen.Id("farDown")).Op(":=").List(jen.Id("up"), jen.Id("down")),
				jen.Id("farUp").Index(jen.Id("col")).Op("+=").Id("h"),
				jen.Id("farDown").Index(jen.Id("col")).Op("-=").Id("h"),
				jen.List(jen.Id("ru"), jen.Id("rd")).Op(":=").List(jen.Id("residuals").Call(jen.Id("up")), jen.Id("residuals").Call(jen.Id("down"))),
				jen.List(jen.Id("ru2"), jen.Id("rd2")).Op(":=").List(jen.Id("residuals").Call(jen.Id("farUp")), jen.Id("residuals").Call(jen.Id("farDown"))),
				jen.For(jen.Id("i").Op(":=").Range().Id("ru")).Block(
					jen.Id("approx").Op(":=").Float64().Call(jen.Id("ru").Index(jen.Id("i")).Op("-").Id("rd").Index(jen.Id("i"))).Op("/").Float64().Call(jen.Id("up").Index(jen.Id("col")).Op("-").Id("down").Index(jen.Id("col"))),
					jen.Id("wide").Op(":=").Float64().Call(jen.Id("ru2").Index(jen.Id("i")).Op("-").Id("rd2").Index(jen.Id("i"))).Op("/").Float64().Call(jen.Id("farUp").Index(jen.Id("col")).Op("-").Id("farDown").Index(jen.Id("col"))),
					jen.Id("exact").Op(":=").Float64().Call(jen.Id("j").Index(jen.Id("i")).Index(jen.Id("col"))),
					jen.Id("size").Op(":=").Qual("math", "Max").Call(jen.Qual("math", "Abs").Call(jen.Float64().Call(jen.Id("ru").Index(jen.Id("i")))), jen.Qual("math", "Abs").Call(jen.Float64().Call(jen.Id("rd").Index(jen.Id("i"))))),
					jen.Id("allowed").Op(":=").Op(tol).Op("*").Qual("math", "Max").Call(jen.Lit(1.0), jen.Qual("math", "Abs").Call(jen.Id("exact"))).Op("+").Lit(100).Op("*").Op(formatFloat(rules.Roundoff(s.Elem))).Op("*").Id("size").Op("/").Float64().Call(jen.Id("h")).Op("+").Qual("math", "Abs").Call(jen.Id("wide").Op("-").Id("approx")),
					jen.If(jen.Op("!").Parens(jen.Qual("math", "Abs").Call(jen.Id("approx").Op("-").Id("exact")).Op("<=").Id("allowed"))).Block(
						jen.Id("t").Dot("Errorf").Call(jen.Lit("at %v: J[%d][%d] = ∂r%d/∂x%d is %g, central differences give %g"), jen.Id("x"), jen.Id("i"), jen.Id("col"), jen.Id("i"), jen.Id("col"), jen.Id("exact"), jen.Id("approx")),
					),
				),
			),
		),
	)...)
}

// userCall names the user's function fn as the generated tests call it:
// fn, or recv.fn for a method.
func userCall(s Shape) func(fn string) *jen.Statement {
	return func(fn string) *jen.Statement {
		if s.Receiver == "" {
			return jen.Id(fn)
		}
		return jen.Id("recv").Dot(fn)
	}
}

// projectionInto is, with bounds, the declarations of the box b and of
// inside(x), x projected into it, and a wrapper calling inside; without,
// the identity and nothing.
func projectionInto(p *Plan, vec *jen.Statement) (func(jen.Code) jen.Code, []jen.Code) {
	if !p.Bounded {
		return func(x jen.Code) jen.Code { return x }, nil
	}
	at := func(side string) *jen.Statement { return jen.Id("b").Dot(side).Index(jen.Id("i")) }
	xi := func() *jen.Statement { return jen.Id("x").Index(jen.Id("i")) }
	return func(x jen.Code) jen.Code { return jen.Id("inside").Call(x) }, []jen.Code{
		jen.Id("b").Op(":=").Add(boxValue(p)),
		jen.Id("inside").Op(":=").Func().Params(jen.Id("x").Add(vec.Clone())).Add(vec.Clone()).Block(
			jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
				jen.If(xi().Op("<").Add(at("lower"))).Block(xi().Op("=").Add(at("lower"))),
				jen.If(xi().Op(">").Add(at("upper"))).Block(xi().Op("=").Add(at("upper"))),
			),
			jen.Return(jen.Id("x")),
		),
	}
}
