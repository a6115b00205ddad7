package rules

// StepRule is the spec's step.rule: how far to move along the direction.
var StepRule = &Choice{Table: "step", Key: "rule", Default: "armijo",
	Doc: "how far to move along the search direction"}

// backtrackingCalls is the most objective calls of a backtracking
// iteration: every trial, then one gradient at the accepted point.
func backtrackingCalls(trials, gradientCalls int) int { return trials + gradientCalls }

// wolfeCalls is the most objective calls of a Wolfe iteration: a gradient
// at every trial at most.
func wolfeCalls(trials, gradientCalls int) int { return trials * (1 + gradientCalls) }

// Step rules.
var (
	Fixed = StepRule.register(&Entry{
		Name:    "fixed",
		Summary: "always step by `initial`; the hand-written gradient loop, made bounded and NaN-safe",
		Math:    "x₊ = x + initial·d; converges for steepest descent only when initial < 2/L, L the gradient's Lipschitz constant",
		Params:  []*Param{Initial},
		References: []string{
			NocedalWright + ", §3.3",
		},
		Picks:          Picks{"lineSearch": "fixedStep"},
		IterationCalls: func(trials, gradientCalls int) int { return 1 + gradientCalls },
	})
	SimpleDecrease = StepRule.register(&Entry{
		Name:    "decrease",
		Summary: "backtrack from `initial` until f decreases at all",
		Math:    "accept t when f(x + t·d) < f(x); otherwise t ← shrink·t (or interpolate)",
		Params:  []*Param{Initial, Shrink, Trials, Interpolate},
		References: []string{
			NocedalWright + ", §3.1 (why simple decrease is not enough)",
		},
		Picks:          Picks{"lineSearch": "backtrackSearch", "acceptable": "simpleDecrease"},
		IterationCalls: backtrackingCalls,
	})
	ArmijoRule = StepRule.register(&Entry{
		Name:    "armijo",
		Summary: "backtrack from `initial` until the Armijo sufficient-decrease test holds",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd; otherwise t ← shrink·t (or interpolate)",
		Params:  []*Param{Initial, Shrink, Decrease, Trials, Interpolate},
		References: []string{
			Armijo1966,
			NocedalWright + ", eq. 3.4, Algorithm 3.1, §3.5",
			DennisSchnabel + ", Algorithm A6.3.1 (interpolation safeguards)",
		},
		Picks:          Picks{"lineSearch": "backtrackSearch", "acceptable": "armijoDecrease"},
		BoundedPicks:   Picks{"acceptable": "arcDecrease"},
		IterationCalls: backtrackingCalls,
		Tune:           true,
	})
	WolfeRule = StepRule.register(&Entry{
		Name:    "wolfe",
		Summary: "bracket and zoom until sufficient decrease and the curvature condition hold",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd and ∇f(x + t·d)ᵀd ≥ c2·∇f(x)ᵀd",
		Params:  []*Param{Initial, Decrease, Curvature, Trials},
		References: []string{
			Wolfe1969,
			NocedalWright + ", eq. 3.6, Algorithms 3.5–3.6, §3.5",
			MoreThuente,
		},
		Picks:          Picks{"lineSearch": "wolfeSearch", "curvatureMet": "weakCurvature"},
		IterationCalls: wolfeCalls,
		Curvature:      true,
		Tune:           true,
	})
	StrongWolfeRule = StepRule.register(&Entry{
		Name:    "strong-wolfe",
		Summary: "bracket and zoom until sufficient decrease and the strong curvature condition hold",
		Math:    "accept t when f(x + t·d) ≤ f(x) + c1·t·∇f(x)ᵀd and |∇f(x + t·d)ᵀd| ≤ c2·|∇f(x)ᵀd|",
		Params:  []*Param{Initial, Decrease, Curvature, Trials},
		References: []string{
			Wolfe1969,
			NocedalWright + ", eq. 3.7, Algorithms 3.5–3.6, §3.5",
			MoreThuente,
		},
		Picks:          Picks{"lineSearch": "wolfeSearch", "curvatureMet": "strongCurvature"},
		IterationCalls: wolfeCalls,
		Curvature:      true,
		Tune:           true,
	})
)

// Damping is the Levenberg–Marquardt step rule.
var Damping = StepRule.register(&Entry{
	Name:    "damping",
	Summary: "Levenberg–Marquardt damping: try x + d(λ), raise λ until the decrease is at least c1 of the Gauss–Newton model's, lower it after a good step",
	Math:    "accept s = d(λ) when ρ = (f(x) − f(x + s))/(−gᵀs − ½sᵀJᵀJs) ≥ c1, then λ ← λ·max(1/3, 1 − (2ρ − 1)³), ν ← 2; else λ ← λν, ν ← 2ν and solve again",
	Params:  []*Param{Decrease, Trials},
	References: []string{
		MoreLM,
		"H. B. Nielsen, Damping parameter in Marquardt's method, IMM-REP-1999-05, Technical University of Denmark, 1999 (from memory)",
		"K. Madsen, H. B. Nielsen and O. Tingleff, Methods for Non-Linear Least Squares Problems, 2nd ed., IMM, Technical University of Denmark, 2004, §3.2 (from memory)",
	},
	Picks:          Picks{"lineSearch": "dampedSearch"},
	IterationCalls: backtrackingCalls,
	Exclusive:      true,
	Tune:           true,
})
