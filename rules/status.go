package rules

// Status is one way a run ends: a value of the generated status type.
type Status struct {
	StandIn   string // the stand-in constant in templates/shape.go
	Suffix    string // appended to the minimizer's name
	Text      string // what String returns, and expect.status names
	Converged bool
	Doc       string
}

// Statuses lists the statuses in the order of the templates' stand-ins.
var Statuses = []*Status{
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

// StatusByText finds a status by its String text.
func StatusByText(text string) (*Status, bool) {
	for _, s := range Statuses {
		if s.Text == text {
			return s, true
		}
	}
	return nil, false
}
