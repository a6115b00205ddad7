package rules

import "fmt"

// Direction is the spec's direction: the search direction at each step.
var Direction = &Choice{Key: "direction", Default: "bfgs",
	Doc: "the search direction at each step"}

// Directions.
var (
	Steepest = Direction.register(&Entry{
		Name:    "steepest",
		Summary: "steepest descent, d = −∇f; no memory, linear convergence",
		Math:    "d = −∇f(x); later line searches start at α₋₁·(g₋₁ᵀd₋₁)/(gᵀd) (N&W eq. 3.60)",
		References: []string{
			NocedalWright + ", §3.3 and eq. 3.60",
		},
		Picks:       Picks{"direction": "steepestDirection"},
		DefaultRule: ArmijoRule,
	})
	BFGS = Direction.register(&Entry{
		Name:    "bfgs",
		Summary: "BFGS quasi-Newton with a dense inverse-Hessian approximation (dim² numbers)",
		Math:    "d = −H∇f; H₊ = (I − ρsyᵀ)H(I − ρysᵀ) + ρssᵀ, ρ = 1/yᵀs, H₀ = (yᵀs/yᵀy)I; skip when yᵀs ≤ √u‖s‖‖y‖",
		References: []string{
			NocedalWright + ", eqs. 6.17 and 6.20",
			NocedalWright + ", §6.1, condition 6.7 (why pairs with yᵀs ≤ 0 are skipped)",
		},
		Picks:       Picks{"direction": "bfgsDirection"},
		DefaultRule: WolfeRule,
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			bytes := dim*dim*elemBytes + 8
			return bytes, fmt.Sprintf("a %d×%d matrix of", dim, dim)
		},
		SmallerState: `use direction "lbfgs" or "cg"`,
		Fallback:     LBFGS,
	})
	LBFGS = Direction.register(&Entry{
		Name:    "lbfgs",
		Summary: "limited-memory BFGS: the last `memory` pairs, two-loop recursion (2·memory·dim numbers)",
		Math:    "d = −H∇f by Algorithm 7.4 with H₀ = γI, γ = sᵀy/yᵀy of the newest pair",
		Params:  []*Param{Memory},
		References: []string{
			LiuNocedal,
			NocedalWright + ", Algorithm 7.4 and eq. 7.20",
		},
		Picks:       Picks{"direction": "lbfgsDirection"},
		DefaultRule: WolfeRule,
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			memory := int(value(Memory))
			return 2*memory*dim*elemBytes + memory*elemBytes + 16, fmt.Sprintf("%d vectors (memory %d) of %d", 2*memory, memory, dim)
		},
		SmallerState: `lower memory or use direction "cg"`,
		Fallback:     CG,
	})
	CG = Direction.register(&Entry{
		Name:    "cg",
		Summary: "nonlinear conjugate gradients, Polak–Ribière clipped at zero (PR+), restarted when successive gradients are far from orthogonal (Powell)",
		Math:    "d = −g + βd₋₁, β = max(gᵀ(g − g₋₁)/‖g₋₁‖², 0); d = −g when |gᵀg₋₁| ≥ 0.1‖g‖² (N&W eq. 5.52); pair with strong-wolfe, c2 = 0.1",
		References: []string{
			PolakRibiere,
			NocedalWright + ", eqs. 5.44–5.45, §5.2",
		},
		Picks:       Picks{"direction": "cgDirection"},
		DefaultRule: StrongWolfeRule,
		// c2 = 0.1 for nonlinear conjugate gradients (Nocedal & Wright
		// 2006, §3.1, the paragraph after eq. 3.7).
		Defaults: map[*Param]float64{Curvature: 0.1},
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			return 2*dim*elemBytes + 16, fmt.Sprintf("2 vectors of %d", dim)
		},
		SmallerState:   `use direction "steepest"`,
		Fallback:       Steepest,
		NeedsCurvature: true,
		NoBounds:       `its directions stay conjugate, and descend, only along unbroken lines, which projection onto the box breaks; use direction "lbfgs" or "bfgs" with bounds`,
	})
)
