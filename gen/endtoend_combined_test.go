package gen

// The combined part of the end-to-end module: objectives that return
// their value and write their gradient through g in the same call, in
// every form (scalar, array, pointer to array, slice; function, value and
// pointer receiver) and both float types, with every direction and step
// rule, two of them on a box. Each records its calls, so that the
// hand-written test can check that a minimizer pays once per point:
// Evaluations counts every call, and no call repeats the point of the
// call before (the start and the accepted trial of a line search are not
// evaluated again for their gradient). Every minimum is a closed form.

const e2eCombinedGo = `// Package combined holds objectives that return their value and write
// their gradient through g in the same call.
package combined

import "fmt"

// Calls counts the calls of the objectives below, and Repeats the calls
// made at the point of the call before, which a minimizer that pays once
// per point never makes. The hand-written test resets and reads them.
var Calls, Repeats int

// last holds the point of the latest call, its first lastN components.
var (
	last  [4]float64
	lastN int
)

// note records a call at x. It is kept out of line, so that the
// minimizers' escape analysis, which the end-to-end test reads, sees a
// plain call.
//
//go:noinline
func note(x []float64) {
	Calls++
	same := len(x) == lastN
	for i := range x {
		same = same && x[i] == last[i]
	}
	if same {
		Repeats++
	}
	lastN = copy(last[:], x)
}

// note32 records a call at a float32 point (exactly, as float64).
//
//go:noinline
func note32(x []float32) {
	var w [4]float64
	for i := range x {
		w[i] = float64(x[i])
	}
	note(w[:len(x)])
}

// inside panics when x lies outside [lower, upper], out of line like note.
//
//go:noinline
func inside(name string, x []float64, lower, upper [2]float64) {
	for i := range x {
		if !(x[i] >= lower[i] && x[i] <= upper[i]) {
			panic(fmt.Sprintf("%s called outside its box: x[%d] = %v", name, i, x[i]))
		}
	}
}

// Bowl is 3(x − 1.5)² + 2 with f′ = 6(x − 1.5): f′ vanishes at 1.5 and
// f″ = 6 > 0, so 1.5 is the minimizer (Nocedal & Wright 2006, Theorem 2.4).
func Bowl(x float64, g *float64) float64 {
	v := [1]float64{x}
	note(v[:])
	d := x - 1.5
	*g = 6 * d
	return 3*d*d + 2
}

// Bowl32 is Bowl in float32.
func Bowl32(x float32, g *float32) float32 {
	v := [1]float32{x}
	note32(v[:])
	d := x - 1.5
	*g = 6 * d
	return 3*d*d + 2
}

// Shifted quadratics Σ cᵢ(xᵢ − aᵢ)², gradient 2cᵢ(xᵢ − aᵢ), every cᵢ > 0:
// the gradient vanishes only at a and the Hessian diag(2c) is positive
// definite, so a is the unique minimizer (Nocedal & Wright 2006,
// Theorem 2.4).
var (
	quad3A = [3]float64{1, -2, 0.5}
	quad3C = [3]float64{1, 2, 3}
	quad4A = [4]float64{2, -1, 0, 3}
	quad4C = [4]float64{1, 1.5, 2, 0.5}
	quad2A = [2]float32{-0.5, 1.5}
	quad2C = [2]float32{2, 1}
	unit2A = [2]float64{0.5, -1.25}
)

// Quad3 is Σ cᵢ(xᵢ − aᵢ)² with a = quad3A, c = quad3C; minimum at a.
func Quad3(x [3]float64, g *[3]float64) float64 {
	note(x[:])
	var s float64
	for i := range x {
		d := x[i] - quad3A[i]
		g[i] = 2 * quad3C[i] * d
		s += quad3C[i] * d * d
	}
	return s
}

// Quad3f is Quad3 in float32.
func Quad3f(x [3]float32, g *[3]float32) float32 {
	note32(x[:])
	var s float32
	for i := range x {
		d := x[i] - float32(quad3A[i])
		g[i] = 2 * float32(quad3C[i]) * d
		s += float32(quad3C[i]) * d * d
	}
	return s
}

// Rosen is Rosenbrock's function (1 − x₀)² + 100(x₁ − x₀²)², minimum 0 at
// (1, 1) (Moré, Garbow & Hillstrom, ACM TOMS 7(1):17–41, 1981, problem 1),
// with its gradient (−2(1 − x₀) − 400x₀(x₁ − x₀²), 200(x₁ − x₀²)), which
// shares 1 − x₀ and x₁ − x₀² with the value.
func Rosen(x, g *[2]float64) float64 {
	note(x[:])
	a, b := 1-x[0], x[1]-x[0]*x[0]
	g[0] = -2*a - 400*x[0]*b
	g[1] = 200 * b
	return a*a + 100*b*b
}

// Quad2f is Σ cᵢ(xᵢ − aᵢ)² with a = quad2A, c = quad2C; minimum at a.
func Quad2f(x, g *[2]float32) float32 {
	note32(x[:])
	var s float32
	for i := range x {
		d := x[i] - quad2A[i]
		g[i] = 2 * quad2C[i] * d
		s += quad2C[i] * d * d
	}
	return s
}

// Quad4 is Σ cᵢ(xᵢ − aᵢ)² over four unknowns, a = quad4A, c = quad4C;
// minimum at a.
func Quad4(x, g []float64) float64 {
	note(x)
	var s float64
	for i := range quad4A {
		d := x[i] - quad4A[i]
		g[i] = 2 * quad4C[i] * d
		s += quad4C[i] * d * d
	}
	return s
}

// Quad4f is Quad4 in float32.
func Quad4f(x, g []float32) float32 {
	note32(x)
	var s float32
	for i := range quad4A {
		d := x[i] - float32(quad4A[i])
		g[i] = 2 * float32(quad4C[i]) * d
		s += float32(quad4C[i]) * d * d
	}
	return s
}

// Unit2 is Σ (xᵢ − aᵢ)², a = unit2A; minimum at a. Its gradient 2(x − a)
// has Lipschitz constant 2, so steepest descent with the fixed step 0.25
// (< 2/L = 1) converges: each step halves x − a (Nocedal & Wright 2006, §3.3).
func Unit2(x [2]float64, g *[2]float64) float64 {
	note(x[:])
	var s float64
	for i := range x {
		d := x[i] - unit2A[i]
		g[i] = 2 * d
		s += d * d
	}
	return s
}

// Shift is a receiver with data: Cost is (x₀ − A₀)² + 3(x₁ − A₁)²,
// minimum at A.
type Shift struct{ A [2]float64 }

// Origin is the instance the generated tests use.
var Origin = Shift{A: [2]float64{0.75, -0.5}}

// Cost is the shifted quadratic and its gradient, on a value receiver.
func (s Shift) Cost(x [2]float64, g *[2]float64) float64 {
	note(x[:])
	a, b := x[0]-s.A[0], x[1]-s.A[1]
	g[0], g[1] = 2*a, 6*b
	return a*a + 3*b*b
}

// Shift32 is Shift in float32.
type Shift32 struct{ A [2]float32 }

// NewShift32 gives the receiver the generated tests use.
func NewShift32() *Shift32 { return &Shift32{A: [2]float32{-1, 2}} }

// Cost is the shifted quadratic and its gradient, on a pointer receiver.
func (s *Shift32) Cost(x, g *[2]float32) float32 {
	note32(x[:])
	a, b := x[0]-s.A[0], x[1]-s.A[1]
	g[0], g[1] = 2*a, 6*b
	return a*a + 3*b*b
}

var (
	boxLower = [2]float64{0, 0}
	boxUpper = [2]float64{2, 5}
)

// Box2 is (x₀ − 3)² + 2(x₁ + 1)² + x₀x₁/2 on [0, 2] × [0, 5], defined only
// there. At (2, 0) ∂f/∂x₀ = 2(x₀ − 3) + x₁/2 = −2 ≤ 0 at the upper bound
// and ∂f/∂x₁ = 4(x₁ + 1) + x₀/2 = 5 ≥ 0 at the lower one: the minimizer of
// this convex quadratic on the box, by the Karush–Kuhn–Tucker conditions
// (Nocedal & Wright 2006, Theorem 12.1).
func Box2(x [2]float64, g *[2]float64) float64 {
	inside("Box2", x[:], boxLower, boxUpper)
	note(x[:])
	a, b := x[0]-3, x[1]+1
	g[0] = 2*a + 0.5*x[1]
	g[1] = 4*b + 0.5*x[0]
	return a*a + 2*b*b + 0.5*x[0]*x[1]
}

// Box2f is Box2 in float32, taking x by pointer.
func Box2f(x, g *[2]float32) float32 {
	inside("Box2f", []float64{float64(x[0]), float64(x[1])}, boxLower, boxUpper)
	note32(x[:])
	a, b := x[0]-3, x[1]+1
	g[0] = 2*a + 0.5*x[1]
	g[1] = 4*b + 0.5*x[0]
	return a*a + 2*b*b + 0.5*x[0]*x[1]
}
`

const e2eCombinedSpec = `# Combined objectives: every form and float type, every direction and
# step rule, two on a box. derivative = "analytic" without a gradient key:
# the objective writes its gradient through g.

[[minimizer]]
name = "BowlSteepest"
objective = "Bowl"
derivative = "analytic"
direction = "steepest"
start = 0.0
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = 1.5                       # 3(x − 1.5)² + 2, f′(1.5) = 0
tolerance = 1e-6

[[minimizer]]
name = "Bowl32BFGS"
objective = "Bowl32"
derivative = "analytic"
direction = "bfgs"
start = 0.0
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = 1.5
tolerance = 1e-3

[[minimizer]]
name = "Quad3LBFGS"
objective = "Quad3"
derivative = "analytic"
direction = "lbfgs"
memory = 2
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [1.0, -2.0, 0.5]          # shifted quadratic: minimum at a
tolerance = 1e-6

[[minimizer]]
name = "Quad3fSteepest"
objective = "Quad3f"
derivative = "analytic"
direction = "steepest"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "decrease"
interpolate = true
[minimizer.expect]
x = [1.0, -2.0, 0.5]
tolerance = 1e-3

[[minimizer]]
name = "RosenBFGS"
objective = "Rosen"
derivative = "analytic"
direction = "bfgs"
start = [-1.2, 1.0]           # Moré, Garbow & Hillstrom 1981, problem 1, standard start
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [1.0, 1.0]                # Rosenbrock: f = 0 at (1, 1)
tolerance = 1e-6

[[minimizer]]
name = "Quad2fCG"
objective = "Quad2f"
derivative = "analytic"
direction = "cg"
start = [1.0, 0.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [-0.5, 1.5]
tolerance = 1e-3

[[minimizer]]
name = "Quad4CG"
objective = "Quad4"
derivative = "analytic"
direction = "cg"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
curvature = 0.2
[minimizer.expect]
x = [2.0, -1.0, 0.0, 3.0]
tolerance = 1e-6

[[minimizer]]
name = "Quad4fLBFGS"
objective = "Quad4f"
derivative = "analytic"
direction = "lbfgs"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "armijo"
interpolate = true
[minimizer.expect]
x = [2.0, -1.0, 0.0, 3.0]
tolerance = 1e-3

[[minimizer]]
name = "Unit2Fixed"
objective = "Unit2"
derivative = "analytic"
direction = "steepest"
start = [3.0, 2.0]
[minimizer.step]
rule = "fixed"
initial = 0.25                # < 2/L = 1 for f = Σ(x − a)²: each step halves x − a
[minimizer.expect]
x = [0.5, -1.25]
tolerance = 1e-6

[[minimizer]]
name = "ShiftValue"
objective = "Shift.Cost"
derivative = "analytic"
instance = "Origin"
start = [2.0, 2.0]
[minimizer.expect]
x = [0.75, -0.5]              # the receiver's shift
tolerance = 1e-6

[[minimizer]]
name = "Shift32Pointer"
objective = "Shift32.Cost"
derivative = "analytic"
direction = "lbfgs"
instance = "NewShift32"
start = [0.0, 0.0]
[minimizer.expect]
x = [-1.0, 2.0]
tolerance = 1e-3

[[minimizer]]
name = "Box2Bounded"
objective = "Box2"
derivative = "analytic"
direction = "bfgs"
start = [-1.0, 7.0]           # outside the box: projected in
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]                # Karush–Kuhn–Tucker point on two bounds

[[minimizer]]
name = "Box2fBounded"
objective = "Box2f"
derivative = "analytic"
direction = "lbfgs"
start = [1.0, 1.0]
[minimizer.step]
rule = "wolfe"
[minimizer.bounds]
lower = [0.0, 0.0]
upper = [2.0, 5.0]
[minimizer.expect]
x = [2.0, 0.0]
tolerance = 1e-3
`

const e2eCombinedTest = `package combined

import "testing"

// Every combined minimizer pays once per point: its Evaluations count
// every call of the objective, no call is made at the point of the call
// before (the start and the accepted trial of a line search are not
// evaluated again for their gradient), and the run takes at least one
// call per accepted step beyond the start.
func TestOneCallPerPoint(t *testing.T) {
	type outcome struct {
		evaluations, iterations int
		converged               bool
	}
	runs := []struct {
		name string
		run  func() outcome
	}{
		{"BowlSteepest", func() outcome { r := BowlSteepest(bowlSteepestTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Bowl32BFGS", func() outcome { r := Bowl32BFGS(bowl32BFGSTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Quad3LBFGS", func() outcome { r := Quad3LBFGS(quad3LBFGSTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Quad3fSteepest", func() outcome {
			r := Quad3fSteepest(quad3fSteepestTestStart())
			return outcome{r.Evaluations, r.Iterations, r.Status.Converged()}
		}},
		{"RosenBFGS", func() outcome { r := RosenBFGS(rosenBFGSTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Quad2fCG", func() outcome { r := Quad2fCG(quad2fCGTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Quad4CG", func() outcome { r := Quad4CG(quad4CGTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Quad4fLBFGS", func() outcome { r := Quad4fLBFGS(quad4fLBFGSTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Unit2Fixed", func() outcome { r := Unit2Fixed(unit2FixedTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"ShiftValue", func() outcome {
			r := ShiftValue(shiftValueTestReceiver(), shiftValueTestStart())
			return outcome{r.Evaluations, r.Iterations, r.Status.Converged()}
		}},
		{"Shift32Pointer", func() outcome {
			r := Shift32Pointer(shift32PointerTestReceiver(), shift32PointerTestStart())
			return outcome{r.Evaluations, r.Iterations, r.Status.Converged()}
		}},
		{"Box2Bounded", func() outcome { r := Box2Bounded(box2BoundedTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
		{"Box2fBounded", func() outcome { r := Box2fBounded(box2fBoundedTestStart()); return outcome{r.Evaluations, r.Iterations, r.Status.Converged()} }},
	}
	for _, c := range runs {
		Calls, Repeats, lastN = 0, 0, 0
		o := c.run()
		if !o.converged || o.iterations == 0 {
			t.Errorf("%s: converged %v after %d iterations", c.name, o.converged, o.iterations)
		}
		if Calls != o.evaluations || Repeats != 0 || o.evaluations < o.iterations+1 {
			t.Errorf("%s: %d evaluations reported over %d iterations, %d calls made, %d of them at the point of the call before", c.name, o.evaluations, o.iterations, Calls, Repeats)
		}
	}
}
`
