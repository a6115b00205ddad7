package templates

// fixedStep always takes the step stepInitial, whatever it does to f; only
// a non-finite value at the new point ends the run as diverged. It is the plain gradient
// loop with a hand-picked step. On a quadratic with Hessian A, steepest
// descent with step t maps the error e to (I − tA)e, so it converges only
// when t < 2/λ_max(A) and otherwise oscillates or diverges (closed form).
func fixedStep(recv *receiver, x *vec, fx elem, g, d *vec, slope, first elem, floor *stepFloor, budget int, xt, gt *vec, diffs *differences) lineResult {
	if budget < 1 {
		return lineResult{end: searchOutOfBudget}
	}
	trialPoint(xt, x, stepInitial, d, &diffs.bounds)
	ft := value(recv, xt, gt, diffs)
	if !finite(ft) {
		return lineResult{calls: 1, end: searchDiverged}
	}
	return lineResult{step: stepInitial, value: ft, calls: 1, end: searchAccepted}
}

// backtrackSearch backtracks from the trial step first until the rule's
// acceptance test holds, taking t ← next trial after each
// failure, by fixed shrink or by interpolation (Nocedal & Wright 2006,
// Algorithm 3.1 and §3.5). A non-finite value fails like any trial.
func backtrackSearch(recv *receiver, x *vec, fx elem, g, d *vec, slope, first elem, floor *stepFloor, budget int, xt, gt *vec, diffs *differences) lineResult {
	if !finite(slope) {
		slope = shortenAlong(g, d, slope) // the call only where it acts: shortenAlong is not inlined
	}
	t := first
	var previous, fPrevious elem
	var trend riseTrend
	for trial := 0; trial < stepTrials; trial++ {
		if trial > 0 && t <= floor.at(x, d, diffs) {
			return lineResult{calls: trial, rising: trend.contradicts(), end: tinyOrExhausted(finite(fPrevious))}
		}
		if trial >= budget {
			return lineResult{calls: trial, end: searchOutOfBudget}
		}
		trialPoint(xt, x, t, d, &diffs.bounds)
		ft := value(recv, xt, gt, diffs)
		if finite(ft) && acceptable(fx, ft, t, slope, x, xt, g) {
			return lineResult{step: t, value: ft, calls: trial + 1, end: searchAccepted}
		}
		trend.add(x, xt, d, t, ft-fx, fx)
		t, previous, fPrevious = backtrackTrial(fx, slope, t, ft, previous, fPrevious), t, ft
	}
	return lineResult{calls: stepTrials, rising: trend.contradicts(), end: searchExhausted}
}

// acceptable is the backtracking rule's test of a trial t, at xt, with
// value ft; g is the gradient at x. It stands in for the rule the spec
// chose, along the projection arc when the spec has bounds; gen keeps
// only that one under this name.
func acceptable(fx, ft, t, slope elem, x, xt, g *vec) bool {
	switch {
	case stepRule == ruleDecrease:
		return simpleDecrease(fx, ft, t, slope, x, xt, g)
	case boxed:
		return arcDecrease(fx, ft, t, slope, x, xt, g)
	}
	return armijoDecrease(fx, ft, t, slope, x, xt, g)
}

// simpleDecrease accepts any decrease, f(x + t·d) < f(x). Simple decrease
// does not guarantee convergence (Nocedal & Wright 2006, §3.1, the example
// around Fig. 3.2), which is why the Armijo rule exists.
func simpleDecrease(fx, ft, t, slope elem, x, xt, g *vec) bool {
	return ft < fx
}

// armijoDecrease is the Armijo sufficient-decrease condition
//
//	f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd,  c1 = stepDecrease
//
// (Armijo 1966; Nocedal & Wright 2006, eq. 3.4 and Algorithm 3.1).
//
// References:
//   - L. Armijo, Minimization of functions having Lipschitz continuous
//     first partial derivatives, Pacific J. Math. 16(1):1–3, 1966.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §3.1 and §3.5.
func armijoDecrease(fx, ft, t, slope elem, x, xt, g *vec) bool {
	return ft <= fx+stepDecrease*t*slope // N&W eq. 3.4
}

// backtrackTrial picks the next, smaller trial after t failed with
// f(x + t·d) = ft; previous and fPrevious are the trial before it (zero on
// the first backtrack). It stands in for the backtracking the spec chose;
// gen keeps only that one under this name.
func backtrackTrial(fx, slope, t, ft, previous, fPrevious elem) elem {
	if backtrackKind == backtrackInterpolate {
		return interpolatedTrial(fx, slope, t, ft, previous, fPrevious)
	}
	return shrunkTrial(fx, slope, t, ft, previous, fPrevious)
}

// shrunkTrial is t·stepShrink (Nocedal & Wright 2006, Algorithm 3.1).
func shrunkTrial(fx, slope, t, ft, previous, fPrevious elem) elem {
	return t * stepShrink
}

// interpolatedTrial minimizes a model of φ(t) = f(x + t·d) built from what
// is known: φ(0) = fx, φ'(0) = slope and the failed trials. The first
// backtrack uses the quadratic through φ(0), φ'(0) and φ(t) (Nocedal &
// Wright 2006, eq. 3.58); later ones the cubic through φ(0), φ'(0) and the
// last two trials (the formula after eq. 3.58). The result is kept within
// [0.1·t, 0.5·t] so that steps neither stall nor collapse (the safeguard
// §3.5 asks for; the bounds 0.1 and 0.5 are common practice). A trial
// whose value is not finite is shrunk by stepShrink, since no model fits
// it.
func interpolatedTrial(fx, slope, t, ft, previous, fPrevious elem) elem {
	low, high := 0.1*t, 0.5*t
	if !finite(ft) {
		return t * stepShrink
	}
	var next elem
	if previous == 0 || !finite(fPrevious) {
		next = -slope * t * t / (2 * (ft - fx - slope*t)) // N&W eq. 3.58
	} else {
		// Cubic φ(a) = A·a³ + B·a² + slope·a + fx through (t, ft) and
		// (previous, fPrevious): N&W 2006, p. 58, the formula after eq. 3.58.
		rt := ft - fx - slope*t
		rp := fPrevious - fx - slope*previous
		scale := 1 / (t * t * previous * previous * (t - previous))
		a := scale * (previous*previous*rt - t*t*rp)
		b := scale * (-previous*previous*previous*rt + t*t*t*rp)
		// The minimizer is (−b + √(b² − 3a·slope)) / (3a). When b > 0 that
		// numerator cancels as a → 0, and rounding leaves a tiny but
		// nonzero whenever φ is nearly quadratic, so the root is taken in
		// the equal form −slope / (b + √(b² − 3a·slope)), which has no
		// cancellation and gives −slope/(2b) at a = 0 (the usual
		// rearrangement of the quadratic formula; common practice).
		root := squareRoot(b*b - 3*a*slope)
		switch {
		case b > 0:
			next = -slope / (b + root)
		case a == 0:
			next = -slope / (2 * b) // a concave quadratic: no minimizer, clamped below
		default:
			next = (-b + root) / (3 * a) // b ≤ 0: −b and root add without cancellation
		}
	}
	if !(next >= low) { // also catches NaN
		return low
	}
	if next > high {
		return high
	}
	return next
}

// tinyOrExhausted ends a search that has run below the step limit: no
// decrease was found when the last failure was a finite value, but a
// non-finite value says nothing about f near x, so the search has simply
// failed.
func tinyOrExhausted(lastFinite bool) searchEnd {
	if lastFinite {
		return searchTiny
	}
	return searchExhausted
}
