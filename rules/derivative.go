package rules

// Derivative is the spec's derivative: where the gradient comes from.
var Derivative = &Choice{Key: "derivative", Default: "central",
	Doc: "where the gradient comes from"}

// Derivative sources.
var (
	Analytic = Derivative.register(&Entry{
		Name:          "analytic",
		Summary:       "the user's own gradient function (spec key `gradient`); costs no objective calls",
		Math:          "g = gradient(x); the generated test checks it against central differences",
		References:    []string{NocedalWright + ", §8.1 (gradient checking)"},
		Picks:         Picks{"derivative": "analyticGradient"},
		GradientCalls: func(dim int) int { return 0 },
	})
	Forward = Derivative.register(&Entry{
		Name:          "forward",
		Summary:       "forward differences: dim objective calls per gradient, error O(√u)",
		Math:          "gᵢ ≈ (f(x + hᵢeᵢ) − f(x))/hᵢ, hᵢ = √u·max(1, |xᵢ|)",
		References:    []string{NocedalWright + ", eq. 8.1 and §8.1"},
		Picks:         Picks{"derivative": "forwardDifference"},
		GradientCalls: func(dim int) int { return dim },
	})
	Central = Derivative.register(&Entry{
		Name:          "central",
		Summary:       "central differences: 2·dim objective calls per gradient, error O(u^(2/3))",
		Math:          "gᵢ ≈ (f(x + hᵢeᵢ) − f(x − hᵢeᵢ))/(2hᵢ), hᵢ = ∛u·max(1, |xᵢ|)",
		References:    []string{NocedalWright + ", eq. 8.7 and §8.1"},
		Picks:         Picks{"derivative": "centralDifference"},
		GradientCalls: func(dim int) int { return 2 * dim },
	})
)
