package rules

import "fmt"

// Derivative is the spec's derivative: where the gradient comes from.
var Derivative = &Choice{Key: "derivative", Default: "central",
	Doc: "where the gradient comes from"}

// Derivative sources.
var (
	Analytic = Derivative.register(&Entry{
		Name:             "analytic",
		Summary:          "the user's own gradient function (spec key `gradient`); costs no objective calls",
		Math:             "g = gradient(x); the generated test checks it against central differences",
		References:       []string{NocedalWright + ", §8.1 (gradient checking)"},
		Picks:            Picks{"derivative": "analyticGradient", "calibrate": "calibrateNothing", "gradientError": "exactGradient", "diagonalCurvature": "probedCurvature"},
		ResidualPicks:    Picks{"jacobian": "rowsJacobian", "jacobianError": "exactJacobian"},
		ResidualSummary:  "the user's own Jacobian of the residuals (spec key `jacobian`), g = Jᵀr; costs no residual calls",
		GradientCalls:    func(dim int) int { return 0 },
		CalibrationCalls: func(dim int) int { return 0 },
		Exact:            true,
	})
	Automatic = Derivative.register(&Entry{
		Name:             "automatic",
		Summary:          "thalweg differentiates the objective's own Go source (forward mode) and writes the gradient beside the minimizer; costs no objective calls",
		Math:             "each float v that depends on x carries its tangent ∂v ∈ ℝᴺ; a statement v = φ(u₁…uₘ) becomes ∂v = Σⱼ (∂φ/∂uⱼ)·∂uⱼ, the partials from a reverse sweep over the statement's expression, one loop over the N components; a read of xᵢ has the tangent eᵢ; exact to rounding",
		References:       []string{GriewankWalther + ", §3.1 and §10.2", BischofADIFOR},
		Picks:            Picks{"derivative": "analyticGradient", "calibrate": "calibrateNothing", "gradientError": "exactGradient", "diagonalCurvature": "probedCurvature"},
		ResidualPicks:    Picks{"jacobian": "rowsJacobian", "jacobianError": "exactJacobian"},
		ResidualSummary:  "thalweg differentiates the residuals' own Go source (forward mode) into their Jacobian by rows, g = Jᵀr; costs no residual calls",
		GradientCalls:    func(dim int) int { return 0 },
		CalibrationCalls: func(dim int) int { return 0 },
		Exact:            true,
		Derived:          true,
	})
	Forward = Derivative.register(&Entry{
		Name:             "forward",
		Summary:          "forward differences: dim objective calls per gradient, intervals from the objective's curvature, error O(√u)",
		Math:             "gᵢ ≈ (f(x + hᵢeᵢ) − f(x))/hᵢ, hᵢ = 2√(ε_A/|f″|) with f″ estimated along eᵢ (2 calls per unknown), error bound 2(hᵢ|f″|/2 + 2ε_A/hᵢ), ε_A = 4u(|f| + Σ|gᵢxᵢ|); one-sided three-point probes at a bound",
		References:       []string{GillMurraySaundersWright, NocedalWright + ", eq. 8.1 and §8.1"},
		Picks:            Picks{"derivative": "forwardDifference", "calibrate": "calibrateForward", "gradientError": "forwardError", "diagonalCurvature": "calibratedCurvature"},
		ResidualPicks:    Picks{"jacobian": "forwardJacobian", "jacobianError": "forwardJacobianError"},
		ResidualSummary:  "the Jacobian by forward differences of the residuals, hⱼ = √u·|xⱼ| (√u at 0, as MINPACK): dim residual calls per Jacobian, error O(√u); g = Jᵀr",
		GradientCalls:    func(dim int) int { return dim },
		CalibrationCalls: func(dim int) int { return 2 * dim },
		State:            differenceState,
	})
	Central = Derivative.register(&Entry{
		Name:             "central",
		Summary:          "central differences: 2·dim objective calls per gradient, intervals from the objective's curvature, error O(u^(2/3))",
		Math:             "gᵢ ≈ (f(x + hᵢeᵢ) − f(x − hᵢeᵢ))/(2hᵢ), hᵢ = ∛(3ε_A/|f‴|) with f‴ estimated along eᵢ (4 calls per unknown), error bound 2(hᵢ²|f‴|/6 + ε_A/hᵢ), ε_A = 4u(|f| + Σ|gᵢxᵢ|); at a bound the one-sided three-point formula, bound 2(hᵢ²|f‴|/3 + 4ε_A/hᵢ)",
		References:       []string{GillMurraySaundersWright, NocedalWright + ", eq. 8.7 and §8.1"},
		Picks:            Picks{"derivative": "centralDifference", "calibrate": "calibrateCentral", "gradientError": "centralError", "diagonalCurvature": "calibratedCurvature"},
		ResidualPicks:    Picks{"jacobian": "centralJacobian", "jacobianError": "centralJacobianError"},
		ResidualSummary:  "the Jacobian by central differences of the residuals, hⱼ = ∛u·|xⱼ| (∛u at 0): 2·dim residual calls per Jacobian, error O(u^(2/3)); g = Jᵀr",
		GradientCalls:    func(dim int) int { return 2 * dim },
		CalibrationCalls: func(dim int) int { return 4 * dim },
		State:            differenceState,
	})
)

// differenceState is the intervals and curvatures differences keep: two
// vectors in one variable.
func differenceState(dim, elemBytes int, value func(*Param) float64) (int, string) {
	return 2 * dim * elemBytes, fmt.Sprintf("2 vectors of %d", dim)
}
