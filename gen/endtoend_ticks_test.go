package gen

import "strings"

// The end-to-end module's ticks package: minimizers advanced a tick at a
// time by a caller-owned solver, for every direction and derivative
// source, bounded and not, float32 and float64, on objectives that count
// their own calls, and one that tracks a moving target.
const e2eTicksGo = `// Package ticks holds objectives that count their calls, for the
// solvers advanced under a budget per tick.
package ticks

// calls counts every objective call of this package.
var calls int

// Bowl64 is f = (x₀ − 1)² + (x₀ − 1)(x₁ + ½) + 30(x₁ + ½)² + 2(x₂ − 2)²,
// a convex quadratic whose Hessian [[2, 1, 0], [1, 60, 0], [0, 0, 4]] is
// positive definite (condition number about 30, where memory pays), so
// the unique minimizer is where the gradient vanishes, (1, −½, 2) (Nocedal & Wright 2006, Theorem 2.4); in the box
// x₂ ≤ 1.5, where x₂ is decoupled from the others, it is (1, −½, 1.5).
func Bowl64(x *[3]float64) float64 {
	calls++
	a, b, c := x[0]-1, x[1]+0.5, x[2]-2
	return a*a + a*b + 30*b*b + 2*c*c
}

// Bowl64Grad is the gradient of Bowl64.
func Bowl64Grad(x, g *[3]float64) {
	a, b, c := x[0]-1, x[1]+0.5, x[2]-2
	g[0], g[1], g[2] = 2*a+b, a+60*b, 4*c
}

// Bowl32 is Bowl64 in float32.
func Bowl32(x [3]float32) float32 {
	calls++
	a, b, c := x[0]-1, x[1]+0.5, x[2]-2
	return a*a + a*b + 30*b*b + 2*c*c
}

// Bowl32Grad is the gradient of Bowl32.
func Bowl32Grad(x [3]float32) [3]float32 {
	a, b, c := x[0]-1, x[1]+0.5, x[2]-2
	return [3]float32{2*a + b, a + 60*b, 4 * c}
}

// Target is a bowl f = a² + ab + 5b², a = x₀ − C₀, b = x₁ − C₁, whose
// minimizer is its centre C (Hessian [[2, 1], [1, 10]], positive
// definite), which a control loop moves between ticks.
type Target struct{ C [2]float64 }

// NewTarget is the target the generated tests use.
func NewTarget() *Target { return &Target{C: [2]float64{1, -1}} }

// Cost is the bowl around t.C.
func (t *Target) Cost(x *[2]float64) float64 {
	calls++
	a, b := x[0]-t.C[0], x[1]-t.C[1]
	return a*a + a*b + 5*b*b
}

// CostGrad is the gradient of Cost.
func (t *Target) CostGrad(x, g *[2]float64) {
	a, b := x[0]-t.C[0], x[1]-t.C[1]
	g[0], g[1] = 2*a+b, a+10*b
}
`

// e2eTicksMinimizers are the ticks package's minimizers on the bowls:
// name, direction, derivative, float type, bounded.
var e2eTicksMinimizers = []struct {
	name, direction, derivative, elem string
	bounded                           bool
}{
	{"TickSteepest64", "steepest", "analytic", "64", false},
	{"TickSteepestCentral32", "steepest", "central", "32", true},
	{"TickBFGSForward64", "bfgs", "forward", "64", true},
	{"TickBFGS32", "bfgs", "analytic", "32", false},
	{"TickLBFGSCentral64", "lbfgs", "central", "64", false},
	{"TickLBFGSForward64", "lbfgs", "forward", "64", true},
	{"TickCG64", "cg", "analytic", "64", false},
	{"TickCGCentral32", "cg", "central", "32", false},
}

// e2eTicksSpec is the ticks package's spec.
func e2eTicksSpec() string {
	var b strings.Builder
	b.WriteString("# Solvers advanced a tick at a time: every direction and derivative\n# source, bounded and not, float32 and float64.\n\n")
	for _, m := range e2eTicksMinimizers {
		b.WriteString("[[minimizer]]\nname = \"" + m.name + "\"\nobjective = \"Bowl" + m.elem + "\"\n")
		b.WriteString("derivative = \"" + m.derivative + "\"\ndirection = \"" + m.direction + "\"\n")
		if m.derivative == "analytic" {
			b.WriteString("gradient = \"Bowl" + m.elem + "Grad\"\n")
		}
		b.WriteString("start = [-1.0, 1.0, 0.5]\n")
		want := "[1.0, -0.5, 2.0]"
		if m.bounded {
			b.WriteString("[minimizer.bounds]\nlower = [-2.0, -1.0, 0.0]\nupper = [3.0, 1.0, 1.5]\n")
			want = "[1.0, -0.5, 1.5]"
		}
		tol := "1e-6"
		if m.elem == "32" {
			tol = "1e-3"
		}
		b.WriteString("[minimizer.expect]\nx = " + want + "\ntolerance = " + tol + "\n\n")
	}
	b.WriteString(`[[minimizer]]
name = "Track"
objective = "Target.Cost"
derivative = "analytic"
gradient = "CostGrad"
direction = "bfgs"
instance = "NewTarget"
start = [0.0, 0.0]
[minimizer.expect]
x = [1.0, -1.0]
`)
	return b.String()
}

// e2eTicksTest checks, for each bowl minimizer, with the objective's own
// call counter: no Advance calls the objective more often than its budget
// (the worst case the solver's doc comment states) and each reports the
// calls it made; advancing ends where the whole run does; and, for the
// directions with memory, keeping it across ticks converges in fewer
// calls than forgetting it at every tick. The tracker follows a target
// moving along a circle better than standing still would.
func e2eTicksTest() string {
	var b strings.Builder
	b.WriteString(`package ticks

import (
	"math"
	"testing"
)
`)
	for _, m := range e2eTicksMinimizers {
		memory := "true"
		if m.direction == "steepest" {
			memory = "false"
		}
		b.WriteString(strings.NewReplacer("$N", m.name, "$T", "float"+m.elem, "$MEMORY", memory).Replace(e2eTicksTemplate))
	}
	b.WriteString(e2eTrackTest)
	return b.String()
}

const e2eTicksTemplate = `
func Test$NTicks(t *testing.T) {
	start := [3]$T{-1, 1, 0.5}
	calls = 0
	want := $N(start)
	if !want.Status.Converged() || want.Evaluations != calls {
		t.Fatalf("whole run: status %v, %d evaluations reported, %d calls", want.Status, want.Evaluations, calls)
	}
	for _, budget := range []int{$NTickMinimum, $NTickMinimum + 2, 3 * $NTickMinimum} {
		var s $NSolver
		s.Start(start)
		calls = 0
		for tick := 1; ; tick++ {
			before := calls
			r := s.Advance(budget)
			if calls-before > budget {
				t.Fatalf("budget %d, tick %d: %d objective calls", budget, tick, calls-before)
			}
			if r.Evaluations != calls {
				t.Fatalf("budget %d, tick %d: %d evaluations reported, %d calls", budget, tick, r.Evaluations, calls)
			}
			if r.Status != $NRunning {
				if r.X != want.X || r.F != want.F || r.Evaluations != want.Evaluations || r.Iterations != want.Iterations || r.Status != want.Status {
					t.Fatalf("budget %d: ticks ended with %+v, the whole run with %+v", budget, r, want)
				}
				break
			}
			if r.Status.Converged() || r.Status.String() != "running" {
				t.Fatalf("running status: Converged %v, String %q", r.Status.Converged(), r.Status.String())
			}
		}
	}
	if $MEMORY {
		// Memory kept across ticks against memory forgotten at each.
		ticked := func(forget bool) $NResult {
			var s $NSolver
			s.Start(start)
			for {
				if forget {
					s.Forget()
				}
				if r := s.Advance($NTickMinimum); r.Status != $NRunning {
					return r
				}
			}
		}
		kept, forgot := ticked(false), ticked(true)
		if !kept.Status.Converged() || !(kept.Evaluations < forgot.Evaluations) {
			t.Errorf("memory kept: %v after %d calls; forgotten every tick: %v after %d", kept.Status, kept.Evaluations, forgot.Status, forgot.Evaluations)
		}
	}
}
`

const e2eTrackTest = `
// The centre moves by 0.02 along the unit circle at every tick; the
// control loop warm-starts from the last result (StartFrom, the BFGS
// matrix kept) and advances with a budget that covers the start and one
// iteration. Standing still would lag by the whole move; the tracker must
// lag by less, and never exceed the budget.
func TestTrackMovingTarget(t *testing.T) {
	target := NewTarget()
	var s TrackSolver
	s.Start([2]float64{1, 0})
	budget := 2 * TrackTickMinimum
	var r TrackResult
	for tick := 0; tick < 300; tick++ {
		angle := 0.02 * float64(tick)
		target.C = [2]float64{math.Cos(angle), math.Sin(angle)}
		if tick > 0 {
			s.StartFrom(r)
		}
		before := calls
		r = s.Advance(target, budget)
		if calls-before > budget || r.Evaluations != calls-before {
			t.Fatalf("tick %d: %d calls, %d reported, budget %d", tick, calls-before, r.Evaluations, budget)
		}
	}
	if lag := math.Hypot(r.X[0]-target.C[0], r.X[1]-target.C[1]); !(lag < 0.02) {
		t.Errorf("after 300 ticks x = %v, centre %v: lag %g, not below the step 0.02 of the target", r.X, target.C, lag)
	}
}
`
