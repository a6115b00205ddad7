package templates

// This file holds what a residual objective adds to the kernels: the
// objective r(x) ∈ ℝᴹ with f(x) = ½‖r(x)‖², its gradient Jᵀr, the
// Gauss–Newton model JᵀJ of the Hessian, the gauss-newton and
// levenberg-marquardt steps that solve with it, and the parameter
// covariance at a solution.

// residualModel is what the kernels keep of a residual objective: the
// residuals of the latest value call with the point they were taken at,
// so that the gradient Jᵀr at an accepted trial costs no second residual
// call; and, from the gradient at the current point x, the Gauss–Newton
// matrix JᵀJ and the error bound of Jᵀr when J comes from differences.
// The Levenberg–Marquardt damping λ, its growth factor ν and the scaling
// D live here too, since its search changes them between calls.
type residualModel struct {
	r       rvec     // residuals at at
	at      vec      // where r was taken
	known   bool     // whether r and at are set
	normal  [dim]vec // JᵀJ at the current point
	err     vec      // error bound of each component of Jᵀr there
	scale   vec      // D: each (JᵀJ)ᵢᵢ's largest value this run (Moré 1978, §6)
	damping elem     // λ; 0 until the first damped solve
	growth  elem     // ν, the factor of λ's next rise
	wide    bool     // whether difference Jacobians take twice their intervals (settleResiduals)
	noise   elem     // the rounding noise of f at the current point (residualGradient)
	typical vec      // each unknown's typical size: |x₀ᵢ|, or 1 where x₀ᵢ = 0 (calibrateResiduals)
	// levenberg-marquardt's structured model: the secant estimate S of
	// Σrᵢ∇²rᵢ, the part of the Hessian JᵀJ leaves out (secantUpdate), and
	// whether the step solves with JᵀJ + S or JᵀJ (chooseModel).
	second    [dim]vec
	augmented bool
}

// noStructure is residualModel for any other objective: nothing.
type noStructure struct{}

// value is f at x, where the kernel may want the gradient with it (the
// start and every line-search trial). It stands in for the objective's
// kind; gen keeps only that one under this name.
func value(recv *receiver, x, g *vec, diffs *differences) elem {
	if residualObjective {
		return squaresValue(recv, x, g, diffs)
	}
	return plainValue(recv, x, g, diffs)
}

// plainValue calls the objective; a combined one also writes ∇f(x) into g.
func plainValue(recv *receiver, x, g *vec, diffs *differences) elem {
	return recv.evaluate(x, g)
}

// squaresValue is f(x) = ½‖r(x)‖², one residual call; it keeps r(x) for
// the gradient at x (residualGradient). A residual that overflows makes f
// +Inf, which every search rejects.
func squaresValue(recv *receiver, x, g *vec, diffs *differences) elem {
	m := &diffs.model
	recv.residual(x, &m.r)
	m.at, m.known = *x, true
	var sum elem
	for _, ri := range m.r {
		sum += ri * ri
	}
	return sum / 2
}

// residualGradient is the gradient of f = ½‖r‖², g = Jᵀr (Nocedal &
// Wright 2006, eq. 10.3), with the Jacobian J from the source the spec
// chose (jacobian); it also sets the Gauss–Newton matrix JᵀJ (eq. 10.4
// without the second-order term), the scaling D and the error bound of g.
// The residuals are those the value call at x kept; should x not be
// where they were taken, they are taken again, one more call, counted.
// It returns the residual calls made.
func residualGradient(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	m := &diffs.model
	calls := m.residualsAt(recv, x)
	var jac [residuals]vec
	calls += jacobian(recv, x, &m.r, &jac, diffs)
	transposeTimes(&jac, &m.r, g) // N&W eq. 10.3: ∇f = Jᵀr
	m.normal = [dim]vec{}
	for k := range jac {
		row := &jac[k]
		for i := range row {
			for j := 0; j <= i; j++ {
				m.normal[i][j] += row[i] * row[j] // N&W eq. 10.4: JᵀJ
			}
		}
	}
	for i := range m.normal {
		for j := 0; j < i; j++ {
			m.normal[j][i] = m.normal[i][j]
		}
		m.scale[i] = larger(m.scale[i], m.normal[i][i])
	}
	// f's rounding noise: each rᵢ = model − yᵢ carries rounding of the
	// model's size, |rᵢ| + Σⱼ|Jᵢⱼxⱼ| (the sum is the model itself for
	// models linear or homogeneous in x, Euler's theorem), which ½Σrᵢ²
	// feels as |rᵢ| times that: 4u·Σᵢ|rᵢ|(|rᵢ| + Σⱼ|Jᵢⱼxⱼ|), added to
	// ε_A of f (noiseLevel). A fit with small residuals to large data
	// has far more noise than u·|f| (common practice for the model; the
	// idea of ε_A is Gill, Murray, Saunders & Wright 1983).
	m.noise = 0
	for k := range jac {
		size := abs(m.r[k])
		for j := range x {
			size += abs(jac[k][j] * x[j])
		}
		m.noise += abs(m.r[k]) * size
	}
	m.noise = 4*unitRoundoff*m.noise + noiseLevel(x, fx, g)
	jacobianError(x, &jac, &m.r, &m.err, diffs)
	return calls
}

// secantUpdate lets levenberg-marquardt's model learn from the step s and
// the gradient change y, after the gradient and JᵀJ at the new point. The
// Hessian of f = ½‖r‖² is JᵀJ + Σrᵢ∇²rᵢ; Gauss–Newton keeps JᵀJ only,
// which is poor where the residuals stay large (Brown–Dennis) and makes
// the damped step converge linearly there. A structured secant method
// keeps an estimate S of the second term instead, so that the augmented
// model JᵀJ + S satisfies the secant equation (JᵀJ + S₊)s = y:
//
//	y♯ = y − JᵀJ·s,  w = y♯ − S·s,
//	S₊ = S + (w yᵀ + y wᵀ)/(yᵀs) − (wᵀs)·y yᵀ/(yᵀs)²,
//
// the symmetric rank-two update of Dennis, Gay and Welsch, with S first
// scaled down by τ = min(1, |sᵀy♯|/|sᵀSs|) so that S shrinks with the
// residuals. (They take y♯ = (J − J₋₁)ᵀr, which needs the previous
// Jacobian kept; the two agree to first order.) A pair with yᵀs not safely
// positive leaves S as it was (curvatureSafeFrom). At the start S = 0; which
// model the next step solves with, chooseModel decides.
//
// References:
//   - J. E. Dennis, D. M. Gay and R. E. Welsch, An adaptive nonlinear
//     least-squares algorithm, ACM TOMS 7(3):348–368, 1981 (the update,
//     the sizing and the choice of model; from memory).
//   - J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained
//     Optimization and Nonlinear Equations, Prentice-Hall, 1983, §10.3.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §10.3 (methods for large-residual problems).
func secantUpdate(s, y *vec, diffs *differences) {
	m := &diffs.model
	var ss, sharp vec
	for i := range m.second {
		ss[i] = dot(&m.second[i], s)
		sharp[i] = y[i] - dot(&m.normal[i], s) // y♯ = y − JᵀJ·s
	}
	if sss := dot(s, &ss); sss != 0 {
		if tau := abs(dot(s, &sharp) / sss); tau < 1 { // DGW's sizing
			for i := range m.second {
				for j := range m.second[i] {
					m.second[i][j] *= tau
				}
				ss[i] *= tau
			}
		}
	}
	sy, sDotS, yDotY := pairProducts(s, y)
	if !curvatureSafeFrom(sy, sDotS, yDotY) {
		return
	}
	var w vec
	difference(&w, &sharp, &ss)
	ws := dot(&w, s) / sy / sy // not (sy·sy): its square may overflow or underflow in float32
	for i := range m.second {
		a, b := w[i]/sy, y[i]/sy
		for j := 0; j <= i; j++ {
			m.second[i][j] += a*y[j] + b*w[j] - ws*y[i]*y[j] // DGW's update
			m.second[j][i] = m.second[i][j]                  // symmetric by construction, whatever the compiler fuses
		}
	}
}

// chooseModel decides, when a step is accepted, which model the next step
// solves with: JᵀJ + S when it predicted the decrease f just made (fall)
// better than JᵀJ did, as NL2SOL switches between its two models (Dennis,
// Gay & Welsch 1981), so that zero-residual fits keep Gauss–Newton's fast
// convergence and large-residual ones gain a secant method's. linear is
// −gᵀs and normalTerm, secondTerm are sᵀJᵀJs and sᵀSs. Where f's change
// and the prediction are within f's rounding noise, they tell the models
// apart no more, and the step is Gauss–Newton's.
func chooseModel(m *residualModel, fall, linear, normalTerm, secondTerm, noise elem) {
	normalModel := linear - normalTerm/2
	m.augmented = abs(normalModel-secondTerm/2-fall) < abs(normalModel-fall) &&
		!(abs(fall) <= noise && abs(normalModel) <= noise)
}

// residualsAt makes the kept residuals those at x, taking them again
// only when the last value call was elsewhere; it returns the calls made.
func (m *residualModel) residualsAt(recv *receiver, x *vec) int {
	if m.known && m.at == *x {
		return 0
	}
	recv.residual(x, &m.r)
	m.at, m.known = *x, true
	return 1
}

// transposeTimes sets g = Jᵀr.
func transposeTimes(jac *[residuals]vec, r *rvec, g *vec) {
	*g = vec{}
	for k := range jac {
		for i := range g {
			g[i] += jac[k][i] * r[k]
		}
	}
}

// jacobian fills jac with J(x), J[i][j] = ∂rᵢ/∂xⱼ, where the residuals are
// r, and returns the residual calls made: at most derivativeCost. It
// stands in for the source the spec chose; gen keeps only that one under
// this name.
func jacobian(recv *receiver, x *vec, r *rvec, jac *[residuals]vec, diffs *differences) int {
	switch {
	case derivativeSource == sourceForward:
		return forwardJacobian(recv, x, r, jac, diffs)
	case derivativeSource == sourceCentral:
		return centralJacobian(recv, x, r, jac, diffs)
	case jacobianColumns:
		return columnsJacobian(recv, x, r, jac, diffs)
	default:
		return rowsJacobian(recv, x, r, jac, diffs)
	}
}

// rowsJacobian is the user's analytic Jacobian, written by rows.
func rowsJacobian(recv *receiver, x *vec, r *rvec, jac *[residuals]vec, diffs *differences) int {
	recv.jacobian(x, jac)
	return 0
}

// columnsJacobian is the user's analytic Jacobian written by columns,
// cols[j][i] = ∂rᵢ/∂xⱼ, transposed into rows.
func columnsJacobian(recv *receiver, x *vec, r *rvec, jac *[residuals]vec, diffs *differences) int {
	var cols [dim]rvec
	recv.jacobianColumns(x, &cols)
	for j := range cols {
		for i := range cols[j] {
			jac[i][j] = cols[j][i]
		}
	}
	return 0
}

// forwardJacobian approximates each column of J by forward differences of
// the residuals, (r(x + hⱼeⱼ) − r(x))/hⱼ with hⱼ = √u·max(|xⱼ|,
// typicalⱼ) (typicalScale)
// (Nocedal & Wright 2006, eq. 8.1 and §8.1; §10.3 for residuals): dim
// residual calls. At an upper bound the difference is taken backwards; a
// variable fixed by equal bounds gets a zero column.
func forwardJacobian(recv *receiver, x *vec, r *rvec, jac *[residuals]vec, diffs *differences) int {
	probe := *x
	var moved rvec
	calls := 0
	for j := range probe {
		xj := probe[j]
		lower, upper := coordinateRange(j, diffs)
		up, h := probeStep(xj, oneSide(xj, intervalScale(diffs)*squareRoot(unitRoundoff)*typicalScale(xj, j, diffs), 1, lower, upper), lower, upper)
		if h == 0 {
			for i := range jac {
				jac[i][j] = 0 // fixed by equal bounds
			}
			continue
		}
		probe[j] = up
		recv.residual(&probe, &moved)
		probe[j] = xj
		calls++
		for i := range jac {
			jac[i][j] = (moved[i] - r[i]) / h // N&W eq. 8.1, with the representable h
		}
	}
	return calls
}

// centralJacobian approximates each column of J by central differences of
// the residuals, (r(x + hⱼeⱼ) − r(x − hⱼeⱼ))/(2hⱼ) with hⱼ = ∛u·max(|xⱼ|,
// typicalⱼ) (typicalScale) (Nocedal & Wright 2006, eq. 8.7 and §8.1): 2·dim residual calls.
// Where a bound leaves no room on one side, the three-point endpoint
// formula on the other side takes its place at the same cost (parabola);
// a variable fixed by equal bounds gets a zero column.
func centralJacobian(recv *receiver, x *vec, r *rvec, jac *[residuals]vec, diffs *differences) int {
	probe := *x
	var near, far rvec
	calls := 0
	for j := range probe {
		xj := probe[j]
		lower, upper := coordinateRange(j, diffs)
		h := intervalScale(diffs) * centralScale * typicalScale(xj, j, diffs)
		if xj+h <= upper && xj-h >= lower {
			up, _ := probeStep(xj, h, lower, upper)
			down, _ := probeStep(xj, -h, lower, upper)
			probe[j] = up
			recv.residual(&probe, &near)
			probe[j] = down
			recv.residual(&probe, &far)
			probe[j] = xj
			calls += 2
			for i := range jac {
				jac[i][j] = (near[i] - far[i]) / (up - down) // N&W eq. 8.7, with the representable 2h
			}
			continue
		}
		h = oneSide(xj, h, 2, lower, upper)
		a, b := elem(0), elem(0)
		if h != 0 {
			var at elem
			at, a = probeStep(xj, h, lower, upper)
			probe[j] = at
			recv.residual(&probe, &near)
			at, b = probeStep(xj, 2*h, lower, upper)
			probe[j] = at
			recv.residual(&probe, &far)
			probe[j] = xj
			calls += 2
		}
		for i := range jac {
			jac[i][j] = 0 // fixed by equal bounds
			if a != 0 && b != a {
				jac[i][j], _ = parabola(r[i], a, near[i], b, far[i]) // the three-point endpoint formula
			}
		}
	}
	return calls
}

// typicalScale is the scale of xⱼ for a residual objective, for the
// difference intervals of its Jacobian and for the step test:
// max(|xⱼ|, typicalⱼ), typicalⱼ the size of the start's xⱼ (1 where it
// is 0), the typical magnitude of Dennis & Schnabel 1983, §7.1, taken
// from the start. Relative intervals and a relative step test are
// MINPACK's choices for fitting (J. J. Moré, B. S. Garbow and
// K. E. Hillstrom, User Guide for MINPACK-1, Argonne ANL-80-74, 1980,
// fdjac2 and the test on xtol; from memory): fitted parameters are
// often far below 1 (a rate of 1e-6), where an absolute interval would
// swamp them and an absolute step test would stop the run with digits
// still to find; the typical size keeps them from collapsing where an
// unknown of size 1 passes near 0.
func typicalScale(xj elem, j int, diffs *differences) elem {
	return larger(abs(xj), diffs.model.typical[j])
}

// calibrateResiduals records each unknown's typical size at the start:
// |x₀ᵢ|, or 1 where x₀ᵢ = 0. It makes no call.
func calibrateResiduals(recv *receiver, x *vec, fx elem, diffs *differences, budget int) (int, bool) {
	for i, xi := range x {
		diffs.model.typical[i] = abs(xi)
		if xi == 0 {
			diffs.model.typical[i] = 1
		}
	}
	return 0, true
}

// intervalScale is 2 while settleResiduals takes the Jacobian with twice
// the intervals, else 1.
func intervalScale(diffs *differences) elem {
	if diffs.model.wide {
		return 2
	}
	return 1
}

// jacobianError bounds the error of each component of g = Jᵀr that the
// Jacobian's source leaves. It stands in for the source the spec chose;
// gen keeps only that one under this name.
func jacobianError(x *vec, jac *[residuals]vec, r *rvec, e *vec, diffs *differences) {
	switch derivativeSource {
	case sourceForward:
		forwardJacobianError(x, jac, r, e, diffs)
	case sourceCentral:
		centralJacobianError(x, jac, r, e, diffs)
	default:
		exactJacobian(x, jac, r, e, diffs)
	}
}

// exactJacobian: an analytic Jacobian is taken as exact (the generated
// test checks it against central differences of the residuals).
func exactJacobian(x *vec, jac *[residuals]vec, r *rvec, e *vec, diffs *differences) {
	*e = vec{}
}

// forwardJacobianError bounds each |∂rᵢ/∂xⱼ| of forward differences by
// √u·(|Jᵢⱼ|/2 + 2|rᵢ|/sⱼ), sⱼ = typicalScale(xⱼ): the truncation hⱼ|r″|/2,
// with the curvature of rᵢ over sⱼ taken as that of its slope, and the
// rounding 2u|rᵢ|/hⱼ at hⱼ = √u·sⱼ (Nocedal & Wright 2006, §8.1; the
// curvature model is common practice), so that g's error is at most
// Σᵢ |rᵢ|·that.
func forwardJacobianError(x *vec, jac *[residuals]vec, r *rvec, e *vec, diffs *differences) {
	differenceError(x, jac, r, e, diffs, squareRoot(unitRoundoff), 1.0/2, 2)
}

// centralJacobianError bounds each |∂rᵢ/∂xⱼ| of central differences by
// u^(2/3)·(|Jᵢⱼ|/3 + 4|rᵢ|/sⱼ), sⱼ = typicalScale(xⱼ): the truncation
// hⱼ²|r‴|/6 (h²|r‴|/3 for the endpoint formula), with the third
// derivative of rᵢ over sⱼ² taken as its slope, and the rounding u|rᵢ|/hⱼ
// (4u|rᵢ|/hⱼ for the endpoint formula) at hⱼ = ∛u·sⱼ (Nocedal & Wright
// 2006, §8.1; the curvature model is common practice).
func centralJacobianError(x *vec, jac *[residuals]vec, r *rvec, e *vec, diffs *differences) {
	differenceError(x, jac, r, e, diffs, elem(centralScale*centralScale), 1.0/3, 4)
}

// differenceError sets eⱼ = Σᵢ |rᵢ|·order·(truncation·|Jᵢⱼ| +
// rounding·|rᵢ|/sⱼ), the bound on the error of gⱼ = (Jᵀr)ⱼ that a
// difference Jacobian of that order leaves.
func differenceError(x *vec, jac *[residuals]vec, r *rvec, e *vec, diffs *differences, order, truncation, rounding elem) {
	for j := range e {
		s := typicalScale(x[j], j, diffs)
		var sum elem
		for i := range jac {
			sum += abs(r[i]) * order * (truncation*abs(jac[i][j]) + rounding*abs(r[i])/s)
		}
		e[j] = sum
	}
}

// residualError is the error bound of Jᵀr that residualGradient set at x
// from the Jacobian's source.
func residualError(x *vec, fx elem, g, e *vec, diffs *differences) {
	*e = diffs.model.err
}

// settleResiduals prepares a verdict at x for a residual objective. With
// a difference Jacobian it confirms the gradient first, as confirmGradient
// does for differences of f: it takes the Jacobian again with twice the
// intervals and adds to each error bound eᵢ three times the change that
// made in gᵢ = (Jᵀr)ᵢ, which measures the truncation the error model
// cannot see (a third derivative far above the slope's, as in rational
// models) and rounding above it (Richardson's comparison of two
// intervals; the factor three is common practice). It costs
// derivativeCost residual calls, one more should the residuals at x not be at hand. At
// a stall (stall true) it adds the rounding floor 4u·|xᵢ|·(JᵀJ)ᵢᵢ, the
// change that moving xᵢ by a few of its rounding units makes in gᵢ, with
// the Gauss–Newton (JᵀJ)ᵢᵢ for ∂²f/∂xᵢ² (as roundingFloor does with a
// probed curvature; common practice). It returns the calls spent and
// false when budget ran out first.
func settleResiduals(recv *receiver, x *vec, fx elem, g, e *vec, diffs *differences, stall bool, budget int) (int, bool) {
	m := &diffs.model
	calls := 0
	if derivativeCost > 0 {
		need := derivativeCost
		if !(m.known && m.at == *x) {
			need++ // the residuals at x, should they not be at hand
		}
		if budget < need {
			return 0, false
		}
		calls = m.residualsAt(recv, x)
		var jac [residuals]vec
		m.wide = true
		calls += jacobian(recv, x, &m.r, &jac, diffs)
		m.wide = false
		var wide vec
		transposeTimes(&jac, &m.r, &wide)
		for i := range e {
			change := abs(wide[i] - g[i])
			e[i] += 3 * change // Richardson: the change with twice the intervals
		}
	}
	if stall {
		for i := range e {
			e[i] += 4 * unitRoundoff * abs(x[i]) * m.normal[i][i]
		}
	}
	return calls, true
}

// gaussNewtonDirection is the memory of the least-squares directions:
// none, since their step solves with the Jacobian at x (solveDirection).
// The first trial of a line search is the whole Gauss–Newton step.
type gaussNewtonDirection struct{}

func (s *gaussNewtonDirection) reset() {}

func (s *gaussNewtonDirection) update(step, change *vec) {}

// stalled: Gauss–Newton keeps nothing in reserve for a stall.
func (s *gaussNewtonDirection) stalled() bool { return false }

// firstTrial is stepInitial, 1 by default: the Gauss–Newton step is the
// minimizer of the linearized model, which the search should try first
// (Nocedal & Wright 2006, §10.3).
func (s *gaussNewtonDirection) firstTrial(t, slope, now elem) elem {
	return stepInitial
}

// solveDirection sets d from the gradient g (with bounds, its active
// components zeroed): the direction's own rule, or the least-squares
// step. It stands in for the direction the spec chose; gen keeps only
// that one under this name.
func solveDirection(dir *direction, g, d *vec, diffs *differences) {
	switch directionKind {
	case kindGaussNewton:
		gaussNewtonStep(dir, g, d, diffs)
	case kindLevenbergMarquardt:
		dampedStep(dir, g, d, diffs)
	default:
		memoryDirection(dir, g, d, diffs)
	}
}

// memoryDirection is the direction's own rule, from its memory.
func memoryDirection(dir *direction, g, d *vec, diffs *differences) {
	dir.compute(g, d)
}

// gaussNewtonStep solves the Gauss–Newton equations JᵀJ·d = −g (Nocedal &
// Wright 2006, eq. 10.23) by a Cholesky factorization of JᵀJ. When J is
// rank deficient or so ill conditioned that a pivot falls to the rounding
// level, it adds τ·I with τ doubling from √u·max (JᵀJ)ᵢᵢ until the
// factorization succeeds (N&W Algorithm 3.3, Cholesky with added multiple
// of the identity; the starting τ is common practice), which turns the
// step towards steepest descent along the directions J cannot see. d is a
// descent direction whenever g ≠ 0, since −gᵀd = gᵀ(JᵀJ + τI)⁻¹g > 0.
func gaussNewtonStep(dir *direction, g, d *vec, diffs *differences) {
	shiftedSolve(&diffs.model.normal, &vec{}, 0, g, d) // no damping: the weights are never read
}

// dampedStep solves the Levenberg–Marquardt equations
//
//	(JᵀJ + λD)·d = −g,  D = diag(Dᵢᵢ),
//
// with Dᵢᵢ the largest (JᵀJ)ᵢᵢ seen this run, which makes the damping
// invariant to the scale of each unknown (Marquardt 1963; Moré 1978, §6),
// and λ from the model's damping, 10⁻³ at the first step (Nielsen's τ,
// Madsen, Nielsen & Tingleff 2004, §3.2; common practice). A column that
// was zero at every point gets Dᵢᵢ = 1. Should the factorization fail
// (λD too small to lift a rank-deficient JᵀJ), the added multiple of the
// identity of gaussNewtonStep takes over.
//
// References:
//   - D. W. Marquardt, An algorithm for least-squares estimation of
//     nonlinear parameters, J. SIAM 11(2):431–441, 1963.
//   - J. J. Moré, The Levenberg–Marquardt algorithm: implementation and
//     theory, in Numerical Analysis, Lecture Notes in Mathematics 630,
//     Springer, 1978, 105–116.
//   - K. Madsen, H. B. Nielsen and O. Tingleff, Methods for Non-Linear
//     Least Squares Problems, 2nd ed., IMM, Technical University of
//     Denmark, 2004 (from memory).
func dampedStep(dir *direction, g, d *vec, diffs *differences) {
	m := &diffs.model
	if m.damping == 0 {
		m.damping, m.growth = 1e-3, 2 // Nielsen's τ = 10⁻³, ν = 2
	}
	var weight vec
	var largest elem
	for i := range weight {
		largest = larger(largest, m.scale[i])
	}
	for i := range weight {
		weight[i] = larger(m.scale[i], unitRoundoff*largest) // Moré 1978: D from the columns' norms
		if !(weight[i] > 0) {
			weight[i] = 1
		}
	}
	if !m.augmented {
		shiftedSolve(&m.normal, &weight, m.damping, g, d)
		return
	}
	model := m.normal
	for i := range model {
		for j := range model[i] {
			model[i][j] += m.second[i][j]
		}
	}
	shiftedSolve(&model, &weight, m.damping, g, d)
}

// shiftedSolve sets d to the solution of (a + λ·diag(w))·d = −g by
// Cholesky factorization; when a pivot falls to the rounding level it
// adds τ·I, doubling τ from √u·max aᵢᵢ (Nocedal & Wright 2006, Algorithm
// 3.3), and leaves d = −g should even that fail (a non-finite a).
func shiftedSolve(a *[dim]vec, w *vec, lambda elem, g, d *vec) {
	var l [dim]vec
	var largest elem
	for i := range a {
		largest = larger(largest, abs(a[i][i]))
	}
	tau := elem(0)
	for attempt := 0; attempt < 64; attempt++ {
		if cholesky(a, w, lambda, tau, &l) {
			choleskySolve(&l, g, d)
			if finiteVec(d) {
				return
			}
		}
		tau = larger(2*tau, squareRoot(unitRoundoff)*larger(largest, 1)) // N&W Algorithm 3.3: τ ← max(2τ, β)
	}
	negate(d, g)
}

// cholesky factors a + λ·diag(w) + τ·I = L·Lᵀ into l, lower triangle,
// and reports false when a pivot is not above dim·u times its diagonal
// entry, the rounding level of the elimination (Golub & Van Loan,
// Matrix Computations, 4th ed., Algorithm 4.2.1 and §4.2.7; the pivot
// test is common practice), or not finite.
func cholesky(a *[dim]vec, w *vec, lambda, tau elem, l *[dim]vec) bool {
	for j := range a {
		diag := a[j][j] + lambda*w[j] + tau
		pivot := diag
		for k := 0; k < j; k++ {
			pivot -= l[j][k] * l[j][k]
		}
		if !(pivot > elem(dim)*unitRoundoff*abs(diag)) || !finite(pivot) {
			return false
		}
		l[j][j] = squareRoot(pivot)
		for i := j + 1; i < len(a); i++ {
			sum := a[i][j]
			for k := 0; k < j; k++ {
				sum -= l[i][k] * l[j][k]
			}
			l[i][j] = sum / l[j][j]
		}
	}
	return true
}

// choleskySolve sets d to the solution of L·Lᵀ·d = −g by forward and
// back substitution.
func choleskySolve(l *[dim]vec, g, d *vec) {
	for i := range d {
		sum := -g[i]
		for k := 0; k < i; k++ {
			sum -= l[i][k] * d[k]
		}
		d[i] = sum / l[i][i]
	}
	for i := len(d) - 1; i >= 0; i-- {
		sum := d[i]
		for k := i + 1; k < len(d); k++ {
			sum -= l[k][i] * d[k]
		}
		d[i] = sum / l[i][i]
	}
}

// dampedSearch is the Levenberg–Marquardt step rule, a trust region
// handled through the damping λ (Moré 1978; Nocedal & Wright 2006,
// §10.3): it tries x + d with d from dampedStep and accepts it when the
// decrease achieved is at least c1 (stepDecrease) times the decrease the
// Gauss–Newton model predicted,
//
//	ρ = (f(x) − f(x + s)) / (−gᵀs − ½sᵀJᵀJs) ≥ c1,  s = x₊ − x,
//
// then lowers λ by max(1/3, 1 − (2ρ − 1)³) and resets ν = 2; otherwise it
// raises λ by ν, doubles ν, solves again and tries the shorter step
// (Nielsen's update, Madsen, Nielsen & Tingleff 2004, §3.2, from memory).
// Near a minimizer the predicted decrease falls below the rounding noise
// of f (residualGradient's estimate, ε_A of noiseLevel plus the rounding
// of each residual), where f's change says nothing: a step predicted to decrease f by at most ε_A is accepted when
// f rose by at most ε_A, and λ lowered as for ρ = 1, so that the run
// goes on to the Gauss–Newton point the gradient test looks for instead
// of stalling where f can no longer tell (our safeguard, in the spirit
// of the relative-reduction tests of Moré 1978, §8).
// Each trial is one residual call, at most stepTrials. The search ends
// tiny when every component of the step is at most tiny times the first
// step's (the step test holds there), and exhausted when the trials run
// out. With bounds each trial is projected onto the box, s the projected
// step.
func dampedSearch(recv *receiver, x *vec, fx elem, g, d *vec, slope, first elem, floor *stepFloor, budget int, xt, gt *vec, diffs *differences) lineResult {
	m := &diffs.model
	firstStep := *d
	noise := m.noise
	var dir direction // the least-squares directions keep no memory
	for trial := 0; trial < stepTrials; trial++ {
		if trial > 0 {
			searchDirection(&dir, x, g, d, diffs) // the step for the raised λ
			if within(d, &firstStep, floor.at(x, &firstStep, diffs)) {
				return lineResult{calls: trial, end: searchTiny}
			}
		}
		if trial >= budget {
			return lineResult{calls: trial, end: searchOutOfBudget}
		}
		trialPoint(xt, x, 1, d, &diffs.bounds)
		ft := value(recv, xt, gt, diffs)
		linear, normalTerm, secondTerm := modelTerms(x, xt, g, m)
		predicted := linear - normalTerm/2
		if m.augmented {
			predicted = linear - (normalTerm+secondTerm)/2
		}
		if finite(ft) && predicted > 0 && (fx-ft >= stepDecrease*predicted || predicted <= noise && ft <= fx+noise) { // Moré 1978: ρ ≥ c1
			rho := elem(1) // a step below f's resolution: the model is all there is to judge it by
			if predicted > noise {
				rho = (fx - ft) / predicted
			}
			cube := 2*rho - 1
			m.damping *= larger(1.0/3, 1-cube*cube*cube) // Nielsen: λ ← λ·max(1/3, 1 − (2ρ − 1)³)
			m.growth = 2
			chooseModel(m, fx-ft, linear, normalTerm, secondTerm, noise)
			return lineResult{step: 1, value: ft, calls: trial + 1, end: searchAccepted}
		}
		m.damping *= m.growth // Nielsen: λ ← λ·ν, ν ← 2ν
		m.growth *= 2
	}
	return lineResult{calls: stepTrials, end: searchExhausted}
}

// within reports whether every |dᵢ| is at most tiny·|firstᵢ|, so that the
// step d passes the step test wherever tiny·first does.
func within(d, first *vec, tiny elem) bool {
	for i := range d {
		if !(abs(d[i]) <= tiny*abs(first[i])) {
			return false
		}
	}
	return true
}

// modelTerms are the terms of the decrease −gᵀs − ½sᵀBs that the model
// f(x) + gᵀs + ½sᵀBs predicts for the step s = xt − x, B the Gauss–Newton
// matrix JᵀJ or the augmented JᵀJ + S (Nocedal & Wright 2006, eq. 10.19
// with the model of eq. 10.4): −gᵀs, sᵀJᵀJs and sᵀSs.
func modelTerms(x, xt, g *vec, m *residualModel) (linear, normalTerm, secondTerm elem) {
	var s vec
	difference(&s, xt, x)
	for i := range s {
		normalTerm += s[i] * dot(&m.normal[i], &s)
		secondTerm += s[i] * dot(&m.second[i], &s)
	}
	return -dot(g, &s), normalTerm, secondTerm
}

// uncertainty is the parameter covariance estimate of a least-squares
// fit at x,
//
//	C = s²·(JᵀJ)⁻¹,  s² = ‖r(x)‖²/(M − N) = 2f(x)/(M − N),
//
// and the standard errors √Cᵢᵢ, with J from the spec's Jacobian source
// (Seber & Wild, Nonlinear Regression, Wiley, 1989, §2.1 and §5.1; the
// estimate NIST certifies its standard deviations with). It assumes
// independent errors of equal variance and a model that is close to
// linear within a few standard errors of x, and it means something only
// at a minimizer. An unknown fixed by equal bounds is held constant: its
// row and column of C are 0. It costs one residual call and a Jacobian,
// and reports ok false when M ≤ N, when JᵀJ is singular to working precision or a
// value is not finite.
func uncertainty(recv *receiver, x vec, bounds box) (cov [dim]vec, stdErr vec, variance elem, calls int, ok bool) {
	diffs := differences{bounds: bounds}
	calibrateResiduals(recv, &x, 0, &diffs, 0) // the fit's own sizes for the intervals
	var g vec
	fx := value(recv, &x, &g, &diffs)
	calls = 1 + residualGradient(recv, &x, fx, &g, &diffs)
	if residuals <= dim || !finite(fx) || !finiteVec(&g) {
		return cov, stdErr, variance, calls, false
	}
	variance = 2 * fx / elem(residuals-dim) // Seber & Wild §2.1: s² = RSS/(M − N)
	// An unknown fixed by equal bounds is no parameter of the fit: its
	// row and column of JᵀJ give way to the identity, and its variance
	// and covariances are 0.
	normal := diffs.model.normal
	for i := range normal {
		if pinned(i, &bounds) {
			for j := range normal {
				normal[i][j], normal[j][i] = 0, 0
			}
			normal[i][i] = 1
		}
	}
	var l [dim]vec
	var zero vec
	if !cholesky(&normal, &zero, 0, 0, &l) {
		return cov, stdErr, variance, calls, false
	}
	for j := range cov {
		var unit, column vec
		unit[j] = -1 // choleskySolve solves for −g
		choleskySolve(&l, &unit, &column)
		for i := range column {
			if !pinned(i, &bounds) && !pinned(j, &bounds) {
				cov[i][j] = variance * column[i]
			}
		}
	}
	for i := range stdErr {
		stdErr[i] = squareRoot(cov[i][i])
	}
	return cov, stdErr, variance, calls, finiteVec(&stdErr)
}
