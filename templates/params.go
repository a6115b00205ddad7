package templates

// Tunables. gen drops these declarations and emits the spec's values as
// constants of the same names, so the kernels read them the same way.
const (
	stepInitial   = 1.0  // first trial step
	stepShrink    = 0.5  // backtracking factor
	stepDecrease  = 1e-4 // sufficient-decrease constant c1
	stepCurvature = 0.9  // curvature constant c2 (Wolfe rules)
	stepTrials    = 40   // objective calls allowed in one line search

	// ∛u for the unit roundoff u = 2⁻⁵³ of float64, the scale of the probe
	// the forward-difference calibration takes (Nocedal & Wright 2006, §8.1).
	centralScale = 4.806217383937352e-06
	unitRoundoff = 0x1p-53 // u of float64

	largestFinite = 0x1.fffffffffffffp1023 // the largest finite float64

	lbfgsMemory = 5 // L-BFGS correction pairs

	activeMargin = 1e-3 // ε̄ of the ε-active set at a bound (see boundDirection)
)

// Selectors used only by this package's tests to pick among the
// alternatives; gen picks one at generation time instead.
var (
	derivativeSource  = sourceAnalytic
	directionKind     = kindBFGS
	stepRule          = ruleArmijo
	backtrackKind     = backtrackShrink
	gradientTest      = testRelative
	derivativeCost    = 0     // objective calls per gradient, set with derivativeSource
	calibrationCost   = 0     // objective calls of choosing the difference intervals, set with derivativeSource
	iterationCalls    = 40    // most objective calls of a line search and the gradient at its step, set with stepRule
	settleCalls       = 0     // most objective calls of settle: calibrationCost + 2·derivativeCost, or dim for a combined objective
	boxed             = false // whether the spec has bounds
	combined          = false // whether the objective gives its gradient with its value
	residualObjective = false // whether the objective gives residuals, f = ½‖r‖²
	jacobianColumns   = false // whether the analytic Jacobian is written transposed, J[j][i] = ∂rᵢ/∂xⱼ
)

// Alternatives for the selectors above.
const (
	sourceAnalytic = iota
	sourceForward
	sourceCentral
)

const (
	kindSteepest = iota
	kindBFGS
	kindLBFGS
	kindCG
	kindGaussNewton
	kindLevenbergMarquardt
)

const (
	ruleFixed = iota
	ruleDecrease
	ruleArmijo
	ruleWolfe
	ruleStrongWolfe
	ruleDamping
)

const (
	backtrackShrink = iota
	backtrackInterpolate
)

const (
	testRelative = iota
	testAbsolute
)
