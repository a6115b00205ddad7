package templates

// cgDirection is nonlinear conjugate gradients with the Polak–Ribière
// choice, clipped at zero (PR+):
//
//	d = −g + β d₋₁,  β = max(gᵀ(g − g₋₁) / ‖g₋₁‖², 0)
//
// (Nocedal & Wright 2006, eqs. 5.44 and 5.45). It restarts with steepest
// descent every dim iterations (§5.2) and whenever the kernel finds d is
// not a descent direction. It needs a line search that keeps curvature in
// check: the strong Wolfe rule with c2 = 0.1 (§5.2).
//
// References:
//   - E. Polak and G. Ribière, Note sur la convergence de méthodes de
//     directions conjuguées, Rev. Française Informat. Recherche
//     Opérationnelle 3(16):35–43, 1969.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §5.2.
type cgDirection struct {
	previous vec  // d₋₁
	change   vec  // y = g − g₋₁, set by update
	squared  elem // ‖g₋₁‖²
	steps    int  // iterations since the last restart; 0 means restart
}

func (s *cgDirection) reset() {
	s.steps = 0
}

func (s *cgDirection) compute(g, d *vec) {
	var beta elem
	if s.steps > 0 && s.steps < dim && s.squared > 0 {
		beta = larger(dot(g, &s.change)/s.squared, 0) // N&W eq. 5.45 (PR+)
	}
	for i := range d {
		d[i] = -g[i] + beta*s.previous[i] // N&W eq. 5.44
	}
	if beta == 0 {
		s.steps = 0
	}
	s.steps++
	s.previous = *d
	s.squared = dot(g, g)
}

func (s *cgDirection) update(step, change *vec) {
	s.change = *change
}

func (s *cgDirection) firstTrial(t, slope, now elem) elem {
	return scaledTrial(t, slope, now)
}
