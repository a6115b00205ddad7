package gen

// The bounded part of the end-to-end module: objectives whose domain is a
// box, each of which panics when called outside it, so that any
// evaluation outside the bounds (a trial point, a difference probe, a
// calibration probe, a gradient) fails the test that made it. Every
// minimum is a closed form from the Karush–Kuhn–Tucker conditions of a
// convex quadratic on a box (Nocedal & Wright 2006, Theorem 12.1 and
// §16.7): at x*, each ∂f/∂xᵢ is zero for a free xᵢ, ≥ 0 at its lower bound
// and ≤ 0 at its upper one; convexity makes that point the minimizer.

const e2eBoxedGo = `// Package boxed holds objectives defined only on a box.
package boxed

import (
	"fmt"
	"math"
)

// outside is the panic of an objective called outside its box.
type outside struct {
	name  string
	index int
	value float64
}

func (o outside) Error() string {
	return fmt.Sprintf("%s called outside its box: x[%d] = %v", o.name, o.index, o.value)
}

// guard panics when x lies outside [lower, upper]. It is kept out of
// line, so that its panic value is not inlined into the minimizers,
// whose escape analysis the end-to-end test reads.
//
//go:noinline
func guard(name string, x, lower, upper []float64) {
	for i := range x {
		if !(x[i] >= lower[i] && x[i] <= upper[i]) {
			panic(outside{name, i, x[i]})
		}
	}
}

var (
	box2Lower  = [2]float64{0, 0}
	box2Upper  = [2]float64{2, 5}
	mixedLower = [2]float64{0, -5}
	mixedUpper = [2]float64{2, 5}
	inf        = math.Inf(1)
	fixedLower = [3]float64{-inf, -1, 0.5}
	fixedUpper = [3]float64{inf, inf, 0.5}
)

// Box2 is (x₀ − 3)² + 2(x₁ + 1)² + x₀x₁/2 on [0, 2] × [0, 5]. At (2, 0)
// ∂f/∂x₀ = 2(x₀ − 3) + x₁/2 = −2 ≤ 0 at the upper bound and
// ∂f/∂x₁ = 4(x₁ + 1) + x₀/2 = 5 ≥ 0 at the lower one: the minimizer, f = 3.
func Box2(x [2]float64) float64 {
	guard("Box2", x[:], box2Lower[:], box2Upper[:])
	a, b := x[0]-3, x[1]+1
	return a*a + 2*b*b + 0.5*x[0]*x[1]
}

// Box2Grad is Box2's gradient.
func Box2Grad(x, g *[2]float64) {
	guard("Box2Grad", x[:], box2Lower[:], box2Upper[:])
	g[0] = 2*(x[0]-3) + 0.5*x[1]
	g[1] = 4*(x[1]+1) + 0.5*x[0]
}

// Mixed2 is (x₀ − 3)² + 2(x₁ − 1)² + x₀x₁/2 on [0, 2] × [−5, 5]: x₀ = 2 at
// its upper bound, and x₁ free where 4(x₁ − 1) + x₀/2 = 0, x₁ = 0.75;
// there ∂f/∂x₀ = −2 + 0.375 ≤ 0.
func Mixed2(x [2]float64) float64 {
	guard("Mixed2", x[:], mixedLower[:], mixedUpper[:])
	a, b := x[0]-3, x[1]-1
	return a*a + 2*b*b + 0.5*x[0]*x[1]
}

// Mixed2Grad is Mixed2's gradient.
func Mixed2Grad(x [2]float64) [2]float64 {
	guard("Mixed2Grad", x[:], mixedLower[:], mixedUpper[:])
	return [2]float64{2*(x[0]-3) + 0.5*x[1], 4*(x[1]-1) + 0.5*x[0]}
}

// Fixed3 is (x₀ − 1)² + (x₁ + 2)² + (x₂ − 3)² + x₀x₂ with x₁ ≥ −1 and x₂
// fixed at 0.5 by equal bounds: x₀ free where 2(x₀ − 1) + x₂ = 0, x₀ =
// 0.75, and x₁ = −1 at its lower bound, where ∂f/∂x₁ = 2 ≥ 0.
func Fixed3(x *[3]float64) float64 {
	guard("Fixed3", x[:], fixedLower[:], fixedUpper[:])
	a, b, c := x[0]-1, x[1]+2, x[2]-3
	return a*a + b*b + c*c + x[0]*x[2]
}

// Fixed3Grad is Fixed3's gradient.
func Fixed3Grad(x, g *[3]float64) {
	guard("Fixed3Grad", x[:], fixedLower[:], fixedUpper[:])
	g[0] = 2*(x[0]-1) + x[2]
	g[1] = 2 * (x[1] + 2)
	g[2] = 2*(x[2]-3) + x[0]
}

// Box2f is Box2 in float32.
func Box2f(x [2]float32) float32 {
	guard("Box2f", []float64{float64(x[0]), float64(x[1])}, box2Lower[:], box2Upper[:])
	a, b := x[0]-3, x[1]+1
	return a*a + 2*b*b + 0.5*x[0]*x[1]
}

// Box2fGrad is Box2f's gradient.
func Box2fGrad(x, g *[2]float32) {
	guard("Box2fGrad", []float64{float64(x[0]), float64(x[1])}, box2Lower[:], box2Upper[:])
	g[0] = 2*(x[0]-3) + 0.5*x[1]
	g[1] = 4*(x[1]+1) + 0.5*x[0]
}

// Cap64 is (x − 2)² on [−3, 1]: the minimizer is the upper bound 1,
// where f′ = −2 ≤ 0.
func Cap64(x float64) float64 {
	guard("Cap64", []float64{x}, []float64{-3}, []float64{1})
	return (x - 2) * (x - 2)
}

// Cap64Grad is Cap64's derivative.
func Cap64Grad(x float64) float64 {
	guard("Cap64Grad", []float64{x}, []float64{-3}, []float64{1})
	return 2 * (x - 2)
}

// Floor32 is (x + 1)² on [0.5, 3] in float32: the minimizer is the lower
// bound 0.5, where f′ = 3 ≥ 0.
func Floor32(x float32) float32 {
	guard("Floor32", []float64{float64(x)}, []float64{0.5}, []float64{3})
	return (x + 1) * (x + 1)
}
`

const e2eBoxedSpec = `# Bounded minimizers: every direction that takes bounds with every
# derivative source and step rule; starts outside the box, minima on a
# bound, a variable fixed by equal bounds.

[[minimizer]]
name = "BoxSteepestArmijo"
objective = "Box2"
derivative = "analytic"
gradient = "Box2Grad"
direction = "steepest"
start = [-1.0, 7.0]
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]

[[minimizer]]
name = "BoxSteepestCentral"
objective = "Mixed2"
direction = "steepest"
start = [5.0, -9.0]
[minimizer.bounds]
lower = [0.0, -5.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.75]
tolerance = 1e-5

[[minimizer]]
name = "BoxSteepestDecrease"
objective = "Box2"
derivative = "forward"
direction = "steepest"
start = [1.0, 1.0]
[minimizer.step]
rule = "decrease"
interpolate = true
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]

[[minimizer]]
name = "BoxFixedStep"
objective = "Box2"
derivative = "analytic"
gradient = "Box2Grad"
direction = "steepest"
start = [1.0, 1.0]
[minimizer.step]
rule = "fixed"
initial = 0.1
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]

[[minimizer]]
name = "BoxDefaults"
objective = "Box2"
start = [-1.0, 7.0]
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]

[[minimizer]]
name = "BoxBFGSArmijo"
objective = "Mixed2"
derivative = "analytic"
gradient = "Mixed2Grad"
start = [1.0, 1.0]
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, -5.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.75]

[[minimizer]]
name = "BoxBFGSStrong"
objective = "Fixed3"
derivative = "forward"
start = [5.0, 5.0, 9.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.bounds]
lower = [-inf, -1.0, 0.5]
upper = [inf, inf, 0.5]
[minimizer.expect]
x = [0.75, -1.0, 0.5]
tolerance = 1e-5

[[minimizer]]
name = "BoxLBFGS"
objective = "Fixed3"
derivative = "analytic"
gradient = "Fixed3Grad"
direction = "lbfgs"
start = [5.0, 5.0, 9.0]
[minimizer.bounds]
lower = [-inf, -1.0, 0.5]
upper = [inf, inf, 0.5]
[minimizer.expect]
x = [0.75, -1.0, 0.5]

[[minimizer]]
name = "BoxLBFGSArmijo"
objective = "Mixed2"
direction = "lbfgs"
start = [-3.0, 3.0]
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, -5.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.75]
tolerance = 1e-5

[[minimizer]]
name = "BoxLBFGSForward"
objective = "Box2"
derivative = "forward"
direction = "lbfgs"
memory = 3
start = [1.0, 1.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]

[[minimizer]]
name = "BoxFloat32"
objective = "Box2f"
derivative = "analytic"
gradient = "Box2fGrad"
start = [-1.0, 7.0]
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]
tolerance = 1e-3

[[minimizer]]
name = "BoxFloat32Central"
objective = "Box2f"
direction = "lbfgs"
start = [1.0, 1.0]
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]
tolerance = 1e-3

[[minimizer]]
name = "BoxScalar"
objective = "Cap64"
derivative = "analytic"
gradient = "Cap64Grad"
start = 5.0
[minimizer.bounds]
lower = -3.0
upper = 1.0
[minimizer.expect]
x = 1.0

[[minimizer]]
name = "BoxScalar32"
objective = "Floor32"
direction = "steepest"
start = -2.0
[minimizer.bounds]
lower = 0.5
upper = 3.0
[minimizer.expect]
x = 0.5
tolerance = 1e-3

[[minimizer]]
name = "BoxStartAtMinimum"
objective = "Box2"
derivative = "analytic"
gradient = "Box2Grad"
start = [2.0, 0.0]
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]
`

// e2eBoxedTest runs the minimizers on Box2 from far outside the box, from
// its corners and from its edges: each must converge to the minimizer
// (2, 0) with X inside the box; the objectives panic if called outside.
const e2eBoxedTest = `package boxed

import (
	"math"
	"testing"
)

func TestBox2FromEveryCorner(t *testing.T) {
	runs := map[string]func([2]float64) ([2]float64, bool){
		"BoxSteepestArmijo":   func(x [2]float64) ([2]float64, bool) { r := BoxSteepestArmijo(x); return r.X, r.Status.Converged() },
		"BoxSteepestDecrease": func(x [2]float64) ([2]float64, bool) { r := BoxSteepestDecrease(x); return r.X, r.Status.Converged() },
		"BoxDefaults":         func(x [2]float64) ([2]float64, bool) { r := BoxDefaults(x); return r.X, r.Status.Converged() },
		"BoxLBFGSForward":     func(x [2]float64) ([2]float64, bool) { r := BoxLBFGSForward(x); return r.X, r.Status.Converged() },
		"BoxStartAtMinimum":   func(x [2]float64) ([2]float64, bool) { r := BoxStartAtMinimum(x); return r.X, r.Status.Converged() },
	}
	starts := [][2]float64{{-100, 100}, {100, -100}, {0, 0}, {2, 5}, {0, 5}, {2, 0}, {1, 0}, {2, 2.5}, {1e-300, 5}}
	for name, run := range runs {
		for _, start := range starts {
			x, converged := run(start)
			if !converged || math.Abs(x[0]-2) > 1e-6 || math.Abs(x[1]) > 1e-6 {
				t.Errorf("%s from %v: x = %v, converged %v; want (2, 0)", name, start, x, converged)
			}
			if x[0] < 0 || x[0] > 2 || x[1] < 0 || x[1] > 5 {
				t.Errorf("%s from %v: x = %v lies outside the box", name, start, x)
			}
		}
	}
}
`
