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
		Picks:       Picks{"direction": "steepestDirection", "solveDirection": "memoryDirection", "gradientChange": "noChange", "learnCurvature": "learnNothing"},
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
		Picks:       Picks{"direction": "bfgsDirection", "solveDirection": "memoryDirection", "gradientChange": "difference", "learnCurvature": "learnNothing"},
		DefaultRule: WolfeRule,
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			bytes := dim*dim*elemBytes + 8
			return bytes, fmt.Sprintf("a %d×%d matrix of", dim, dim)
		},
		SmallerState: `use direction "lbfgs" or "cg"`,
		Fallback:     LBFGS,
		// bench (README, Performance): lbfgs solves variably dimensioned
		// (MGH 25) 1.7× faster than bfgs at N = 20 and 6.7× at 100, where
		// bfgs's N² update dominates; at 10 it is 1.2× faster there but
		// 1.15× slower on extended Rosenbrock (MGH 21), and below 10 bfgs
		// is as fast or faster.
		FallbackFrom: 20,
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
		Picks:       Picks{"direction": "lbfgsDirection", "solveDirection": "memoryDirection", "gradientChange": "difference", "learnCurvature": "learnNothing"},
		DefaultRule: WolfeRule,
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			memory := int(value(Memory))
			return 2*memory*dim*elemBytes + (memory+1)*elemBytes + 16, fmt.Sprintf("%d vectors (memory %d) of %d", 2*memory, memory, dim)
		},
		SmallerState: `lower memory or use direction "cg"`,
		Fallback:     CG,
	})
	CG = Direction.register(&Entry{
		Name:    "cg",
		Summary: "nonlinear conjugate gradients, Polak–Ribière clipped at zero (PR+), restarted when successive gradients are far from orthogonal (Powell)",
		Math:    "d = −g + βd₋₁, β = max(gᵀ(g − g₋₁)/‖g₋₁‖², 0); d = −g when |gᵀg₋₁| ≥ 0.1‖g‖² (N&W eq. 5.52); pair with strong-wolfe, c2 = 0.1. After a stall, preconditioned by diag(1/b), b learnt from every pair by bᵢ₊ = bᵢ − (bᵢsᵢ)²/sᵀBs + yᵢ²/yᵀs: g becomes z = g/b in d and β, β = max(zᵀ(g − g₋₁)/z₋₁ᵀg₋₁, 0)",
		References: []string{
			PolakRibiere,
			NocedalWright + ", eqs. 5.44–5.45, §5.2",
			GilbertLemarechal + " (the diagonal update)",
		},
		Picks:       Picks{"direction": "cgDirection", "solveDirection": "memoryDirection", "gradientChange": "difference", "learnCurvature": "learnNothing"},
		DefaultRule: StrongWolfeRule,
		// c2 = 0.1 for nonlinear conjugate gradients (Nocedal & Wright
		// 2006, §3.1, the paragraph after eq. 3.7).
		Defaults: map[*Param]float64{Curvature: 0.1},
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			return 3*dim*elemBytes + 16, fmt.Sprintf("3 vectors of %d", dim)
		},
		SmallerState:   `use direction "steepest"`,
		Fallback:       Steepest,
		NeedsCurvature: true,
		NoBounds:       `its directions stay conjugate, and descend, only along unbroken lines, which projection onto the box breaks; use direction "lbfgs" or "bfgs" with bounds`,
	})
)

// The least-squares directions, for residual objectives f = ½‖r‖².
var (
	GaussNewton = Direction.register(&Entry{
		Name:    "gauss-newton",
		Summary: "Gauss–Newton for residual objectives: solve JᵀJ·d = −Jᵀr, with a line search (damped Gauss–Newton)",
		Math:    "d = −(JᵀJ)⁻¹Jᵀr by Cholesky; when a pivot falls to rounding, JᵀJ + τI with τ doubling from √u·max(JᵀJ)ᵢᵢ (N&W Algorithm 3.3)",
		References: []string{
			NocedalWright + ", §10.3, eq. 10.23",
			NocedalWright + ", Algorithm 3.3 (Cholesky with added multiple of the identity)",
			DennisSchnabel + ", §10.2 (damped Gauss–Newton)",
		},
		Picks:       Picks{"direction": "gaussNewtonDirection", "solveDirection": "gaussNewtonStep", "gradientChange": "noChange", "learnCurvature": "learnNothing"},
		DefaultRule: ArmijoRule,
		Residual:    true,
		Pairs:       []*Entry{Fixed, SimpleDecrease, ArmijoRule},
		PairsWhy:    "its step needs the Jacobian at the accepted trial, which only the last trial's residuals give; the backtracking rules accept the last trial, a Wolfe search may not",
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			return dim * dim * elemBytes, fmt.Sprintf("a %d×%d matrix (JᵀJ) of", dim, dim)
		},
		SmallerState: `use direction "lbfgs" on the residual objective`,
	})
	LevenbergMarquardt = Direction.register(&Entry{
		Name:    "levenberg-marquardt",
		Summary: "Levenberg–Marquardt for residual objectives: solve (B + λD)·d = −Jᵀr, B = JᵀJ or JᵀJ + S with S a secant estimate of Σrᵢ∇²rᵢ for large residuals, the damping λ adjusted like a trust region (step rule damping)",
		Math:    "D = diag of the largest (JᵀJ)ᵢᵢ seen (Moré 1978), λ₀ = 10⁻³; S₊ = τS + (wyᵀ + ywᵀ)/yᵀs − (wᵀs)yyᵀ/(yᵀs)², w = y − JᵀJs − τSs, τ = min(1, |sᵀ(y − JᵀJs)|/|sᵀSs|) (Dennis, Gay & Welsch 1981); B = JᵀJ + S when it predicted the last decrease better than JᵀJ; see step rule damping for the update of λ",
		References: []string{
			"D. W. Marquardt, An algorithm for least-squares estimation of nonlinear parameters, J. SIAM 11(2):431–441, 1963",
			MoreLM,
			"J. E. Dennis, D. M. Gay and R. E. Welsch, An adaptive nonlinear least-squares algorithm, ACM TOMS 7(3):348–368, 1981 (the structured secant model; from memory)",
			DennisSchnabel + ", §10.3 (large-residual problems)",
			NocedalWright + ", §10.3",
		},
		Picks:       Picks{"direction": "gaussNewtonDirection", "solveDirection": "dampedStep", "gradientChange": "difference", "learnCurvature": "secantUpdate"},
		DefaultRule: Damping,
		Residual:    true,
		Pairs:       []*Entry{Damping},
		PairsWhy:    "its step length comes from the damping λ, which step rule damping adjusts; a line search along one damped step would fight it",
		State: func(dim, elemBytes int, value func(*Param) float64) (int, string) {
			return 2*dim*dim*elemBytes + 5*dim*elemBytes + 4*elemBytes, fmt.Sprintf("two %d×%d matrices (JᵀJ and S), the damping and the secant pair of", dim, dim)
		},
		SmallerState: `use direction "lbfgs" on the residual objective`,
	})
)
