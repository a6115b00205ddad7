package rules

// GradientTest is the spec's stop.gradient_test: how the stop test
// measures the gradient.
var GradientTest = &Choice{Table: "stop", Key: "gradient_test", Default: "relative",
	Doc: "how the gradient test measures the gradient"}

// Gradient tests.
var (
	Relative = GradientTest.register(&Entry{
		Name:    "relative",
		Summary: "the relative gradient, max (|gᵢ| + eᵢ)·max(|xᵢ|, 1)/max(|f|, 1): the same test whatever the units of f and of each xᵢ above 1",
		Math:    "max over i of (|∂f/∂xᵢ| + eᵢ)·max(|xᵢ|, 1)/max(|f(x)|, 1), eᵢ the error bound of differences (0 for an analytic gradient)",
		References: []string{
			DennisSchnabel + ", §7.2 (relative gradient, typical x and f of 1)",
		},
		Picks: Picks{"gradientMeasure": "relativeGradient"},
	})
	Absolute = GradientTest.register(&Entry{
		Name:    "absolute",
		Summary: "the largest gradient component, max (|gᵢ| + eᵢ), in the units of f per unit of x",
		Math:    "max over i of |∂f/∂xᵢ| + eᵢ",
		References: []string{
			NocedalWright + ", §2.1 (first-order necessary condition ∇f = 0)",
		},
		Picks: Picks{"gradientMeasure": "absoluteGradient"},
	})
)
