package templates

import "math"

// steepestDirection is steepest descent, d = −∇f(x): the direction of
// fastest first-order decrease. It needs no memory and converges linearly,
// slowly on ill-conditioned problems (Nocedal & Wright 2006, §3.3).
type steepestDirection struct{}

func (s *steepestDirection) reset() {}

func (s *steepestDirection) compute(g, d *vec) {
	negate(d, g)
}

func (s *steepestDirection) update(step, change *vec) {}

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
	if reach := t * elem(math.Ldexp(1, stepTrials/2)); next > reach {
		return reach
	}
	return next
}
