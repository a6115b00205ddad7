package templates

import "math"

// differences is what the kernel knows about evaluating the objective:
// the box it may be evaluated in, and what the difference gradients learn
// from the objective at the start: for each coordinate i, the interval as
// a multiple of max(1, |x_i|), and the curvature along e_i it was chosen
// from (|f″| for forward differences, |f‴| for central ones). The
// analytic gradient uses only the box.
type differences struct {
	ratio     vec
	curvature vec
	second    vec // |f″| along e_i, for the rounding floor of a stall (see roundingFloor)
	bounds    box
	model     residualModel // a residual objective's residuals and Jacobian products (noStructure for any other)
}

// derivative fills g with the gradient at x, where fx = f(x), and returns
// the objective calls it made: at most derivativeCost, fewer only for
// variables fixed by equal bounds. It stands in for the source the spec
// chose; gen keeps only that one under this name.
func derivative(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	switch {
	case residualObjective:
		return residualGradient(recv, x, fx, g, diffs)
	case combined:
		return givenGradient(recv, x, fx, g, diffs)
	case derivativeSource == sourceForward:
		return forwardDifference(recv, x, fx, g, diffs)
	case derivativeSource == sourceCentral:
		return centralDifference(recv, x, fx, g, diffs)
	default:
		return analyticGradient(recv, x, fx, g, diffs)
	}
}

// calibrate chooses the difference intervals at x before the first
// gradient, spending at most budget objective calls; it returns the calls
// spent and false when the budget ran out first. It stands in for the
// source the spec chose; gen keeps only that one under this name.
func calibrate(recv *receiver, x *vec, fx elem, diffs *differences, budget int) (int, bool) {
	switch {
	case residualObjective:
		return calibrateResiduals(recv, x, fx, diffs, budget)
	case derivativeSource == sourceForward:
		return calibrateForward(recv, x, fx, diffs, budget)
	case derivativeSource == sourceCentral:
		return calibrateCentral(recv, x, fx, diffs, budget)
	default:
		return calibrateNothing(recv, x, fx, diffs, budget)
	}
}

// gradientError fills e with a bound on the error of each component of
// the gradient g at x, where fx = f(x). It stands in for the source the spec
// chose; gen keeps only that one under this name.
func gradientError(x *vec, fx elem, g, e *vec, diffs *differences) {
	switch {
	case residualObjective:
		residualError(x, fx, g, e, diffs)
	case derivativeSource == sourceForward:
		forwardError(x, fx, g, e, diffs)
	case derivativeSource == sourceCentral:
		centralError(x, fx, g, e, diffs)
	default:
		exactGradient(x, fx, g, e, diffs)
	}
}

// analyticGradient calls the user's gradient; it costs no objective calls.
func analyticGradient(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	recv.gradient(x, g)
	return 0
}

// givenGradient: a combined objective wrote ∇f(x) into g in the call
// that computed fx (the start's, or the line-search trial's at x), so
// there is nothing to compute and no call to make.
func givenGradient(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	return 0
}

// calibrateNothing: an analytic gradient needs no intervals.
func calibrateNothing(recv *receiver, x *vec, fx elem, diffs *differences, budget int) (int, bool) {
	return 0, true
}

// exactGradient: the analytic gradient is taken as exact; its error is
// the user's to check (the generated test compares it with differences).
func exactGradient(x *vec, fx elem, g, e *vec, diffs *differences) {
	for i := range e {
		e[i] = 0
	}
}

// noiseLevel is the absolute error assumed in a computed value fx of the
// objective at x, where its gradient is about g:
//
//	ε_A = 4u·(|fx| + Σᵢ |gᵢ·xᵢ|),
//
// a few roundings of the result plus the change that rounding each xᵢ by
// a relative u makes in f, which is what an objective computed with
// cancellation inside (y − x² in Rosenbrock's valley) shows near a zero
// minimum, where u·|f| alone vanishes (the first-order error of
// evaluating f at a rounded x; the factor 4 is common practice; Gill,
// Murray, Saunders & Wright 1983 leave ε_A to the user).
func noiseLevel(x *vec, fx elem, g *vec) elem {
	sum := abs(fx)
	for i := range x {
		sum += abs(g[i] * x[i])
	}
	return 4 * unitRoundoff * sum
}

// magnitude is |v| for a finite v and 0 otherwise: a probe that fell
// outside the objective's domain says nothing about its rounding.
func magnitude(v elem) elem {
	if !finite(v) {
		return 0
	}
	return abs(v)
}

// probeStep returns x_i moved by h, kept within [lower, upper], and the
// step actually representable.
func probeStep(xi, h, lower, upper elem) (elem, elem) {
	moved := clampBetween(xi+h, lower, upper)
	return moved, moved - xi
}

// parabola returns the first and second derivatives at 0 of the parabola
// through (0, f0), (a, fa) and (b, fb), for probes on one side of a bound.
// With b = 2a they are the three-point endpoint formulas
// f′ ≈ (−3f0 + 4fa − fb)/(2a), error a²|f‴|/3, and
// f″ ≈ (f0 − 2fa + fb)/a² (Burden & Faires, Numerical Analysis, §4.1
// and §4.1's second-derivative formulas, from memory); written for unequal
// a and b, so that the representable steps can be used.
func parabola(f0, a, fa, b, fb elem) (slope, second elem) {
	slope = -(a+b)/(a*b)*f0 + b/(a*(b-a))*fa - a/(b*(b-a))*fb
	second = 2 * (f0/(a*b) - fa/(a*(b-a)) + fb/(b*(b-a)))
	return slope, second
}

// sidedProbes evaluates f at x moved along coordinate i by h and by 2h,
// kept within [lower, upper], and returns the slope and second derivative
// of the parabola through them and (x, fx) (see parabola), and the larger
// magnitude of the two values.
func sidedProbes(recv *receiver, probe *vec, i int, fx, h, lower, upper elem) (slope, second, size elem) {
	xi := probe[i]
	near, a := probeStep(xi, h, lower, upper)
	far, b := probeStep(xi, 2*h, lower, upper)
	probe[i] = near
	fNear := recv.objective(probe)
	probe[i] = far
	fFar := recv.objective(probe)
	probe[i] = xi
	slope, second = parabola(fx, a, fNear, b, fFar)
	return slope, second, larger(magnitude(fNear), magnitude(fFar))
}

// calibrateForward chooses each forward-difference interval from the
// second derivative along e_i, estimated at x with two probes at
// ±h̄, h̄ = ∛u·s, s = max(1, |x_i|):
//
//	f″  ≈ (f(x + h̄eᵢ) − 2f(x) + f(x − h̄eᵢ)) / h̄²,
//	h_i  = 2·√(ε_A / |f″|)
//
// the interval that balances the truncation error h|f″|/2 against the
// rounding error 2ε_A/h (Gill, Murray, Saunders & Wright 1983, §2; Nocedal
// & Wright 2006, §8.1), with ε_A from noiseLevel and the probes' slopes.
// An estimate of f″ below its own rounding noise 4ε_A/h̄² is replaced by
// that noise, and h_i is kept within [64u·s, h̄], so that the step stays
// resolvable and within the local model. It costs two objective calls per
// unknown.
//
// References:
//   - P. E. Gill, W. Murray, M. A. Saunders and M. H. Wright, Computing
//     forward-difference intervals for numerical optimization, SIAM J.
//     Sci. Stat. Comput. 4(2):310–321, 1983.
//   - J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed.,
//     Springer, 2006, §8.1.
func calibrateForward(recv *receiver, x *vec, fx elem, diffs *differences, budget int) (int, bool) {
	probe := *x
	var slope vec
	scale := abs(fx)
	calls := 0
	for i := range probe {
		if calls+2 > budget {
			return calls, false
		}
		xi := probe[i]
		bar := centralScale * larger(1, abs(xi))
		lower, upper := coordinateRange(i, diffs)
		if xi+bar > upper || xi-bar < lower {
			// At a bound: two probes on the side with room, at h and 2h.
			h := oneSide(xi, bar, 2, lower, upper)
			if h == 0 {
				continue // fixed by equal bounds
			}
			sided, second, size := sidedProbes(recv, &probe, i, fx, h, lower, upper)
			calls += 2
			scale = larger(scale, size)
			if finite(sided) && finite(second) {
				diffs.curvature[i], slope[i] = abs(second), sided
			}
			continue
		}
		up, hUp := probeStep(xi, bar, lower, upper)
		down, hDown := probeStep(xi, -bar, lower, upper)
		probe[i] = up
		fUp := recv.objective(&probe)
		probe[i] = down
		fDown := recv.objective(&probe)
		probe[i] = xi
		calls += 2
		scale = larger(scale, larger(magnitude(fUp), magnitude(fDown)))
		if finite(fUp) && finite(fDown) {
			// f″ from the two one-sided slopes over the representable
			// steps hUp > 0 > hDown, and the central slope.
			diffs.curvature[i] = abs((fUp-fx)/hUp-(fx-fDown)/(-hDown)) * 2 / (hUp - hDown)
			slope[i] = (fUp - fDown) / (hUp - hDown)
		}
	}
	noise := noiseLevel(x, scale, &slope)
	for i := range probe {
		s := larger(1, abs(probe[i]))
		bar := centralScale * s
		second := larger(diffs.curvature[i], 4*noise/(bar*bar))
		h := bar
		if second > 0 {
			h = 2 * squareRoot(noise/second) // GMSW 1983: h = 2√(ε_A/|f″|)
		}
		diffs.ratio[i] = clampBetween(h, 64*unitRoundoff*s, bar) / s
		diffs.curvature[i] = second
		diffs.second[i] = second
	}
	return calls, true
}

// calibrateCentral chooses each central-difference interval from the
// third derivative along e_i, estimated at x with four probes at ±h̄ and
// ±2h̄, h̄ = u^(1/4)·s, s = max(1, |x_i|):
//
//	f‴ ≈ (f(x + 2h̄eᵢ) − 2f(x + h̄eᵢ) + 2f(x − h̄eᵢ) − f(x − 2h̄eᵢ)) / (2h̄³),
//	h_i  = ∛(3ε_A / |f‴|)
//
// the interval that minimizes the truncation error h²|f‴|/6 plus the
// rounding error ε_A/h of a central difference (Nocedal & Wright 2006,
// §8.1, with the third-derivative estimate of the forward interval's
// procedure of Gill, Murray, Saunders & Wright 1983 carried one order
// up), with ε_A from noiseLevel and the probes' slopes. An estimate below
// its rounding noise 3ε_A/h̄³ is replaced by that noise, and h_i is kept
// within [64u·s, h̄]. It costs four objective calls per unknown.
func calibrateCentral(recv *receiver, x *vec, fx elem, diffs *differences, budget int) (int, bool) {
	probe := *x
	var slope vec
	scale := abs(fx)
	quarter := squareRoot(squareRoot(unitRoundoff)) // u^(1/4)
	calls := 0
	for i := range probe {
		if calls+4 > budget {
			return calls, false
		}
		xi := probe[i]
		bar := quarter * larger(1, abs(xi))
		lower, upper := coordinateRange(i, diffs)
		if xi+2*bar > upper || xi-2*bar < lower {
			// At a bound: three probes on the side with room, at h, 2h
			// and 3h, for f‴ ≈ (f(3h) − 3f(2h) + 3f(h) − f(0))/h³ (the
			// third forward difference).
			h := oneSide(xi, bar, 3, lower, upper)
			if h == 0 {
				continue // fixed by equal bounds
			}
			var f [3]elem
			for k := range f {
				probe[i], _ = probeStep(xi, elem(k+1)*h, lower, upper)
				f[k] = recv.objective(&probe)
				scale = larger(scale, magnitude(f[k]))
			}
			probe[i] = xi
			calls += 3
			if finite(f[0]) && finite(f[1]) && finite(f[2]) {
				diffs.curvature[i] = abs(f[2]-3*f[1]+3*f[0]-fx) / abs(h*h*h)
				diffs.second[i] = abs(fx-2*f[0]+f[1]) / (h * h)
				slope[i] = (-3*fx + 4*f[0] - f[1]) / (2 * h)
			}
			continue
		}
		var f [4]elem
		for k, m := range [4]elem{2, 1, -1, -2} {
			probe[i], _ = probeStep(xi, m*bar, lower, upper)
			f[k] = recv.objective(&probe)
			scale = larger(scale, magnitude(f[k]))
		}
		probe[i] = xi
		calls += 4
		if finite(f[0]) && finite(f[1]) && finite(f[2]) && finite(f[3]) {
			diffs.curvature[i] = abs(f[0]-2*f[1]+2*f[2]-f[3]) / (2 * bar * bar * bar)
			diffs.second[i] = abs(f[1]-2*fx+f[2]) / (bar * bar)
			slope[i] = (f[1] - f[2]) / (2 * bar)
		}
	}
	noise := noiseLevel(x, scale, &slope)
	for i := range probe {
		s := larger(1, abs(probe[i]))
		bar := quarter * s
		third := larger(diffs.curvature[i], 3*noise/(bar*bar*bar))
		h := bar
		if third > 0 {
			h = cubeRoot(3 * noise / third) // N&W §8.1: minimizes h²|f‴|/6 + ε_A/h
		}
		diffs.ratio[i] = clampBetween(h, 64*unitRoundoff*s, bar) / s
		diffs.curvature[i] = third
	}
	return calls, true
}

// cubeRoot returns ∛v for v ≥ 0.
func cubeRoot(v elem) elem {
	return elem(math.Cbrt(float64(v)))
}

// forwardDifference approximates the gradient by forward differences,
//
//	g_i ≈ (f(x + h_i e_i) − f(x)) / h_i,
//
// with the intervals calibrateForward chose, h_i = ratio_i·max(1, |x_i|)
// (Nocedal & Wright 2006, eq. 8.1). It costs dim objective calls. Where
// a bound leaves no room ahead the difference is taken backwards, over
// the room there is when the box is narrower than h_i; a variable fixed
// by equal bounds costs nothing and gets 0.
func forwardDifference(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	probe := *x
	calls := 0
	for i := range probe {
		xi := probe[i]
		lower, upper := coordinateRange(i, diffs)
		up, h := probeStep(xi, forwardInterval(x, i, diffs), lower, upper)
		if h == 0 {
			g[i] = 0 // fixed by equal bounds
			continue
		}
		probe[i] = up
		g[i] = (recv.objective(&probe) - fx) / h // N&W eq. 8.1, with the representable h
		probe[i] = xi
		calls++
	}
	return calls
}

// forwardInterval is the signed interval of coordinate i at x: ratio_i·
// max(1, |x_i|) forwards, or backwards at an upper bound, shortened where
// the box is narrower than that (see oneSide).
func forwardInterval(x *vec, i int, diffs *differences) elem {
	lower, upper := coordinateRange(i, diffs)
	return oneSide(x[i], diffs.ratio[i]*larger(1, abs(x[i])), 1, lower, upper)
}

// forwardError bounds each forward difference's error by twice its
// truncation h|f″|/2 plus rounding 2ε_A/h, with f″ from the last
// calibration and ε_A at x (Nocedal & Wright 2006, §8.1; the factor 2
// allows for f″ changing within the interval and since the calibration,
// common practice).
func forwardError(x *vec, fx elem, g, e *vec, diffs *differences) {
	noise := noiseLevel(x, fx, g)
	for i := range e {
		h := abs(forwardInterval(x, i, diffs))
		e[i] = 0 // fixed by equal bounds
		if h > 0 {
			e[i] = 2 * (h*diffs.curvature[i]/2 + 2*noise/h)
		}
	}
}

// centralDifference approximates the gradient by central differences,
//
//	g_i ≈ (f(x + h_i e_i) − f(x − h_i e_i)) / (2 h_i),
//
// with the intervals calibrateCentral chose, h_i = ratio_i·max(1, |x_i|)
// (Nocedal & Wright 2006, eq. 8.7). It costs 2·dim objective calls. Where
// a bound leaves no room on one side, the three-point endpoint formula on
// the other side takes its place at the same cost (see parabola); a
// variable fixed by equal bounds costs nothing and gets 0.
func centralDifference(recv *receiver, x *vec, fx elem, g *vec, diffs *differences) int {
	probe := *x
	calls := 0
	for i := range probe {
		xi := probe[i]
		h, oneSided := centralInterval(x, i, diffs)
		lower, upper := coordinateRange(i, diffs)
		switch {
		case h == 0:
			g[i] = 0 // fixed by equal bounds
			continue
		case oneSided:
			g[i], _, _ = sidedProbes(recv, &probe, i, fx, h, lower, upper) // the three-point endpoint formula
		default:
			up, _ := probeStep(xi, h, lower, upper)
			down, _ := probeStep(xi, -h, lower, upper)
			probe[i] = up
			fUp := recv.objective(&probe)
			probe[i] = down
			fDown := recv.objective(&probe)
			g[i] = (fUp - fDown) / (up - down) // N&W eq. 8.7, with the representable 2h
			probe[i] = xi
		}
		calls += 2
	}
	return calls
}

// centralInterval is the interval of coordinate i at x, ratio_i·max(1,
// |x_i|), and whether the box leaves room for probes on both sides; when
// it does not, the interval is signed towards the side with room for
// probes at h and 2h, and shortened where the box is narrower than that
// (see oneSide).
func centralInterval(x *vec, i int, diffs *differences) (h elem, oneSided bool) {
	lower, upper := coordinateRange(i, diffs)
	h = diffs.ratio[i] * larger(1, abs(x[i]))
	if x[i]+h <= upper && x[i]-h >= lower {
		return h, false
	}
	return oneSide(x[i], h, 2, lower, upper), true
}

// centralError bounds each central difference's error by twice its
// truncation h²|f‴|/6 plus rounding ε_A/h, with f‴ from the last
// calibration and ε_A at x (Nocedal & Wright 2006, §8.1; the factor 2 as
// in forwardError).
func centralError(x *vec, fx elem, g, e *vec, diffs *differences) {
	noise := noiseLevel(x, fx, g)
	for i := range e {
		h, oneSided := centralInterval(x, i, diffs)
		h = abs(h)
		switch {
		case h == 0:
			e[i] = 0 // fixed by equal bounds
		case oneSided:
			e[i] = 2 * (h*h*diffs.curvature[i]/3 + 4*noise/h) // the endpoint formula: truncation h²|f‴|/3, rounding (3 + 4 + 1)ε_A/(2h)
		default:
			e[i] = 2 * (h*h*diffs.curvature[i]/6 + noise/h)
		}
	}
}

// confirmGradient recomputes a difference gradient at x before the run is
// called converged there: it chooses the intervals again from the
// curvature at x (calibrate), computes g with them and with twice them,
// and bounds each component's error by the model (gradientError) plus
// three times the change the doubling made. That change measures what the
// model can miss, truncation from curvature that varies and rounding
// noise above 4u·|f|; as one sample of that noise it is tripled
// (Richardson's idea of comparing two intervals; the factor is common
// practice for a posteriori error estimates). It costs a calibration and two
// gradients, and returns the calls spent and false when budget ran out
// first.
func confirmGradient(recv *receiver, x *vec, fx elem, g, e *vec, diffs *differences, budget int) (int, bool) {
	calls, ok := calibrate(recv, x, fx, diffs, budget)
	if !ok || calls+2*derivativeCost > budget {
		return calls, false
	}
	wide := *diffs
	for i := range wide.ratio {
		wide.ratio[i] *= 2
	}
	var doubled vec
	calls += derivative(recv, x, fx, g, diffs)
	calls += derivative(recv, x, fx, &doubled, &wide)
	gradientError(x, fx, g, e, diffs)
	for i := range e {
		e[i] += 3 * abs(g[i]-doubled[i])
	}
	return calls, true
}

// diagonalCurvature fills h with |∂²f/∂xᵢ²| at x, where the gradient is g,
// for the rounding floor of a stall (see roundingFloor). It stands in for
// the source the spec chose; gen keeps only that one under this name.
func diagonalCurvature(recv *receiver, x, g *vec, diffs *differences, h *vec) {
	if derivativeSource == sourceAnalytic {
		probedCurvature(recv, x, g, diffs, h)
		return
	}
	calibratedCurvature(recv, x, g, diffs, h)
}

// probedCurvature estimates each |∂²f/∂xᵢ²| from the analytic gradient
// at x + δᵢeᵢ, δᵢ = √u·max(1, |xᵢ|): dim gradient calls and no objective
// call (a forward difference of the gradient, Nocedal & Wright 2006,
// §8.1).
func probedCurvature(recv *receiver, x, g *vec, diffs *differences, h *vec) {
	probe := *x
	var moved vec
	for i := range probe {
		xi := probe[i]
		lower, upper := coordinateRange(i, diffs)
		up, delta := probeStep(xi, oneSide(xi, squareRoot(unitRoundoff)*larger(1, abs(xi)), 1, lower, upper), lower, upper)
		h[i] = 0 // fixed by equal bounds
		if delta != 0 {
			probe[i] = up
			recv.gradient(&probe, &moved)
			h[i] = abs(moved[i]-g[i]) / abs(delta)
			probe[i] = xi
		}
	}
}

// calibratedCurvature takes each |f″| along eᵢ from the differences' last
// calibration, which confirmGradient has just made at x.
func calibratedCurvature(recv *receiver, x, g *vec, diffs *differences, h *vec) {
	*h = diffs.second
}

// roundingFloor adds to each error bound e_i the change 4u·|xᵢ|·|∂²f/∂xᵢ²|
// that moving xᵢ by a few of its rounding units makes in gᵢ:
// where no step the step test resolves decreases f, a gradient that small
// is zero to the rounding of x (the resolution of x in floating point,
// common practice). It is added only at a stall, so a gradient far above
// it still ends the run as stalled.
func roundingFloor(recv *receiver, x, g, e *vec, diffs *differences) {
	var h vec
	diagonalCurvature(recv, x, g, diffs, &h)
	for i := range e {
		e[i] += 4 * unitRoundoff * abs(x[i]) * h[i]
	}
}
