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
//     limit, which it reports. Before a stall ends the run, differences
//     retry once with the intervals chosen there, and a direction with
//     something in reserve (dir.stalled: cg's preconditioner) searches
//     again from x.
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
	var r descent
	r.prepare(x0, lim, bounds)
	r.forget()
	return r.advance(recv, unlimited)
}

// unlimited is a tick budget that never pauses a run.
const unlimited = int(^uint(0) >> 1)

// descent is one run of the descent loop, held in a value so
// that a caller can run it a tick at a time (see advance): the limits, the
// point with its value, gradient and error bound, the difference
// intervals, the direction's memory, the previous step and the loop's
// bookkeeping. prepare begins a run and keeps the direction's memory;
// forget forgets it.
type descent struct {
	lim       limits
	stage     int         // what advance does next
	diffs     differences // the box and the difference intervals
	dir       direction   // the direction's memory
	x, g, e   vec         // the point, its gradient and the gradient's error bound
	d, s, y   vec         // the search direction, the last step and its gradient change
	fx        elem        // f(x)
	t, slope  elem        // the previous iteration's accepted step and slope
	out, best outcome     // the run so far, and its lowest point for runs that end unconverged
	start     elem        // f(x0)
	rises     int         // consecutive accepted steps that raised f above f(x0)
	confirmed bool        // whether g and e at x come from confirmGradient or settle
	stalled   bool        // whether the run can make no more progress at x
	retried   int         // the iteration whose stall was retried, with recalibrated differences or the direction's reserve
	verify    int         // what to check at x before judging it again
}

// The stages of a run: advance starts each only when the calls left in
// the tick cover its worst case.
const (
	stageBegin  = iota // the first value, the calibration and the first gradient: startCalls
	stageJudge         // settle when asked (settleCalls), judge x, learn from the step: no calls otherwise
	stageSearch        // the line search and the gradient at the accepted point: iterationCalls
	stageOver          // the run has ended; out is its result
)

// prepare begins a run at x0, moved into the box, within lim. It makes no
// objective call and keeps the direction's memory.
func (r *descent) prepare(x0 vec, lim limits, bounds box) {
	r.lim, r.stage = lim, stageBegin
	r.diffs = differences{bounds: bounds}
	r.x = x0
	enterBox(&r.x, &r.diffs.bounds)
	r.g, r.e, r.d, r.s, r.y = vec{}, vec{}, vec{}, vec{}, vec{}
	r.out = outcome{x: r.x, f: elem(math.NaN()), status: statusOutOfEvaluations, gradient: elem(math.NaN())}
	r.best = r.out
}

// forget forgets the direction's memory (the BFGS matrix, the L-BFGS
// pairs, the previous CG direction): the next step is steepest descent.
func (r *descent) forget() {
	r.dir.reset()
}

// advance runs the stages of the run until it ends, and returns its
// result, or until the calls left of budget, this tick's, do not cover
// the worst case of the next stage, and returns the best point so far
// with statusRunning. It never makes more than budget objective calls;
// the smallest budget that always lets it progress is the largest of
// startCalls, settleCalls and iterationCalls. A run that has ended
// returns its result again without a call.
func (r *descent) advance(recv *receiver, budget int) outcome {
	used := r.out.evaluations
	for r.stage != stageOver {
		left := budget - (r.out.evaluations - used)
		switch r.stage {
		case stageBegin:
			if left < 1+calibrationCost+derivativeCost { // startCalls
				return r.paused()
			}
			r.begin(recv)
		case stageJudge:
			if r.verify != verifyNothing && left < settleCalls {
				return r.paused()
			}
			r.judge(recv)
		default:
			if left < iterationCalls {
				return r.paused()
			}
			r.search(recv)
		}
	}
	return r.out
}

// paused is the best point so far, reported as still running.
func (r *descent) paused() outcome {
	return r.best.ending(statusRunning, r.out.iterations, r.out.evaluations)
}

// finish ends the run with the best point seen.
func (r *descent) finish(end status) {
	r.out = r.best.ending(end, r.out.iterations, r.out.evaluations)
	r.stage = stageOver
}

// begin is the start: the first value, the calibration of differences
// and the first gradient.
func (r *descent) begin(recv *receiver) {
	r.stage = stageOver
	r.out.f = 0
	if r.lim.Evaluations < 1 {
		return
	}
	r.fx = value(recv, &r.x, &r.g, &r.diffs) // a combined objective writes ∇f(x) into g
	r.out.f, r.out.evaluations = r.fx, 1
	if !finite(r.fx) || !finiteVec(&r.x) {
		r.out.status = statusNonFiniteStart
		return
	}
	calls, ok := calibrate(recv, &r.x, r.fx, &r.diffs, r.lim.Evaluations-r.out.evaluations)
	r.out.evaluations += calls
	if !ok || r.out.evaluations+derivativeCost > r.lim.Evaluations {
		return
	}
	r.out.evaluations += derivative(recv, &r.x, r.fx, &r.g, &r.diffs)
	observe(0, r.out.evaluations, &r.x, r.fx, &r.g, 0, 0)

	if !finiteVec(&r.g) {
		r.out.status = statusNonFiniteGradient
		return
	}
	r.t, r.slope = stepInitial, 0
	r.best = r.out
	r.start, r.rises = r.fx, 0
	r.confirmed, r.stalled, r.retried, r.verify = false, false, -1, verifyNothing
	r.stage = stageJudge
}

// judge is steps 1, 2, 5 (learning) and 6 at x: it settles when asked,
// tests convergence and the stall, and lets the direction learn from the
// step that led to x; it leaves stageSearch next when the run goes on.
func (r *descent) judge(recv *receiver) {
	switch {
	case r.verify != verifyNothing:
		// Confirm a difference gradient that passed the test, or
		// settle at a stall (see confirmGradient and settle).
		calls, ok := settle(recv, &r.x, r.fx, &r.g, &r.e, &r.diffs, r.verify == verifyStall, r.lim.Evaluations-r.out.evaluations)
		r.out.evaluations += calls
		if !ok {
			r.finish(statusOutOfEvaluations)
			return
		}
		if !finiteVec(&r.g) {
			r.finish(statusNonFiniteGradient)
			return
		}
		r.verify, r.confirmed = verifyNothing, true
	case !r.confirmed:
		gradientError(&r.x, r.fx, &r.g, &r.e, &r.diffs)
	}
	measure, floor := stationarity(&r.g, &r.e, &r.x, r.fx, &r.diffs.bounds)
	r.out.gradient, r.out.gradientLimit = measure, larger(r.lim.Gradient, 3*floor)
	if r.stalled {
		// No step can make progress here: the gradient is as small as
		// this point shows it, within ten times the limit or the floor.
		r.out.gradientLimit = 10 * larger(r.lim.Gradient, floor)
	}
	if r.out.f <= r.best.f {
		r.best = r.out
	}
	if measure <= r.out.gradientLimit && (derivativeCost == 0 || r.confirmed) {
		r.out.status = statusGradientSmall
		r.stage = stageOver
		return
	}
	if measure <= r.out.gradientLimit {
		r.verify = verifyPass // differences pass the test: confirm it
		return
	}
	if r.stalled {
		// Settled and still above the limit: stalled, unless
		// differences, whose intervals were just chosen here, can
		// search once more with the better gradient, or the direction
		// has a reserve (with differences it is asked when the retry
		// stalls too, in search).
		if derivativeCost == 0 && !r.dir.stalled() {
			r.finish(statusStalled)
			return
		}
		r.stalled, r.retried = false, r.out.iterations
	}
	// At a stall, settle first: the run is converged if the gradient
	// is zero to the rounding of x (and, with differences, to their
	// accuracy, confirmed); see settle.
	if r.out.iterations > 0 && r.retried != r.out.iterations {
		if stepWithin(&r.s, &r.x, r.lim.Step, &r.diffs) {
			r.verify, r.stalled = verifyStall, true
			return
		}
		if r.rises >= 8 {
			r.finish(statusDiverged)
			return
		}
		curvaturePair(&r.s, &r.y, &r.x, &r.diffs.bounds)
		r.dir.update(&r.s, &r.y)
		learnCurvature(&r.s, &r.y, &r.diffs)
	}
	if r.out.iterations >= r.lim.Iterations {
		r.finish(statusOutOfIterations)
		return
	}
	r.stage = stageSearch
}

// search is steps 3 to 5: the direction, the line search, the move and
// the gradient at the new point; it leaves stageJudge next when the run
// goes on.
func (r *descent) search(recv *receiver) {
	searchDirection(&r.dir, &r.x, &r.g, &r.d, &r.diffs)
	now := dot(&r.g, &r.d)
	// g is finite here, so a non-finite dᵢ makes ∇fᵀd non-finite: d is
	// scanned only then (a finite d whose slope overflowed is kept; the
	// search shortens it, see shortenAlong).
	if !(now < 0) || !finite(now) && !finiteVec(&r.d) {
		r.dir.reset() // not a descent direction: start again from steepest descent
		searchDirection(&r.dir, &r.x, &r.g, &r.d, &r.diffs)
		now = dot(&r.g, &r.d)
	}
	first := elem(stepInitial)
	if r.out.iterations > 0 {
		first = r.dir.firstTrial(r.t, r.slope, now)
	}
	floor := stepFloor{tol: r.lim.Step} // steps t ≤ floor pass the step test
	var xt, gt vec
	found := lineSearch(recv, &r.x, r.fx, &r.g, &r.d, now, first, &floor, r.lim.Evaluations-r.out.evaluations, &xt, &gt, &r.diffs)
	r.out.evaluations += found.calls
	if !finite(now) {
		now = dot(&r.g, &r.d) // the search shortened d (see shortenAlong)
	}
	switch found.end {
	case searchOutOfBudget:
		r.finish(statusOutOfEvaluations)
		return
	case searchDiverged:
		r.finish(statusDiverged)
		return
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
		case found.end == searchTiny && r.retried != r.out.iterations:
			r.verify, r.stalled, r.stage = verifyStall, true, stageJudge
			return
		case found.end == searchTiny && r.dir.stalled():
			return // search again with the direction's reserve (cg's preconditioner)
		case found.end == searchTiny:
			end = statusStalled
		}
		r.finish(end)
		return
	}
	if !finiteVec(&xt) {
		r.finish(statusNoAcceptableStep) // the accepted trial overflowed x
		return
	}
	if !found.gradient {
		if r.out.evaluations+derivativeCost > r.lim.Evaluations {
			if found.value < r.best.f { // keep a better point even without its gradient
				r.best.x, r.best.f, r.best.gradient = xt, found.value, elem(math.NaN())
				r.out.iterations++
			}
			r.finish(statusOutOfEvaluations)
			return
		}
		r.out.evaluations += derivative(recv, &xt, found.value, &gt, &r.diffs)
	}
	r.out.iterations++
	difference(&r.s, &xt, &r.x)
	gradientChange(&r.y, &gt, &r.g)
	if found.value > r.fx && found.value > r.start {
		r.rises++
	} else {
		r.rises = 0
	}
	r.x, r.fx, r.g, r.confirmed = xt, found.value, gt, false
	r.out.x, r.out.f, r.out.gradient = r.x, r.fx, elem(math.NaN())
	r.t, r.slope = found.step, now
	observe(r.out.iterations, r.out.evaluations, &r.x, r.fx, &r.g, r.t, r.slope)

	if !finiteVec(&r.g) {
		if r.out.f < r.best.f {
			r.best = r.out
		}
		r.finish(statusNonFiniteGradient)
		return
	}
	r.stage = stageJudge
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
	if residualObjective {
		return settleResiduals(recv, x, fx, g, e, diffs, stall, budget)
	}
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
