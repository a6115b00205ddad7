package gen

import (
	"fmt"

	"github.com/dave/jennifer/jen"
	"github.com/thalweg-go/thalweg/rules"
)

// emitSolver writes the caller-owned state that advances a run a tick at
// a time under a budget of objective calls:
//
//	const NAMETickMinimum = …
//	type NAMESolver struct { run prefixDescent; limits NAMELimits; … }
//	func (s *NAMESolver) SetLimits(limits NAMELimits)
//	func (s *NAMESolver) Start(x0 X)
//	func (s *NAMESolver) StartFrom(from NAMEResult)
//	func (s *NAMESolver) Forget()
//	func (s *NAMESolver) Advance([recv R,] budget int) NAMEResult
//
// The kernel's run (templates' descent) holds every piece of loop state;
// the glue only converts x and the result, and fills in the defaults.
func emitSolver(f *jen.File, p *Plan, state string) {
	name := p.M.Name
	solver := name + "Solver"
	self := func() *jen.Statement { return jen.Id("s").Op("*").Id(solver) }

	f.Commentf("%sTickMinimum is the smallest call budget with which every %s.Advance progresses: the largest worst case of one stage of a run (%s).", name, solver, stageCosts(p))
	f.Const().Id(name + "TickMinimum").Op("=").Lit(p.TickMinimum())

	for _, line := range solverDoc(p) {
		f.Comment(line)
	}
	f.Type().Id(solver).Struct(
		jen.Id("run").Id(state).Comment("the run: its point, gradient, difference intervals, the direction's memory and the loop's bookkeeping"),
		jen.Id("limits").Id(name+"Limits").Comment("the limits of the runs; "+name+"DefaultLimits() until SetLimits"),
		jen.Id("ownLimits").Bool().Comment("whether SetLimits has set limits"),
		jen.Id("started").Bool().Comment("whether a run has begun"),
	)

	f.Commentf("SetLimits sets the stop limits of the run in progress and of later ones; the iteration limit and the evaluation cap count from the run's start (Start or StartFrom).")
	f.Func().Params(self()).Id("SetLimits").Params(jen.Id("limits").Id(name+"Limits")).Block(
		jen.List(jen.Id("s").Dot("limits"), jen.Id("s").Dot("ownLimits")).Op("=").List(jen.Id("limits"), jen.True()),
		jen.Id("s").Dot("run").Dot("lim").Op("=").Id("limits"),
	)

	f.Commentf("Start begins a new run at x0 (moved into the bounds when the spec has them) and forgets the direction's memory. It makes no objective call: the next Advance does.")
	f.Func().Params(self()).Id("Start").Params(jen.Id("x0").Add(xType(p))).Block(
		jen.Id("s").Dot("begin").Call(jen.Id("x0")),
		jen.Id("s").Dot("run").Dot("forget").Call(),
	)

	f.Commentf("StartFrom begins a new run at from.X, keeping what the direction learned in earlier runs (%s), a warm start: after the objective changed a little, as when the data it reads tracks a moving target, the next run starts from the last point with a good model of the curvature. It makes no objective call; the next Advance evaluates f afresh at from.X%s, and the counts and limits start over.", memoryOf(p), calibrates(p))
	f.Func().Params(self()).Id("StartFrom").Params(jen.Id("from").Id(name + "Result")).Block(
		jen.Id("s").Dot("begin").Call(jen.Id("from").Dot("X")),
	)

	f.Commentf("Forget forgets the direction's memory (%s); the run goes on from its point, next with a steepest-descent step.", memoryOf(p))
	f.Func().Params(self()).Id("Forget").Params().Block(jen.Id("s").Dot("run").Dot("forget").Call())

	f.Commentf("begin prepares a run at x0 with the solver's limits, the direction's memory kept.")
	f.Func().Params(self()).Id("begin").Params(jen.Id("x0").Add(xType(p))).Block(
		jen.If(jen.Op("!").Id("s").Dot("ownLimits")).Block(jen.Id("s").Dot("limits").Op("=").Id(name+"DefaultLimits").Call()),
		jen.Id("s").Dot("run").Dot("prepare").Call(kernelStart(p, jen.Id("x0")), jen.Id("s").Dot("limits"), kernelBoxValue(p)),
		jen.Id("s").Dot("started").Op("=").True(),
	)

	// Advance.
	params := append(receiverParam(p), jen.Id("budget").Int())
	kernelArgs := append(kernelRecv(p), jen.Id("budget"))
	f.Commentf("Advance goes on with the run for at most budget objective calls and returns its result, or, when this tick's budget does not cover the next stage, the best point so far with Status %sRunning (Converged false): check Status before acting on X. A run that has ended returns its result again without a call; a solver never started begins at the zero x0. See %s for the budget rule and what advancing assumes of the objective.", name, solver)
	f.Func().Params(self()).Id("Advance").Params(params...).Id(name+"Result").Block(
		jen.If(jen.Op("!").Id("s").Dot("started")).Block(
			jen.Var().Id("x0").Add(xType(p)),
			jen.Id("s").Dot("Start").Call(jen.Id("x0")),
		),
		jen.Id("out").Op(":=").Id("s").Dot("run").Dot("advance").Call(kernelArgs...),
		jen.Return(resultOf(p)),
	)
}

// stageCosts names the worst case of each stage of a run.
func stageCosts(p *Plan) string {
	s := fmt.Sprintf("objective calls: the start %d, an iteration %d", p.StartCalls(), p.IterationCalls())
	switch c := p.SettleCalls(); {
	case c > 0 && p.Shape.Combined:
		s += fmt.Sprintf(", the curvature probes at a stall %d", c)
	case c > 0:
		s += fmt.Sprintf(", confirming a difference gradient %d", c)
	}
	return s
}

// memoryOf says what the direction remembers between iterations.
func memoryOf(p *Plan) string {
	switch p.Direction {
	case rules.BFGS:
		return "the inverse-Hessian approximation"
	case rules.LBFGS:
		return "the L-BFGS correction pairs"
	case rules.CG:
		return "the previous conjugate direction"
	}
	return "steepest descent remembers nothing"
}

// calibrates says what a new run's start adds for differences.
func calibrates(p *Plan) string {
	if !usesIntervals(p) {
		return ""
	}
	return " and chooses the difference intervals again"
}

// usesIntervals reports whether the minimizer differences the objective
// with intervals it calibrates. SettleCalls is no test of that: a
// combined objective settles a stall with curvature probes but has no
// intervals.
func usesIntervals(p *Plan) bool {
	return p.CalibrationCalls() > 0 && !p.Shape.Combined
}

// solverDoc is the doc comment of the solver type: the budget rule, what
// advancing assumes, the stack and the caution.
func solverDoc(p *Plan) []string {
	name := p.M.Name
	solver := name + "Solver"
	return []string{
		fmt.Sprintf("%s is a run of %s that the caller owns and advances a tick at a time, for control loops that may spend only so many objective calls per tick. It is a plain value: declare it once (a variable or a field) and it never allocates; copying it copies the run. Start begins a run, Advance goes on with it, StartFrom begins a new one where an earlier one ended keeping the direction's memory, Forget drops that memory, SetLimits changes the stop limits (%sDefaultLimits until then). The zero value is ready: its first Advance starts at the zero x0.", solver, name, name),
		"",
		fmt.Sprintf("Budget rule: Advance(…, budget) makes at most budget objective calls, so the worst case of one Advance is its budget. It begins a stage of the run only when the calls left in the tick cover that stage's worst case: %s. A budget of at least %sTickMinimum = %d progresses at every Advance; a smaller one may make no call. Advancing until the status is not %sRunning ends exactly as %sWithLimits does with the same limits, with the same calls, whatever the budgets.", stageCosts(p), name, p.TickMinimum(), name, name),
		"",
		fmt.Sprintf("Advancing assumes the objective stays the same function throughout a run: %s kept from earlier ticks refer to it. When the data the objective reads changes between ticks (tracking a moving target), call StartFrom with the last result before advancing again: the new run starts from that point with fresh values, and the direction's memory stays a good guess while the curvature changes slowly.", map[bool]string{true: "f(x), the gradient and the difference intervals", false: "f(x) and the gradient"}[usesIntervals(p)]),
		"",
		stackDoc(p),
		"",
		fmt.Sprintf("While Status is %sRunning, X is the best point so far, not a verified minimizer: check Status.Converged() before acting on X.", name),
	}
}

// emitSolverTests writes the solver's generated tests:
//
//	func TestNAMESolverTicks(t *testing.T) { … }
//	func TestNAMESolverAllocatesNothing(t *testing.T) { … }
//	func prefixTestSameResult(a, b NAMEResult) bool { … }
func emitSolverTests(f *jen.File, p *Plan, helper string, setup func() []jen.Code) {
	name := p.M.Name
	same := helper + "SameResult"
	advance := func(budget jen.Code) *jen.Statement {
		var args []jen.Code
		if p.Shape.Receiver != "" {
			args = append(args, jen.Id("recv"))
		}
		return jen.Id("s").Dot("Advance").Call(append(args, budget)...)
	}
	start := jen.Id(helper + "Start").Call()
	whole := []jen.Code{jen.Id(helper + "Start").Call()}
	if p.Shape.Receiver != "" {
		whole = append([]jen.Code{jen.Id("recv")}, whole...)
	}

	f.Commentf("Test%sSolverTicks advances a %sSolver from the spec's start with budgets of %sTickMinimum, one more, twice and seven times it per tick, and checks that no Advance reports more objective calls than its budget, that each one that does not end the run makes calls, and that the run ends exactly where %s's does (same X, F, counts and status); and that a budget of 0 makes no call.", name, name, name, name)
	f.Func().Id("Test" + name + "SolverTicks").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(setup(),
		jen.Id("want").Op(":=").Id(name).Call(whole...),
		jen.For(jen.List(jen.Id("_"), jen.Id("budget")).Op(":=").Range().Index().Int().Values(
			jen.Id(name+"TickMinimum"), jen.Id(name+"TickMinimum").Op("+").Lit(1), jen.Lit(2).Op("*").Id(name+"TickMinimum"), jen.Lit(7).Op("*").Id(name+"TickMinimum"),
		)).Block(
			jen.Var().Id("s").Id(name+"Solver"),
			jen.Id("s").Dot("Start").Call(start.Clone()),
			jen.Id("spent").Op(":=").Lit(0),
			jen.For(jen.Id("tick").Op(":=").Lit(1), jen.Empty(), jen.Id("tick").Op("++")).Block(
				jen.Id("r").Op(":=").Add(advance(jen.Id("budget"))),
				jen.If(jen.Id("r").Dot("Evaluations").Op("-").Id("spent").Op(">").Id("budget")).Block(
					jen.Id("t").Dot("Fatalf").Call(jen.Lit("budget %d, tick %d: %d objective calls"), jen.Id("budget"), jen.Id("tick"), jen.Id("r").Dot("Evaluations").Op("-").Id("spent")),
				),
				jen.If(jen.Id("r").Dot("Status").Op("!=").Id(name+"Running")).Block(
					jen.If(jen.Op("!").Id(same).Call(jen.Id("r"), jen.Id("want"))).Block(
						jen.Id("t").Dot("Fatalf").Call(jen.Lit("budget %d: the ticks ended with %+v, the whole run with %+v"), jen.Id("budget"), jen.Id("r"), jen.Id("want")),
					),
					jen.Break(),
				),
				jen.If(jen.Id("r").Dot("Evaluations").Op("==").Id("spent")).Block(
					jen.Id("t").Dot("Fatalf").Call(jen.Lit("budget %d, tick %d: no progress"), jen.Id("budget"), jen.Id("tick")),
				),
				jen.Id("spent").Op("=").Id("r").Dot("Evaluations"),
			),
		),
		jen.Var().Id("s").Id(name+"Solver"),
		jen.Id("s").Dot("Start").Call(start.Clone()),
		jen.If(jen.Id("r").Op(":=").Add(advance(jen.Lit(0))), jen.Id("r").Dot("Status").Op("!=").Id(name+"Running").Op("||").Id("r").Dot("Evaluations").Op("!=").Lit(0)).Block(
			jen.Id("t").Dot("Errorf").Call(jen.Lit("budget 0: status %v after %d calls"), jen.Id("r").Dot("Status"), jen.Id("r").Dot("Evaluations")),
		),
	)...)

	f.Commentf("Test%sSolverAllocatesNothing proves that starting and advancing a solver to the end of its run makes no heap allocation.", name)
	f.Func().Id("Test" + name + "SolverAllocatesNothing").Params(jen.Id("t").Op("*").Qual("testing", "T")).Block(append(setup(),
		jen.Var().Id("s").Id(name+"Solver"),
		jen.Id("allocs").Op(":=").Qual("testing", "AllocsPerRun").Call(jen.Lit(10), jen.Func().Params().Block(
			jen.Id("s").Dot("Start").Call(start.Clone()),
			jen.For(advance(jen.Id(name+"TickMinimum")).Dot("Status").Op("==").Id(name+"Running")).Block(),
		)),
		jen.If(jen.Id("allocs").Op("!=").Lit(0)).Block(
			jen.Id("t").Dot("Errorf").Call(jen.Lit("%v allocations per run, want 0"), jen.Id("allocs")),
		),
	)...)

	f.Commentf("%s reports whether two results are the same, NaN matching NaN.", same)
	eq := func(field string) *jen.Statement {
		a, b := jen.Id("a").Dot(field), jen.Id("b").Dot(field)
		return jen.Parens(a.Clone().Op("==").Add(b.Clone()).Op("||").Add(a.Clone()).Op("!=").Add(a.Clone()).Op("&&").Add(b.Clone()).Op("!=").Add(b.Clone()))
	}
	f.Func().Id(same).Params(jen.List(jen.Id("a"), jen.Id("b")).Id(name + "Result")).Bool().Block(
		jen.Return(jen.Id("a").Dot("X").Op("==").Id("b").Dot("X").Op("&&").Add(eq("F")).Op("&&").Add(eq("Gradient")).Op("&&").Add(eq("GradientLimit")).Op("&&").
			Id("a").Dot("Iterations").Op("==").Id("b").Dot("Iterations").Op("&&").Id("a").Dot("Evaluations").Op("==").Id("b").Dot("Evaluations").Op("&&").Id("a").Dot("Status").Op("==").Id("b").Dot("Status")),
	)
}
