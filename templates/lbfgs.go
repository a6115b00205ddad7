package templates

// lbfgsDirection is limited-memory BFGS: d = −H∇f(x) where H is the BFGS
// inverse Hessian built from only the last lbfgsMemory pairs (s, y), kept
// in fixed-size ring buffers, and applied by the two-loop recursion
// (Nocedal & Wright 2006, Algorithm 7.4) starting from H₀ = γI with
// γ = sᵀy / yᵀy of the newest pair (eq. 7.20). Pairs whose curvature is not
// safely positive are skipped.
//
// Memory (the spec's memory key, lbfgsMemory here): a few pairs suffice;
// Nocedal & Wright report that values between 3 and 20 usually work
// (§7.2). thalweg's default is 5, to keep the stack small on devices.
//
// References:
//   - D. C. Liu and J. Nocedal, On the limited memory BFGS method for large
//     scale optimization, Math. Programming 45:503–528, 1989.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §7.2.
type lbfgsDirection struct {
	s, y   [lbfgsMemory]vec
	rho    [lbfgsMemory]elem
	gamma  elem // sᵀy/yᵀy of the newest pair, H₀'s scale (N&W eq. 7.20)
	newest int  // index of the newest pair
	count  int  // pairs held, at most lbfgsMemory
}

func (s *lbfgsDirection) reset() {
	s.count = 0
	s.newest = 0
}

func (s *lbfgsDirection) compute(g, d *vec) {
	var alpha [lbfgsMemory]elem
	q := *g
	// First loop, newest pair to oldest (Algorithm 7.4).
	k := s.newest
	for n := 0; n < s.count; n++ {
		a, y := s.rho[k]*dot(&s.s[k], &q), &s.y[k]
		alpha[k] = a
		for i := range q {
			q[i] -= a * y[i]
		}
		k--
		if k < 0 {
			k = lbfgsMemory - 1
		}
	}
	if s.count > 0 {
		for i := range q {
			q[i] *= s.gamma // H₀ = γI, N&W eq. 7.20
		}
	}
	// Second loop, oldest pair to newest; k is now the slot before the oldest.
	for n := 0; n < s.count; n++ {
		k++
		if k == lbfgsMemory {
			k = 0
		}
		beta := s.rho[k] * dot(&s.y[k], &q)
		c, step := alpha[k]-beta, &s.s[k]
		for i := range q {
			q[i] += step[i] * c
		}
	}
	negate(d, &q)
}

func (s *lbfgsDirection) update(step, change *vec) {
	sy, ss, yy := pairProducts(step, change)
	if !curvatureSafeFrom(sy, ss, yy) {
		return
	}
	if s.count > 0 {
		s.newest++
		if s.newest == lbfgsMemory {
			s.newest = 0
		}
	}
	if s.count < lbfgsMemory {
		s.count++
	}
	s.s[s.newest] = *step
	s.y[s.newest] = *change
	s.rho[s.newest] = 1 / sy
	s.gamma = sy / yy // N&W eq. 7.20
}

// stalled: lbfgs keeps nothing in reserve for a stall.
func (s *lbfgsDirection) stalled() bool { return false }

// firstTrial is 1, the quasi-Newton step (Nocedal & Wright 2006, §3.5).
func (s *lbfgsDirection) firstTrial(t, slope, now elem) elem {
	return 1
}
