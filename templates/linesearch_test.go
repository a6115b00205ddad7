package templates

import (
	"fmt"
	"math"
	"testing"
)

// lineFunction is a one-dimensional φ(α) with its derivative, embedded as
// the receiver's objective f(x) = φ(x[0]) with ∂f/∂x[1] = 0, so that a
// search from x = (0, 0) along d = (1, 0) sees exactly φ.
type lineFunction struct {
	name       string
	phi, slope func(alpha float64) float64
}

func (fn lineFunction) alongFirstAxis() *receiver {
	return &receiver{
		valueFunc:    func(x *vec) elem { return fn.phi(x[0]) },
		gradientFunc: func(x, g *vec) { g[0], g[1] = fn.slope(x[0]), 0 },
	}
}

// moreThuenteFunctions are the six test functions of Moré & Thuente, "Line
// search algorithms with guaranteed sufficient decrease", ACM TOMS
// 20(3):286–307, 1994, §5 (eqs. 5.1–5.4), with the parameters of their
// Tables 1–6. The formulas and derivatives are copied from gonum's
// optimize/functions/functions.go (ConcaveRight, ConcaveLeft, Plassmann,
// YanaiOzawaKaneko), which cites the same equations.
func moreThuenteFunctions() []lineFunction {
	plassmann := func(l, beta float64) lineFunction {
		return lineFunction{
			name: fmt.Sprintf("plassmann(l=%g,β=%g)", l, beta),
			phi: func(a float64) float64 {
				r := 2 * (1 - beta) / (l * math.Pi) * math.Sin(l*math.Pi/2*a)
				switch {
				case a <= 1-beta:
					r += 1 - a
				case a <= 1+beta:
					r += 0.5 * ((a-1)*(a-1)/beta + beta)
				default:
					r += a - 1
				}
				return r
			},
			slope: func(a float64) float64 {
				r := (1 - beta) * math.Cos(l*math.Pi/2*a)
				switch {
				case a <= 1-beta:
					r--
				case a <= 1+beta:
					r += (a - 1) / beta
				default:
					r++
				}
				return r
			},
		}
	}
	yok := func(b1, b2 float64) lineFunction {
		g1 := math.Sqrt(1+b1*b1) - b1
		g2 := math.Sqrt(1+b2*b2) - b2
		return lineFunction{
			name: fmt.Sprintf("yanai-ozawa-kaneko(β1=%g,β2=%g)", b1, b2),
			phi: func(a float64) float64 {
				return g1*math.Sqrt((1-a)*(1-a)+b2*b2) + g2*math.Sqrt(a*a+b1*b1)
			},
			slope: func(a float64) float64 {
				return g1*(a-1)/math.Sqrt((a-1)*(a-1)+b2*b2) + g2*a/math.Sqrt(a*a+b1*b1)
			},
		}
	}
	return []lineFunction{
		{ // eq. 5.1, β = 2: minimizer √2
			name:  "concave-right(β=2)",
			phi:   func(a float64) float64 { return -a / (a*a + 2) },
			slope: func(a float64) float64 { return (a*a - 2) / ((a*a + 2) * (a*a + 2)) },
		},
		{ // eq. 5.2, β = 0.004: (α+β)⁵ − 2(α+β)⁴ = (α+β)⁴(α − 1.996), minimizer 1.596
			name:  "concave-left(β=0.004)",
			phi:   func(a float64) float64 { return math.Pow(a+0.004, 4) * (a - 1.996) },
			slope: func(a float64) float64 { return math.Pow(a+0.004, 3) * (5*a - 7.98) },
		},
		plassmann(39, 0.01), // eq. 5.3
		yok(0.001, 0.001),   // eq. 5.4
		yok(0.01, 0.001),
		yok(0.001, 0.01),
	}
}

// recording wraps recv so that every objective call also records its
// argument, in order.
func recording(recv *receiver) (*receiver, *[]vec) {
	var trials []vec
	inner := recv.valueFunc
	recv.valueFunc = func(x *vec) elem {
		trials = append(trials, *x)
		return inner(x)
	}
	return recv, &trials
}

// sufficientDecrease is the Armijo condition f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd
// with c1 = stepDecrease (Armijo 1966; Nocedal & Wright 2006, eq. 3.4),
// failing for a value that is not finite.
func sufficientDecrease(ft, fx, step, slope float64) bool {
	return finite(ft) && ft <= fx+stepDecrease*step*slope
}

// armijoProblem is a search along d from x; x[0] is 0 and d = (δ, 0) with
// δ a power of two, so that a trial's step t is recovered exactly from the
// point x + t·d the objective was called at.
type armijoProblem struct {
	name string
	make func() *receiver
	x, d vec
}

func armijoProblems() []armijoProblem {
	axis := func(fn lineFunction) armijoProblem {
		return armijoProblem{fn.name, fn.alongFirstAxis, vec{0, 0}, vec{1, 0}}
	}
	problems := []armijoProblem{
		axis(lineFunction{"quadratic (α−3)²",
			func(a float64) float64 { return (a - 3) * (a - 3) },
			func(a float64) float64 { return 2 * (a - 3) }}),
		axis(lineFunction{"quartic (1−4α)⁴",
			func(a float64) float64 { return math.Pow(1-4*a, 4) },
			func(a float64) float64 { return -16 * math.Pow(1-4*a, 3) }}),
		axis(lineFunction{"kink |α−1|",
			func(a float64) float64 { return math.Abs(a - 1) },
			func(a float64) float64 {
				if a < 1 {
					return -1
				}
				return 1
			}}),
		axis(lineFunction{"α²−4α, +Inf from α = 1",
			func(a float64) float64 {
				if a >= 1 {
					return math.Inf(1)
				}
				return a*a - 4*a
			},
			func(a float64) float64 { return 2*a - 4 }}),
		axis(lineFunction{"α²−4α, −Inf from α = 1",
			func(a float64) float64 {
				if a >= 1 {
					return math.Inf(-1)
				}
				return a*a - 4*a
			},
			func(a float64) float64 { return 2*a - 4 }}),
		axis(lineFunction{"α²−4α+√(1−α)−1, NaN beyond α = 1",
			func(a float64) float64 { return a*a - 4*a + math.Sqrt(1-a) - 1 },
			func(a float64) float64 { return 2*a - 4 - 0.5/math.Sqrt(1-a) }}),
		// Rosenbrock from (0, 0) along (2, 0): φ(α) = 1600α⁴ + (1 − 2α)²,
		// a genuinely two-dimensional objective and a non-unit direction.
		{"rosenbrock along (2, 0)", rosenbrock, vec{0, 0}, vec{2, 0}},
	}
	for _, fn := range moreThuenteFunctions() {
		problems = append(problems, axis(fn))
	}
	return problems
}

// backtrackSearch with the Armijo test accepts the first trial meeting sufficient decrease (N&W
// 2006, eq. 3.4 and Algorithm 3.1): every earlier trial violated it, the
// accepted one meets it, and the trials follow the backtracking rule —
// t ← t·stepShrink exactly for backtrackShrink (Algorithm 3.1), a step in
// [0.1t, 0.5t] for backtrackInterpolate (§3.5, with the safeguard of
// backtrack.go). The reported calls match the objective's own count, and
// the result holds x + t·d and f there.
func TestArmijoSearch(t *testing.T) {
	for _, kind := range []int{backtrackShrink, backtrackInterpolate} {
		for _, prob := range armijoProblems() {
			for _, first := range []float64{1e-3, 1, 10, 1e3, 1e6} {
				name := fmt.Sprintf("%s/%s/first=%g", []string{"shrink", "interpolate"}[kind], prob.name, first)
				t.Run(name, func(t *testing.T) {
					policy{sourceAnalytic, kindSteepest, ruleArmijo, kind}.use(t)
					recv, trials := recording(prob.make())
					if prob.x[0] != 0 || prob.d[1] != 0 {
						t.Fatalf("test data: x[0] must be 0 and d along the first axis")
					}
					if frac, _ := math.Frexp(math.Abs(prob.d[0])); frac != 0.5 {
						t.Fatalf("test data: d[0] = %g is not a power of two", prob.d[0])
					}
					x, d := prob.x, prob.d
					fx := recv.valueFunc(&x)
					*trials = nil
					var g vec
					recv.gradient(&x, &g)
					slope := dot(&g, &d)
					if !(slope < 0) {
						t.Fatalf("test data: slope %g is not negative", slope)
					}
					var xt, gt vec
					res := backtrackSearch(recv, &x, fx, nil, &d, slope, first, knownFloor(0), 1000, &xt, &gt, calibrated(recv, &x))
					if res.end != searchAccepted {
						t.Fatalf("end %d after %d calls", res.end, res.calls)
					}
					if res.calls != recv.calls || res.calls != len(*trials) || res.calls > stepTrials {
						t.Errorf("reported %d calls, objective saw %d", res.calls, recv.calls)
					}
					if res.gradient {
						t.Errorf("backtrackSearch claims to hold the gradient")
					}
					steps := make([]float64, len(*trials))
					values := make([]float64, len(*trials))
					for k, p := range *trials {
						steps[k] = p[0] / d[0]
						values[k] = prob.make().valueFunc(&p)
					}
					if steps[0] != first {
						t.Errorf("first trial %g, want %g", steps[0], first)
					}
					last := len(steps) - 1
					for k := 0; k < last; k++ {
						if sufficientDecrease(values[k], fx, steps[k], slope) {
							t.Errorf("trial %d at t = %g already met sufficient decrease (f = %g) but was rejected", k, steps[k], values[k])
						}
						switch {
						case kind == backtrackShrink || !finite(values[k]):
							if steps[k+1] != steps[k]*stepShrink {
								t.Errorf("trial %d: t = %g after %g, want ×%g", k+1, steps[k+1], steps[k], stepShrink)
							}
						case !(steps[k+1] >= 0.1*steps[k] && steps[k+1] <= 0.5*steps[k]):
							t.Errorf("trial %d: t = %g after %g, outside [0.1t, 0.5t]", k+1, steps[k+1], steps[k])
						}
						if kind == backtrackInterpolate {
							// The model is fitted to the two latest trials
							// (backtrack.go: the quadratic on the first
							// backtrack, the cubic after).
							var previous, fPrevious float64
							if k > 0 {
								previous, fPrevious = steps[k-1], values[k-1]
							}
							if want := interpolatedTrial(fx, slope, steps[k], values[k], previous, fPrevious); steps[k+1] != want {
								t.Errorf("trial %d: t = %g, want the model's %g", k+1, steps[k+1], want)
							}
						}
					}
					step := steps[last]
					if res.step != step || xt != (*trials)[last] || res.value != values[last] {
						t.Errorf("result step %g value %g at %v; last trial t = %g, f = %g at %v", res.step, res.value, xt, step, values[last], (*trials)[last])
					}
					if !sufficientDecrease(res.value, fx, res.step, slope) {
						t.Errorf("accepted t = %g with f = %g > f(x) + c1·t·slope = %g", res.step, res.value, fx+stepDecrease*res.step*slope)
					}
					if kind == backtrackShrink && last > 0 {
						before := res.step / stepShrink
						var xb vec
						moveTo(&xb, &x, before, &d)
						if sufficientDecrease(prob.make().valueFunc(&xb), fx, before, slope) {
							t.Errorf("t/stepShrink = %g meets sufficient decrease, so t = %g was not the first acceptable trial", before, res.step)
						}
					}
				})
			}
		}
	}
}

// When no trial is acceptable backtrackSearch stops after stepTrials calls,
// and it never spends more calls than its budget.
func TestArmijoSearchLimits(t *testing.T) {
	for _, kind := range []int{backtrackShrink, backtrackInterpolate} {
		policy{sourceAnalytic, kindSteepest, ruleArmijo, kind}.use(t)
		wall := &receiver{ // +Inf at every trial: nothing is acceptable
			valueFunc:    func(x *vec) elem { return math.Inf(1) },
			gradientFunc: func(x, g *vec) { g[0], g[1] = -1, 0 },
		}
		x, d := vec{0, 0}, vec{1, 0}
		var xt, gt vec
		res := backtrackSearch(wall, &x, 0, nil, &d, -1, 1, knownFloor(0), 1000, &xt, &gt, calibrated(wall, &x))
		if res.end != searchExhausted || res.calls != stepTrials || wall.calls != stepTrials {
			t.Errorf("all +Inf: end %d after %d calls (objective saw %d), want exhausted after %d", res.end, res.calls, wall.calls, stepTrials)
		}
		// Every budget below what a search needs ends it out of budget
		// with no more calls than the budget; the exact budget suffices.
		for _, prob := range armijoProblems() {
			x, d := prob.x, prob.d
			fx := prob.make().valueFunc(&x)
			var g vec
			prob.make().gradient(&x, &g)
			slope := dot(&g, &d)
			full := backtrackSearch(prob.make(), &x, fx, nil, &d, slope, 1e6, knownFloor(0), 1000, &xt, &gt, calibrated(prob.make(), &x))
			if full.end != searchAccepted {
				t.Fatalf("%s: end %d", prob.name, full.end)
			}
			for budget := 0; budget <= full.calls; budget++ {
				recv := prob.make()
				res := backtrackSearch(recv, &x, fx, nil, &d, slope, 1e6, knownFloor(0), budget, &xt, &gt, calibrated(recv, &x))
				if recv.calls > budget || res.calls != recv.calls {
					t.Errorf("%s, budget %d: %d calls, %d reported", prob.name, budget, recv.calls, res.calls)
				}
				if budget < full.calls && res.end != searchOutOfBudget || budget == full.calls && res != full {
					t.Errorf("%s, budget %d of %d: %+v", prob.name, budget, full.calls, res)
				}
			}
		}
	}
}

// The first backtrack minimizes the quadratic through φ(0), φ'(0) and
// φ(t) (Nocedal & Wright 2006, eq. 3.58): for a quadratic φ(α) = f0 +
// s·α + c·α² that is its exact minimizer −s/(2c), whenever it lies in the
// safeguard interval [0.1t, 0.5t]; otherwise the nearer end of it.
func TestInterpolatedTrialQuadratic(t *testing.T) {
	cases := []struct{ f0, s, c, step float64 }{
		{1, -2, 4, 1},         // minimizer 0.25 = t/4
		{0, -1, 1, 2.5},       // minimizer 0.5 = t/5
		{-3, -0.5, 0.3, 5},    // minimizer 0.8333… = t/6
		{10, -7, 2, 4},        // minimizer 1.75 = 0.4375t
		{0, -1e-3, 1e3, 1e-5}, // minimizer 5e-7 = 0.05t: clamped to 0.1t
		{0, -1, 0.01, 1},      // minimizer 50: clamped to 0.5t
		{2, -1, 0.51, 1},      // minimizer 0.98: clamped to 0.5t
		{2, -1, 100, 1},       // minimizer 0.005: clamped to 0.1t
	}
	for _, c := range cases {
		phi := func(a float64) float64 { return c.f0 + c.s*a + c.c*a*a }
		want := min(max(-c.s/(2*c.c), 0.1*c.step), 0.5*c.step)
		got := interpolatedTrial(phi(0), c.s, c.step, phi(c.step), 0, 0)
		if math.Abs(got-want) > 1e-13*want {
			t.Errorf("φ = %g%+gα%+gα², t = %g: next %g, want %g", c.f0, c.s, c.c, c.step, got, want)
		}
	}
	// A φ(t) on or below the tangent gives a model without a minimizer:
	// the trial stays within the safeguard.
	for _, ft := range []float64{-2, -1.5, -10} {
		got := interpolatedTrial(0, -2, 1, ft, 0, 0)
		if !(got >= 0.1 && got <= 0.5) {
			t.Errorf("φ(1) = %g below the tangent: next %g outside [0.1, 0.5]", ft, got)
		}
	}
}

// Later backtracks minimize the cubic through φ(0), φ'(0) and the last two
// trials (Nocedal & Wright 2006, the formula following eq. 3.58, recalled
// from memory): for a cubic φ(α) = f0 + s·α + B·α² + A·α³ that is its
// local minimizer, the root of φ'(α) = s + 2Bα + 3Aα² with φ” > 0,
// within the safeguard [0.1t, 0.5t]. A φ that is in fact quadratic
// (A = 0) must give −s/(2B) although rounding makes the fitted A tiny but
// not zero.
func TestInterpolatedTrialCubic(t *testing.T) {
	cases := []struct{ f0, s, b, a, previous, step float64 }{
		{0, -1, 1, 2, 1, 0.6},            // minimizer 0.2743
		{1, -2, -1, 3, 2, 1.3},           // B < 0
		{5, -0.5, 0.2, 0.1, 4, 3.9},      // trials close together
		{0, -3, 1, -0.05, 10, 4},         // A < 0 with a local minimizer
		{0, -1, 4, 1e-3, 1, 0.7},         // nearly quadratic
		{0, -1, 4, -1e-3, 1, 0.7},        // nearly quadratic, A < 0
		{1, -2, 4, 0, 1, 0.6},            // quadratic
		{1, -2, 3.7, 0, 1, 0.3},          // quadratic
		{0, -2, 10, 0, 1, 0.45},          // quadratic
		{0, -2, 123.456, 0, 0.37, 0.111}, // quadratic
		{1, -2, 0.3, 0, 0.9, 0.405},      // quadratic, minimizer clamped to 0.5t
	}
	// A grid of exactly quadratic φ = 1 − 2α + Bα² whose minimizer m lies
	// inside the safeguard: t from 2.5m to 9m, the previous trial t/r.
	for _, b := range []float64{0.3, 4, 10, 123.456} {
		for _, k := range []float64{2.5, 3, 5, 9} {
			for _, r := range []float64{0.2, 0.3, 0.45} {
				step := k * 2 / (2 * b)
				cases = append(cases, struct{ f0, s, b, a, previous, step float64 }{1, -2, b, 0, step / r, step})
			}
		}
	}
	for _, c := range cases {
		phi := func(a float64) float64 { return c.f0 + c.s*a + c.b*a*a + c.a*a*a*a }
		var minimizer float64
		if c.a == 0 {
			minimizer = -c.s / (2 * c.b)
		} else {
			minimizer = (-c.b + math.Sqrt(c.b*c.b-3*c.a*c.s)) / (3 * c.a)
		}
		if curvature := 2*c.b + 6*c.a*minimizer; !(curvature > 0) {
			t.Fatalf("test data: φ''(%g) = %g is not positive", minimizer, curvature)
		}
		if c.a != 0 && math.Abs(c.s+2*c.b*minimizer+3*c.a*minimizer*minimizer) > 1e-12 {
			t.Fatalf("test data: %g is not a root of φ'", minimizer)
		}
		want := min(max(minimizer, 0.1*c.step), 0.5*c.step)
		got := interpolatedTrial(phi(0), c.s, c.step, phi(c.step), c.previous, phi(c.previous))
		if math.Abs(got-want) > 1e-9*want {
			t.Errorf("φ = %g%+gα%+gα²%+gα³, trials %g then %g: next %.17g, want %.17g", c.f0, c.s, c.b, c.a, c.previous, c.step, got, want)
		}
	}
}

// A trial whose value is not finite fits no model and is shrunk by
// stepShrink; a non-finite earlier trial is left out of the model.
func TestInterpolatedTrialNonFinite(t *testing.T) {
	for _, ft := range []float64{math.Inf(1), math.Inf(-1), math.NaN()} {
		if got := interpolatedTrial(0, -1, 3, ft, 0, 0); got != 3*stepShrink {
			t.Errorf("f(t) = %g: next %g, want %g", ft, got, 3*stepShrink)
		}
		if got := interpolatedTrial(0, -1, 3, ft, 6, 1); got != 3*stepShrink {
			t.Errorf("f(t) = %g after a finite trial: next %g, want %g", ft, got, 3*stepShrink)
		}
		// φ = 1 − 2α + 4α²: the quadratic step from (t, φ(t)) alone is 0.25.
		if got := interpolatedTrial(1, -2, 1, 3, 2, ft); got != 0.25 {
			t.Errorf("f(previous) = %g: next %g, want the quadratic step 0.25", ft, got)
		}
	}
}

// The six line-search test functions of Moré & Thuente (1994, §5, Tables
// 1–6 set-up) from initial steps 1e-3, 1e-1, 1, 1e1 and 1e3 (their
// Tables use 1e-3, 1e-1, 1e1, 1e3; 1 is added, as gonum's
// optimize/linesearcher_test.go does). Every accepted step must meet
// sufficient decrease and the (strong) curvature condition (Nocedal &
// Wright 2006, eqs. 3.6 and 3.7), as gonum's test checks for its line
// searchers. Moré & Thuente use other c1, c2 in their tables (e.g. 0.001
// and 0.1, recalled from memory); these kernels fix c1 = stepDecrease = 1e-4 and c2 =
// stepCurvature = 0.9 in params.go, and the test uses those. The search
// must hand back the exact gradient at the accepted point and report
// exactly the calls the objective saw, within stepTrials.
func TestWolfeMoreThuente(t *testing.T) {
	for _, rule := range []int{ruleWolfe, ruleStrongWolfe} {
		for _, fn := range moreThuenteFunctions() {
			for _, first := range []float64{1e-3, 1e-1, 1, 1e1, 1e3} {
				t.Run(fmt.Sprintf("%s/%s/first=%g", ruleNames[rule], fn.name, first), func(t *testing.T) {
					policy{sourceAnalytic, kindBFGS, rule, backtrackShrink}.use(t)
					checkWolfeSearch(t, fn, first, rule)
				})
			}
		}
	}
}

// checkWolfeSearch runs wolfeSearch on fn from α = 0 along d = (1, 0) and
// checks the accepted step. It returns the result.
func checkWolfeSearch(t *testing.T, fn lineFunction, first float64, rule int) lineResult {
	t.Helper()
	recv, trials := recording(fn.alongFirstAxis())
	x, d := vec{0, 0}, vec{1, 0}
	fx, slope := fn.phi(0), fn.slope(0)
	if !(slope < 0) {
		t.Fatalf("test data: φ'(0) = %g is not negative", slope)
	}
	var xt, gt vec
	res := wolfeSearch(recv, &x, fx, nil, &d, slope, first, knownFloor(0), 1000, &xt, &gt, calibrated(recv, &x))
	if res.end != searchAccepted {
		t.Fatalf("end %d after %d calls", res.end, res.calls)
	}
	if res.calls != recv.calls || res.calls > stepTrials {
		t.Errorf("reported %d calls, objective saw %d (limit %d)", res.calls, recv.calls, stepTrials)
	}
	var want vec
	moveTo(&want, &x, res.step, &d)
	if xt != want || res.value != fn.phi(res.step) {
		t.Errorf("xt = %v, f = %g; want %v, %g", xt, res.value, want, fn.phi(res.step))
	}
	if !res.gradient || gt != (vec{fn.slope(res.step), 0}) {
		t.Errorf("gradient %v, gt = %v; want true, (%g, 0)", res.gradient, gt, fn.slope(res.step))
	}
	if !sufficientDecrease(res.value, fx, res.step, slope) {
		t.Errorf("t = %g: φ = %g above φ(0) + c1·t·φ'(0) = %g", res.step, res.value, fx+stepDecrease*res.step*slope)
	}
	// Nocedal & Wright 2006, §3.5 (the properties of α_lo stated with
	// Algorithm 3.6, recalled from memory): the low end of the bracket is,
	// among the trials meeting sufficient decrease, the one with the least
	// value, and a trial is accepted only if it improves on it; so the
	// accepted value is below that of every other such trial. (A trial
	// whose slope is not finite cannot be the low end; wolfe.go makes it
	// the high end instead, so it is left out.)
	for k, p := range *trials {
		v := fn.phi(p[0])
		if p[0] != res.step && sufficientDecrease(v, fx, p[0], slope) && finite(fn.slope(p[0])) && !(res.value < v) {
			t.Errorf("trial %d at t = %g met sufficient decrease with φ = %g, not above the accepted φ(%g) = %g", k, p[0], v, res.step, res.value)
		}
	}
	now := fn.slope(res.step)
	if rule == ruleStrongWolfe {
		if !(math.Abs(now) <= stepCurvature*math.Abs(slope)) { // N&W eq. 3.7b
			t.Errorf("t = %g: |φ'| = %g above c2·|φ'(0)| = %g", res.step, math.Abs(now), stepCurvature*math.Abs(slope))
		}
	} else if !(now >= stepCurvature*slope) { // N&W eq. 3.6b
		t.Errorf("t = %g: φ' = %g below c2·φ'(0) = %g", res.step, now, stepCurvature*slope)
	}
	return res
}

// With finite-difference gradients the Wolfe search charges derivativeCost
// calls for every gradient it takes, and its count still matches the
// objective's; the gradient it hands back is the difference gradient at
// the accepted point.
func TestWolfeCallsWithDifferences(t *testing.T) {
	for _, source := range []int{sourceForward, sourceCentral} {
		for _, rule := range []int{ruleWolfe, ruleStrongWolfe} {
			for _, fn := range moreThuenteFunctions() {
				t.Run(fmt.Sprintf("%s/%s/%s", sourceNames[source], ruleNames[rule], fn.name), func(t *testing.T) {
					policy{source, kindBFGS, rule, backtrackShrink}.use(t)
					recv := fn.alongFirstAxis()
					x, d := vec{0, 0}, vec{1, 0}
					var xt, gt vec
					res := wolfeSearch(recv, &x, fn.phi(0), nil, &d, fn.slope(0), 1e-1, knownFloor(0), 1000, &xt, &gt, calibrated(recv, &x))
					if res.end != searchAccepted {
						t.Fatalf("end %d after %d calls", res.end, res.calls)
					}
					if res.calls != recv.calls {
						t.Errorf("reported %d calls, objective saw %d", res.calls, recv.calls)
					}
					if !sufficientDecrease(res.value, fn.phi(0), res.step, fn.slope(0)) {
						t.Errorf("t = %g fails sufficient decrease", res.step)
					}
					var want vec
					derivative(fn.alongFirstAxis(), &xt, res.value, &want, calibrated(fn.alongFirstAxis(), &x))
					if !res.gradient || gt != want {
						t.Errorf("gt = %v, want the difference gradient %v", gt, want)
					}
				})
			}
		}
	}
}

// Every budget smaller than what a search needs ends it without exceeding
// the budget, with gradients by analytic or by differences: out of budget
// when no trial has met sufficient decrease yet, otherwise with the best
// such trial, whose value and gradient were already paid for; the full
// budget gives the same accepted step.
func TestWolfeBudget(t *testing.T) {
	fn := moreThuenteFunctions()[1] // concave-left from 1e-3: a long search
	for _, source := range []int{sourceAnalytic, sourceForward} {
		for _, rule := range []int{ruleWolfe, ruleStrongWolfe} {
			policy{source, kindBFGS, rule, backtrackShrink}.use(t)
			x, d := vec{0, 0}, vec{1, 0}
			var xt, gt vec
			full := wolfeSearch(fn.alongFirstAxis(), &x, fn.phi(0), nil, &d, fn.slope(0), 1e-3, knownFloor(0), 1000, &xt, &gt, calibrated(fn.alongFirstAxis(), &x))
			if full.end != searchAccepted {
				t.Fatalf("%s/%s: end %d", sourceNames[source], ruleNames[rule], full.end)
			}
			for budget := 0; budget < full.calls; budget++ {
				recv := fn.alongFirstAxis()
				res := wolfeSearch(recv, &x, fn.phi(0), nil, &d, fn.slope(0), 1e-3, knownFloor(0), budget, &xt, &gt, calibrated(recv, &x))
				if recv.calls > budget || res.calls != recv.calls {
					t.Errorf("%s/%s budget %d of %d: %d calls, %d reported", sourceNames[source], ruleNames[rule], budget, full.calls, recv.calls, res.calls)
				}
				switch res.end {
				case searchOutOfBudget:
				case searchAccepted:
					// Sufficient decrease (N&W eq. 3.6a), with the value and
					// the gradient of the accepted point handed back.
					if !(res.step > 0) || fn.phi(res.step) > fn.phi(0)+stepDecrease*res.step*fn.slope(0) ||
						res.value != fn.phi(res.step) || !res.gradient || xt[0] != res.step {
						t.Errorf("%s/%s budget %d: accepted %+v, not a sufficient decrease", sourceNames[source], ruleNames[rule], budget, res)
					}
				default:
					t.Errorf("%s/%s budget %d: end %d", sourceNames[source], ruleNames[rule], budget, res.end)
				}
			}
			recv := fn.alongFirstAxis()
			res := wolfeSearch(recv, &x, fn.phi(0), nil, &d, fn.slope(0), 1e-3, knownFloor(0), full.calls, &xt, &gt, calibrated(recv, &x))
			if res != full {
				t.Errorf("%s/%s: exact budget gave %+v, want %+v", sourceNames[source], ruleNames[rule], res, full)
			}
		}
	}
}

// A non-finite trial value fails sufficient decrease (wolfe.go's rule; a
// NaN or ±Inf says nothing about φ, common practice) and narrows the
// bracket: the search still ends with an acceptable finite step, or, when
// none exists, with searchExhausted after at most stepTrials calls. −Inf
// in particular must never be accepted as "decrease".
func TestWolfeNonFiniteTrials(t *testing.T) {
	quadratic := func(beyond float64) lineFunction { // (α − 2)² below α = 3, beyond after
		return lineFunction{
			name: fmt.Sprintf("(α−2)² then %g", beyond),
			phi: func(a float64) float64 {
				if a >= 3 {
					return beyond
				}
				return (a - 2) * (a - 2)
			},
			slope: func(a float64) float64 { return 2 * (a - 2) },
		}
	}
	nanSlope := lineFunction{ // finite values, NaN derivative beyond α = 3
		name: "(α−2)², φ' NaN beyond 3",
		phi:  func(a float64) float64 { return (a - 2) * (a - 2) },
		slope: func(a float64) float64 {
			if a > 3 {
				return math.NaN()
			}
			return 2 * (a - 2)
		},
	}
	for _, rule := range []int{ruleWolfe, ruleStrongWolfe} {
		for _, fn := range []lineFunction{quadratic(math.Inf(1)), quadratic(math.Inf(-1)), quadratic(math.NaN()), nanSlope} {
			for _, first := range []float64{1e-3, 1, 10, 1e3} {
				t.Run(fmt.Sprintf("%s/%s/first=%g", ruleNames[rule], fn.name, first), func(t *testing.T) {
					policy{sourceAnalytic, kindBFGS, rule, backtrackShrink}.use(t)
					res := checkWolfeSearch(t, fn, first, rule)
					if !finite(res.value) || res.step >= 3 && fn.name != nanSlope.name {
						t.Errorf("accepted t = %g with φ = %g", res.step, res.value)
					}
				})
			}
			// From 1e300 the bracket against a non-finite end shrinks only
			// by the zoom safeguard's factor 10 a trial (the model's
			// minimizer is the low end itself), too slowly to reach α < 3
			// within stepTrials: the search must either accept a valid
			// step or give up cleanly, within stepTrials calls.
			t.Run(fmt.Sprintf("%s/%s/first=1e300", ruleNames[rule], fn.name), func(t *testing.T) {
				policy{sourceAnalytic, kindBFGS, rule, backtrackShrink}.use(t)
				recv := fn.alongFirstAxis()
				x, d := vec{0, 0}, vec{1, 0}
				var xt, gt vec
				res := wolfeSearch(recv, &x, fn.phi(0), nil, &d, fn.slope(0), 1e300, knownFloor(0), 1000, &xt, &gt, calibrated(recv, &x))
				if res.calls != recv.calls || res.calls > stepTrials {
					t.Errorf("reported %d calls, objective saw %d (limit %d)", res.calls, recv.calls, stepTrials)
				}
				switch res.end {
				case searchExhausted:
				case searchAccepted:
					checkWolfeSearch(t, fn, 1e300, rule)
				default:
					t.Errorf("end %d", res.end)
				}
			})
		}
		// No step meets the curvature condition: φ = −α is linear
		// (φ' = −1 < c2·φ'(0) everywhere) until +Inf from α = 3, where the
		// search must end with its best sufficient decrease after all its
		// trials; and +Inf everywhere, where it must give up.
		policy{sourceAnalytic, kindBFGS, rule, backtrackShrink}.use(t)
		for _, fn := range []lineFunction{
			{"−α then +Inf",
				func(a float64) float64 {
					if a >= 3 {
						return math.Inf(1)
					}
					return -a
				},
				func(a float64) float64 { return -1 }},
			{"+Inf",
				func(a float64) float64 {
					if a > 0 {
						return math.Inf(1)
					}
					return 0
				},
				func(a float64) float64 { return -1 }},
		} {
			for _, first := range []float64{1e-3, 1, 1e3} {
				recv := fn.alongFirstAxis()
				x, d := vec{0, 0}, vec{1, 0}
				var xt, gt vec
				res := wolfeSearch(recv, &x, 0, nil, &d, -1, first, knownFloor(0), 1000, &xt, &gt, calibrated(recv, &x))
				want := searchExhausted
				if fn.name == "−α then +Inf" {
					want = searchAccepted
					if !(res.step > 0 && res.step < 3) || res.value != -res.step {
						t.Errorf("%s/%s from %g: accepted step %g, value %g", ruleNames[rule], fn.name, first, res.step, res.value)
					}
				}
				if res.end != want || res.calls != recv.calls || res.calls != stepTrials {
					t.Errorf("%s/%s from %g: end %d after %d calls (objective saw %d), want %d after %d",
						ruleNames[rule], fn.name, first, res.end, res.calls, recv.calls, want, stepTrials)
				}
			}
		}
	}
}

// hermite is the C¹ piecewise-cubic Hermite interpolant of the knots
// (α_k, φ_k, φ'_k), continued beyond the last knot by the quadratic with
// the last knot's value and slope and curvature 2.
func hermite(knots [][3]float64) lineFunction {
	locate := func(a float64) (k int, h, u float64) {
		for k = 0; k < len(knots)-2 && a > knots[k+1][0]; k++ {
		}
		h = knots[k+1][0] - knots[k][0]
		return k, h, (a - knots[k][0]) / h
	}
	last := knots[len(knots)-1]
	return lineFunction{
		name: "hermite",
		phi: func(a float64) float64 {
			if a > last[0] {
				e := a - last[0]
				return last[1] + last[2]*e + e*e
			}
			k, h, u := locate(a)
			p, q := knots[k], knots[k+1]
			h00, h10 := 2*u*u*u-3*u*u+1, u*u*u-2*u*u+u
			h01, h11 := -2*u*u*u+3*u*u, u*u*u-u*u
			return h00*p[1] + h10*h*p[2] + h01*q[1] + h11*h*q[2]
		},
		slope: func(a float64) float64 {
			if a > last[0] {
				return last[2] + 2*(a-last[0])
			}
			k, h, u := locate(a)
			p, q := knots[k], knots[k+1]
			d00, d10 := (6*u*u-6*u)/h, 3*u*u-4*u+1
			d01, d11 := (-6*u*u+6*u)/h, 3*u*u-2*u
			return d00*p[1] + d10*p[2] + d01*q[1] + d11*q[2]
		},
	}
}

// When an expanding trial meets sufficient decrease with φ' ≥ 0, Algorithm
// 3.5 of Nocedal & Wright 2006 calls zoom(α_i, α_{i−1}) (recalled from
// memory): the new trial is the low end, because it has the least value.
// Here φ(1) = −0.5 with φ'(1) = 1 fails the strong curvature condition;
// between 0.2 and 0.8 lies a shelf at φ ≈ −0.25 where |φ'| is small (the
// interpolating cubic's minimizer, about 0.77, falls on it), and beyond it,
// near 0.92, a valley under −0.5. A bracket kept the wrong way round
// would accept a point on the shelf, above φ(1); checkWolfeSearch rejects
// any accepted value that is not below every trial meeting sufficient
// decrease.
func TestWolfeBracketKeepsLowerEnd(t *testing.T) {
	policy{sourceAnalytic, kindBFGS, ruleStrongWolfe, backtrackShrink}.use(t)
	fn := hermite([][3]float64{
		{0, 0, -1},
		{0.2, -0.2, -0.1},
		{0.5, -0.25, 0},
		{0.8, -0.3, -0.1},
		{0.92, -0.62, 0},
		{1, -0.5, 1},
	})
	for a := 0.2; a <= 0.8; a += 1.0 / 64 {
		if v, s := fn.phi(a), fn.slope(a); !(v > -0.5 && v < 0 && math.Abs(s) <= stepCurvature) {
			t.Fatalf("test data: φ(%g) = %g, φ' = %g is not on the shelf", a, v, s)
		}
	}
	res := checkWolfeSearch(t, fn, 1, ruleStrongWolfe)
	if !(res.value < fn.phi(1)) {
		t.Errorf("accepted t = %g with φ = %g, above φ(1) = %g", res.step, res.value, fn.phi(1))
	}
}

// cubicPoint is the linePoint of φ(α) = (α − 3)²(α + 1) = α³ − 5α² + 3α + 9,
// φ'(α) = (3α − 1)(α − 3): local maximum 1/3, local minimum 3.
func cubicPoint(a float64) linePoint {
	return linePoint{step: a, value: a*a*a - 5*a*a + 3*a + 9, slope: 3*a*a - 10*a + 3, hasSlope: true}
}

// quadraticPoint is the linePoint of φ(α) = (α − 2)², with or without its
// slope.
func quadraticPoint(a float64, withSlope bool) linePoint {
	p := linePoint{step: a, value: (a - 2) * (a - 2)}
	if withSlope {
		p.slope, p.hasSlope = 2*(a-2), true
	}
	return p
}

// modelMinimizer interpolates exactly: the cubic through two values and
// slopes of a cubic is that cubic, so eq. 3.59 of Nocedal & Wright 2006
// returns its local minimizer, in either order of the points (the
// sign(α_i − α_{i−1}) in d₂); the quadratic through one value and slope
// and another value of a quadratic is that quadratic. A model without a
// minimizer says so.
func TestModelMinimizer(t *testing.T) {
	for _, pair := range [][2]float64{{1, 4}, {4, 1}, {0.5, 1}, {2, 10}, {10, 2}, {0, 4}, {5, -1}} {
		a, b := cubicPoint(pair[0]), cubicPoint(pair[1])
		got, ok := modelMinimizer(&a, &b)
		if !ok || math.Abs(got-3) > 1e-12 {
			t.Errorf("cubic through %g and %g: %.17g, %v; want 3", pair[0], pair[1], got, ok)
		}
	}
	for _, pair := range [][2]float64{{0, 5}, {5, 0}, {1.5, 1.9}, {-3, 7}} {
		a, b := quadraticPoint(pair[0], true), quadraticPoint(pair[1], false)
		got, ok := modelMinimizer(&a, &b)
		if !ok || math.Abs(got-2) > 1e-13 {
			t.Errorf("quadratic through %g and %g: %.17g, %v; want 2", pair[0], pair[1], got, ok)
		}
	}
	// φ = −α³ − α has no critical point; φ = −(α − 2)² only a maximum;
	// a linear φ has none.
	for _, pair := range [][2]linePoint{
		{{step: 0, value: 0, slope: -1, hasSlope: true}, {step: 1, value: -2, slope: -4, hasSlope: true}},
		{{step: 0, value: -4, slope: 4, hasSlope: true}, {step: 5, value: -9}},
		{{step: 0, value: 1, slope: -1, hasSlope: true}, {step: 2, value: -1}},
	} {
		if got, ok := modelMinimizer(&pair[0], &pair[1]); ok {
			t.Errorf("model through %+v and %+v: minimizer %g, want none", pair[0], pair[1], got)
		}
	}
}

// zoomTrial takes the model's minimizer, kept a tenth of the bracket away
// from either end, or bisects when there is none; expandTrial takes it
// kept within [2, 8] times the current step, or doubles (the safeguards
// of wolfe.go, common practice; Moré & Thuente 1994 use safeguards of the
// same kind).
func TestZoomAndExpandTrials(t *testing.T) {
	zooms := []struct {
		name      string
		low, high linePoint
		want      float64
	}{
		{"cubic inside", cubicPoint(1), cubicPoint(4), 3},
		{"cubic inside, reversed", cubicPoint(4), cubicPoint(1), 3},
		{"cubic near low", cubicPoint(2.9), cubicPoint(10), 2.9 + 0.1*(10-2.9)},
		{"cubic near low, reversed", cubicPoint(3.1), cubicPoint(-4), 3.1 + 0.1*(-4-3.1)},
		{"quadratic near high", quadraticPoint(0, true), quadraticPoint(2.1, false), 2.1 - 0.1*(2.1-0)},
		{"no model: bisect", linePoint{step: 0, value: 0, slope: -1, hasSlope: true}, linePoint{step: 1, value: -2}, 0.5},
	}
	for _, c := range zooms {
		if got := zoomTrial(&c.low, &c.high); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("zoom %s: %.17g, want %.17g", c.name, got, c.want)
		}
	}
	expands := []struct {
		name              string
		previous, current linePoint
		want              float64
	}{
		{"cubic inside", cubicPoint(0.5), cubicPoint(1), 3},
		{"cubic below 2×", cubicPoint(0.5), cubicPoint(2), 4},
		{"cubic beyond 8×", cubicPoint(0.1), cubicPoint(0.2), 1.6},
		{"no model: double", linePoint{step: 0, value: 0, slope: -1, hasSlope: true}, linePoint{step: 1, value: -2, slope: -4, hasSlope: true}, 2},
	}
	for _, c := range expands {
		if got := expandTrial(&c.previous, &c.current); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("expand %s: %.17g, want %.17g", c.name, got, c.want)
		}
	}
}
