package rules

// Derivative sources.
var (
	Analytic = register(&derivatives, Entry{
		Name:       "analytic",
		Summary:    "the user's own gradient function (spec key `gradient`); costs no objective calls",
		Math:       "g = gradient(x); the generated test checks it against central differences",
		References: []string{NocedalWright + ", §8.1 (gradient checking)"},
		Kernel:     "analyticGradient",
	})
	Forward = register(&derivatives, Entry{
		Name:       "forward",
		Summary:    "forward differences: dim objective calls per gradient, error O(√u)",
		Math:       "gᵢ ≈ (f(x + hᵢeᵢ) − f(x))/hᵢ, hᵢ = √u·max(1, |xᵢ|)",
		References: []string{NocedalWright + ", eq. 8.1 and §8.1"},
		Kernel:     "forwardDifference",
	})
	Central = register(&derivatives, Entry{
		Name:       "central",
		Summary:    "central differences: 2·dim objective calls per gradient, error O(u^(2/3))",
		Math:       "gᵢ ≈ (f(x + hᵢeᵢ) − f(x − hᵢeᵢ))/(2hᵢ), hᵢ = ∛u·max(1, |xᵢ|)",
		References: []string{NocedalWright + ", eq. 8.7 and §8.1"},
		Kernel:     "centralDifference",
	})
)

// Cost returns the objective calls one gradient costs.
func Cost(source string, dim int) int {
	switch source {
	case "forward":
		return dim
	case "central":
		return 2 * dim
	}
	return 0
}
