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
// A stall (no step above the step limit decreases f, even after the
// kernel's retry) switches on a diagonal preconditioner P = diag(1/b):
// z = Pg replaces g above, β = max(zᵀ(g − g₋₁)/z₋₁ᵀg₋₁, 0) and Powell's
// test reads |zᵀg₋₁| ≥ ν zᵀg (preconditioned nonlinear CG, §5.2). b is
// learnt from every pair by the diagonal of the BFGS update (see update),
// so it holds the scale of each coordinate when the stall comes. Powell
// badly scaled (MGH 3), where ∇²f spans 2.4e-8 to 1.7e10, stalled in its
// curved valley without it on every platform; with it, it converges there
// on some and not on others, as the last bits of b fall (checks/emulated).
// It stays off until then: on the rest of the MGH set
// preconditioning from the start cost up to 50 times the iterations
// (variably dimensioned, whose Hessian I + rank one suits plain CG) and
// stalled on Watson 6.
//
// References:
//   - E. Polak and G. Ribière, Note sur la convergence de méthodes de
//     directions conjuguées, Rev. Française Informat. Recherche
//     Opérationnelle 3(16):35–43, 1969.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §5.2.
//   - J. C. Gilbert and C. Lemaréchal, Some numerical experiments with
//     variable-storage quasi-Newton algorithms, Math. Programming
//     45:407–435, 1989 (the diagonal update).
type cgDirection struct {
	previous  vec  // d₋₁
	change    vec  // y = g − g₋₁, set by update
	curvature vec  // b, the diagonal Hessian estimate whose inverse preconditions g
	squared   elem // g₋₁ᵀz₋₁, z₋₁ = g₋₁/b
	fresh     bool // no previous direction to build on: the next compute restarts
	scaled    bool // whether b has been learnt since reset; before, b = 1
	rescaled  bool // whether a stall switched the preconditioner on
}

func (s *cgDirection) reset() {
	s.fresh = true
	s.scaled, s.rescaled = false, false
	for i := range s.curvature {
		s.curvature[i] = 1
	}
}

func (s *cgDirection) compute(g, d *vec) {
	var beta elem
	z := *g
	if s.rescaled {
		for i := range z {
			z[i] /= s.curvature[i] // z = P g, P = diag(1/b)
		}
	}
	gz, zy := dot(g, &z), dot(&z, &s.change)
	if !s.fresh && s.squared > 0 && abs(gz-zy) < 0.1*gz { // N&W eq. 5.52 in P's metric: |zᵀg₋₁| < ν zᵀg, zᵀg₋₁ = zᵀg − zᵀy
		beta = larger(zy/s.squared, 0) // N&W eq. 5.45 (PR+), preconditioned (§5.2)
	}
	for i := range d {
		d[i] = -z[i] + beta*s.previous[i] // N&W eq. 5.44, preconditioned
	}
	s.fresh = false
	s.previous = *d
	s.squared = gz
}

// update keeps y for β and learns b from the pair (s, y) by the diagonal
// of the BFGS update of diag(b) (Gilbert & Lemaréchal 1989):
//
//	bᵢ₊ = bᵢ − (bᵢsᵢ)²/sᵀBs + yᵢ²/yᵀs,
//
// which stays positive whenever yᵀs is, after scaling b to yᵀy/yᵀs on the
// first safe pair (the inverse of N&W eq. 6.20). A pair whose curvature is
// not safely positive, or an entry that would not stay a positive finite
// number, leaves b as it was.
func (s *cgDirection) update(step, change *vec) {
	s.change = *change
	var sy, ss, yy, sbs elem // one pass over the pair for all four products
	for i := range step {
		sy += step[i] * change[i]
		ss += step[i] * step[i]
		yy += change[i] * change[i]
		sbs += s.curvature[i] * step[i] * step[i]
	}
	if !curvatureSafeFrom(sy, ss, yy) {
		return
	}
	if !s.scaled {
		gamma := yy / sy // inverse of N&W eq. 6.20
		for i := range s.curvature {
			s.curvature[i] = gamma
		}
		sbs = gamma * ss
		s.scaled = true
	}
	overSBS, overSY := 1/sbs, 1/sy // two divisions, not two per unknown
	for i := range s.curvature {
		bs := s.curvature[i] * step[i]
		next := s.curvature[i] - bs*bs*overSBS + change[i]*change[i]*overSY // Gilbert & Lemaréchal 1989, diagonal of N&W eq. 6.19
		if next > 0 && finite(next) {
			s.curvature[i] = next
		}
	}
}

// stalled is asked when the line search can make no progress along d
// even after a retry: once a curvature pair has taught b, it switches the
// preconditioner on and restarts, and reports true, so the run searches
// again from x; otherwise, or the second time, it reports false and the
// run ends stalled.
func (s *cgDirection) stalled() bool {
	if s.rescaled || !s.scaled {
		return false
	}
	s.rescaled, s.fresh = true, true
	return true
}

func (s *cgDirection) firstTrial(t, slope, now elem) elem {
	return scaledTrial(t, slope, now)
}
