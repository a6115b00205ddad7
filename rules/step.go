package rules

import "math"

// Parameters shared by the step rules; each rule lists those it reads.
var (
	// Initial is the first trial step of the first line search, and the
	// only step of the fixed rule.
	Initial = Param{Key: "initial", Default: 1, Low: 0, High: math.Inf(1), LowOpen: true,
		Doc: "first trial step; 1 suits quasi-Newton directions (Nocedal & Wright 2006, §3.5)"}
	// Shrink is the backtracking factor.
	Shrink = Param{Key: "shrink", Default: 0.5, Low: 0, High: 1, LowOpen: true, HighOpen: true,
		Doc: "backtracking factor ρ; 0.5 is common practice (Nocedal & Wright 2006, Algorithm 3.1 leaves ρ in (0,1))"}
	// Decrease is the sufficient-decrease constant c1.
	Decrease = Param{Key: "decrease", Default: 1e-4, Low: 0, High: 1, LowOpen: true, HighOpen: true,
		Doc: "sufficient-decrease constant c1; 1e-4 after Nocedal & Wright 2006, §3.1"}
	// Trials caps the trial points of one line search.
	Trials = Param{Key: "trials", Default: 40, Low: 1, High: 1000, Integer: true,
		Doc: "most trial points (objective values) in one line search; 40 halvings span 12 decades (common practice)"}
	// Curvature is the Wolfe curvature constant c2; its default depends on
	// the direction (see CurvatureDefault).
	Curvature = Param{Key: "curvature", Default: 0.9, Low: 0, High: 1, LowOpen: true, HighOpen: true,
		Doc: "curvature constant c2 in (c1, 1); 0.9 for quasi-Newton, 0.1 for cg (Nocedal & Wright 2006, §3.1)"}
	// Interpolate switches backtracking from a fixed shrink to safeguarded
	// quadratic then cubic interpolation.
	Interpolate = Param{Key: "interpolate", Default: 0, Low: 0, High: 1, Integer: true,
		Doc: "true: pick each backtrack by quadratic then cubic interpolation, kept in [0.1t, 0.5t] (Nocedal & Wright 2006, §3.5)"}
)

// CurvatureDefault returns c2's default for a direction: 0.1 for nonlinear
// conjugate gradients, 0.9 otherwise (Nocedal & Wright 2006, §3.1, the
// paragraph after eq. 3.7).
func CurvatureDefault(direction string) float64 {
	if direction == "cg" {
		return 0.1
	}
	return 0.9
}

// Step rules.
var (
	Fixed = register(&stepRules, Entry{
		Name:    "fixed",
		Summary: "always step by `initial`; the hand-written gradient loop, made bounded and NaN-safe",
		Math:    "x₊ = x + initial·d; converges for steepest descent only when initial < 2/L, L the gradient's Lipschitz constant",
		Params:  []Param{Initial},
		References: []string{
			NocedalWright + ", §3.3",
		},
		Kernel: "fixedStep",
	})
	SimpleDecrease = register(&stepRules, Entry{
		Name:    "decrease",
		Summary: "backtrack from `initial` until f decreases at all",
		Math:    "accept t when f(x + t·d) < f(x); otherwise t ← shrink·t (or interpolate)",
		Params:  []Param{Initial, Shrink, Trials, Interpolate},
		References: []string{
			NocedalWright + ", §3.1 (why simple decrease is not enough)",
		},
		Kernel: "simpleDecrease",
	})
	ArmijoRule = register(&stepRules, Entry{
		Name:    "armijo",
		Summary: "backtrack from `initial` until the Armijo sufficient-decrease test holds",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd; otherwise t ← shrink·t (or interpolate)",
		Params:  []Param{Initial, Shrink, Decrease, Trials, Interpolate},
		References: []string{
			Armijo1966,
			NocedalWright + ", eq. 3.4, Algorithm 3.1, §3.5",
			DennisSchnabel + ", Algorithm A6.3.1 (interpolation safeguards)",
		},
		Kernel: "armijoDecrease",
	})
	WolfeRule = register(&stepRules, Entry{
		Name:    "wolfe",
		Summary: "bracket and zoom until sufficient decrease and the curvature condition hold",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd and ∇f(x + t·d)ᵀd ≥ c2·∇f(x)ᵀd",
		Params:  []Param{Initial, Decrease, Curvature, Trials},
		References: []string{
			Wolfe1969,
			NocedalWright + ", eq. 3.6, Algorithms 3.5–3.6, §3.5",
			MoreThuente,
		},
		Kernel: "wolfeSearch",
	})
	StrongWolfeRule = register(&stepRules, Entry{
		Name:    "strong-wolfe",
		Summary: "bracket and zoom until sufficient decrease and the strong curvature condition hold",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd and |∇f(x + t·d)ᵀd| ≤ c2·|∇f(x)ᵀd|",
		Params:  []Param{Initial, Decrease, Curvature, Trials},
		References: []string{
			Wolfe1969,
			NocedalWright + ", eq. 3.7, Algorithms 3.5–3.6, §3.5",
			MoreThuente,
		},
		Kernel: "wolfeSearch",
	})
)
