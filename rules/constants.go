package rules

import (
	"math"
	"strconv"
)

// Constant is a templates constant (templates/params.go) that no spec key
// sets: gen derives it from the float type, the dimension and the chosen
// entries.
type Constant struct {
	Name  string // in templates/params.go
	Doc   string // echoed beside the generated constant
	Value func(c *Context) string
}

// Constants lists the derived constants.
var Constants = []*Constant{
	{"derivativeCost", "objective calls per gradient", func(c *Context) string {
		return strconv.Itoa(c.Derivative.GradientCalls(c.Dim))
	}},
	{"calibrationCost", "objective calls of choosing the difference intervals", func(c *Context) string {
		return strconv.Itoa(c.CalibrationCalls())
	}},
	{"iterationCalls", "most objective calls of one line search with the gradient at its step", func(c *Context) string {
		return strconv.Itoa(c.IterationCalls())
	}},
	{"settleCalls", "most objective calls of settling at x: confirming a difference gradient, or a combined objective's probes at a stall", func(c *Context) string {
		return strconv.Itoa(c.SettleCalls())
	}},
	{"unitRoundoff", "unit roundoff u of the float type", func(c *Context) string {
		return FormatFloat(Roundoff(c.Elem))
	}},
	{"largestFinite", "the largest finite value of the float type", func(c *Context) string {
		if c.Elem == "float32" {
			return "0x1.fffffep127"
		}
		return "0x1.fffffffffffffp1023"
	}},
	{"activeMargin", "ε̄, the widest margin of the ε-active set at a bound (Bertsekas 1982; the value is common practice)", func(c *Context) string {
		return "1e-3"
	}},
	{"centralScale", "∛u, central-difference step scale (Nocedal & Wright 2006, §8.1)", func(c *Context) string {
		return FormatFloat(math.Cbrt(Roundoff(c.Elem)))
	}},
}

// Roundoff is the unit roundoff u = 2^−p of a float type with p-bit
// significand: 2⁻²⁴ for float32, 2⁻⁵³ for float64 (IEEE 754).
func Roundoff(elem string) float64 {
	if elem == "float32" {
		return 0x1p-24
	}
	return 0x1p-53
}

// IterationCalls is the most objective calls of one iteration's line
// search and the gradient at the accepted step.
func (c *Context) IterationCalls() int {
	return c.Rule.IterationCalls(int(c.Value(Trials)), c.Derivative.GradientCalls(c.Dim))
}

// StartCalls is the most objective calls of a run's start: the first
// value, the calibration of differences and the first gradient.
func (c *Context) StartCalls() int {
	return 1 + c.CalibrationCalls() + c.Derivative.GradientCalls(c.Dim)
}

// CalibrationCalls is the objective calls of choosing the difference
// intervals: none for a residual objective, whose Jacobian differences
// use the standard intervals of Nocedal & Wright 2006, §8.1.
func (c *Context) CalibrationCalls() int {
	if c.Residuals > 0 {
		return 0
	}
	return c.Derivative.CalibrationCalls(c.Dim)
}

// SettleCalls is the most objective calls of confirming a difference
// gradient (a calibration and two gradients); none for an analytic one;
// for a combined objective, the curvature probes of a stall, one per
// unknown (settleCombined).
func (c *Context) SettleCalls() int {
	if c.Combined {
		return c.Dim
	}
	if c.Residuals > 0 && c.Derivative.GradientCalls(c.Dim) > 0 {
		return 1 + c.Derivative.GradientCalls(c.Dim) // settleResiduals: a Jacobian with twice the intervals, and r should it be missing
	}
	if c.CalibrationCalls() == 0 {
		return 0 // an analytic gradient, or a residual objective (settleResiduals)
	}
	return c.CalibrationCalls() + 2*c.Derivative.GradientCalls(c.Dim)
}

// TickMinimum is the smallest call budget with which every advance of a
// solver makes progress: the largest worst case of one stage.
func (c *Context) TickMinimum() int {
	return max(c.StartCalls(), c.SettleCalls(), c.IterationCalls())
}
