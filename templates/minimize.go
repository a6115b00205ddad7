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
//     the gradient test still fails. At a stall the run settles first
//     (settle): the error bound gains the rounding floor of x, with
//     differences confirmed, and the limit rises to ten times the larger
//     of lim.Gradient and the bound's measure; a gradient within that is
//     as small as this point can show, and the run is converged with that
//     limit, which it reports.
//
// Only step 1 is convergence: the first-order test holds at X. Before
// every objective call it checks that lim.Evaluations leaves room for it,
// so the cap is never exceeded. A NaN or ±Inf at the start or in a
// gradient ends the run with its own status; a non-finite trial value is
// rejected by the line search like any failed trial. X is the best point
// seen unless the run converged, which it did at X. A fixed step whose
// value overflows, or that raised f above f(x0) at eight steps in a row,
// ends the run as diverged (common practice for a divergence test).
func minimize(recv *receiver, x0 vec, lim limits, bounds box) outcome {
	x := x0
	enterBox(&x, &bounds)
	out := outcome{x: x, status: statusOutOfEvaluations, gradient: elem(math.NaN())}
	if lim.Evaluations < 1 {
		return out
	}
	fx := recv.evaluate(&x, &x0)
	out.f, out.evaluations = fx, 1
	if !finite(fx) || !finiteVec(&x) {
		out.status = statusNonFiniteStart
		return out
	}
	diffs := differences{bounds: bounds}
	calls, ok := calibrate(recv, &x, fx, &diffs, lim.Evaluations-out.evaluations)
	out.evaluations += calls
	if !ok || out.evaluations+derivativeCost > lim.Evaluations {
		return out
	}
	var g, e vec
	out.evaluations += derivative(recv, &x, fx, &g, &diffs)
	recv.keepGradient(&g, &x0)
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
	confirmed := false                     // whether g and e at x come from confirmGradient or settle
	stalled := false                       // whether the run can make no more progress at x
	retried := -1                          // the iteration whose stall was retried with recalibrated differences
	verify := verifyNothing                // what to check at x before judging it again
	for {
		switch {
		case verify != verifyNothing:
			// Confirm a difference gradient that passed the test, or
			// settle at a stall (see confirmGradient and settle).
			calls, ok := settle(recv, &x, fx, &g, &e, &diffs, verify == verifyStall, lim.Evaluations-out.evaluations)
			out.evaluations += calls
			if !ok {
				return best.ending(statusOutOfEvaluations, out.iterations, out.evaluations)
			}
			if !finiteVec(&g) {
				return best.ending(statusNonFiniteGradient, out.iterations, out.evaluations)
			}
			verify, confirmed = verifyNothing, true
		case !confirmed:
			gradientError(&x, fx, &g, &e, &diffs)
		}
		measure, floor := stationarity(&g, &e, &x, fx, &diffs.bounds)
		out.gradient, out.gradientLimit = measure, larger(lim.Gradient, 3*floor)
		if stalled {
			// No step can make progress here: the gradient is as small as
			// this point shows it, within ten times the limit or the floor.
			out.gradientLimit = 10 * larger(lim.Gradient, floor)
		}
		if out.f <= best.f {
			best = out
		}
		if measure <= out.gradientLimit && (derivativeCost == 0 || confirmed) {
			out.status = statusGradientSmall
			return out
		}
		if measure <= out.gradientLimit {
			verify = verifyPass // differences pass the test: confirm it
			continue
		}
		if stalled {
			// Settled and still above the limit: stalled, unless
			// differences, whose intervals were just chosen here, can
			// search once more with the better gradient.
			if derivativeCost == 0 {
				return best.ending(statusStalled, out.iterations, out.evaluations)
			}
			stalled, retried = false, out.iterations
		}
		// At a stall, settle first: the run is converged if the gradient
		// is zero to the rounding of x (and, with differences, to their
		// accuracy, confirmed); see settle.
		canSettle := retried != out.iterations
		if out.iterations > 0 && canSettle {
			if stepWithin(&s, &x, lim.Step) {
				verify, stalled = verifyStall, true
				continue
			}
			if rises >= 8 {
				return best.ending(statusDiverged, out.iterations, out.evaluations)
			}
			curvaturePair(&s, &y, &x, &diffs.bounds)
			dir.update(&s, &y)
		}
		if out.iterations >= lim.Iterations {
			return best.ending(statusOutOfIterations, out.iterations, out.evaluations)
		}
		searchDirection(&dir, &x, &g, &d, &diffs.bounds)
		now := dot(&g, &d)
		if !(now < 0) || !finiteVec(&d) {
			dir.reset() // not a descent direction: start again from steepest descent
			searchDirection(&dir, &x, &g, &d, &diffs.bounds)
			now = dot(&g, &d)
		}
		first := elem(stepInitial)
		if out.iterations > 0 {
			first = dir.firstTrial(t, slope, now)
		}
		tiny := tinyStep(&x, &d, lim.Step) // steps t ≤ tiny pass the step test
		found := lineSearch(recv, &x, fx, &g, &d, now, first, tiny, lim.Evaluations-out.evaluations, &xt, &gt, &diffs)
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
			case found.end == searchTiny && canSettle:
				verify, stalled = verifyStall, true
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
			out.evaluations += derivative(recv, &xt, found.value, &gt, &diffs)
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

// What minimize checks at x before judging it again.
const (
	verifyNothing = iota
	verifyPass    // a difference gradient passed the test
	verifyStall   // no step makes progress
)

// settle prepares a verdict at x, where f(x) = fx and the gradient is g
// with error bound e: at a stall (stall true) the bound gains the
// rounding floor of x, with differences confirmed first. It returns the
// objective calls spent and false when budget ran out first. It stands
// in for the objective's kind; gen keeps only that one under this name.
func settle(recv *receiver, x *vec, fx elem, g, e *vec, diffs *differences, stall bool, budget int) (int, bool) {
	if combined {
		return settleCombined(recv, x, fx, g, e, diffs, stall, budget)
	}
	return settleAt(recv, x, fx, g, e, diffs, stall, budget)
}

// settleAt prepares a verdict at x: with differences it confirms the
// gradient (confirmGradient), and at a stall it adds to each error bound
// the rounding floor of x (roundingFloor). It returns the objective calls
// spent and false when budget ran out first.
func settleAt(recv *receiver, x *vec, fx elem, g, e *vec, diffs *differences, stall bool, budget int) (int, bool) {
	calls := 0
	if derivativeCost > 0 {
		spent, ok := confirmGradient(recv, x, fx, g, e, diffs, budget)
		if !ok {
			return spent, false
		}
		calls = spent
	}
	if stall {
		roundingFloor(recv, x, g, e, diffs)
	}
	return calls, true
}

// settleCombined prepares a verdict at a stall for a combined objective,
// which gives its gradient only with its value: it adds to each error
// bound eᵢ the rounding floor 4u·|xᵢ|·|∂²f/∂xᵢ²|, the change that moving
// xᵢ by a few of its rounding units makes in gᵢ (common practice), with
// |∂²f/∂xᵢ²| a forward difference of the gradient at x + δᵢeᵢ,
// δᵢ = √u·max(1, |xᵢ|) (Nocedal & Wright 2006, §8.1), as an analytic
// gradient's stall does. Each probe is an objective call here: at most
// dim of them, counted and kept within budget. It returns the calls spent
// and false when budget ran out first. The gradient of a combined
// objective is taken as exact (the generated test checks it), so nothing
// is confirmed before a stall, and nothing is done elsewhere.
func settleCombined(recv *receiver, x *vec, fx elem, g, e *vec, diffs *differences, stall bool, budget int) (int, bool) {
	if !stall {
		return 0, true
	}
	probe := *x
	var moved vec
	calls := 0
	for i := range probe {
		xi := probe[i]
		lower, upper := coordinateRange(i, diffs)
		up, delta := probeStep(xi, oneSide(xi, squareRoot(unitRoundoff)*larger(1, abs(xi)), 1, lower, upper), lower, upper)
		if delta == 0 {
			continue // fixed by equal bounds
		}
		if calls >= budget {
			return calls, false
		}
		probe[i] = up
		recv.evaluate(&probe, &moved)
		calls++
		probe[i] = xi
		e[i] += 4 * unitRoundoff * abs(x[i]) * abs(moved[i]-g[i]) / abs(delta) // 4u·|xᵢ|·|∂²f/∂xᵢ²|
	}
	return calls, true
}
