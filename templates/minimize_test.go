package templates

import (
	"fmt"
	"math"
	"testing"
)

// Every policy reaches the published minimum of Rosenbrock (1, 1), f = 0
// (Moré, Garbow & Hillstrom 1981, problem 1) and of the closed-form
// ellipse, and reports exactly the objective calls it made.
func TestEveryPolicyConverges(t *testing.T) {
	// lowest is the smallest eigenvalue of ∇²f(x*), which turns a gradient
	// limit into a distance from x*: |x − x*| ≲ ‖g‖/λ_min. Rosenbrock's
	// Hessian at (1, 1) is [[802, −400], [−400, 200]], λ_min ≈ 0.3994; the
	// ellipse's is diag(2, 20).
	problems := []struct {
		name   string
		make   func() *receiver
		start  vec
		want   vec
		lowest float64
	}{
		{"rosenbrock", rosenbrock, vec{-1.2, 1}, vec{1, 1}, 0.3994},
		{"ellipse", ellipse, vec{0, 0}, vec{3, -1}, 2},
	}
	for _, p := range everyPolicy() {
		if p.kind == kindCG && p.rule < ruleWolfe {
			// Polak–Ribière directions are descent directions only under the
			// strong Wolfe conditions with c2 < ½ (Nocedal & Wright 2006,
			// §5.2, Lemma 5.6 and the discussion of PR+); with backtracking
			// alone CG crawls on Rosenbrock. TestEvaluationCapIsNeverExceeded
			// and TestNonFiniteValues still cover those pairs.
			continue
		}
		for _, prob := range problems {
			t.Run(p.String()+"/"+prob.name, func(t *testing.T) {
				p.use(t)
				recv := prob.make()
				lim := defaultLimits()
				out := minimize(recv, prob.start, lim, box{})
				if out.status != statusGradientSmall {
					t.Fatalf("status %d after %d iterations, %d calls, x = %v, f = %g, gradient %g over limit %g", out.status, out.iterations, out.evaluations, out.x, out.f, out.gradient, out.gradientLimit)
				}
				// Converged means the first-order test holds at X: the exact
				// gradient's measure is within the limit the run reports.
				var exact, none vec
				recv.gradientFunc(&out.x, &exact)
				if m, _ := relativeGradient(&exact, &none, &out.x, out.f); !(m <= out.gradientLimit) {
					t.Errorf("converged with the exact gradient's measure %g above the limit %g", m, out.gradientLimit)
				}
				// ‖g‖∞ ≤ limit·max(|f|, 1) by the relative measure; ‖g‖₂ ≤ √2‖g‖∞.
				tol := max(1e-4, 2*math.Sqrt2*out.gradientLimit*max(1, math.Abs(out.f))/prob.lowest)
				for i := range out.x {
					if math.Abs(out.x[i]-prob.want[i]) > tol {
						t.Errorf("x = %v, want %v", out.x, prob.want)
					}
				}
				if out.evaluations != recv.calls {
					t.Errorf("reported %d evaluations, objective saw %d calls", out.evaluations, recv.calls)
				}
			})
		}
	}
}

// Steepest descent with a fixed step t on f = ½·a·x² + ½·b·y² is the linear
// map x ← (1 − t·a)·x, so after k steps x = (1 − t·a)ᵏ·x₀ exactly (closed
// form, Nocedal & Wright 2006, §3.3).
func TestFixedStepMatchesClosedForm(t *testing.T) {
	policy{sourceAnalytic, kindSteepest, ruleFixed, backtrackShrink}.use(t)
	const a, b = 1.0, 1.5 // stepInitial = 1 needs a, b < 2 to converge
	recv := &receiver{
		valueFunc:    func(x *vec) elem { return 0.5*a*x[0]*x[0] + 0.5*b*x[1]*x[1] },
		gradientFunc: func(x, g *vec) { g[0], g[1] = a*x[0], b*x[1] },
	}
	lim := limits{Gradient: -1, Step: -1, Iterations: 7, Evaluations: 100}
	out := minimize(recv, vec{2, 3}, lim, box{})
	if out.status != statusOutOfIterations || out.iterations != 7 {
		t.Fatalf("status %d after %d iterations", out.status, out.iterations)
	}
	want := vec{2 * math.Pow(1-stepInitial*a, 7), 3 * math.Pow(1-stepInitial*b, 7)}
	if out.x != want {
		t.Errorf("x = %v, want %v", out.x, want)
	}
	if out.evaluations != 8 {
		t.Errorf("evaluations = %d, want 8 (one per step plus the start)", out.evaluations)
	}
}

// A fixed step larger than 2/L diverges: the step is taken whatever f
// does, as the rule promises, f grows ninefold at every step, and after
// eight rises above f(x0) the run ends as diverged, reporting the best
// point seen, the start.
func TestFixedStepDivergesAndStops(t *testing.T) {
	policy{sourceAnalytic, kindSteepest, ruleFixed, backtrackShrink}.use(t)
	recv := &receiver{
		valueFunc:    func(x *vec) elem { return 2 * (x[0]*x[0] + x[1]*x[1]) },
		gradientFunc: func(x, g *vec) { g[0], g[1] = 4*x[0], 4*x[1] },
	}
	out := minimize(recv, vec{1, 1}, defaultLimits(), box{})
	if out.status != statusDiverged {
		t.Fatalf("status %d, want diverged", out.status)
	}
	if out.x != (vec{1, 1}) || out.f != 4 || out.iterations != 8 {
		t.Errorf("x = %v, f = %g after %d iterations: want the start, f = 4, after 8 rising steps", out.x, out.f, out.iterations)
	}
	// A value that overflows before eight rises is divergence too.
	recv.valueFunc = func(x *vec) elem { return 1e300 * (x[0]*x[0] + x[1]*x[1]) }
	recv.gradientFunc = func(x, g *vec) { g[0], g[1] = 2e300*x[0], 2e300*x[1] }
	if out := minimize(recv, vec{1, 1}, defaultLimits(), box{}); out.status != statusDiverged || out.x != (vec{1, 1}) {
		t.Errorf("overflow: status %d at x = %v, want diverged at the start", out.status, out.x)
	}
}

// The evaluation cap is hard: a run is deterministic, so for every cap
// below what an uncapped run needs, the capped run follows the same path,
// stops with out-of-evaluations and never calls the objective more often
// than the cap allows.
func TestEvaluationCapIsNeverExceeded(t *testing.T) {
	for _, p := range everyPolicy() {
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			needed := minimize(rosenbrock(), vec{-1.2, 1}, defaultLimits(), box{}).evaluations
			for cap := 0; cap < needed; cap += 1 + cap/40 {
				recv := rosenbrock()
				lim := defaultLimits()
				lim.Evaluations = cap
				out := minimize(recv, vec{-1.2, 1}, lim, box{})
				if recv.calls > cap || out.evaluations != recv.calls {
					t.Fatalf("cap %d: %d calls, %d reported", cap, recv.calls, out.evaluations)
				}
				if out.status != statusOutOfEvaluations {
					t.Fatalf("cap %d of %d needed: status %d, want out of evaluations", cap, needed, out.status)
				}
			}
		})
	}
}

// NaN or ±Inf never loops: each ends the run with its own status.
func TestNonFiniteValues(t *testing.T) {
	for _, p := range everyPolicy() {
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			nan := math.NaN()
			start := rosenbrock()
			if out := minimize(start, vec{nan, 1}, defaultLimits(), box{}); out.status != statusNonFiniteStart {
				t.Errorf("NaN start: status %d", out.status)
			}
			wall := rosenbrock() // +Inf everywhere but the start
			inner := wall.valueFunc
			wall.valueFunc = func(x *vec) elem {
				if *x == (vec{-1.2, 1}) {
					return inner(x)
				}
				return math.Inf(1)
			}
			if p.source == sourceAnalytic {
				out := minimize(wall, vec{-1.2, 1}, defaultLimits(), box{})
				if out.status != statusNoAcceptableStep || out.evaluations > 1+stepTrials {
					t.Errorf("Inf trials: status %d after %d calls", out.status, out.evaluations)
				}
			} else {
				out := minimize(wall, vec{-1.2, 1}, defaultLimits(), box{})
				if out.status != statusNonFiniteGradient {
					t.Errorf("Inf in differences: status %d", out.status)
				}
			}
			if p.source == sourceAnalytic {
				badGradient := rosenbrock()
				badGradient.gradientFunc = func(x, g *vec) { g[0], g[1] = nan, 0 }
				if out := minimize(badGradient, vec{-1.2, 1}, defaultLimits(), box{}); out.status != statusNonFiniteGradient {
					t.Errorf("NaN gradient: status %d", out.status)
				}
			}
		})
	}
}

// The evaluation count of the finite differences: forward costs dim calls,
// central 2·dim (Nocedal & Wright 2006, §8.1).
func TestDerivativeCosts(t *testing.T) {
	for source, want := range []int{0, dim, 2 * dim} {
		policy{source, kindBFGS, ruleArmijo, backtrackShrink}.use(t)
		recv := rosenbrock()
		x := vec{-1.2, 1}
		var g vec
		diffs := calibrated(recv, &x)
		derivative(recv, &x, recv.valueFunc(&x), &g, diffs)
		if recv.calls != want || derivativeCost != want {
			t.Errorf("%s: %d calls, cost %d, want %d", sourceNames[source], recv.calls, derivativeCost, want)
		}
	}
}

// The error bound a difference gradient carries when the run is about to
// be called converged (confirmGradient: intervals chosen at x, the model
// plus the change from doubling them) holds against Rosenbrock's analytic
// gradient at points near and far from the minimum, and at points where
// f has cancellation inside it (y − x² near the valley), which the
// rounding model 4u·|f| alone misses. The convergence test relies on it.
func TestConfirmedDifferencesWithinTheirBound(t *testing.T) {
	for _, source := range []int{sourceForward, sourceCentral} {
		policy{source, kindBFGS, ruleArmijo, backtrackShrink}.use(t)
		recv := rosenbrock()
		for _, x := range []vec{{-1.2, 1}, {0.3, -2}, {1, 1}, {1.0001, 0.9999}, {0.999999, 1.000001}, {1.001, 1.002}, {40, 1600.5}, {1.5, 2.25}} {
			var exact, approx, bound vec
			var diffs differences
			recv.gradientFunc(&x, &exact)
			if _, ok := confirmGradient(recv, &x, recv.valueFunc(&x), &approx, &bound, &diffs, 1<<30); !ok {
				t.Fatal("confirmGradient ran out of an unlimited budget")
			}
			for i := range exact {
				if e := math.Abs(approx[i] - exact[i]); !(e <= bound[i]) {
					t.Errorf("%s at %v: g[%d] = %g, exact %g, error %g above the bound %g",
						sourceNames[source], x, i, approx[i], exact[i], e, bound[i])
				}
			}
		}
	}
}

// At an exact minimizer, forward differences still report a gradient of
// size about h times the second derivative (Nocedal & Wright 2006, §8.1),
// above a tight gradient limit. That gradient is within its own error
// bound of zero, so the run is converged to the differences' accuracy at
// once: the limit it reports is raised to twice that bound's measure.
func TestExactMinimumWithDifferencesConvergesToTheirAccuracy(t *testing.T) {
	for _, p := range everyPolicy() {
		if p.source != sourceForward {
			continue
		}
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			lim := defaultLimits()
			lim.Gradient = 1e-12
			lim.Step = 1e-10
			out := minimize(ellipse(), vec{3, -1}, lim, box{})
			if out.status != statusGradientSmall || out.iterations != 0 || !(out.gradientLimit > lim.Gradient) {
				t.Fatalf("status %d after %d iterations, limit %g: want converged at once, with the limit raised", out.status, out.iterations, out.gradientLimit)
			}
			if out.x != (vec{3, -1}) || out.f != 0 {
				t.Errorf("x = %v, f = %g; want the exact minimizer kept", out.x, out.f)
			}
		})
	}
}

// A wrong analytic gradient makes f rise where it predicts a fall. No
// rule may then claim convergence away from the minimizer, whatever the
// error: a sign flipped in one component, the gradient scaled by −3, one
// component scaled by −0.01 (a case whose last trials once lost the trend
// to rounding). Where the wrong gradient vanishes only at x*, converging
// there is right.
func TestWrongGradientNeverConvergesAway(t *testing.T) {
	type wrong struct {
		name     string
		value    func(x *vec) elem
		gradient func(x, g *vec)
		min      vec
		starts   []vec
	}
	square := func(x *vec) elem { return x[0]*x[0] + x[1]*x[1] }
	wrongs := []wrong{
		{"one sign flipped", square, func(x, g *vec) { g[0], g[1] = -2*x[0], 2*x[1] }, vec{0, 0}, []vec{{1, 0.1}, {1, 1.5}, {1, 0.9}}},
		{"−3 times the gradient", square, func(x, g *vec) { g[0], g[1] = -6*x[0], -6*x[1] }, vec{0, 0}, []vec{{1, 1}, {-2, 0.5}}},
		{"second component times −0.01", ellipse().valueFunc, func(x, g *vec) { g[0], g[1] = 2*(x[0]-3), -0.01*20*(x[1]+1) },
			vec{3, -1}, []vec{{1.7586854673231482, -2.2175046186622507}, {0, 0}}},
	}
	for _, p := range everyPolicy() {
		if p.source != sourceAnalytic {
			continue
		}
		for _, w := range wrongs {
			for _, start := range w.starts {
				t.Run(fmt.Sprintf("%s/%s/%v", p, w.name, start), func(t *testing.T) {
					p.use(t)
					recv := &receiver{valueFunc: w.value, gradientFunc: w.gradient}
					out := minimize(recv, start, defaultLimits(), box{})
					away := math.Abs(out.x[0]-w.min[0]) > 1e-4 || math.Abs(out.x[1]-w.min[1]) > 1e-4
					if out.status == statusGradientSmall && away {
						t.Fatalf("status %d (converged) at x = %v after %d iterations, from a wrong gradient", out.status, out.x, out.iterations)
					}
				})
			}
		}
	}
}

// Brown badly scaled (Moré, Garbow & Hillstrom 1981, problem 4) with its
// exact gradient, from a start where x₁ ≈ 1e6 is too large to move by the
// shortest trials: those trials are not steps along d, so their rises say
// nothing about the gradient, and no rule may report no decrease.
func TestBadlyScaledExactGradientIsNotContradicted(t *testing.T) {
	recv := &receiver{
		valueFunc: func(x *vec) elem {
			a, b, c := x[0]-1e6, x[1]-2e-6, x[0]*x[1]-2
			return a*a + b*b + c*c
		},
		gradientFunc: func(x, g *vec) {
			c := x[0]*x[1] - 2
			g[0] = 2*(x[0]-1e6) + 2*c*x[1]
			g[1] = 2*(x[1]-2e-6) + 2*c*x[0]
		},
	}
	for _, p := range everyPolicy() {
		if p.source != sourceAnalytic || p.kind == kindCG && p.rule < ruleWolfe {
			continue
		}
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			out := minimize(recv, vec{1.0645067985197222e6, 3.07036456363477e-6}, defaultLimits(), box{})
			if out.status == statusNoDecrease {
				t.Errorf("no decrease at x = %v, f = %g, with the exact gradient", out.x, out.f)
			}
		})
	}
}

// At a minimizer of an objective computed with cancellation (a sum of 64
// squared residuals minus its own minimum, so f ≈ 0 carries rounding noise
// far above u·|f|), an exact gradient cannot resolve any decrease. With a
// gradient limit below what the noise allows, every rule must stop as
// stalled (not converged, the gradient test fails) near the minimum, and
// never report no decrease: the noise does not rise in proportion to the
// step the way a wrong gradient's error does.
func TestNoisyMinimumStallsWithoutBlamingTheGradient(t *testing.T) {
	var a, b [64]elem
	for i := range a {
		a[i], b[i] = elem(1+i%7), elem(3*(i%5)-1)
	}
	// Least squares in two unknowns, f = Σ (a_i x₁ + x₂ − b_i)², with its
	// minimum value computed by the normal equations, then subtracted.
	var saa, sa, sb, sab, sbb elem
	for i := range a {
		saa, sa, sb, sab, sbb = saa+a[i]*a[i], sa+a[i], sb+b[i], sab+a[i]*b[i], sbb+b[i]*b[i]
	}
	n := elem(len(a))
	det := saa*n - sa*sa
	x1, x2 := (sab*n-sa*sb)/det, (saa*sb-sa*sab)/det
	var base elem
	for i := range a {
		r := a[i]*x1 + x2 - b[i]
		base += r * r
	}
	recv := &receiver{
		valueFunc: func(x *vec) elem {
			var s elem
			for i := range a {
				r := a[i]*x[0] + x[1] - b[i]
				s += r * r
			}
			return s - base
		},
		gradientFunc: func(x, g *vec) {
			g[0], g[1] = 0, 0
			for i := range a {
				r := a[i]*x[0] + x[1] - b[i]
				g[0] += 2 * r * a[i]
				g[1] += 2 * r
			}
		},
	}
	for _, p := range everyPolicy() {
		if p.source != sourceAnalytic || p.kind == kindCG && p.rule < ruleWolfe {
			continue // CG needs a Wolfe rule, see TestEveryPolicyConverges
		}
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			lim := defaultLimits()
			lim.Gradient = 1e-14 // below what the noise allows: the run must end on the step limit
			for k := 0; k < 12; k++ {
				start := vec{x1 + elem(k%4) - 1.5, x2 + elem(k/4) - 1}
				out := minimize(recv, start, lim, box{})
				if out.status != statusStalled && out.status != statusGradientSmall {
					t.Errorf("from %v: status %d after %d iterations, f = %g", start, out.status, out.iterations, out.f)
				}
				// Rounding of the 64-term sum is about 64·u·base (common
				// practice, Higham's bound for summation recalled from
				// memory); f may not end more than 1000 times above it.
				if noise := 64 * 0x1p-53 * max(base, 1); !(out.f <= 1000*noise) {
					t.Errorf("from %v: f = %g above the noise level %g, x = %v", start, out.f, noise, out.x)
				}
			}
		})
	}
}

// The step test judges each component on its own scale: with x = (1e6,
// 1e-5), a step of 1e-9 in both passes the infinity-norm test
// ‖s‖∞ ≤ 1e-14·(‖x‖∞ + 1) = 1e-8, but the second component has moved by
// far more than 1e-14 of its own size (common practice: Dennis & Schnabel
// 1983, §7.2, scale each component, recalled from memory).
func TestStepTestIsPerComponent(t *testing.T) {
	x := vec{1e6, 1e-5}
	if stepWithin(&vec{1e-9, 1e-9}, &x, 1e-14, &differences{}) {
		t.Errorf("a step of 1e-9 in a component of size 1e-5 passed the step test at 1e-14")
	}
	if !stepWithin(&vec{1e-9, 1e-15}, &x, 1e-14, &differences{}) {
		t.Errorf("a step within tol·(|xᵢ|+1) in every component failed the step test")
	}
	d := vec{1, 1e3}
	tiny := tinyStep(&x, &d, 1e-14, &differences{})
	var s vec
	moveTo(&s, &vec{}, tiny, &d)
	if !stepWithin(&s, &x, 1e-14, &differences{}) {
		t.Errorf("tinyStep %g gives a step %v that fails the step test", tiny, s)
	}
	moveTo(&s, &vec{}, 1.01*tiny, &d)
	if stepWithin(&s, &x, 1e-14, &differences{}) {
		t.Errorf("a step 1%% longer than tinyStep %g still passes the step test", tiny)
	}
	if got := tinyStep(&x, &vec{}, 1e-14, &differences{}); got != -1 {
		t.Errorf("tinyStep along a zero direction = %g, want -1", got)
	}
}

// A wrong gradient's proportional rise, once seen five times in a row,
// stands even when the last, shortest trials change f by mere rounding:
// Rosenbrock with ∂f/∂x₂ scaled by 1.1 from (2.73, 2.85), where BFGS with
// interpolating simple decrease once stopped "converged" at (1.037, 1.079).
// (Found by a randomized review; it must end not converged or at x*.)
func TestProportionalRiseOutlastsRounding(t *testing.T) {
	policy{sourceAnalytic, kindBFGS, ruleDecrease, backtrackInterpolate}.use(t)
	recv := rosenbrock()
	exact := recv.gradientFunc
	recv.gradientFunc = func(x, g *vec) { exact(x, g); g[1] *= 1.1 }
	out := minimize(recv, vec{2.728413826766369, 2.845310935799424}, defaultLimits(), box{})
	away := math.Abs(out.x[0]-1) > 1e-4 || math.Abs(out.x[1]-1) > 1e-4
	if out.status == statusGradientSmall && away {
		t.Fatalf("status %d (converged) at x = %v, from a wrong gradient", out.status, out.x)
	}
}
