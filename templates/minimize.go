package templates

// outcome is the kernel's report; the generated entry point copies it into
// the spec's result type.
type outcome struct {
	x           vec
	f           elem
	iterations  int
	evaluations int
	status      status
}

// minimize runs the descent loop from x0 within lim:
//
//  1. stop when the largest gradient component is at most lim.Gradient;
//  2. stop after lim.Iterations accepted steps;
//  3. take the direction d, falling back to steepest descent when ∇fᵀd is
//     not negative;
//  4. search along d; stop when no trial is acceptable, or when only
//     steps shorter than the step limit are left to try (converged,
//     unless f contradicts an analytic gradient: no decrease);
//  5. move, refresh the gradient, let the direction learn from the step;
//  6. stop when every |Δx_i| is at most lim.Step·(|x_i| + 1).
//
// Before every objective call it checks that lim.Evaluations leaves room
// for it, so the cap is never exceeded. A NaN or ±Inf at the start or in a
// gradient ends the run with its own status; a non-finite trial value is
// rejected by the line search like any failed trial.
func minimize(recv *receiver, x0 vec, lim limits) outcome {
	out := outcome{x: x0, status: statusOutOfEvaluations}
	if lim.Evaluations < 1 {
		return out
	}
	x := x0
	fx := recv.objective(&x)
	out.f, out.evaluations = fx, 1
	if !finite(fx) || !finiteVec(&x) {
		out.status = statusNonFiniteStart
		return out
	}
	if out.evaluations+derivativeCost > lim.Evaluations {
		return out
	}
	var g vec
	derivative(recv, &x, fx, &g)
	out.evaluations += derivativeCost
	observe(0, out.evaluations, &x, fx, &g, 0, 0)

	if !finiteVec(&g) {
		out.status = statusNonFiniteGradient
		return out
	}
	var dir direction
	dir.reset()
	var d, xt, gt, s, y vec
	t, slope := elem(stepInitial), elem(0) // the previous iteration's accepted step and slope
	for {
		if maxAbs(&g) <= lim.Gradient {
			out.status = statusGradientSmall
			return out
		}
		if out.iterations > 0 {
			if stepWithin(&s, &x, lim.Step) {
				out.status = statusStepTiny
				return out
			}
			dir.update(&s, &y)
		}
		if out.iterations >= lim.Iterations {
			out.status = statusOutOfIterations
			return out
		}
		dir.compute(&g, &d)
		now := dot(&g, &d)
		if !(now < 0) || !finiteVec(&d) {
			dir.reset() // not a descent direction: start again from steepest descent
			dir.compute(&g, &d)
			now = dot(&g, &d)
		}
		first := elem(stepInitial)
		if out.iterations > 0 {
			first = dir.firstTrial(t, slope, now)
		}
		tiny := tinyStep(&x, &d, lim.Step) // steps t ≤ tiny pass the step test
		found := lineSearch(recv, &x, fx, &d, now, first, tiny, lim.Evaluations-out.evaluations, &xt, &gt)
		out.evaluations += found.calls
		switch found.end {
		case searchOutOfBudget:
			return out
		case searchExhausted:
			out.status = statusNoAcceptableStep
			return out
		case searchTiny:
			// Converged to the step limit: no step the step test would
			// reject decreases f. Not so when an analytic gradient is
			// contradicted by f rising in proportion to the step (see
			// riseTrend, which never reports that for differences).
			out.status = statusStepTiny
			if found.rising {
				out.status = statusNoDecrease
			}
			return out
		}
		if !finiteVec(&xt) {
			out.status = statusNoAcceptableStep // the accepted trial overflowed x
			return out
		}
		if !found.gradient {
			if out.evaluations+derivativeCost > lim.Evaluations {
				if found.value < fx { // keep a better point even without its gradient
					out.x, out.f = xt, found.value
					out.iterations++
				}
				return out
			}
			derivative(recv, &xt, found.value, &gt)
			out.evaluations += derivativeCost
		}
		out.iterations++
		difference(&s, &xt, &x)
		difference(&y, &gt, &g)
		x, fx, g = xt, found.value, gt
		out.x, out.f = x, fx
		t, slope = found.step, now
		observe(out.iterations, out.evaluations, &x, fx, &g, t, slope)

		if !finiteVec(&g) {
			out.status = statusNonFiniteGradient
			return out
		}
	}
}
