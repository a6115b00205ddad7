package templates

// direction stands in for the search direction the spec chose; gen keeps
// only that one under this name. Every direction has the same methods:
//
//	reset()                         forget all history (start, and whenever a direction fails to descend)
//	compute(g, d *vec)              set d to the search direction for gradient g
//	update(s, y *vec)               learn from the step s = x₊ − x and gradient change y = g₊ − g
//	firstTrial(t, slope, now elem)  the first trial step of a line search, given the previous
//	                                accepted step t, the previous slope gᵀd and the current one
//	stalled() bool                  at a stall: switch to a reserve and report true (cg's
//	                                preconditioner, once), or report false and let the run end
type direction struct {
	steepest steepestDirection
	bfgs     bfgsDirection
	lbfgs    lbfgsDirection
	cg       cgDirection
	// gaussNewton serves both least-squares directions, whose step
	// comes from the residual model (see solveDirection).
	gaussNewton gaussNewtonDirection
}

func (s *direction) reset() {
	switch directionKind {
	case kindSteepest:
		s.steepest.reset()
	case kindLBFGS:
		s.lbfgs.reset()
	case kindCG:
		s.cg.reset()
	case kindGaussNewton, kindLevenbergMarquardt:
		s.gaussNewton.reset()
	default:
		s.bfgs.reset()
	}
}

func (s *direction) compute(g, d *vec) {
	switch directionKind {
	case kindSteepest:
		s.steepest.compute(g, d)
	case kindLBFGS:
		s.lbfgs.compute(g, d)
	case kindCG:
		s.cg.compute(g, d)
	default:
		s.bfgs.compute(g, d)
	}
}

func (s *direction) update(step, change *vec) {
	switch directionKind {
	case kindSteepest:
		s.steepest.update(step, change)
	case kindLBFGS:
		s.lbfgs.update(step, change)
	case kindCG:
		s.cg.update(step, change)
	case kindGaussNewton, kindLevenbergMarquardt:
		s.gaussNewton.update(step, change)
	default:
		s.bfgs.update(step, change)
	}
}

func (s *direction) stalled() bool {
	switch directionKind {
	case kindSteepest:
		return s.steepest.stalled()
	case kindLBFGS:
		return s.lbfgs.stalled()
	case kindCG:
		return s.cg.stalled()
	case kindGaussNewton, kindLevenbergMarquardt:
		return s.gaussNewton.stalled()
	default:
		return s.bfgs.stalled()
	}
}

func (s *direction) firstTrial(t, slope, now elem) elem {
	switch directionKind {
	case kindSteepest:
		return s.steepest.firstTrial(t, slope, now)
	case kindLBFGS:
		return s.lbfgs.firstTrial(t, slope, now)
	case kindCG:
		return s.cg.firstTrial(t, slope, now)
	case kindGaussNewton, kindLevenbergMarquardt:
		return s.gaussNewton.firstTrial(t, slope, now)
	default:
		return s.bfgs.firstTrial(t, slope, now)
	}
}

// pairProducts returns sᵀy, sᵀs and yᵀy in one pass over the pair, each
// sum in the order dot takes, so the products are dot's bit for bit: one
// pass instead of three saved 3.3 % of a Rosenbrock 2-D bfgs solve's
// instructions (callgrind).
func pairProducts(s, y *vec) (sy, ss, yy elem) {
	for i := range s {
		sy += s[i] * y[i]
		ss += s[i] * s[i]
		yy += y[i] * y[i]
	}
	return sy, ss, yy
}

// curvatureSafeFrom reports, from the products sᵀy, sᵀs and yᵀy (see
// pairProducts; cg sums a fourth in the same pass), whether the pair
// (s, y) may enter a quasi-Newton update: sᵀy must be positive and not
// negligible against ‖s‖‖y‖, tested as (sᵀy/sᵀs)·(sᵀy/yᵀy) > u, that is
// (sᵀy)² > u·(sᵀs)(yᵀy) written so that float32 does not overflow, with
// u the unit roundoff, so that the updated matrix stays positive definite
// and well conditioned (Nocedal & Wright 2006, §6.1, condition 6.7). The
// relative threshold √u·‖s‖‖y‖ is common practice: below it, sᵀy is
// within rounding of zero.
func curvatureSafeFrom(sy, ss, yy elem) bool {
	return sy > 0 && (sy/ss)*(sy/yy) > unitRoundoff
}

// scaledTrial is the first trial of steepest descent and conjugate
// gradients: it assumes the first-order change will match the previous
// iteration's, α₀ = α₋₁·(g₋₁ᵀd₋₁)/(gᵀd) (Nocedal & Wright 2006, eq. 3.60).
// A ratio that is not a positive finite number falls back to stepInitial.
func scaledTrial(t, slope, now elem) elem {
	next := t * (slope / now) // N&W eq. 3.60
	if !(next > 0) || !finite(next) {
		return stepInitial
	}
	return next
}

// gradientChange sets y = g₊ − g, the gradient change of the step just
// taken, for the directions that learn from it (bfgs, lbfgs, cg); the
// others never read y and skip the N subtractions. It stands in for the
// direction the spec chose; gen keeps only that one under this name.
func gradientChange(y, next, now *vec) {
	switch directionKind {
	case kindSteepest, kindGaussNewton, kindLevenbergMarquardt:
		noChange(y, next, now)
	default:
		difference(y, next, now)
	}
}

// noChange: a direction without memory never reads y.
func noChange(y, next, now *vec) {}

// learnCurvature lets a model kept beside the direction learn from the
// step s and gradient change y (after curvaturePair): levenberg-marquardt's
// secant estimate of the residuals' curvature (secantUpdate); no other
// direction keeps one. It stands in for the direction the spec chose;
// gen keeps only that one under this name.
func learnCurvature(s, y *vec, diffs *differences) {
	if directionKind == kindLevenbergMarquardt {
		secantUpdate(s, y, diffs)
		return
	}
	learnNothing(s, y, diffs)
}

// learnNothing: the direction keeps no model beside its memory.
func learnNothing(s, y *vec, diffs *differences) {}
