package templates

// linePoint is one trial of a Wolfe search: the step, φ(step) = f(x+step·d)
// and, when known, φ'(step) = ∇f(x+step·d)ᵀd.
type linePoint struct {
	step, value, slope elem
	hasSlope           bool
}

// wolfeSearch finds a step meeting the Wolfe conditions
//
//	f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd                (sufficient decrease)
//	∇f(x + t·d)ᵀd ≥ c2·∇f(x)ᵀd                      (curvature, "wolfe")
//	|∇f(x + t·d)ᵀd| ≤ c2·|∇f(x)ᵀd|                  (strong curvature, "strong-wolfe")
//
// with 0 < c1 = stepDecrease < c2 = stepCurvature < 1 (Nocedal & Wright
// 2006, eqs. 3.6 and 3.7). It brackets an acceptable step by expansion,
// then narrows the bracket (Algorithms 3.5 and 3.6), choosing each trial by
// safeguarded interpolation (§3.5). The gradient is computed only at trials
// that pass sufficient decrease, since only they can be accepted or become
// the low end of a bracket; the accepted trial's value and gradient are
// handed back, so the kernel never pays for them twice. A non-finite trial
// value counts as a failure of sufficient decrease. With bounds the
// search stays on the segment up to the first bound along d (stepCap): a
// trial there that meets sufficient decrease with f still falling is
// accepted as the capped step, which makes that bound active.
//
// References:
//   - P. Wolfe, Convergence conditions for ascent methods, SIAM Review
//     11(2):226–235, 1969.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §3.1 and §3.5.
//   - J. J. Moré and D. J. Thuente, Line search algorithms with guaranteed
//     sufficient decrease, ACM TOMS 20(3):286–307, 1994.
func wolfeSearch(recv *receiver, x *vec, fx elem, g, d *vec, slope, first elem, floor *stepFloor, budget int, xt, gt *vec, diffs *differences) lineResult {
	if !finite(slope) {
		slope = shortenAlong(g, d, slope) // the call only where it acts: shortenAlong is not inlined
	}
	low := linePoint{value: fx, slope: slope, hasSlope: true} // best trial meeting sufficient decrease; t = 0 at first
	var high linePoint                                        // the other end of the bracket, once bracketed
	var lowGradient vec                                       // ∇f at low, kept for accepting low from a collapsed bracket
	bracketed := false
	var previous linePoint               // low before the last trial replaced it: the expansion's other point
	var trend riseTrend                  // of the trials failing sufficient decrease
	limit := stepCap(x, d, floor, diffs) // the first bound along d, when the spec has bounds
	t := first
	if t > limit {
		t = limit
	}
	calls := 0
	for trial := 0; trial < stepTrials; trial++ {
		if bracketed && abs(high.step-low.step) <= floor.at(x, d, diffs) {
			// The bracket is below the step limit: take low when it
			// decreased f; else no step decreased f, unless f was not
			// finite there.
			if low.step == 0 {
				return lineResult{calls: calls, rising: trend.contradicts(), end: tinyOrExhausted(finite(high.value))}
			}
			return acceptLow(x, d, &low, &lowGradient, calls, xt, gt, diffs)
		}
		if calls >= budget {
			return lineResult{calls: calls, end: searchOutOfBudget}
		}
		trialPoint(xt, x, t, d, &diffs.bounds)
		current := linePoint{step: t, value: value(recv, xt, gt, diffs)}
		calls++
		if !finite(current.value) || current.value > fx+stepDecrease*t*slope || current.value >= low.value { // N&W Alg. 3.5 and 3.6, first test
			high, bracketed = current, true // too far: [low, current] holds an acceptable step
			trend.add(x, xt, d, t, current.value-fx, fx)
		} else {
			if calls+derivativeCost > budget {
				return lineResult{calls: calls, end: searchOutOfBudget}
			}
			calls += derivative(recv, xt, current.value, gt, diffs)
			current.slope, current.hasSlope = dot(gt, d), true
			switch {
			case !finite(current.slope):
				high, bracketed = current, true
			case curvatureMet(current.slope, slope):
				return lineResult{step: t, value: current.value, calls: calls, gradient: true, end: searchAccepted}
			case bracketed && current.slope*(high.step-low.step) >= 0:
				high, low, lowGradient = low, current, *gt // Alg. 3.6: the new low's slope points away from high
			case !bracketed && current.slope >= 0:
				high, low, lowGradient, bracketed = low, current, *gt, true // Alg. 3.5: φ' ≥ 0 brackets [previous, current]
			case !bracketed && t >= limit:
				// Sufficient decrease at the first bound, still falling:
				// the capped step, where the bound becomes active.
				return lineResult{step: t, value: current.value, calls: calls, gradient: true, end: searchAccepted}
			default: // the only way on without a bracket, so the only place expandTrial's previous is set
				previous, low, lowGradient = low, current, *gt
			}
		}
		if bracketed {
			t = zoomTrial(&low, &high)
		} else if t = expandTrial(&previous, &current); t > limit {
			t = limit
		}
	}
	if low.step > 0 {
		return acceptLow(x, d, &low, &lowGradient, calls, xt, gt, diffs) // sufficient decrease without curvature beats no step
	}
	return lineResult{calls: calls, rising: trend.contradicts(), end: searchExhausted}
}

// acceptLow ends a Wolfe search with its best trial, which met sufficient
// decrease though not the curvature condition, when the bracket collapsed
// or the trials ran out. Its gradient was kept in lowGradient. (When the
// budget runs out the search ends without a step instead, so that a capped
// run follows the uncapped run's path up to the cap.)
func acceptLow(x, d *vec, low *linePoint, lowGradient *vec, calls int, xt, gt *vec, diffs *differences) lineResult {
	trialPoint(xt, x, low.step, d, &diffs.bounds)
	*gt = *lowGradient
	return lineResult{step: low.step, value: low.value, calls: calls, gradient: true, end: searchAccepted}
}

// curvatureMet applies the curvature condition of the spec's Wolfe rule
// to the slope now at a trial, given the slope at t = 0. It stands in for
// the rule the spec chose; gen keeps only that one under this name.
func curvatureMet(now, initial elem) bool {
	if stepRule == ruleStrongWolfe {
		return strongCurvature(now, initial)
	}
	return weakCurvature(now, initial)
}

// weakCurvature is the Wolfe curvature condition φ'(t) ≥ c2·φ'(0)
// (Nocedal & Wright 2006, eq. 3.6b).
func weakCurvature(now, initial elem) bool {
	return now >= stepCurvature*initial // N&W eq. 3.6b
}

// strongCurvature is the strong Wolfe curvature condition
// |φ'(t)| ≤ c2·|φ'(0)| (Nocedal & Wright 2006, eq. 3.7b).
func strongCurvature(now, initial elem) bool {
	return abs(now) <= -stepCurvature*initial // N&W eq. 3.7b
}

// zoomTrial picks the next trial inside the bracket between low and high:
// the minimizer of the cubic through both ends when both slopes are known,
// otherwise of the quadratic through low's value and slope and high's value
// (N&W 2006, §3.5, eqs. 3.58–3.59), kept at least a tenth of the bracket
// away from either end so that the bracket shrinks geometrically (common
// practice; Moré & Thuente 1994 use a safeguard of the same kind). A model
// without a minimizer falls back to bisection.
func zoomTrial(low, high *linePoint) elem {
	margin := 0.1 * (high.step - low.step)
	next, ok := modelMinimizer(low, high)
	if !ok {
		return low.step + 0.5*(high.step-low.step)
	}
	return clampBetween(next, low.step+margin, high.step-margin)
}

// expandTrial picks a larger trial after current met sufficient decrease
// with a slope still steeply negative: the model's minimizer through
// previous and current, kept within [2, 8] times current's step (common
// practice; Moré & Thuente 1994 bound extrapolation in the same way with
// factors of their own).
func expandTrial(previous, current *linePoint) elem {
	next, ok := modelMinimizer(previous, current)
	if !ok {
		return 2 * current.step
	}
	return clampBetween(next, 2*current.step, 8*current.step)
}

// clampBetween returns v limited to the interval with ends a and b, in
// either order.
func clampBetween(v, a, b elem) elem {
	if a > b {
		a, b = b, a
	}
	if v < a {
		return a
	}
	if v > b {
		return b
	}
	return v
}

// modelMinimizer returns the minimizer of the cubic interpolating values
// and slopes at a and b (N&W 2006, eq. 3.59), or, when b's slope is
// unknown, of the quadratic through a's value and slope and b's value; ok
// is false when the model has no finite minimizer.
func modelMinimizer(a, b *linePoint) (t elem, ok bool) {
	delta := b.step - a.step
	if !b.hasSlope {
		// q(t) = φ(a) + φ'(a)·(t − a) + c·(t − a)², minimized at a − φ'(a)/(2c).
		c := (b.value - a.value - a.slope*delta) / (delta * delta)
		t = a.step - a.slope/(2*c)
		return t, c > 0 && finite(t)
	}
	d1 := a.slope + b.slope - 3*(a.value-b.value)/(a.step-b.step) // N&W eq. 3.59
	radicand := d1*d1 - a.slope*b.slope
	if !(radicand >= 0) {
		return 0, false // the cubic has no local minimizer
	}
	d2 := squareRoot(radicand)
	if delta < 0 {
		d2 = -d2 // sign(b − a) in eq. 3.59
	}
	t = b.step - delta*(b.slope+d2-d1)/(b.slope-a.slope+2*d2) // N&W eq. 3.59
	return t, finite(t)
}
