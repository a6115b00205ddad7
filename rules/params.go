package rules

import (
	"fmt"
	"math"
)

// The parameters, declared in one file so that their order of declaration
// is their order of registration: the order of the generated constants,
// and within each table the order `thalweg init` writes them in.
var (
	// Initial is the first trial step of the first line search, and the
	// only step of the fixed rule.
	Initial = param(&Param{Table: "step", Key: "initial", Const: "stepInitial", Label: "initial", Kind: Real,
		Default: 1, Low: 0, High: math.Inf(1), LowOpen: true,
		Doc: "first trial step; 1 suits quasi-Newton directions (Nocedal & Wright 2006, §3.5)"})
	// Shrink is the backtracking factor.
	Shrink = param(&Param{Table: "step", Key: "shrink", Const: "stepShrink", Label: "shrink", Kind: Real,
		Default: 0.5, Low: 0, High: 1, LowOpen: true, HighOpen: true,
		Doc: "backtracking factor ρ; 0.5 is common practice (Nocedal & Wright 2006, Algorithm 3.1 leaves ρ in (0,1))"})
	// Decrease is the sufficient-decrease constant c1.
	Decrease = param(&Param{Table: "step", Key: "decrease", Const: "stepDecrease", Label: "c1", Kind: Real,
		Default: 1e-4, Low: 0, High: 1, LowOpen: true, HighOpen: true,
		Doc: "sufficient-decrease constant c1; 1e-4 after Nocedal & Wright 2006, §3.1"})
	// Curvature is the Wolfe curvature constant c2; cg sets its own
	// default.
	Curvature = param(&Param{Table: "step", Key: "curvature", Const: "stepCurvature", Label: "c2", Kind: Real,
		Default: 0.9, Low: 0, High: 1, LowOpen: true, HighOpen: true, Exceeds: Decrease,
		Doc: "curvature constant c2 in (c1, 1); 0.9 for quasi-Newton, 0.1 for cg (Nocedal & Wright 2006, §3.1)"})
	// Trials caps the trial points of one line search.
	Trials = param(&Param{Table: "step", Key: "trials", Const: "stepTrials", Kind: Whole,
		Low: 1, High: 1000, DefaultFor: trialsDefault,
		Doc:     "most trial points (objective values) in one line search; default 1 + ⌈ln(max(stop.step, u)/initial)/ln(shrink)⌉, enough shrinks to go from the first trial to the step limit (shrink 1/2 for the Wolfe rules): 48 for float64, 21 for float32 at the other defaults",
		ShownAs: func(v float64) string { return fmt.Sprintf("at most %d trials per line search", int64(v)) }})
	// Interpolate switches backtracking from a fixed shrink to safeguarded
	// quadratic then cubic interpolation.
	Interpolate = param(&Param{Table: "step", Key: "interpolate", Kind: Switch,
		Doc: "true: pick each backtrack by quadratic then cubic interpolation, kept in [0.1t, 0.5t] (Nocedal & Wright 2006, §3.5)",
		On:  Picks{"backtrackTrial": "interpolatedTrial"},
		Off: Picks{"backtrackTrial": "shrunkTrial"},
		ShownAs: func(v float64) string {
			if v != 0 {
				return "trials by safeguarded quadratic/cubic interpolation"
			}
			return ""
		}})

	// Memory is the L-BFGS correction-pair count.
	Memory = param(&Param{Key: "memory", Const: "lbfgsMemory", Kind: Whole,
		Default: 5, Low: 1, High: 100,
		Doc:     "correction pairs kept; 3–20 usually suffice (Nocedal & Wright 2006, §7.2), 5 keeps the stack small on devices",
		ShownAs: func(v float64) string { return fmt.Sprintf("memory %d pairs", int64(v)) }})

	// Stop limits: every minimizer reads all four, and the generated
	// limits type has a field for each, which callers may change at run
	// time.
	StopGradient = param(&Param{Table: "stop", Key: "gradient", Limit: "Gradient", Kind: Real,
		Low: 0, High: math.Inf(1), DefaultFor: gradientDefault,
		LimitDoc: "stop, converged, when the gradient test's measure is at most this (with differences, at most three times the measure of their error bound where that is larger); the result reports the limit used",
		ShownAs:  func(v float64) string { return "gradient measure ≤ " + FormatFloat(v) },
		Doc:      "stop when the gradient test's measure (stop.gradient_test) is at most this, raised with differences to three times the measure of their error bound where that is larger, and at a stall to ten times the larger of the two; default 1e-8 for float64, 1e-4 for float32 (common practice)"})
	StopStep = param(&Param{Table: "stop", Key: "step", Limit: "Step", Kind: Real,
		Low: 0, High: math.Inf(1), DefaultFor: stepDefault,
		LimitDoc: "stop when every |Δxᵢ| is at most this·(|xᵢ| + 1)",
		ShownAs:  func(v float64) string { return "every |Δxᵢ| ≤ " + FormatFloat(v) + "·(|xᵢ| + 1)" },
		Doc:      "stop when every |Δxᵢ| ≤ this·(|xᵢ| + 1); default 1e-14 for float64, 1e-6 for float32 (common practice)"})
	StopIterations = param(&Param{Table: "stop", Key: "iterations", Limit: "Iterations", Kind: Whole,
		Default: 20000, Low: 1, High: 1e9,
		LimitDoc: "most accepted steps",
		ShownAs:  func(v float64) string { return fmt.Sprintf("%d iterations", int64(v)) },
		// High enough that the evaluation cap ends a slow run: L-BFGS
		// needs 17 402 iterations on Watson 9 (checks/mgh).
		Doc: "most accepted steps"})
	StopEvaluations = param(&Param{Table: "stop", Key: "evaluations", Limit: "Evaluations", Kind: Whole,
		Default: 200000, Low: 1, High: 1e9,
		LimitDoc: "hard cap on objective calls, finite differences included; never exceeded",
		ShownAs:  func(v float64) string { return fmt.Sprintf("%d objective calls", int64(v)) },
		Doc:      "hard cap on objective calls, finite differences included; never exceeded"})
)
