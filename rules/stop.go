package rules

import "math"

// gradientDefault is the default gradient limit for the gradient test's
// measure: 1e-8 for float64 and 1e-4 for float32, about √u and 0.4·√u
// (common practice: the gradient of a smooth f computed in floating point
// is rarely reliable far below √u relative). With differences the kernel
// raises it to three times the measure of their error bound where that is
// larger, so that it can be met, and reports the limit it used.
func gradientDefault(c *Context) float64 {
	if c.Elem == "float32" {
		return 1e-4
	}
	return 1e-8
}

// stepDefault is the default step limit: 1e-14 for float64, 1e-6 for
// float32, about 45u and 17u (common practice).
func stepDefault(c *Context) float64 {
	if c.Elem == "float32" {
		return 1e-6
	}
	return 1e-14
}

// trialsDefault is the default number of trials in one line search:
// enough shrinks to go from the first trial step to the step limit, below
// which the search ends anyway,
//
//	trials = 1 + ⌈ln(max(stop.step, u)/initial) / ln(shrink)⌉,
//
// clamped to [1, 1000], with u the unit roundoff (no step limit below it
// can be resolved). The Wolfe rules read no shrink: their zoom keeps each
// trial a tenth of the bracket from either end and usually halves it, so
// 1/2 stands for their shrink. With the defaults this is 48 for float64
// (stop.step 1e-14) and 21 for float32 (1e-6).
func trialsDefault(c *Context) float64 {
	shrink := 0.5
	if c.Rule != nil && c.Rule.Reads(Shrink) {
		shrink = c.Value(Shrink)
	}
	limit := math.Max(c.Value(StopStep), Roundoff(c.Elem))
	shrinks := math.Log(limit/c.Value(Initial)) / math.Log(shrink)
	n := 1 + math.Ceil(shrinks-1e-9) // an exact power (1e-14 = 0.1¹⁴) needs no extra shrink for the logarithms' rounding
	return math.Min(math.Max(n, 1), 1000)
}
