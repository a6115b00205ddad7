package templates

import (
	"math"
	"testing"

	"github.com/thalweg-go/thalweg/rules"
)

// beale is problem 5 of Moré, Garbow & Hillstrom, ACM TOMS 7(1):17–41,
// 1981, in residual form: rᵢ = yᵢ − x₁(1 − x₂ⁱ), y = (1.5, 2.25, 2.625),
// minimum f = 0 at (3, 0.5), standard start (1, 1).
func beale() *receiver {
	y := [3]float64{1.5, 2.25, 2.625}
	return &receiver{
		residualFunc: func(x *vec, r *rvec) {
			for i := range r {
				r[i] = y[i] - x[0]*(1-math.Pow(x[1], float64(i+1)))
			}
		},
		jacobianFunc: func(x *vec, j *[residuals]vec) {
			for i := range j {
				p := float64(i + 1)
				j[i][0] = -(1 - math.Pow(x[1], p))
				j[i][1] = x[0] * p * math.Pow(x[1], p-1)
			}
		},
		columnsFunc: func(x *vec, j *[dim]rvec) {
			for i := range j[0] {
				p := float64(i + 1)
				j[0][i] = -(1 - math.Pow(x[1], p))
				j[1][i] = x[0] * p * math.Pow(x[1], p-1)
			}
		},
	}
}

// straightLine is the fit of a + b·t to (0, 1), (1, 2.9), (2, 5.2)
// (invented data): rᵢ = a + b·tᵢ − yᵢ, a linear least-squares problem.
func straightLine() *receiver {
	t, y := [3]float64{0, 1, 2}, [3]float64{1, 2.9, 5.2}
	return &receiver{
		residualFunc: func(x *vec, r *rvec) {
			for i := range r {
				r[i] = x[0] + x[1]*t[i] - y[i]
			}
		},
		jacobianFunc: func(x *vec, j *[residuals]vec) {
			for i := range j {
				j[i] = vec{1, t[i]}
			}
		},
	}
}

// leastSquares is one choice of the selectors for a residual objective.
type leastSquares struct {
	source, kind, rule int
	columns            bool
}

func (p leastSquares) String() string {
	kind := map[int]string{kindGaussNewton: "gauss-newton", kindLevenbergMarquardt: "levenberg-marquardt", kindBFGS: "bfgs"}[p.kind]
	rule := map[int]string{ruleArmijo: "armijo", ruleDecrease: "decrease", ruleWolfe: "wolfe", ruleDamping: "damping"}[p.rule]
	s := kind + "/" + rule + "/" + sourceNames[p.source]
	if p.columns {
		s += "/columns"
	}
	return s
}

// use installs p for the duration of the test, with the registry's
// costs as gen emits them.
func (p leastSquares) use(t *testing.T) {
	t.Helper()
	saved := []int{derivativeSource, directionKind, stepRule, derivativeCost, calibrationCost, iterationCalls, settleCalls}
	savedResidual, savedColumns := residualObjective, jacobianColumns
	source := [...]*rules.Entry{rules.Analytic, rules.Forward, rules.Central}[p.source]
	rule := map[int]*rules.Entry{ruleArmijo: rules.ArmijoRule, ruleDecrease: rules.SimpleDecrease, ruleWolfe: rules.WolfeRule, ruleDamping: rules.Damping}[p.rule]
	derivativeSource, directionKind, stepRule = p.source, p.kind, p.rule
	residualObjective, jacobianColumns = true, p.columns
	derivativeCost, calibrationCost, settleCalls = source.GradientCalls(dim), 0, 0
	if derivativeCost > 0 {
		settleCalls = 1 + derivativeCost // as rules.Context.SettleCalls
	}
	iterationCalls = rule.IterationCalls(stepTrials, derivativeCost)
	t.Cleanup(func() {
		derivativeSource, directionKind, stepRule, derivativeCost, calibrationCost, iterationCalls, settleCalls = saved[0], saved[1], saved[2], saved[3], saved[4], saved[5], saved[6]
		residualObjective, jacobianColumns = savedResidual, savedColumns
	})
}

func everyLeastSquares() []leastSquares {
	var all []leastSquares
	for source := range sourceNames {
		for _, kr := range [][2]int{{kindGaussNewton, ruleArmijo}, {kindGaussNewton, ruleDecrease}, {kindLevenbergMarquardt, ruleDamping}, {kindBFGS, ruleWolfe}} {
			all = append(all, leastSquares{source: source, kind: kr[0], rule: kr[1]})
			if source == sourceAnalytic {
				all = append(all, leastSquares{source: source, kind: kr[0], rule: kr[1], columns: true})
			}
		}
	}
	return all
}

// Every least-squares policy reaches Beale's published minimum (3, 0.5),
// f = 0 (MGH 1981, problem 5), converged, counting every residual call.
func TestResidualsReachBeale(t *testing.T) {
	for _, p := range everyLeastSquares() {
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			recv := beale()
			out := minimize(recv, vec{1, 1}, defaultLimits(), box{lower: vec{math.Inf(-1), math.Inf(-1)}, upper: vec{math.Inf(1), math.Inf(1)}})
			if out.status != statusGradientSmall {
				t.Fatalf("status %d after %d iterations, f = %g at %v", out.status, out.iterations, out.f, out.x)
			}
			if math.Abs(out.x[0]-3) > 1e-6 || math.Abs(out.x[1]-0.5) > 1e-6 || out.f > 1e-12 {
				t.Errorf("x = %v, f = %g; want (3, 0.5), 0", out.x, out.f)
			}
			if recv.calls != out.evaluations {
				t.Errorf("%d residual calls, %d evaluations reported", recv.calls, out.evaluations)
			}
		})
	}
}

// Gauss–Newton solves a linear least-squares problem in one step, and
// the covariance is the textbook one of simple linear regression:
// var(b) = s²/Sₜₜ, var(a) = s²(1/n + t̄²/Sₜₜ), cov(a, b) = −t̄s²/Sₜₜ with
// s² = RSS/(n − 2) (N. R. Draper and H. Smith, Applied Regression
// Analysis, 3rd ed., Wiley, 1998, §1.4 and §3.2; from memory).
func TestGaussNewtonLinearFitAndCovariance(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindGaussNewton, rule: ruleArmijo}.use(t)
	recv := straightLine()
	out := minimize(recv, vec{0, 0}, defaultLimits(), box{lower: vec{math.Inf(-1), math.Inf(-1)}, upper: vec{math.Inf(1), math.Inf(1)}})
	ts, ys := []float64{0, 1, 2}, []float64{1, 2.9, 5.2}
	tMean, yMean := 1.0, (1+2.9+5.2)/3
	var stt, sty float64
	for i := range ts {
		stt += (ts[i] - tMean) * (ts[i] - tMean)
		sty += (ts[i] - tMean) * (ys[i] - yMean)
	}
	b := sty / stt
	a := yMean - b*tMean
	if out.status != statusGradientSmall || out.iterations != 1 {
		t.Fatalf("status %d after %d iterations; want converged after 1", out.status, out.iterations)
	}
	if math.Abs(out.x[0]-a) > 1e-12 || math.Abs(out.x[1]-b) > 1e-12 {
		t.Fatalf("x = %v, want (%g, %g)", out.x, a, b)
	}
	var rss float64
	for i := range ts {
		r := a + b*ts[i] - ys[i]
		rss += r * r
	}
	s2 := rss / float64(len(ts)-2)
	cov, stdErr, variance, calls, ok := uncertainty(recv, out.x, box{lower: vec{math.Inf(-1), math.Inf(-1)}, upper: vec{math.Inf(1), math.Inf(1)}})
	if !ok || calls != 1 {
		t.Fatalf("uncertainty not ok (%v) or %d calls, want 1", ok, calls)
	}
	want := [2][2]float64{{s2 * (1/3.0 + tMean*tMean/stt), -tMean * s2 / stt}, {-tMean * s2 / stt, s2 / stt}}
	if math.Abs(variance-s2) > 1e-12*s2 {
		t.Errorf("s² = %g, want %g", variance, s2)
	}
	for i := range want {
		for j := range want[i] {
			if math.Abs(cov[i][j]-want[i][j]) > 1e-10*math.Abs(want[i][j]) {
				t.Errorf("cov[%d][%d] = %g, want %g", i, j, cov[i][j], want[i][j])
			}
		}
		if math.Abs(stdErr[i]-math.Sqrt(want[i][i])) > 1e-10*math.Sqrt(want[i][i]) {
			t.Errorf("standard error %d = %g, want %g", i, stdErr[i], math.Sqrt(want[i][i]))
		}
	}
}

// A rank-deficient Jacobian (r depends on x₁ + x₂ only) still gives a
// descent direction: the added multiple of the identity takes over.
func TestGaussNewtonRankDeficient(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindGaussNewton, rule: ruleArmijo}.use(t)
	var diffs differences
	diffs.model.normal = [dim]vec{{1, 1}, {1, 1}} // JᵀJ of J = [1 1]
	g := vec{2, 2}
	var d vec
	var dir direction
	solveDirection(&dir, &g, &d, &diffs)
	if !(dot(&g, &d) < 0) || !finiteVec(&d) {
		t.Fatalf("d = %v is no descent direction for g = %v", d, g)
	}
}

// The Levenberg–Marquardt search raises λ after a rejected step and
// lowers it after a good one (Nielsen's update).
func TestDampingFollowsTheRatio(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindLevenbergMarquardt, rule: ruleDamping}.use(t)
	recv := straightLine()
	var diffs differences
	x := vec{0, 0}
	var g, d, xt, gt vec
	fx := value(recv, &x, &g, &diffs)
	residualGradient(recv, &x, fx, &g, &diffs)
	var dir direction
	searchDirection(&dir, &x, &g, &d, &diffs)
	before := diffs.model.damping
	found := dampedSearch(recv, &x, fx, &g, &d, dot(&g, &d), 1, knownFloor(1e-14), 100, &xt, &gt, &diffs)
	if found.end != searchAccepted || !(diffs.model.damping < before) {
		t.Fatalf("a linear model's step: end %d, λ %g → %g; want accepted and λ lowered", found.end, before, diffs.model.damping)
	}
	// A model that predicts far more than f delivers: rejected, λ raised.
	diffs.model.normal = [dim]vec{{1e-6, 0}, {0, 1e-6}}
	diffs.model.damping = 1e-3
	searchDirection(&dir, &x, &g, &d, &diffs)
	found = dampedSearch(recv, &x, fx, &g, &d, dot(&g, &d), 1, knownFloor(1e-14), 1, &xt, &gt, &diffs)
	if found.end != searchOutOfBudget || !(diffs.model.damping > 1e-3) {
		t.Fatalf("end %d, λ %g; want the budget's end after a rejected trial and λ raised", found.end, diffs.model.damping)
	}
}

// The gradient at a point other than the one the residuals were kept for
// takes them again, and counts the call.
func TestResidualGradientRetakesResiduals(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindGaussNewton, rule: ruleArmijo}.use(t)
	recv := straightLine()
	var diffs differences
	x, y := vec{0, 0}, vec{1, 1}
	var g vec
	fx := value(recv, &x, &g, &diffs)
	if calls := residualGradient(recv, &x, fx, &g, &diffs); calls != 0 {
		t.Errorf("gradient at the kept point made %d calls, want 0", calls)
	}
	if calls := residualGradient(recv, &y, fx, &g, &diffs); calls != 1 {
		t.Errorf("gradient elsewhere made %d calls, want 1", calls)
	}
	// g = Jᵀr at (1, 1): r = (0, −0.9, −2.2).
	if math.Abs(g[0]-(-3.1)) > 1e-12 || math.Abs(g[1]-(-5.3)) > 1e-12 {
		t.Errorf("g = %v, want (−3.1, −5.3)", g)
	}
}

// FuzzResiduals runs every least-squares policy (everyLeastSquares) on
// random residual objectives in two unknowns, three residuals each a
// quadratic polynomial rᵢ = aᵢ + bᵢx₁ + cᵢx₂ + dᵢx₁x₂ + eᵢx₁², from
// random starts: zero, small and large residuals, rank-deficient and
// indefinite models. Whatever the objective, a run never panics, never
// calls the residuals more often than its cap nor reports other than the
// calls it made, returns a finite X from a finite start, and reports
// convergence only where the true relative gradient of ½‖r‖² at X is
// within ten times the limit it claims (the MGH check's margin).
func FuzzResiduals(f *testing.F) {
	f.Add(uint8(0), 1.0, 1.0, 0.0, 0.0, 0.0, -1.0, 0.0, 1.0, 0.0, 0.0, 0.5, 2.0, 3.0)
	f.Add(uint8(5), 0.0, 1.0, 1.0, 0.0, 0.0, 0.0, 2.0, 2.0, 0.0, 0.0, 1.0, -1.0, 1.0) // rank-deficient: x₁ + x₂ only
	f.Add(uint8(9), 3.0, 0.0, 0.0, 1.0, 1.0, -2.0, 1.0, 0.0, 0.0, -1.0, 0.0, 0.5, -0.5)
	policies := everyLeastSquares()
	f.Fuzz(func(t *testing.T, which uint8, a, b, c, d, e, a2, b2, c2, d2, e2, shift, x1, x2 float64) {
		coefficients := []*float64{&a, &b, &c, &d, &e, &a2, &b2, &c2, &d2, &e2, &shift, &x1, &x2}
		for _, v := range coefficients {
			if math.IsNaN(*v) || math.IsInf(*v, 0) {
				t.Skip("coefficients and start are finite")
			}
			*v = math.Max(-1e3, math.Min(1e3, *v))
		}
		p := policies[int(which)%len(policies)]
		p.use(t)
		rows := [3][5]float64{{a, b, c, d, e}, {a2, b2, c2, d2, e2}, {shift, b + c2, c - b2, e, d}}
		residualsAt := func(x *vec, r *rvec) {
			for i, w := range rows {
				r[i] = w[0] + w[1]*x[0] + w[2]*x[1] + w[3]*x[0]*x[1] + w[4]*x[0]*x[0]
			}
		}
		jacobianAt := func(x *vec, j *[residuals]vec) {
			for i, w := range rows {
				j[i] = vec{w[1] + w[3]*x[1] + 2*w[4]*x[0], w[2] + w[3]*x[0]}
			}
		}
		recv := &receiver{residualFunc: residualsAt, jacobianFunc: jacobianAt,
			columnsFunc: func(x *vec, j *[dim]rvec) {
				var rows [residuals]vec
				jacobianAt(x, &rows)
				for i := range rows {
					j[0][i], j[1][i] = rows[i][0], rows[i][1]
				}
			}}
		lim := limits{Gradient: 1e-8, Step: 1e-14, Iterations: 300, Evaluations: 2000}
		out := minimize(recv, vec{x1, x2}, lim, box{})
		if recv.calls > lim.Evaluations || out.evaluations != recv.calls {
			t.Fatalf("%v: %d residual calls, %d reported, cap %d", p, recv.calls, out.evaluations, lim.Evaluations)
		}
		if !finiteVec(&out.x) {
			t.Fatalf("%v: X = %v from the finite start (%g, %g), status %d", p, out.x, x1, x2, out.status)
		}
		if out.status == statusGradientSmall {
			var r rvec
			var j [residuals]vec
			residualsAt(&out.x, &r)
			jacobianAt(&out.x, &j)
			var f float64
			var g vec
			for k := range r {
				f += r[k] * r[k] / 2
				for i := range g {
					g[i] += j[k][i] * r[k]
				}
			}
			var measure float64
			for i := range g {
				measure = math.Max(measure, math.Abs(g[i])*math.Max(math.Abs(out.x[i]), 1)/math.Max(math.Abs(f), 1))
			}
			if !(measure <= 10*out.gradientLimit) {
				t.Fatalf("%v: converged at X = %v with true relative gradient %g over ten times the limit %g it claims", p, out.x, measure, out.gradientLimit)
			}
		}
	})
}

// After a step, the augmented model JᵀJ + S meets the secant equation
// (JᵀJ + S₊)s = y, and S stays symmetric (Dennis, Gay & Welsch 1981).
func TestSecantUpdateMeetsTheSecantEquation(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindLevenbergMarquardt, rule: ruleDamping}.use(t)
	var diffs differences
	m := &diffs.model
	m.normal = [dim]vec{{5, 1.5}, {1.5, 2}} // JᵀJ at the new point
	m.second = [dim]vec{{0.5, -0.25}, {-0.25, 1}}
	s, y := vec{0.5, 0.25}, vec{3.5, 2}
	secantUpdate(&s, &y, &diffs)
	for i := range s {
		bs := dot(&m.normal[i], &s) + dot(&m.second[i], &s)
		if math.Abs(bs-y[i]) > 1e-12 {
			t.Errorf("(JᵀJ + S)s = %g in row %d, want y = %g", bs, i, y[i])
		}
	}
	if m.second[0][1] != m.second[1][0] {
		t.Errorf("S is not symmetric: %v", m.second)
	}
}

// On a linear fit the residuals have no curvature: y = JᵀJ·s, so S stays
// at the rounding level.
func TestStructuredModelStaysZeroOnALinearFit(t *testing.T) {
	leastSquares{source: sourceAnalytic, kind: kindLevenbergMarquardt, rule: ruleDamping}.use(t)
	recv := straightLine()
	var r descent
	r.prepare(vec{10, -10}, defaultLimits(), box{lower: vec{math.Inf(-1), math.Inf(-1)}, upper: vec{math.Inf(1), math.Inf(1)}})
	r.forget()
	out := r.advance(recv, unlimited)
	if out.status != statusGradientSmall || out.iterations < 2 {
		t.Fatalf("status %d after %d iterations; want converged after a few", out.status, out.iterations)
	}
	// Only rounding is left in y − JᵀJ·s: S is at its level.
	m := &r.diffs.model
	var largest, normal float64
	for i := range m.second {
		for j := range m.second[i] {
			largest = math.Max(largest, math.Abs(m.second[i][j]))
			normal = math.Max(normal, math.Abs(m.normal[i][j]))
		}
	}
	if largest > 1e-10*normal {
		t.Errorf("S = %v against JᵀJ = %v; want S at the rounding level", m.second, m.normal)
	}
}

// The next step solves with the model that predicted the last step's
// decrease better: JᵀJ + S when f fell by what the augmented model
// said, JᵀJ when f fell by what JᵀJ alone said, and JᵀJ when the fall is
// rounding noise.
func TestChooseModelTakesTheBetterPrediction(t *testing.T) {
	// Along s: −gᵀs = 2, sᵀJᵀJs = 1, sᵀSs = −2, so JᵀJ predicts 1.5 and
	// JᵀJ + S predicts 2.5.
	for _, c := range []struct {
		name        string
		fall, noise float64
		augmented   bool
	}{
		{"as JᵀJ + S predicted", 2.5, 1e-12, true},
		{"as JᵀJ predicted", 1.5, 1e-12, false},
		{"within rounding noise", 2.5, 3, false},
	} {
		t.Run(c.name, func(t *testing.T) {
			var m residualModel
			chooseModel(&m, c.fall, 2, 1, -2, c.noise)
			if m.augmented != c.augmented {
				t.Errorf("augmented %v, want %v", m.augmented, c.augmented)
			}
		})
	}
}
