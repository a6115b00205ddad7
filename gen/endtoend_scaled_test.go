package gen

// The scaled part of the end-to-end module: objectives whose unknowns
// differ in size by eight orders of magnitude, minimized through scale in
// every direction with every derivative source and every argument form.
// Each minimum is a closed form: the objectives are convex quadratics in
// the unknowns divided by their typical magnitude, minimized where the
// gradient vanishes, or, on a box, where the Karush–Kuhn–Tucker conditions
// hold (Nocedal & Wright 2006, Theorem 12.1). The bounded ones panic when
// called outside their box (see guard in the boxed package), so rounding
// of the bounds into the scaled unknowns must never let a point through.

const e2eScaledGo = `// Package scaled holds badly scaled objectives.
package scaled

import "fmt"

//go:noinline
func guard(name string, x, lower, upper []float64) {
	for i := range x {
		if !(x[i] >= lower[i] && x[i] <= upper[i]) {
			panic(fmt.Sprintf("%s called outside its box: x[%d] = %v", name, i, x[i]))
		}
	}
}

// coil is a² + ab/2 + b² + c² with a = (x₀ − 2e-3)/1e-3, b = (x₁ − 3e5)/1e5
// and c = x₂ + 7: a coefficient of order 1e-3, one of order 1e5 and one
// of order 1. Its minimum is (2e-3, 3e5, −7), f = 0.
func coil(x0, x1, x2 float64) float64 {
	a, b, c := (x0-2e-3)/1e-3, (x1-3e5)/1e5, x2+7
	return a*a + a*b/2 + b*b + c*c
}

func coilGrad(x0, x1, x2 float64) (g0, g1, g2 float64) {
	a, b, c := (x0-2e-3)/1e-3, (x1-3e5)/1e5, x2+7
	return (2*a + b/2) / 1e-3, (a/2 + 2*b) / 1e5, 2 * c
}

// Coil is coil on an array.
func Coil(x [3]float64) float64 { return coil(x[0], x[1], x[2]) }

// CoilGrad is Coil's gradient.
func CoilGrad(x, g *[3]float64) { g[0], g[1], g[2] = coilGrad(x[0], x[1], x[2]) }

// CoilBox is Coil on x₀ ≥ 3e-4, x₁ ≤ 2.5e5 (bounds that are not
// multiples of the scale in binary): with b = −0.5 held at its bound,
// ∂f/∂a = 2a + b/2 = 0 gives a = 0.125, x₀ = 2.125e-3, inside; there
// ∂f/∂b = a/2 + 2b = −0.9375 ≤ 0 at the upper bound, so that is the
// minimizer, with x₂ = −7 free.
func CoilBox(x *[3]float64) float64 {
	guard("CoilBox", x[:], []float64{3e-4, -1e300, -1e300}, []float64{1e300, 2.5e5, 1e300})
	return coil(x[0], x[1], x[2])
}

// CoilBoxGrad is CoilBox's gradient.
func CoilBoxGrad(x [3]float64) [3]float64 {
	guard("CoilBoxGrad", x[:], []float64{3e-4, -1e300, -1e300}, []float64{1e300, 2.5e5, 1e300})
	g0, g1, g2 := coilGrad(x[0], x[1], x[2])
	return [3]float64{g0, g1, g2}
}

// CoilBoxBoth is CoilBox as a combined objective: the value, with the
// gradient written through g.
func CoilBoxBoth(x *[3]float64, g *[3]float64) float64 {
	guard("CoilBoxBoth", x[:], []float64{3e-4, -1e300, -1e300}, []float64{1e300, 2.5e5, 1e300})
	g[0], g[1], g[2] = coilGrad(x[0], x[1], x[2])
	return coil(x[0], x[1], x[2])
}

// GainBoth is Gain as a combined objective on a scalar.
func GainBoth(k float64, g *float64) float64 {
	*g = GainGrad(k)
	return Gain(k)
}

// Coil32 is coil in float32, taken by pointer.
func Coil32(x *[3]float32) float32 {
	a, b, c := (x[0]-2e-3)/1e-3, (x[1]-3e5)/1e5, x[2]+7
	return a*a + a*b/2 + b*b + c*c
}

// Coil32Grad is Coil32's gradient.
func Coil32Grad(x [3]float32) [3]float32 {
	a, b, c := (x[0]-2e-3)/1e-3, (x[1]-3e5)/1e5, x[2]+7
	return [3]float32{(2*a + b/2) / 1e-3, (a/2 + 2*b) / 1e5, 2 * c}
}

// Drift is ((x₀ − 5e4)/1e4)² + ((x₁ + 3e-5)/1e-5)², on a slice: minimum
// (5e4, −3e-5).
func Drift(x []float64) float64 {
	a, b := (x[0]-5e4)/1e4, (x[1]+3e-5)/1e-5
	return a*a + b*b
}

// DriftGrad is Drift's gradient.
func DriftGrad(x, g []float64) {
	g[0] = 2 * (x[0] - 5e4) / 1e4 / 1e4
	g[1] = 2 * (x[1] + 3e-5) / 1e-5 / 1e-5
}

// Gain is ((k − 4e4)/1e4)² + 1: minimum at k = 4e4.
func Gain(k float64) float64 { a := (k - 4e4) / 1e4; return a*a + 1 }

// GainGrad is Gain's derivative.
func GainGrad(k float64) float64 { return 2 * (k - 4e4) / 1e4 / 1e4 }

// GainBox is Gain on [1e3, 3.3e4]: the minimizer is the upper bound,
// where the derivative is negative.
func GainBox(k float32) float32 {
	guard("GainBox", []float64{float64(k)}, []float64{1e3}, []float64{3.3e4})
	a := (k - 4e4) / 1e4
	return a*a + 1
}

// GainBoxGrad is GainBox's derivative.
func GainBoxGrad(k float32) float32 {
	guard("GainBoxGrad", []float64{float64(k)}, []float64{1e3}, []float64{3.3e4})
	return 2 * (k - 4e4) / 1e4 / 1e4
}

// Rig holds the pose a fit must reach: Misfit is ((x₀ − Aim₀)/1e-2)² +
// ((x₁ − Aim₁)/1e3)² + (x₀ − Aim₀)(x₁ − Aim₁)/10, minimum at Aim.
type Rig struct{ Aim [2]float64 }

// NewRig is the rig the generated tests use.
func NewRig() *Rig { return &Rig{Aim: [2]float64{0.03, -2500}} }

// Misfit is the rig's objective.
func (r *Rig) Misfit(x [2]float64) float64 {
	a, b := (x[0]-r.Aim[0])/1e-2, (x[1]-r.Aim[1])/1e3
	return a*a + b*b + a*b/10
}

// MisfitGrad is Misfit's gradient.
func (r *Rig) MisfitGrad(x [2]float64) [2]float64 {
	a, b := (x[0]-r.Aim[0])/1e-2, (x[1]-r.Aim[1])/1e3
	return [2]float64{(2*a + b/10) / 1e-2, (2*b + a/10) / 1e3}
}
`

const e2eScaledSpec = `# Scaled minimizers: every direction with every derivative source,
# every argument form, bounded and not; expect.tolerance is in units of
# scale.

[[minimizer]]
name = "ScaledSteepestAnalytic"
objective = "CoilBox"
derivative = "analytic"
gradient = "CoilBoxGrad"
direction = "steepest"
start = [1e-3, 4e5, 1.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.bounds]
lower = [3e-4, -inf, -inf]
upper = [inf, 2.5e5, inf]
[minimizer.expect]
x = [2.125e-3, 2.5e5, -7.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledSteepestForward"
objective = "Gain"
derivative = "forward"
direction = "steepest"
start = 1e4
scale = 1e4
[minimizer.expect]
x = 4e4
tolerance = 1e-5

[[minimizer]]
name = "ScaledSteepestCentral"
objective = "Coil"
direction = "steepest"
start = [1e-3, 1e5, 0.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.expect]
x = [2e-3, 3e5, -7.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledBFGSAnalytic"
objective = "Coil32"
derivative = "analytic"
gradient = "Coil32Grad"
start = [1e-3, 1e5, 0.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.expect]
x = [2e-3, 3e5, -7.0]
tolerance = 1e-3

[[minimizer]]
name = "ScaledBFGSForward"
objective = "Drift"
derivative = "forward"
dim = 2
start = [1e4, 1e-5]
scale = [1e4, 1e-5]
[minimizer.expect]
x = [5e4, -3e-5]
tolerance = 1e-5

[[minimizer]]
name = "ScaledBFGSCentral"
objective = "Rig.Misfit"
instance = "NewRig"
start = [0.0, 0.0]
scale = [1e-2, 1e3]
[minimizer.expect]
x = [0.03, -2500.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledLBFGSAnalytic"
objective = "GainBox"
derivative = "analytic"
gradient = "GainBoxGrad"
direction = "lbfgs"
start = 5e4
scale = 1e4
[minimizer.bounds]
lower = 1e3
upper = 3.3e4
[minimizer.expect]
x = 3.3e4
tolerance = 1e-6

[[minimizer]]
name = "ScaledLBFGSForward"
objective = "Coil32"
derivative = "forward"
direction = "lbfgs"
start = [1e-3, 1e5, 0.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.expect]
x = [2e-3, 3e5, -7.0]
tolerance = 1e-2

[[minimizer]]
name = "ScaledLBFGSCentral"
objective = "CoilBox"
direction = "lbfgs"
start = [0.0, 0.0, 0.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.bounds]
lower = [3e-4, -inf, -inf]
upper = [inf, 2.5e5, inf]
[minimizer.expect]
x = [2.125e-3, 2.5e5, -7.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledCGAnalytic"
objective = "Drift"
derivative = "analytic"
gradient = "DriftGrad"
direction = "cg"
dim = 2
start = [1e4, 1e-5]
scale = [1e4, 1e-5]
[minimizer.expect]
x = [5e4, -3e-5]
tolerance = 1e-6

[[minimizer]]
name = "ScaledCGForward"
objective = "Gain"
derivative = "forward"
direction = "cg"
start = 1e4
scale = 1e4
[minimizer.expect]
x = 4e4
tolerance = 1e-5

[[minimizer]]
name = "ScaledCGCentral"
objective = "Rig.Misfit"
direction = "cg"
instance = "NewRig"
start = [0.0, 0.0]
scale = [1e-2, 1e3]
[minimizer.expect]
x = [0.03, -2500.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledCombinedBox"
objective = "CoilBoxBoth"
derivative = "analytic"
direction = "lbfgs"
start = [1e-3, 4e5, 1.0]
scale = [1e-3, 1e5, 1.0]
[minimizer.bounds]
lower = [3e-4, -inf, -inf]
upper = [inf, 2.5e5, inf]
[minimizer.expect]
x = [2.125e-3, 2.5e5, -7.0]
tolerance = 1e-6

[[minimizer]]
name = "ScaledCombinedScalar"
objective = "GainBoth"
derivative = "analytic"
direction = "steepest"
start = 1e4
scale = 1e4
[minimizer.expect]
x = 4e4
tolerance = 1e-6

[[minimizer]]
name = "ScaledRigAnalytic"
objective = "Rig.Misfit"
derivative = "analytic"
gradient = "MisfitGrad"
direction = "bfgs"
instance = "NewRig"
start = [0.0, 0.0]
scale = [1e-2, 1e3]
[minimizer.bounds]
upper = [0.02, inf]
# x₀ = 0.02 caps a = −1; then ∂f/∂b = 2b + a/10 = 0 gives b = 0.05,
# x₁ = −2450, and ∂f/∂a = 2a + b/10 < 0 at the upper bound (KKT).
[minimizer.expect]
x = [0.02, -2450.0]
tolerance = 1e-6
`

// e2eScaledTest checks what the generated tests cannot: that a start and
// a result are in the user's units (a start at the minimum stays there),
// that the stop limits apply to the scaled gradient, and that a bounded
// run from every corner of a wide start box ends on the bound.
const e2eScaledTest = `package scaled

import (
	"math"
	"testing"
)

func TestScaledStartAtMinimumStays(t *testing.T) {
	r := ScaledBFGSCentral(NewRig(), [2]float64{0.03, -2500})
	if !r.Status.Converged() || r.X != [2]float64{0.03, -2500} {
		t.Errorf("from the minimum: x = %v, %v; want it unchanged and converged", r.X, r.Status)
	}
}

func TestScaledGradientIsScaled(t *testing.T) {
	// The scaled gradient at X is sᵢ·∂f/∂xᵢ; Result.Gradient is its measure
	// and must be within the limit, while the unscaled ∂f/∂x₀ at the same
	// point may be 1e3 times larger.
	r := ScaledBFGSAnalytic([3]float32{1e-3, 1e5, 0})
	if !r.Status.Converged() || !(r.Gradient <= r.GradientLimit) {
		t.Fatalf("%v: Gradient %v, limit %v", r.Status, r.Gradient, r.GradientLimit)
	}
	g := Coil32Grad(r.X)
	s := [3]float32{1e-3, 1e5, 1}
	for i := range g {
		if scaled := math.Abs(float64(g[i] * s[i])); scaled > float64(r.GradientLimit) {
			t.Errorf("scaled gradient component %d is %v, above the limit %v", i, scaled, r.GradientLimit)
		}
	}
}

func TestScaledBoxFromEveryCorner(t *testing.T) {
	for _, start := range [][3]float64{{-1, -1e9, -1e3}, {1, 1e9, 1e3}, {3e-4, 2.5e5, 0}, {0.5, 0, -7}} {
		for name, run := range map[string]func([3]float64) ScaledLBFGSCentralResult{
			"ScaledLBFGSCentral": ScaledLBFGSCentral,
			"ScaledSteepestAnalytic": func(x [3]float64) ScaledLBFGSCentralResult {
				r := ScaledSteepestAnalytic(x)
				return ScaledLBFGSCentralResult{X: r.X, Status: ScaledLBFGSCentralStatus(r.Status)}
			},
		} {
			r := run(start)
			want := [3]float64{2.125e-3, 2.5e5, -7}
			scale := [3]float64{1e-3, 1e5, 1}
			for i := range want {
				if !(math.Abs(r.X[i]-want[i]) <= 1e-5*scale[i]) {
					t.Errorf("%s from %v: x = %v (%v), want %v", name, start, r.X, r.Status, want)
					break
				}
			}
			if r.X[0] < 3e-4 || r.X[1] > 2.5e5 {
				t.Errorf("%s from %v: x = %v lies outside the box", name, start, r.X)
			}
		}
	}
}
`
