package templates

// cgDirection is nonlinear conjugate gradients with the Polak–Ribière
// choice, clipped at zero (PR+):
//
//	d = −g + β d₋₁,  β = max(gᵀ(g − g₋₁) / ‖g₋₁‖², 0)
//
// (Nocedal & Wright 2006, eqs. 5.44 and 5.45). It restarts with steepest
// descent when successive gradients are far from orthogonal,
// |gᵀg₋₁| ≥ ν‖g‖² with ν = 0.1 (Powell's test, §5.2, eq. 5.52), and
// whenever the kernel finds d is not a descent direction. Under that test
// β_PR ≥ 0.9‖g‖²/‖g₋₁‖² > 0, so the clip at zero is only a guard. It
// needs a line search that keeps curvature in check: the strong Wolfe rule
// with c2 = 0.1 (§5.2).
//
// Powell's test replaced a restart every dim iterations: on the
// Moré–Garbow–Hillstrom set (checks/mgh) it converges on Brown badly
// scaled with central differences and on Watson 6, which the periodic
// restart left stalled, and cuts the calls on Gulf R&D, Biggs EXP6 and
// Penalty II by a factor of 2 to 3.
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
	fresh    bool // no previous direction to build on: the next compute restarts
}

func (s *cgDirection) reset() {
	s.fresh = true
}

func (s *cgDirection) compute(g, d *vec) {
	var beta elem
	gg, gy := dot(g, g), dot(g, &s.change)
	if !s.fresh && s.squared > 0 && abs(gg-gy) < 0.1*gg { // N&W eq. 5.52: |gᵀg₋₁| < ν‖g‖², gᵀg₋₁ = gᵀg − gᵀy
		beta = larger(gy/s.squared, 0) // N&W eq. 5.45 (PR+)
	}
	for i := range d {
		d[i] = -g[i] + beta*s.previous[i] // N&W eq. 5.44
	}
	s.fresh = false
	s.previous = *d
	s.squared = gg
}

func (s *cgDirection) update(step, change *vec) {
	s.change = *change
}

func (s *cgDirection) firstTrial(t, slope, now elem) elem {
	return scaledTrial(t, slope, now)
}
