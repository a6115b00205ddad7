package templates

// bfgsDirection is the BFGS quasi-Newton direction d = −H∇f(x), where H
// approximates the inverse Hessian in a fixed dim×dim array and is updated
// after each step s with gradient change y by
//
//	H₊ = (I − ρ s yᵀ) H (I − ρ y sᵀ) + ρ s sᵀ,  ρ = 1/(yᵀs)
//
// (Nocedal & Wright 2006, eq. 6.17). Before the first update H is the
// scaled identity (yᵀs / yᵀy)·I (eq. 6.20). A pair whose curvature yᵀs is
// not safely positive is skipped, which keeps H positive definite (§6.1).
//
// References:
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, chapter 6.
//   - J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained
//     Optimization and Nonlinear Equations, Prentice-Hall, 1983.
type bfgsDirection struct {
	h      [dim]vec // inverse-Hessian approximation, symmetric
	scaled bool     // whether h has been scaled by eq. 6.20 since reset
}

func (s *bfgsDirection) reset() {
	for i := range s.h {
		for j := range s.h[i] {
			s.h[i][j] = 0
		}
		s.h[i][i] = 1
	}
	s.scaled = false
}

func (s *bfgsDirection) compute(g, d *vec) {
	for i := range s.h {
		d[i] = -dot(&s.h[i], g)
	}
}

func (s *bfgsDirection) update(step, change *vec) {
	sy, ss, yy := pairProducts(step, change)
	if !curvatureSafeFrom(sy, ss, yy) {
		return
	}
	if !s.scaled {
		gamma := sy / yy // N&W eq. 6.20
		for i := range s.h {
			s.h[i][i] = gamma
		}
		s.scaled = true
	}
	rho := 1 / sy
	// With hy = H·y, eq. 6.17 expands to
	// H₊ = H − ρ(hy sᵀ + s hyᵀ) + (ρ² yᵀhy + ρ) s sᵀ.
	var hy vec
	for i := range s.h {
		hy[i] = dot(&s.h[i], change)
	}
	outer := (rho*rho*dot(change, &hy) + rho)
	for i := range s.h {
		// row i of the update is a·sᵀ − b·hyᵀ, its coefficients hoisted:
		// two multiply-adds per element instead of six multiplies and
		// three adds
		a, b := outer*step[i]-rho*hy[i], rho*step[i]
		for j := range s.h[i] {
			s.h[i][j] += a*step[j] - b*hy[j] // N&W eq. 6.17
		}
	}
}

// stalled: bfgs keeps nothing in reserve for a stall.
func (s *bfgsDirection) stalled() bool { return false }

// firstTrial is 1, the quasi-Newton step, which the line search should try
// first (Nocedal & Wright 2006, §3.5).
func (s *bfgsDirection) firstTrial(t, slope, now elem) elem {
	return 1
}
