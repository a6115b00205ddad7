package rules

// gradientDefault is the default gradient limit. It sits well above the
// error of the gradient, or no step could show progress near a minimizer:
// differences err by about √u (forward) and u^(2/3) (central) relative to
// the scale of f (Nocedal & Wright 2006, §8.1), so their limits are
// looser; the factors are common practice for problems scaled near 1.
func gradientDefault(c *Context) float64 {
	limits := map[string]float64{"analytic": 1e-8, "central": 1e-8, "forward": 1e-6}
	if c.Elem == "float32" {
		limits = map[string]float64{"analytic": 1e-4, "central": 1e-3, "forward": 1e-2}
	}
	return limits[c.Derivative.Name]
}

// stepDefault is the default step limit: 1e-14 for float64, 1e-6 for
// float32, about 45u and 17u (common practice).
func stepDefault(c *Context) float64 {
	if c.Elem == "float32" {
		return 1e-6
	}
	return 1e-14
}
