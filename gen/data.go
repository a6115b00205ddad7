package gen

import (
	"math"
	"strconv"
)

// statusInfo is one value of the generated status type. The template
// names are the stand-ins in templates/shape.go, in the same order.
type statusInfo struct {
	template  string
	suffix    string // appended to the minimizer's name
	text      string // what String returns
	converged bool
	doc       string
}

var statuses = []statusInfo{
	{"statusGradientSmall", "GradientSmall", "gradient small", true,
		"the largest gradient component fell to the gradient limit: converged"},
	{"statusStepTiny", "StepTiny", "step tiny", true,
		"every component of the last step was at most the step limit times |xᵢ| + 1, or no step above the step limit decreased f: converged"},
	{"statusOutOfIterations", "OutOfIterations", "out of iterations", false,
		"the iteration limit came first"},
	{"statusOutOfEvaluations", "OutOfEvaluations", "out of evaluations", false,
		"the next objective call would have exceeded the evaluation cap"},
	{"statusNoAcceptableStep", "NoAcceptableStep", "no acceptable step", false,
		"no trial of the line search met the step rule at a finite point within its trials"},
	{"statusNonFiniteStart", "NonFiniteStart", "non-finite start", false,
		"x0 or the objective at x0 is NaN or ±Inf"},
	{"statusNonFiniteGradient", "NonFiniteGradient", "non-finite gradient", false,
		"a gradient component became NaN or ±Inf"},
	{"statusNoDecrease", "NoDecrease", "no decrease", false,
		"no step longer than the step limit decreased f, and f rose in proportion to the step where the analytic gradient predicted a fall: the gradient is probably wrong (see the generated gradient test)"},
}

// tunable is one constant the kernels read, emitted from the plan.
type tunable struct {
	template string // name in templates/params.go
	source   string // where the value comes from, echoed beside it
	value    func(p *Plan) string
}

var tunables = []tunable{
	{"stepInitial", "step.initial", func(p *Plan) string { return formatFloat(p.M.Initial) }},
	{"stepShrink", "step.shrink", func(p *Plan) string { return formatFloat(p.M.Shrink) }},
	{"stepDecrease", "step.decrease (c1)", func(p *Plan) string { return formatFloat(p.M.Decrease) }},
	{"stepCurvature", "step.curvature (c2)", func(p *Plan) string { return formatFloat(p.M.Curvature) }},
	{"stepTrials", "step.trials", func(p *Plan) string { return strconv.Itoa(p.M.Trials) }},
	{"lbfgsMemory", "memory", func(p *Plan) string { return strconv.Itoa(p.M.Memory) }},
	{"derivativeCost", "objective calls per gradient", func(p *Plan) string { return strconv.Itoa(p.Cost) }},
	{"unitRoundoff", "unit roundoff u of the float type", func(p *Plan) string { return formatFloat(roundoff(p.Shape.Elem)) }},
	{"largestFinite", "the largest finite value of the float type", func(p *Plan) string { return largestFinite(p.Shape.Elem) }},
	{"forwardScale", "√u, forward-difference step scale (Nocedal & Wright 2006, §8.1)", func(p *Plan) string {
		return formatFloat(math.Sqrt(roundoff(p.Shape.Elem)))
	}},
	{"centralScale", "∛u, central-difference step scale (Nocedal & Wright 2006, §8.1)", func(p *Plan) string {
		return formatFloat(math.Cbrt(roundoff(p.Shape.Elem)))
	}},
}

// largestFinite renders the largest finite value of a float type as a Go
// literal (IEEE 754 binary32 and binary64).
func largestFinite(elem string) string {
	if elem == "float32" {
		return "0x1.fffffep127"
	}
	return "0x1.fffffffffffffp1023"
}

// roundoff is the unit roundoff u = 2^−p of a float type with p-bit
// significand: 2⁻²⁴ for float32, 2⁻⁵³ for float64 (IEEE 754).
func roundoff(elem string) float64 {
	if elem == "float32" {
		return 0x1p-24
	}
	return 0x1p-53
}
