package templates

import (
	"math"
	"testing"
)

// withBounds turns the bounded alternatives on for the test's duration.
func withBounds(t *testing.T) {
	t.Helper()
	saved := boxed
	boxed = true
	t.Cleanup(func() { boxed = saved })
}

// guarded wraps a problem so that any call of its objective or gradient
// outside b fails the test.
func guarded(t *testing.T, recv *receiver, b box) *receiver {
	value, gradient := recv.valueFunc, recv.gradientFunc
	inside := func(what string, x *vec) {
		for i := range x {
			if !(x[i] >= b.lower[i] && x[i] <= b.upper[i]) {
				t.Fatalf("%s called outside the box at %v", what, *x)
			}
		}
	}
	recv.valueFunc = func(x *vec) elem { inside("objective", x); return value(x) }
	recv.gradientFunc = func(x, g *vec) { inside("gradient", x); gradient(x, g) }
	return recv
}

// Every direction that takes bounds, with every rule and derivative
// source, reaches the minimizer on the box's boundary, never evaluates
// outside the box, and converges on the projected gradient. The minimizers
// follow from the Karush–Kuhn–Tucker conditions of a box (Nocedal & Wright
// 2006, Theorem 12.1: each ∂f/∂xᵢ is 0 for a free xᵢ, ≥ 0 at a lower and
// ≤ 0 at an upper bound):
//
//   - Rosenbrock (Moré, Garbow & Hillstrom 1981, problem 1) on
//     [−2, 0.5] × [−2, 2]: x₀ = 0.5 at its upper bound, x₁ = x₀² = 0.25
//     free, where ∂f/∂x₀ = −2(1 − x₀) = −1 ≤ 0;
//   - the ellipse (x₀ − 3)² + 10(x₁ + 1)² on [0, 2] × [−0.5, 5]: (2, −0.5),
//     both at a bound, with ∂f/∂x₀ = −2 and ∂f/∂x₁ = 10;
//   - the ellipse with x₁ fixed at 0.25 by equal bounds: (3, 0.25).
func TestBoundedPoliciesReachTheBoundary(t *testing.T) {
	withBounds(t)
	inf := math.Inf(1)
	problems := []struct {
		name  string
		make  func() *receiver
		start vec
		b     box
		want  vec
	}{
		{"rosenbrock", rosenbrock, vec{-1.2, 1}, box{vec{-2, -2}, vec{0.5, 2}}, vec{0.5, 0.25}},
		{"ellipse from outside", ellipse, vec{-7, 9}, box{vec{0, -0.5}, vec{2, 5}}, vec{2, -0.5}},
		{"ellipse fixed", ellipse, vec{0, 0}, box{vec{-inf, 0.25}, vec{inf, 0.25}}, vec{3, 0.25}},
	}
	for _, p := range everyPolicy() {
		if p.kind == kindCG {
			continue // refused with bounds
		}
		for _, prob := range problems {
			t.Run(p.String()+"/"+prob.name, func(t *testing.T) {
				p.use(t)
				recv := guarded(t, prob.make(), prob.b)
				out := minimize(recv, prob.start, defaultLimits(), prob.b)
				if out.status != statusGradientSmall {
					t.Fatalf("status %d after %d iterations, x = %v, gradient %g over %g", out.status, out.iterations, out.x, out.gradient, out.gradientLimit)
				}
				for i := range out.x {
					if math.Abs(out.x[i]-prob.want[i]) > 1e-5 {
						t.Errorf("x = %v, want %v", out.x, prob.want)
						break
					}
				}
				// Converged means the projected gradient passes the test at X.
				var exact, none vec
				recv.gradientFunc(&out.x, &exact)
				if m, _ := projectedMeasure(&exact, &none, &out.x, out.f, &prob.b); !(m <= out.gradientLimit) {
					t.Errorf("the exact projected gradient's measure %g is above the limit %g", m, out.gradientLimit)
				}
				if out.evaluations != recv.calls {
					t.Errorf("reported %d evaluations, objective saw %d calls", out.evaluations, recv.calls)
				}
			})
		}
	}
}

// A step capped at a bound lands on it exactly, even when x + t·d rounds
// short of it, so the bound is active at the next iterate.
func TestCappedStepLandsOnTheBound(t *testing.T) {
	b := box{vec{0.1, -1}, vec{0.7, 1}}
	x, d := vec{0.3, 0}, vec{0.1, 0.1}
	cap := firstBound(&x, &d, knownFloor(0), &differences{bounds: b})
	if want := (b.upper[0] - x[0]) / d[0]; cap != want {
		t.Fatalf("cap %v, want %v", cap, want)
	}
	var xt vec
	projectedTrial(&xt, &x, cap, &d, &b)
	if xt[0] != 0.7 {
		t.Errorf("x₀ = %v after the capped step, want the bound 0.7 exactly", xt[0])
	}
	if want := cap * 0.1; xt[1] != want {
		t.Errorf("x₁ = %v, want %v", xt[1], want)
	}
	// A bound reached within tiny is left to the projection and does not
	// cap the step.
	x = vec{0.7 - 1e-17, 0}
	if got := firstBound(&x, &d, knownFloor(1e-10), &differences{bounds: b}); !(got > 1) {
		t.Errorf("cap %v with a bound 1e-17 away and tiny 1e-10, want the next bound's, (1 − 0)/0.1", got)
	}
}

// One-sided differences at a bound match the analytic gradient to their
// order, never probe outside, and a variable fixed by equal bounds gets 0
// at no cost. f = e^(x₀) + x₁³ + x₀x₁ at a corner of its box (closed-form
// gradient).
func TestDifferencesAtBounds(t *testing.T) {
	withBounds(t)
	b := box{vec{-1, 0.5}, vec{0.25, 2}}
	recv := &receiver{
		valueFunc: func(x *vec) elem { return math.Exp(x[0]) + x[1]*x[1]*x[1] + x[0]*x[1] },
		gradientFunc: func(x, g *vec) {
			g[0] = math.Exp(x[0]) + x[1]
			g[1] = 3*x[1]*x[1] + x[0]
		},
	}
	recv = guarded(t, recv, b)
	for _, x := range []vec{{0.25, 0.5}, {-1, 2}, {0.25, 2}} {
		var want vec
		recv.gradientFunc(&x, &want)
		for _, source := range []int{sourceForward, sourceCentral} {
			policy{source, kindBFGS, ruleWolfe, backtrackShrink}.use(t)
			diffs := differences{bounds: b}
			calibrate(recv, &x, recv.valueFunc(&x), &diffs, 1<<20)
			var g, e vec
			calls := recv.calls
			made := derivative(recv, &x, recv.valueFunc(&x), &g, &diffs)
			if made != derivativeCost || recv.calls-calls != made {
				t.Errorf("%s at %v: %d calls reported, %d made, cost %d", sourceNames[source], x, made, recv.calls-calls, derivativeCost)
			}
			gradientError(&x, recv.valueFunc(&x), &g, &e, &diffs)
			for i := range g {
				if err := math.Abs(g[i] - want[i]); !(err <= e[i]) || err > 1e-5 {
					t.Errorf("%s at %v: g[%d] = %v, want %v; error %g, bound %g", sourceNames[source], x, i, g[i], want[i], err, e[i])
				}
			}
		}
	}
	// x₁ fixed: no probes along it, and 0.
	fixed := box{vec{-1, 0.5}, vec{0.25, 0.5}}
	recv = guarded(t, recv, fixed)
	x := vec{0, 0.5}
	for _, source := range []int{sourceForward, sourceCentral} {
		policy{source, kindBFGS, ruleWolfe, backtrackShrink}.use(t)
		diffs := differences{bounds: fixed}
		calibrate(recv, &x, recv.valueFunc(&x), &diffs, 1<<20)
		var g vec
		if made := derivative(recv, &x, recv.valueFunc(&x), &g, &diffs); made != derivativeCost/2 || g[1] != 0 {
			t.Errorf("%s with x₁ fixed: %d calls, g = %v; want %d calls and g₁ = 0", sourceNames[source], made, g, derivativeCost/2)
		}
	}
}

// The projected gradient counts a component pushing against the bound it
// sits on as zero, and its error bound beyond |gᵢ| only.
func TestProjectedMeasure(t *testing.T) {
	b := box{vec{0, 0}, vec{1, 1}}
	x := vec{0, 0.5}
	g, e := vec{3, 0}, vec{0, 0}
	if m, _ := projectedMeasure(&g, &e, &x, 0, &b); m != 0 {
		t.Errorf("measure %g at a lower bound with g > 0, want 0", m)
	}
	g = vec{-3, 0}
	if m, _ := projectedMeasure(&g, &e, &x, 0, &b); m != 3 {
		t.Errorf("measure %g at a lower bound with g < 0, want 3", m)
	}
	g, e = vec{1e-3, 0}, vec{3e-3, 0}
	if m, floor := projectedMeasure(&g, &e, &x, 0, &b); math.Abs(m-2e-3) > 1e-15 || math.Abs(floor-2e-3) > 1e-15 {
		t.Errorf("measure %g, floor %g with an error bound above g, want 2e-3 both", m, floor)
	}
}
