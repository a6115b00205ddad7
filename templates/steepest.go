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

func (s *steepestDirection) firstTrial(t, slope, now elem) elem {
	return scaledTrial(t, slope, now)
}
