package mgh

// Problem is one MGH problem at one dimension, as the spec needs it: the
// objective's name (its gradient is Name+"Grad"), the dimension and the
// standard starting point. The recorded minima, tolerances and exclusions
// live beside the assertions in mgh_test.go.
type Problem struct {
	Name  string    // objective function in this package
	MGH   int       // problem number in MGH 1981, §3
	N     int       // dimension
	Start []float64 // standard starting point x₀
}

// Problems lists the problems checked. Every start is MGH's x₀ for that
// problem (MGH 1981, §3, the "x₀ =" line of each problem) and, except for
// Powell singular, also the start gonum's own tests use
// (optimize/unconstrained_test.go, v0.17.0).
var Problems = []Problem{
	{"Rosenbrock", 1, 2, []float64{-1.2, 1}},                                                     // unconstrained_test.go: ExtendedRosenbrock x: {-1.2, 1}
	{"PowellBadlyScaled", 3, 2, []float64{0, 1}},                                                 // unconstrained_test.go: PowellBadlyScaled x: {0, 1}
	{"BrownBadlyScaled", 4, 2, []float64{1, 1}},                                                  // unconstrained_test.go: BrownBadlyScaled x: {1, 1}
	{"Beale", 5, 2, []float64{1, 1}},                                                             // unconstrained_test.go: Beale x: {1, 1}
	{"HelicalValley", 7, 3, []float64{-1, 0, 0}},                                                 // unconstrained_test.go: HelicalValley x: {-1, 0, 0}
	{"Gaussian", 9, 3, []float64{0.4, 1, 0}},                                                     // unconstrained_test.go: Gaussian x: {0.4, 1, 0}
	{"GulfRD", 11, 3, []float64{5, 2.5, 0.15}},                                                   // unconstrained_test.go: GulfResearchAndDevelopment x: {5, 2.5, 0.15}
	{"Box3D", 12, 3, []float64{0, 10, 20}},                                                       // unconstrained_test.go: Box3D x: {0, 10, 20}
	{"PowellSingular", 13, 4, []float64{3, -1, 0, 1}},                                            // MGH (13): x₀ = (3, −1, 0, 1); gonum's tests start ExtendedPowellSingular at {3, −1, 0, 3} instead
	{"Wood", 14, 4, []float64{-3, -1, -3, -1}},                                                   // unconstrained_test.go: Wood x: {-3, -1, -3, -1}
	{"BrownDennis", 16, 4, []float64{25, 5, -5, -1}},                                             // unconstrained_test.go: BrownAndDennis x: {25, 5, -5, -1}
	{"BiggsEXP6", 18, 6, []float64{1, 2, 1, 1, 1, 1}},                                            // unconstrained_test.go: BiggsEXP6 x: {1, 2, 1, 1, 1, 1}
	{"Watson6", 20, 6, []float64{0, 0, 0, 0, 0, 0}},                                              // unconstrained_test.go: Watson x: {0, 0, 0, 0, 0, 0}
	{"Watson9", 20, 9, []float64{0, 0, 0, 0, 0, 0, 0, 0, 0}},                                     // unconstrained_test.go: Watson x: {0, …, 0} (9)
	{"PenaltyI4", 23, 4, []float64{1, 2, 3, 4}},                                                  // MGH (23): x₀ = (ξⱼ), ξⱼ = j; unconstrained_test.go uses it for n = 10
	{"PenaltyI10", 23, 10, []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}},                             // unconstrained_test.go: PenaltyI x: {1, …, 10}
	{"PenaltyII4", 24, 4, []float64{0.5, 0.5, 0.5, 0.5}},                                         // unconstrained_test.go: PenaltyII x: {0.5, 0.5, 0.5, 0.5}
	{"PenaltyII10", 24, 10, []float64{0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5}},         // unconstrained_test.go: PenaltyII x: {0.5, …} (10)
	{"VariablyDimensioned10", 25, 10, []float64{0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1, 0}}, // MGH (25): ξⱼ = 1 − j/n; unconstrained_test.go newVariablyDimensioned
	{"Trigonometric10", 26, 10, []float64{0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1}},     // MGH (26): ξⱼ = 1/n; unconstrained_test.go: Trigonometric x: {0.1, …}
}

// Directions and Derivatives are crossed with every problem; every step and
// stop key is left at its default (the step rule then follows the
// direction: Wolfe for the quasi-Newton directions, strong Wolfe for
// nonlinear CG).
var (
	Directions  = []string{"bfgs", "lbfgs", "cg"}
	Derivatives = []string{"analytic", "central"}
)

// ExpectedEnds are the excluded combinations (see mgh_test.go) whose run
// does not converge: the spec names the status each ends with, so that
// its generated test asserts that end instead of convergence.
var ExpectedEnds = map[string]string{
	"PowellBadlyScaledCGAnalytic": "stalled",
	"Watson9CGCentral":            "out of evaluations",
}

// MinimizerName is the generated minimizer's name for one combination, e.g.
// BealeBFGSAnalytic.
func MinimizerName(p Problem, direction, derivative string) string {
	dir := map[string]string{"bfgs": "BFGS", "lbfgs": "LBFGS", "cg": "CG"}[direction]
	der := map[string]string{"analytic": "Analytic", "central": "Central"}[derivative]
	return p.Name + dir + der
}
