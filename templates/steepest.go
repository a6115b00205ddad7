package templates

// steepestDirection is steepest descent, d = −∇f(x): the direction of
// fastest first-order decrease. It needs no memory and converges linearly,
// slowly on ill-conditioned problems (Nocedal & Wright 2006, §3.3).
type steepestDirection struct{}

func (s *steepestDirection) reset() {}

func (s *steepestDirection) compute(g, d *vec) {
	negate(d, g)
}

func (s *steepestDirection) update(step, change *vec) {}

// stalled: steepest keeps nothing in reserve for a stall.
func (s *steepestDirection) stalled() bool { return false }

// firstTrial is the scaled trial (scaledTrial), grown at most by
// 2^(stepTrials/2) over the previous step t. Steepest descent is the one
// direction paired with backtracking that scales its first trial, and
// backtracking can only shrink: after a step that nearly solved the
// problem the slope collapses, the ratio can exceed the range its trials
// halve through, and the search would end with no acceptable step. The
// cap keeps at least half the trials below the previous step (a safeguard
// of our own; cg, whose ratios can legitimately be that large on badly
// scaled problems, always pairs with a Wolfe search, which expands and
// zooms instead).
func (s *steepestDirection) firstTrial(t, slope, now elem) elem {
	next := scaledTrial(t, slope, now)
	if reach := elem(float64(t) * trialGrowth); next > reach { // in float64: in float32 a cap past 2^127 is +Inf, which caps nothing, as before
		return reach
	}
	return next
}

// trialGrowth is 2^(stepTrials/2), the most steepestDirection.firstTrial
// grows a step by: a constant, so that no iteration pays for math.Ldexp
// (6 % of a steepest solve's instructions on Rosenbrock 2-D).
const trialGrowth float64 = 1 << (stepTrials / 2)
