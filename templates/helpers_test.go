package templates

import (
	"fmt"
	"testing"

	"github.com/thalweg-go/thalweg/rules"
)

// rosenbrock is problem 1 of Moré, Garbow & Hillstrom, ACM TOMS
// 7(1):17–41, 1981: f = 100(x₂ − x₁²)² + (1 − x₁)², minimum f = 0 at
// (1, 1), standard start (−1.2, 1).
func rosenbrock() *receiver {
	return &receiver{
		valueFunc: func(x *vec) elem {
			a, b := x[1]-x[0]*x[0], 1-x[0]
			return 100*a*a + b*b
		},
		gradientFunc: func(x, g *vec) {
			a := x[1] - x[0]*x[0]
			g[0] = -400*a*x[0] - 2*(1-x[0])
			g[1] = 200 * a
		},
	}
}

// ellipse is f = (x₁ − 3)² + 10(x₂ + 1)², whose minimum f = 0 at (3, −1)
// follows from setting the gradient to zero (closed form).
func ellipse() *receiver {
	return &receiver{
		valueFunc: func(x *vec) elem {
			a, b := x[0]-3, x[1]+1
			return a*a + 10*b*b
		},
		gradientFunc: func(x, g *vec) {
			g[0] = 2 * (x[0] - 3)
			g[1] = 20 * (x[1] + 1)
		},
	}
}

// policy is one choice of the selectors gen decides at generation time.
type policy struct {
	source, kind, rule, backtrack int
}

var sourceNames = []string{"analytic", "forward", "central"}
var kindNames = []string{"steepest", "bfgs", "lbfgs", "cg"}
var ruleNames = []string{"fixed", "decrease", "armijo", "wolfe", "strong-wolfe"}

func (p policy) String() string {
	s := fmt.Sprintf("%s/%s/%s", kindNames[p.kind], ruleNames[p.rule], sourceNames[p.source])
	if p.backtrack == backtrackInterpolate {
		s += "/interpolate"
	}
	return s
}

// use installs p for the duration of the test.
func (p policy) use(t *testing.T) {
	t.Helper()
	saved := policy{derivativeSource, directionKind, stepRule, backtrackKind}
	savedCosts := [3]int{derivativeCost, calibrationCost, iterationCalls}
	derivativeSource, directionKind, stepRule, backtrackKind = p.source, p.kind, p.rule, p.backtrack
	// The registry's costs, which gen emits as constants for the spec's choice.
	source := [...]*rules.Entry{rules.Analytic, rules.Forward, rules.Central}[p.source]
	derivativeCost, calibrationCost = source.GradientCalls(dim), source.CalibrationCalls(dim)
	rule := [...]*rules.Entry{rules.Fixed, rules.SimpleDecrease, rules.ArmijoRule, rules.WolfeRule, rules.StrongWolfeRule}[p.rule]
	iterationCalls = rule.IterationCalls(stepTrials, derivativeCost)
	t.Cleanup(func() {
		derivativeSource, directionKind, stepRule, backtrackKind = saved.source, saved.kind, saved.rule, saved.backtrack
		derivativeCost, calibrationCost, iterationCalls = savedCosts[0], savedCosts[1], savedCosts[2]
	})
}

// everyPolicy lists every direction × rule × source, both backtracking
// variants for the backtracking rules; fixed steps are left out because
// they need a problem-specific step.
func everyPolicy() []policy {
	var all []policy
	for source := range sourceNames {
		for kind := range kindNames {
			for rule := ruleDecrease; rule <= ruleStrongWolfe; rule++ {
				all = append(all, policy{source, kind, rule, backtrackShrink})
				if rule == ruleDecrease || rule == ruleArmijo {
					all = append(all, policy{source, kind, rule, backtrackInterpolate})
				}
			}
		}
	}
	return all
}

func defaultLimits() limits {
	return limits{Gradient: 1e-8, Step: 1e-14, Iterations: 20000, Evaluations: 200000}
}

// calibrated returns the difference intervals the kernel would choose at
// x for the current derivative source (none for an analytic gradient),
// leaving the receiver's call count as it was.
func calibrated(recv *receiver, x *vec) *differences {
	var diffs differences
	if derivativeSource == sourceAnalytic {
		return &diffs // nothing to calibrate; the objective is not called
	}
	calls := recv.calls
	calibrate(recv, x, recv.valueFunc(x), &diffs, 1<<30)
	recv.calls = calls
	return &diffs
}

// knownFloor is a line search's step limit fixed at t, as a test sets it.
func knownFloor(t elem) *stepFloor {
	return &stepFloor{value: t, known: true}
}
