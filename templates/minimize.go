package templates

import "math"

// outcome is the kernel's report; the generated entry point copies it into
// the spec's result type.
type outcome struct {
	x             vec
	f             elem
	gradient      elem // the stop test's measure at x, error bound included; NaN when not known
	gradientLimit elem // the limit that measure was held to
	iterations    int
	evaluations   int
	status        status
}

// minimize runs the descent loop from x0 within lim:
//
//  1. stop, converged, when the gradient measure (gradientMeasure, error
//     bound of differences included) is at most the limit: lim.Gradient,
//     or three times the measure of the differences' error bound when that is
//     larger, so that the limit can be met (the floor the test can see);
//     differences confirm it first (confirmGradient);
//  2. stop after lim.Iterations accepted steps;
//  3. take the direction d, falling back to steepest descent when ∇fᵀd is
//     not negative;
//  4. search along d; stop when no trial is acceptable or only steps
//     shorter than the step limit are left to try: stalled, or no
//     decrease when f contradicts an analytic gradient (see riseTrend);
//  5. move, refresh the gradient, let the direction learn from the step;
//  6. stop, stalled, when every |Δx_i| is at most lim.Step·(|x_i| + 1) while
//     the gradient test still fails. A stall with differences whose
//     gradient measure is within ten times their error's measure is
//     convergence to their accuracy, once confirmed, with that limit.
//
// Only step 1 is convergence: the first-order test holds at X. Before
// every objective call it checks that lim.Evaluations leaves room for it,
// so the cap is never exceeded. A NaN or ±Inf at the start or in a
// gradient ends the run with its own status; a non-finite trial value is
// rejected by the line search like any failed trial. X is the best point
// seen unless the run converged, which it did at X. A fixed step whose
// value overflows, or that raised f above f(x0) at eight steps in a row,
// ends the run as diverged (common practice for a divergence test).
func minimize(recv *receiver, x0 vec, lim limits) outcome {
	out := outcome{x: x0, status: statusOutOfEvaluations, gradient: elem(math.NaN())}
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
	var diffs differences
	calls, ok := calibrate(recv, &x, fx, &diffs, lim.Evaluations-out.evaluations)
	out.evaluations += calls
	if !ok || out.evaluations+derivativeCost > lim.Evaluations {
		return out
	}
	var g, e vec
	derivative(recv, &x, fx, &g, &diffs)
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
	best := out                            // the lowest point seen, for runs that end unconverged
	start, rises := fx, 0                  // f(x0), and consecutive accepted steps that raised f above it
	confirmed := false                     // whether g and e at x come from confirmGradient
	stalled := false                       // whether the run can make no more progress at x
	retried := -1                          // the iteration whose stall was retried with recalibrated differences
	for {
		if !confirmed {
			gradientError(&x, fx, &g, &e, &diffs)
		}
		measure, floor := gradientMeasure(&g, &e, &x, fx)
		margin := elem(3) // the limit differences can be held to, in multiples of their error's measure
		if stalled {
			margin = 10
		}
		out.gradient, out.gradientLimit = measure, larger(lim.Gradient, margin*floor)
		if out.f <= best.f {
			best = out
		}
		if measure <= out.gradientLimit && (derivativeCost == 0 || confirmed) {
			out.status = statusGradientSmall
			return out
		}
		if measure <= out.gradientLimit {
			// Differences pass the test: confirm it with intervals chosen
			// here and an error measured rather than modelled.
			calls, ok := confirmGradient(recv, &x, fx, &g, &e, &diffs, lim.Evaluations-out.evaluations)
			out.evaluations += calls
			if !ok {
				return best.ending(statusOutOfEvaluations, out.iterations, out.evaluations)
			}
			if !finiteVec(&g) {
				return best.ending(statusNonFiniteGradient, out.iterations, out.evaluations)
			}
			confirmed = true
			continue
		}
		if stalled {
			// The gradient from intervals chosen here is still above the
			// limit: search once more with it.
			stalled, retried = false, out.iterations
		}
		// A stall with differences whose gradient is within ten times its
		// error bound's measure of zero is convergence to their accuracy,
		// once confirmed: no step can show progress below their error.
		lenient := derivativeCost > 0 && retried != out.iterations && measure <= larger(lim.Gradient, 10*floor)
		if out.iterations > 0 && retried != out.iterations {
			if stepWithin(&s, &x, lim.Step) {
				if lenient {
					stalled, confirmed = true, false
					continue
				}
				return best.ending(statusStalled, out.iterations, out.evaluations)
			}
			if rises >= 8 {
				return best.ending(statusDiverged, out.iterations, out.evaluations)
			}
			dir.update(&s, &y)
		}
		if out.iterations >= lim.Iterations {
			return best.ending(statusOutOfIterations, out.iterations, out.evaluations)
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
		found := lineSearch(recv, &x, fx, &d, now, first, tiny, lim.Evaluations-out.evaluations, &xt, &gt, &diffs)
		out.evaluations += found.calls
		switch found.end {
		case searchOutOfBudget:
			return best.ending(statusOutOfEvaluations, out.iterations, out.evaluations)
		case searchDiverged:
			return best.ending(statusDiverged, out.iterations, out.evaluations)
		case searchExhausted, searchTiny:
			// No acceptable step. When an analytic gradient predicted a
			// fall that f contradicted in proportion to the step, the
			// gradient is probably wrong (see riseTrend, which never
			// reports that for differences); otherwise the search stalled
			// below the step limit, or ran out of trials.
			end := statusNoAcceptableStep
			switch {
			case found.rising:
				end = statusNoDecrease
			case found.end == searchTiny && lenient:
				stalled, confirmed = true, false
				continue
			case found.end == searchTiny:
				end = statusStalled
			}
			return best.ending(end, out.iterations, out.evaluations)
		}
		if !finiteVec(&xt) {
			return best.ending(statusNoAcceptableStep, out.iterations, out.evaluations) // the accepted trial overflowed x
		}
		if !found.gradient {
			if out.evaluations+derivativeCost > lim.Evaluations {
				if found.value < best.f { // keep a better point even without its gradient
					best.x, best.f, best.gradient = xt, found.value, elem(math.NaN())
					out.iterations++
				}
				return best.ending(statusOutOfEvaluations, out.iterations, out.evaluations)
			}
			derivative(recv, &xt, found.value, &gt, &diffs)
			out.evaluations += derivativeCost
		}
		out.iterations++
		difference(&s, &xt, &x)
		difference(&y, &gt, &g)
		if found.value > fx && found.value > start {
			rises++
		} else {
			rises = 0
		}
		x, fx, g, confirmed = xt, found.value, gt, false
		out.x, out.f, out.gradient = x, fx, elem(math.NaN())
		t, slope = found.step, now
		observe(out.iterations, out.evaluations, &x, fx, &g, t, slope)

		if !finiteVec(&g) {
			if out.f < best.f {
				best = out
			}
			return best.ending(statusNonFiniteGradient, out.iterations, out.evaluations)
		}
	}
}

// ending is the best point seen, reported with the run's end and counts.
func (o outcome) ending(end status, iterations, evaluations int) outcome {
	o.status, o.iterations, o.evaluations = end, iterations, evaluations
	return o
}
