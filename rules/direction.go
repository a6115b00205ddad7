package rules

import "math"

// Memory is the L-BFGS correction-pair count.
var Memory = Param{Key: "memory", Default: 5, Low: 1, High: 100, Integer: true,
	Doc: "correction pairs kept; 3–20 usually suffice (Nocedal & Wright 2006, §7.2), 5 keeps the stack small on devices"}

// Directions.
var (
	Steepest = register(&directions, Entry{
		Name:    "steepest",
		Summary: "steepest descent, d = −∇f; no memory, linear convergence",
		Math:    "d = −∇f(x); later line searches start at α₋₁·(g₋₁ᵀd₋₁)/(gᵀd) (N&W eq. 3.60)",
		References: []string{
			NocedalWright + ", §3.3 and eq. 3.60",
		},
		Kernel: "steepestDirection",
	})
	BFGS = register(&directions, Entry{
		Name:    "bfgs",
		Summary: "BFGS quasi-Newton with a dense inverse-Hessian approximation (dim² numbers)",
		Math:    "d = −H∇f; H₊ = (I − ρsyᵀ)H(I − ρysᵀ) + ρssᵀ, ρ = 1/yᵀs, H₀ = (yᵀs/yᵀy)I; skip when yᵀs ≤ √u‖s‖‖y‖",
		References: []string{
			NocedalWright + ", eqs. 6.17 and 6.20",
			DennisSchnabel + ", Algorithm A9.4.1 (skip test, recalled from memory)",
		},
		Kernel: "bfgsDirection",
	})
	LBFGS = register(&directions, Entry{
		Name:    "lbfgs",
		Summary: "limited-memory BFGS: the last `memory` pairs, two-loop recursion (2·memory·dim numbers)",
		Math:    "d = −H∇f by Algorithm 7.4 with H₀ = γI, γ = sᵀy/yᵀy of the newest pair",
		Params:  []Param{Memory},
		References: []string{
			LiuNocedal,
			NocedalWright + ", Algorithm 7.4 and eq. 7.20",
		},
		Kernel: "lbfgsDirection",
	})
	CG = register(&directions, Entry{
		Name:    "cg",
		Summary: "nonlinear conjugate gradients, Polak–Ribière clipped at zero (PR+), restarted every dim steps",
		Math:    "d = −g + βd₋₁, β = max(gᵀ(g − g₋₁)/‖g₋₁‖², 0); pair with strong-wolfe, c2 = 0.1",
		References: []string{
			PolakRibiere,
			NocedalWright + ", eqs. 5.44–5.45, §5.2",
		},
		Kernel: "cgDirection",
	})
)

// Stop limits; every minimizer reads all four.
var (
	StopGradient = Param{Key: "gradient", Default: 1e-8, Low: 0, High: math.Inf(1),
		Doc: "stop when the largest |∂f/∂xᵢ| ≤ this; default 1e-8 for float64 (1e-6 with forward differences), 1e-4 for float32 (1e-3 central, 1e-2 forward): above the differences' error, common practice"}
	StopStep = Param{Key: "step", Default: 1e-14, Low: 0, High: math.Inf(1),
		Doc: "stop when every |Δxᵢ| ≤ this·(|xᵢ| + 1); default 1e-14 for float64, 1e-6 for float32 (common practice)"}
	StopIterations = Param{Key: "iterations", Default: 500, Low: 1, High: 1e9, Integer: true,
		Doc: "most accepted steps"}
	StopEvaluations = Param{Key: "evaluations", Default: 10000, Low: 1, High: 1e9, Integer: true,
		Doc: "hard cap on objective calls, finite differences included; never exceeded"}
)

// StopDefault returns a stop limit's default for an element type and
// derivative source. The gradient limit sits well above the error of the
// gradient, or no step could show progress near a minimizer: differences
// err by about √u (forward) and u^(2/3) (central) relative to the scale of
// f (Nocedal & Wright 2006, §8.1), so their limits are looser; the
// factors are common practice for problems scaled near 1.
func StopDefault(p Param, elem, derivative string) float64 {
	switch {
	case p.Key == "gradient":
		return gradientDefaults[elem == "float32"][derivative]
	case p.Key == "step" && elem == "float32":
		return 1e-6
	}
	return p.Default
}

// gradientDefaults are the default gradient limits, by float32 and source.
var gradientDefaults = map[bool]map[string]float64{
	false: {"analytic": 1e-8, "central": 1e-8, "forward": 1e-6},
	true:  {"analytic": 1e-4, "central": 1e-3, "forward": 1e-2},
}
