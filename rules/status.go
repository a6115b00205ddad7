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
// Only one is convergence: the first-order test holds at X.
var Statuses = []*Status{
	{"statusGradientSmall", "GradientSmall", "gradient small", true,
		"the gradient test holds at X: its measure, with the differences' error bound when they are used, is at most the gradient limit: converged"},
	{"statusStalled", "Stalled", "stalled", false,
		"the step test ended the run, or no step longer than the step limit decreased f, while the gradient test still fails: X is as far as the run could get, not a verified minimizer"},
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
		"the line search found no acceptable step, and f rose in proportion to the step where the analytic gradient predicted a fall: the gradient is probably wrong (see the generated gradient test)"},
	{"statusDiverged", "Diverged", "diverged", false,
		"a fixed step overflowed f, or raised f above f(x0) at eight steps in a row: the step is too long for this objective"},
	Running,
}

// Running is the one status that does not end a run: a solver's advance
// spent this tick's call budget first. Only advancing reports it.
var Running = &Status{"statusRunning", "Running", "running", false,
	"the run has not ended: this tick's call budget does not cover the worst case of its next stage; X is the best point so far, and advancing again goes on"}

// StatusByText finds a status by its String text.
func StatusByText(text string) (*Status, bool) {
	for _, s := range Statuses {
		if s.Text == text {
			return s, true
		}
	}
	return nil, false
}
