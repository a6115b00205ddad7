package templates

import "math"

// box stands in for the spec's bounds, lower ≤ x ≤ upper in every
// component, with ±Inf for a side left open. gen emits it with these
// fields for a spec with [minimizer.bounds] and as an empty struct
// otherwise, so an unbounded minimizer carries nothing; only the
// alternatives picked for bounds read the fields.
type box struct {
	lower, upper vec
}

// enterBox moves the start into the box. It stands in for the choice gen
// makes from the spec's bounds and keeps only one alternative under this
// name.
func enterBox(x *vec, b *box) {
	if boxed {
		projectStart(x, b)
		return
	}
	openStart(x, b)
}

// openStart: without bounds every start is inside.
func openStart(x *vec, b *box) {}

// projectStart moves each xᵢ outside [lowerᵢ, upperᵢ] to the nearer bound,
// the projection P(x) onto the box.
func projectStart(x *vec, b *box) {
	for i := range x {
		x[i] = clampBetween(x[i], b.lower[i], b.upper[i])
	}
}

// trialPoint sets out to the trial point of step t along d from x. It
// stands in for the choice gen makes from the spec's bounds.
func trialPoint(out, x *vec, t elem, d *vec, b *box) {
	if boxed {
		projectedTrial(out, x, t, d, b)
		return
	}
	straightTrial(out, x, t, d, b)
}

// straightTrial is x + t·d.
func straightTrial(out, x *vec, t elem, d *vec, b *box) {
	moveTo(out, x, t, d)
}

// projectedTrial is P(x + t·d), the point at t on the projection arc of
// Bertsekas (1976): each component that would cross a bound stops on it.
// A component whose step reaches the bound, t ≥ (boundᵢ − xᵢ)/dᵢ computed
// as firstBound computes it, lands on the bound exactly, so that a Wolfe
// step capped there makes the bound active rather than leaving xᵢ a
// rounding error inside it; the clamp catches a rounded xᵢ + t·dᵢ that
// would cross a bound all the same. So the objective is never evaluated
// outside the box.
//
// References:
//   - D. P. Bertsekas, On the Goldstein–Levitin–Polyak gradient projection
//     method, IEEE Trans. Automatic Control 21(2):174–184, 1976.
func projectedTrial(out, x *vec, t elem, d *vec, b *box) {
	for i := range x {
		v := x[i] + t*d[i]
		switch {
		case d[i] > 0 && t >= (b.upper[i]-x[i])/d[i]:
			v = b.upper[i]
		case d[i] < 0 && t >= (b.lower[i]-x[i])/d[i]:
			v = b.lower[i]
		}
		out[i] = clampBetween(v, b.lower[i], b.upper[i]) // Bertsekas 1976: x(t) = P(x + t·d)
	}
}

// stepCap is the longest step a Wolfe search may take along d from x,
// where steps t ≤ floor are below the step limit. It stands in for the
// choice gen makes from the spec's bounds.
func stepCap(x, d *vec, floor *stepFloor, diffs *differences) elem {
	if boxed {
		return firstBound(x, d, floor, diffs)
	}
	return noCap(x, d, floor, diffs)
}

// noCap: without bounds a step may be as long as the search wants.
func noCap(x, d *vec, floor *stepFloor, diffs *differences) elem {
	return elem(math.Inf(1))
}

// firstBound is the step at which x + t·d first reaches a bound, over the
// components that reach theirs beyond the step limit tiny (floor), or +Inf
// when none does. The Wolfe conditions hold along the straight segment up
// to it; a search
// that would go further takes the capped step, where a bound becomes
// active (a curvature condition cannot be asked for there). Components
// that reach their bound within tiny, a move the step test cannot see,
// are left to the projection of projectedTrial, so that a variable a
// rounding error away from its bound does not cap every step at nothing.
func firstBound(x, d *vec, floor *stepFloor, diffs *differences) elem {
	tiny, b := floor.at(x, d, diffs), &diffs.bounds
	limit := elem(math.Inf(1))
	for i := range x {
		hit := elem(math.Inf(1))
		switch {
		case d[i] > 0:
			hit = (b.upper[i] - x[i]) / d[i]
		case d[i] < 0:
			hit = (b.lower[i] - x[i]) / d[i]
		}
		if hit > tiny && hit < limit {
			limit = hit
		}
	}
	return limit
}

// searchDirection sets d to the search direction at x, where the gradient
// is g. It stands in for the choice gen makes from the spec's bounds.
func searchDirection(dir *direction, x, g, d *vec, diffs *differences) {
	if boxed {
		boundDirection(dir, x, g, d, diffs)
		return
	}
	freeDirection(dir, x, g, d, diffs)
}

// freeDirection is the direction's own.
func freeDirection(dir *direction, x, g, d *vec, diffs *differences) {
	solveDirection(dir, g, d, diffs)
}

// boundDirection is the two-metric projection direction of Bertsekas
// (1982). The ε-active set A holds the variables within εᵢ of a bound that
// the gradient pushes against,
//
//	A = {i : xᵢ ≤ lowerᵢ + εᵢ and gᵢ > 0, or xᵢ ≥ upperᵢ − εᵢ and gᵢ < 0},
//	εᵢ = min(activeMargin·max(1, |xᵢ|), ‖x − P(x − g)‖∞),
//
// so that it shrinks to the exactly active set as x converges. The
// direction's own rule (a quasi-Newton matrix, or the identity for
// steepest descent) acts on the gradient with its active components
// zeroed, and only the free components of the result are kept; the
// active ones take the steepest-descent step −gᵢ towards their bound.
// With a positive definite matrix the free part is then a descent
// direction, since gᵀd over the free variables is −g_Fᵀ·H_FF·g_F, and
// moving along the projection arc cannot raise the first-order change
// above it for small steps (Bertsekas 1982, §2). Finally a
// component at a bound that points out of the box is zeroed, so that d is
// the arc's initial tangent and ∇fᵀd its initial slope. With the identity
// matrix this is the projected gradient method of Bertsekas (1976).
//
// References:
//   - D. P. Bertsekas, Projected Newton methods for optimization problems
//     with simple constraints, SIAM J. Control Optim. 20(2):221–246, 1982.
//   - D. P. Bertsekas, On the Goldstein–Levitin–Polyak gradient projection
//     method, IEEE Trans. Automatic Control 21(2):174–184, 1976.
func boundDirection(dir *direction, x, g, d *vec, diffs *differences) {
	b := &diffs.bounds
	var reach elem // ‖x − P(x − g)‖∞
	for i := range x {
		reach = larger(reach, abs(x[i]-clampBetween(x[i]-g[i], b.lower[i], b.upper[i])))
	}
	var free vec
	var active [dim]bool
	for i := range x {
		margin := activeMargin * larger(1, abs(x[i]))
		if reach < margin {
			margin = reach // Bertsekas 1982: ε = min(ε̄, ‖x − P(x − ∇f(x))‖)
		}
		active[i] = pushedAgainst(x[i], g[i], b.lower[i]+margin, b.upper[i]-margin)
		if !active[i] {
			free[i] = g[i]
		}
	}
	solveDirection(dir, &free, d, diffs)
	for i := range x {
		if active[i] {
			d[i] = -g[i]
		}
		if pushedAgainst(x[i], -d[i], b.lower[i], b.upper[i]) { // d would leave the box
			d[i] = 0
		}
	}
}

// curvaturePair prepares the step s and gradient change y for the
// direction's update at the new x. It stands in for the choice gen makes
// from the spec's bounds.
func curvaturePair(s, y, x *vec, b *box) {
	if boxed {
		freePair(s, y, x, b)
		return
	}
	fullPair(s, y, x, b)
}

// fullPair: without bounds the pair is used as it is.
func fullPair(s, y, x *vec, b *box) {}

// freePair zeroes yᵢ for each variable the step left on a bound it sat on
// (sᵢ = 0, xᵢ at the bound), so that the quasi-Newton update learns the
// curvature of the free variables only, the reduced Hessian that
// boundDirection uses, instead of a secant equation polluted by the
// gradient's change along variables that cannot move (the reduced update
// of projected BFGS, Kelley 1999, §5.5.3, from memory).
//
// References:
//   - C. T. Kelley, Iterative Methods for Optimization, SIAM, 1999,
//     §5.5.3.
func freePair(s, y, x *vec, b *box) {
	for i := range s {
		if s[i] == 0 && (x[i] <= b.lower[i] || x[i] >= b.upper[i]) {
			y[i] = 0
		}
	}
}

// stationarity is the stop test's measure at x (see gradientMeasure). It
// stands in for the choice gen makes from the spec's bounds.
func stationarity(g, e, x *vec, fx elem, b *box) (measure, floor elem) {
	if boxed {
		return projectedMeasure(g, e, x, fx, b)
	}
	return unboundedMeasure(g, e, x, fx, b)
}

// unboundedMeasure measures the gradient itself.
func unboundedMeasure(g, e, x *vec, fx elem, b *box) (measure, floor elem) {
	return gradientMeasure(g, e, x, fx)
}

// projectedMeasure measures the projected gradient, the first-order test
// of a box (Bertsekas 1982, §1: x is stationary when every gᵢ is zero, or
// points out of the box at a bound xᵢ sits on). A component at a bound
// that its gradient pushes against counts as zero, unless its error bound
// eᵢ exceeds |gᵢ|: the true gᵢ might then point inwards by up to
// eᵢ − |gᵢ|, which is what is counted.
func projectedMeasure(g, e, x *vec, fx elem, b *box) (measure, floor elem) {
	pg, pe := *g, *e
	for i := range pg {
		if pushedAgainst(x[i], g[i], b.lower[i], b.upper[i]) {
			pg[i], pe[i] = 0, larger(0, e[i]-abs(g[i]))
		}
	}
	return gradientMeasure(&pg, &pe, x, fx)
}

// arcDecrease is the Armijo condition along the projection arc,
//
//	f(x(t)) ≤ f(x) + c1·∇f(x)ᵀ(x(t) − x),  x(t) = P(x + t·d),
//
// of Bertsekas (1976), with c1 = stepDecrease; a trial whose
// first-order change is not negative (the arc bent too far) fails. It
// stands in for armijoDecrease when the spec has bounds.
func arcDecrease(fx, ft, t, slope elem, x, xt, g *vec) bool {
	var change elem
	for i := range x {
		change += g[i] * (xt[i] - x[i])
	}
	return change < 0 && ft <= fx+stepDecrease*change // Bertsekas 1976: sufficient decrease along the arc
}

// coordinateRange is the interval the objective may be evaluated in along
// coordinate i, for probes of differences. It stands in for the choice gen
// makes from the spec's bounds.
func coordinateRange(i int, diffs *differences) (lower, upper elem) {
	if boxed {
		return boxRange(i, diffs)
	}
	return wholeLine(i, diffs)
}

// wholeLine: without bounds any probe is allowed.
func wholeLine(i int, diffs *differences) (lower, upper elem) {
	return elem(math.Inf(-1)), elem(math.Inf(1))
}

// boxRange is [lowerᵢ, upperᵢ].
func boxRange(i int, diffs *differences) (lower, upper elem) {
	return diffs.bounds.lower[i], diffs.bounds.upper[i]
}

// oneSide returns a signed interval for probes that reach reach·h from xi
// on one side within [lower, upper]: +h when there is room above, else −h
// when there is room below, else the larger room divided by reach, signed,
// or 0 when xi cannot move at all (equal bounds).
func oneSide(xi, h, reach, lower, upper elem) elem {
	above, below := upper-xi, xi-lower
	switch {
	case above >= reach*h:
		return h
	case below >= reach*h:
		return -h
	case above >= below:
		return above / reach
	}
	return -below / reach
}

// pushedAgainst reports whether xᵢ sits on (or within) lower or upper and
// the gradient component gᵢ pushes it against that bound, so that a
// descent step −gᵢ would leave the box there. NaN never pushes.
func pushedAgainst(xi, gi, lower, upper elem) bool {
	return (xi <= lower && gi > 0) || (xi >= upper && gi < 0)
}

// pinned reports whether equal bounds fix coordinate i. It stands in for
// the choice gen makes from the spec's bounds.
func pinned(i int, b *box) bool {
	if boxed {
		return equalBounds(i, b)
	}
	return neverPinned(i, b)
}

// neverPinned: without bounds nothing is fixed.
func neverPinned(i int, b *box) bool { return false }

// equalBounds is lowerᵢ = upperᵢ.
func equalBounds(i int, b *box) bool { return b.lower[i] == b.upper[i] }
