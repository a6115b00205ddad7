package templates

// gradientMeasure is the stop test's measure of the gradient g at x, where
// f(x) = fx, counting each component at |g_i| + e_i, e_i the bound on its
// error (0 for an analytic gradient), so that a measure at most the limit
// means the true gradient's is too. floor is the measure of e alone, the
// smallest the test can see. It stands in for the test the spec chose;
// gen keeps only that one under this name.
func gradientMeasure(g, e, x *vec, fx elem) (measure, floor elem) {
	if gradientTest == testAbsolute {
		return absoluteGradient(g, e, x, fx)
	}
	return relativeGradient(g, e, x, fx)
}

// relativeGradient is the scale-free measure
//
//	max_i (|g_i| + e_i)·max(|x_i|, 1) / max(|f(x)|, 1)
//
// of Dennis & Schnabel 1983, §7.2 (typical x and f of 1): the relative
// change of f for a relative change of x_i, which means the same whatever
// the units of f and of each x_i above 1.
//
// References:
//   - J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained
//     Optimization and Nonlinear Equations, Prentice-Hall, 1983, §7.2.
func relativeGradient(g, e, x *vec, fx elem) (measure, floor elem) {
	scale := larger(abs(fx), 1)
	for i := range g {
		w := larger(abs(x[i]), 1) / scale // D&S §7.2: relative gradient
		measure = larger(measure, (abs(g[i])+e[i])*w)
		floor = larger(floor, e[i]*w)
	}
	return measure, floor
}

// absoluteGradient is max_i (|g_i| + e_i), in the units of f per unit of x.
func absoluteGradient(g, e, x *vec, fx elem) (measure, floor elem) {
	for i := range g {
		measure = larger(measure, abs(g[i])+e[i])
		floor = larger(floor, e[i])
	}
	return measure, floor
}
