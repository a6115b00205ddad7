package templates

import (
	"math"
	"testing"
)

// withCombined turns the combined alternatives on for the test's
// duration, as gen does for an objective that gives its gradient with its
// value (on top of an analytic policy).
func withCombined(t *testing.T) {
	t.Helper()
	saved := combined
	combined = true
	t.Cleanup(func() { combined = saved })
}

// calls records the points an objective or a gradient was called at, in
// order.
type calls []vec

// recorded wraps a problem's value and gradient so that each records the
// points it is called at; both, in order, also go to the log, whose
// gradient marks which.
func recorded(valueFunc func(x *vec) elem, gradientFunc func(x, g *vec)) (*receiver, *calls, *[]loggedCall) {
	values, log := &calls{}, &[]loggedCall{}
	return &receiver{
		valueFunc: func(x *vec) elem {
			*values = append(*values, *x)
			*log = append(*log, loggedCall{*x, false})
			return valueFunc(x)
		},
		gradientFunc: func(x, g *vec) { *log = append(*log, loggedCall{*x, true}); gradientFunc(x, g) },
	}, values, log
}

// loggedCall is one call of a recorded problem: its point, and whether
// it was the gradient's.
type loggedCall struct {
	x        vec
	gradient bool
}

// combinedOf is the same problem as one combined objective: each call
// records its point, writes the gradient into g and returns the value.
// Its valueFunc and gradientFunc are nil, so a kernel that called it for
// its value alone, or for a separate gradient, would crash the test.
func combinedOf(valueFunc func(x *vec) elem, gradientFunc func(x, g *vec)) (*receiver, *calls) {
	points := &calls{}
	return &receiver{combinedFunc: func(x, g *vec) elem {
		*points = append(*points, *x)
		gradientFunc(x, g)
		return valueFunc(x)
	}}, points
}

// twinProblem is a problem run both ways.
type twinProblem struct {
	name     string
	value    func(x *vec) elem
	gradient func(x, g *vec)
	start    vec
	b        box // with bounds when bounded
	bounded  bool
	lim      limits
}

// twinProblems are Rosenbrock and the ellipse (helpers_test.go), the
// noisy least-squares minimum of TestNoisyMinimumStallsWithoutBlamingTheGradient,
// where every rule stalls and settles, the ellipse on a box, and a
// quadratic for the fixed step.
func twinProblems() []twinProblem {
	lim := defaultLimits()
	lim.Iterations = 3000
	noisyLim := lim
	noisyLim.Gradient = 1e-14 // below what the noise allows: the run must end at a stall
	ros, ell := rosenbrock(), ellipse()
	var a, b [64]elem
	for i := range a {
		a[i], b[i] = elem(1+i%7), elem(3*(i%5)-1)
	}
	noisy := func(x *vec) elem {
		var s elem
		for i := range a {
			r := a[i]*x[0] + x[1] - b[i]
			s += r * r
		}
		return s - 1e3 // a large offset, so that f ≈ 0 carries rounding noise
	}
	noisyGradient := func(x, g *vec) {
		g[0], g[1] = 0, 0
		for i := range a {
			r := a[i]*x[0] + x[1] - b[i]
			g[0] += 2 * r * a[i]
			g[1] += 2 * r
		}
	}
	return []twinProblem{
		{name: "rosenbrock", value: ros.valueFunc, gradient: ros.gradientFunc, start: vec{-1.2, 1}, lim: lim},
		{name: "ellipse", value: ell.valueFunc, gradient: ell.gradientFunc, start: vec{0, 0}, lim: lim},
		{name: "noisy", value: noisy, gradient: noisyGradient, start: vec{1, -2}, lim: noisyLim},
		{name: "ellipse in a box", value: ell.valueFunc, gradient: ell.gradientFunc, start: vec{-7, 9},
			b: box{vec{0, -0.5}, vec{2, 5}}, bounded: true, lim: lim},
	}
}

// twinPolicies are every direction with every rule, both backtracking
// variants, with an analytic gradient; the fixed step (stepInitial = 1)
// only diverges on these problems, which the twins must do alike too.
func twinPolicies() []policy {
	var out []policy
	for kind := range kindNames {
		out = append(out, policy{sourceAnalytic, kind, ruleFixed, backtrackShrink})
	}
	for _, p := range everyPolicy() {
		if p.source == sourceAnalytic {
			out = append(out, p)
		}
	}
	return out
}

// A combined objective pays once per point: run with the same problem
// given as value and gradient, the combined run takes the same path bit
// for bit (the kernels see the same numbers), calls the combined
// objective exactly once at every point where the analytic run called the
// objective, in the same order, and nowhere else, except the rounding
// floor's probes at a stall, where the analytic run called its gradient.
// It never calls for the value alone nor for a separate gradient, and
// reports every call.
func TestCombinedPaysOncePerPoint(t *testing.T) {
	probed := 0 // runs that settled at a stall, so that the probes were exercised
	for _, p := range twinPolicies() {
		for _, prob := range twinProblems() {
			if prob.bounded && p.kind == kindCG {
				continue // refused with bounds
			}
			t.Run(p.String()+"/"+prob.name, func(t *testing.T) {
				p.use(t)
				if prob.bounded {
					withBounds(t)
				}
				analytic, values, log := recorded(prob.value, prob.gradient)
				want := minimize(analytic, prob.start, prob.lim, prob.b)
				withCombined(t)
				recv, points := combinedOf(prob.value, prob.gradient)
				got := minimize(recv, prob.start, prob.lim, prob.b)

				if got.status != want.status || got.x != want.x || got.f != want.f || got.iterations != want.iterations {
					t.Fatalf("combined: status %d, x = %v, f = %g after %d iterations; analytic: status %d, x = %v, f = %g after %d",
						got.status, got.x, got.f, got.iterations, want.status, want.x, want.f, want.iterations)
				}
				if recv.valueOnly != 0 || recv.gradients != 0 {
					t.Fatalf("the combined objective was called %d times for its value alone and %d times for a separate gradient", recv.valueOnly, recv.gradients)
				}
				if got.evaluations != recv.calls || recv.calls != len(*points) {
					t.Fatalf("reported %d evaluations, the objective counted %d calls and recorded %d", got.evaluations, recv.calls, len(*points))
				}
				// The combined run calls where the analytic run called its
				// objective, and at the probes of a stall, the points where
				// the analytic run called its gradient alone (never its
				// value), in the same order; a run may go on after a stall
				// (cg's preconditioner), so probes may come mid-run.
				valued := map[vec]bool{}
				for _, x := range *values {
					valued[x] = true
				}
				var expected calls
				probes := 0
				for _, c := range *log {
					if !c.gradient || !valued[c.x] {
						expected = append(expected, c.x)
					}
					if c.gradient && !valued[c.x] {
						probes++
					}
				}
				if len(*points) != len(expected) {
					t.Fatalf("%d combined calls, want the analytic run's %d points and %d probes", len(*points), len(*values), probes)
				}
				for i := range expected {
					if (*points)[i] != expected[i] {
						t.Fatalf("call %d at %v, where the analytic run evaluated %v", i, (*points)[i], expected[i])
					}
				}
				if probes%dim != 0 {
					t.Fatalf("%d probes, want the %d of each stall", probes, dim)
				}
				if probes > 0 {
					probed++
				}
				if got.evaluations != want.evaluations+probes {
					t.Errorf("%d evaluations, want the analytic run's %d and the %d probes", got.evaluations, want.evaluations, probes)
				}
			})
		}
	}
	if probed == 0 {
		t.Error("no run settled at a stall: the probes of settleCombined went unexercised")
	}
}

// The cap holds for a combined objective too, the probes of a stall
// included: every cap below what the run needs stops it on the same path
// with out-of-evaluations and at most that many calls.
func TestCombinedEvaluationCap(t *testing.T) {
	for _, p := range twinPolicies() {
		for _, prob := range twinProblems() {
			if prob.bounded && p.kind == kindCG {
				continue
			}
			t.Run(p.String()+"/"+prob.name, func(t *testing.T) {
				p.use(t)
				withCombined(t)
				if prob.bounded {
					withBounds(t)
				}
				full, path := combinedOf(prob.value, prob.gradient)
				needed := minimize(full, prob.start, prob.lim, prob.b).evaluations
				for cap := 0; cap < needed; cap += 1 + cap/40 {
					recv, points := combinedOf(prob.value, prob.gradient)
					lim := prob.lim
					lim.Evaluations = cap
					out := minimize(recv, prob.start, lim, prob.b)
					if recv.calls > cap || out.evaluations != recv.calls {
						t.Fatalf("cap %d: %d calls, %d reported", cap, recv.calls, out.evaluations)
					}
					if out.status != statusOutOfEvaluations {
						t.Fatalf("cap %d of %d needed: status %d, want out of evaluations", cap, needed, out.status)
					}
					for i := range *points {
						if (*points)[i] != (*path)[i] {
							t.Fatalf("cap %d: call %d at %v, the uncapped run's at %v", cap, i, (*points)[i], (*path)[i])
						}
					}
				}
			})
		}
	}
}

// The probes of a stall stop at the cap: settleCombined spends at most
// its budget, one call per unknown not fixed by the box, and reports
// running out.
func TestSettleCombinedBudget(t *testing.T) {
	withCombined(t)
	ell := ellipse()
	x := vec{3, -1}
	var g, e vec
	ell.gradientFunc(&x, &g)
	for budget := 0; budget <= dim; budget++ {
		recv, points := combinedOf(ell.valueFunc, ell.gradientFunc)
		var diffs differences
		calls, ok := settleCombined(recv, &x, 0, &g, &e, &diffs, true, budget)
		if want := budget < dim; ok == want || calls != min(budget, dim) || len(*points) != calls {
			t.Errorf("budget %d: %d calls (%d recorded), ok %v", budget, calls, len(*points), ok)
		}
	}
	// Nothing to probe, and nothing spent, when not at a stall or for a
	// variable fixed by equal bounds; the ellipse's ∂²f/∂x₀² = 2 sets the
	// other bound's floor, 4u·|x₀|·2.
	recv, _ := combinedOf(ell.valueFunc, ell.gradientFunc)
	if calls, ok := settleCombined(recv, &x, 0, &g, &e, &differences{}, false, 0); calls != 0 || !ok {
		t.Errorf("without a stall: %d calls, ok %v", calls, ok)
	}
	withBounds(t)
	inf := math.Inf(1)
	diffs := differences{bounds: box{vec{-inf, -1}, vec{inf, -1}}}
	e = vec{}
	calls, ok := settleCombined(recv, &x, 0, &g, &e, &diffs, true, 1)
	if calls != 1 || !ok || recv.calls != 1 {
		t.Fatalf("x₁ fixed: %d calls, ok %v", calls, ok)
	}
	if want := 4 * unitRoundoff * 3 * 2; math.Abs(e[0]-want) > 1e-6*want || e[1] != 0 {
		t.Errorf("rounding floor %v, want [%g 0]", e, want)
	}
}

// NaN or ±Inf from a combined objective ends the run with its own
// status, as from an objective and its gradient: a NaN start, a value
// that is +Inf everywhere but the start (no acceptable step within the
// trials), and a NaN written into the gradient.
func TestCombinedNonFinite(t *testing.T) {
	for _, p := range twinPolicies() {
		if p.rule == ruleFixed {
			continue // a fixed step calls a non-finite value divergence
		}
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			withCombined(t)
			ros := rosenbrock()
			nan := math.NaN()
			recv, _ := combinedOf(ros.valueFunc, ros.gradientFunc)
			if out := minimize(recv, vec{nan, 1}, defaultLimits(), box{}); out.status != statusNonFiniteStart || out.evaluations != 1 {
				t.Errorf("NaN start: status %d after %d calls", out.status, out.evaluations)
			}
			start := vec{-1.2, 1}
			wall, _ := combinedOf(func(x *vec) elem {
				if *x == start {
					return ros.valueFunc(x)
				}
				return math.Inf(1)
			}, ros.gradientFunc)
			if out := minimize(wall, start, defaultLimits(), box{}); out.status != statusNoAcceptableStep || out.evaluations > 1+stepTrials {
				t.Errorf("Inf trials: status %d after %d calls", out.status, out.evaluations)
			}
			bad, _ := combinedOf(ros.valueFunc, func(x, g *vec) { g[0], g[1] = nan, 0 })
			if out := minimize(bad, start, defaultLimits(), box{}); out.status != statusNonFiniteGradient || out.evaluations != 1 {
				t.Errorf("NaN gradient: status %d after %d calls", out.status, out.evaluations)
			}
		})
	}
}

// The worst case the entry's doc comment states for a combined objective
// (gen's Plan.WorstCase) holds: at most 1 call at the start, the rule's
// calls in each of iterations + 1 searches (1 for a fixed step, stepTrials
// otherwise, a gradient costing nothing more) and dim probes at a stall.
func TestCombinedWorstCase(t *testing.T) {
	for _, p := range twinPolicies() {
		for _, prob := range twinProblems() {
			if prob.bounded && p.kind == kindCG {
				continue
			}
			t.Run(p.String()+"/"+prob.name, func(t *testing.T) {
				p.use(t)
				withCombined(t)
				if prob.bounded {
					withBounds(t)
				}
				perIteration := stepTrials
				if p.rule == ruleFixed {
					perIteration = 1
				}
				for _, iterations := range []int{0, 1, 2, 5, prob.lim.Iterations} {
					recv, _ := combinedOf(prob.value, prob.gradient)
					lim := prob.lim
					lim.Iterations = iterations
					out := minimize(recv, prob.start, lim, prob.b)
					if bound := 1 + (iterations+1)*perIteration + dim; recv.calls > bound || out.evaluations != recv.calls {
						t.Errorf("%d iterations allowed: %d calls (%d reported), above the worst case %d", iterations, recv.calls, out.evaluations, bound)
					}
				}
			})
		}
	}
}
