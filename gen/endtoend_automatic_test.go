package gen

// The automatic part of the end-to-end module: derivative = "automatic"
// on every objective form in both float types, as functions and as methods
// on value and pointer receivers, on residual objectives in their three
// forms, with every direction, bounds and scale. The objectives use what
// the differentiator takes: branches, loops over arrays and the unknowns,
// local arrays, helpers and methods of the package, receiver fields and
// package data, and the math functions. Every minimum is in closed form,
// so [minimizer.expect] states it, and the generated gradient (Jacobian)
// test checks each derived gradient against central differences.

const e2eAutoGo = `// Package auto holds objectives thalweg differentiates from their source.
package auto

import "math"

// centers are the minimizers of Array64 and Slice64.
var centers = [3]float64{1, -2, 0.5}

func square(t float64) float64 { return t * t }

func square32(t float32) float32 { return t * t }

// hump is log(1 + t²): 0 with zero slope at 0, rising on both sides;
// a named result returned bare.
func hump(t float64) (h float64) {
	h = math.Log1p(t * t)
	return
}

// Scalar64 is d² + log(1 + d²), d = x − 1.5, written twice across a
// branch: minimum 0 at 1.5.
func Scalar64(x float64) float64 {
	d := x - 1.5
	if d > 0 {
		return square(d) + hump(d)
	}
	return d*d + math.Log1p(d*d)
}

// Scalar32 is y²(2 + cos y), y = x − 0.25: 2 + cos y ≥ 1, so the minimum
// is 0 at 0.25.
func Scalar32(x float32) float32 {
	y := x - 0.25
	return y * y * (2 + float32(math.Cos(float64(y))))
}

// Array64 is Σ (i+1)·dᵢ² + 0.1·d₀⁴ + 0.05·erf(d₂)·d₂, dᵢ = xᵢ − centersᵢ
// (erf(d)·d ≥ 0, 0 with zero slope at 0; written with Erfc): minimum at
// centers.
func Array64(x [3]float64) float64 {
	sum := 0.0
	for i, xi := range x {
		d := xi - centers[i]
		sum += float64(i+1) * d * d
	}
	d2 := x[2] - centers[2]
	return sum + 0.1*math.Pow(x[0]-centers[0], 4) + 0.05*(1-math.Erfc(d2))*d2
}

// Array32 is a² + atan(x₁ − 2)² + cosh(a) − 1, a = x₀ − 1: each term is
// at least 0 and vanishes at (1, 2).
func Array32(x [2]float32) float32 {
	a := x[0] - 1
	b := float32(math.Atan(float64(x[1] - 2)))
	return a*a + b*b + float32(math.Cosh(float64(a))) - 1
}

// Pointer64 is Rosenbrock's function through a helper: minimum at (1, 1).
func Pointer64(x *[2]float64) float64 {
	a := 1 - x[0]
	b := x[1] - square(x[0])
	return a*a + 100*b*b
}

// Rebound is (v − 2)² + (x₁ + 1)², v = b·x₀ with b = 2, b assigned
// again after v is formed from it: minimum at (1, −1). (The derived
// gradient once read b's later value in v's tangent.)
func Rebound(x *[2]float64) float64 {
	b := 2.0
	v := b * x[0]
	b = 3.0
	w := v - b + 1
	return w*w + (x[1]+1)*(x[1]+1)
}

// Pointer32 is u² + 3w² + √(1 + u²) − 1, u = x₀ − 2, w = x₁ + 1: minimum
// at (2, −1). The − 1 is taken in float64, before the conversion: in
// float32, 1 + u² would round to 1 and hide u² near the minimum.
func Pointer32(x *[2]float32) float32 {
	u, w := x[0]-2, x[1]+1
	return square32(u) + 3*square32(w) + float32(math.Sqrt(1+float64(u*u))-1)
}

// Slice64 is Σ dᵢ²(1 + tanh² dᵢ), dᵢ = xᵢ − centersᵢ, with a switch that
// weighs nothing differently: minimum at centers.
func Slice64(x []float64) float64 {
	total := 0.0
	for i := range x {
		d := x[i] - centers[i]
		var w float64
		switch {
		case d > 10:
			w = 1
		default:
			w = 1
		}
		t := math.Tanh(d)
		total += w * d * d * (1 + t*t)
	}
	return total
}

// Slice32 is Σ dᵢ² + hypot(dᵢ, 1) − 1, dᵢ = xᵢ − i, with max keeping a
// term at least 0: minimum at (0, 1).
func Slice32(x []float32) float32 {
	var s float32
	for i, xi := range x {
		d := xi - float32(i)
		s += max(d*d, 0) + float32(math.Hypot(float64(d), 1)) - 1
	}
	return s
}

// Well is a weighted bowl around Center; Well32 the same in float32.
type Well struct {
	Center [2]float64
	Weight float64
}

// DefaultWell is the generated tests' receiver.
var DefaultWell = Well{Center: [2]float64{0.5, -1.5}, Weight: 2}

func (w Well) dist2(x *[2]float64) float64 {
	d0, d1 := x[0]-w.Center[0], x[1]-w.Center[1]
	return d0*d0 + d1*d1
}

// Value is a value-receiver method of the pointer form: minimum at Center.
func (w Well) Value(x *[2]float64) float64 {
	return w.Weight*w.dist2(x) + math.Exp(-w.dist2(x))
}

// Energy is a pointer-receiver method of the array form, passing the
// unknowns on to a method: minimum at Center.
func (w *Well) Energy(x [2]float64) float64 {
	return w.Weight * w.dist2(&x)
}

type Well32 struct {
	Center [2]float32
	Weight float32
}

var DefaultWell32 = Well32{Center: [2]float32{0.5, -1.5}, Weight: 2}

// Value is Well.Value in float32, the slice form.
func (w Well32) Value(x []float32) float32 {
	var s float32
	for i := range x {
		d := x[i] - w.Center[i]
		s += w.Weight * d * d
	}
	return s
}

// Scalar is a pointer-receiver method of the scalar form: minimum at
// Center[0].
func (w *Well32) Scalar(x float32) float32 {
	d := x - w.Center[0]
	return w.Weight * float32(math.Abs(float64(d))) * float32(math.Abs(float64(d)))
}

// The residual objectives fit a·exp(b·t) to data made from a = 2,
// b = −0.5, whose residuals vanish exactly there.
var ts = [6]float64{0, 0.5, 1, 1.5, 2, 3}

var ys = func() (y [6]float64) {
	for i, t := range ts {
		y[i] = 2 * math.Exp(-0.5*t)
	}
	return y
}()

var ys32 = func() (y [6]float32) {
	for i, t := range ts {
		y[i] = float32(2) * float32(math.Exp(float64(float32(-0.5)*float32(t))))
	}
	return y
}()

// Decay is the pointer form.
func Decay(x *[2]float64, r *[6]float64) {
	for i, t := range ts {
		r[i] = x[0]*math.Exp(x[1]*t) - ys[i]
	}
}

// Fit holds the model as a method.
type Fit struct{}

func (Fit) model(b *[2]float64, t float64) float64 { return b[0] * math.Exp(b[1]*t) }

// Residuals is the array form as a value-receiver method.
func (f Fit) Residuals(x [2]float64, r *[6]float64) {
	for i := range ts {
		r[i] = f.model(&x, ts[i]) - ys[i]
	}
}

// DecaySlice is the slice form, each residual scaled in place.
func DecaySlice(x, r []float64) {
	for i := range ts {
		r[i] = x[0]*math.Exp(x[1]*ts[i]) - ys[i]
		r[i] *= 1
	}
}

// Decay32 is the pointer form in float32.
func Decay32(x *[2]float32, r *[6]float32) {
	for i, t := range ts {
		r[i] = x[0]*float32(math.Exp(float64(x[1]*float32(t)))) - ys32[i]
	}
}
`

const e2eAutoSpec = `# derivative = "automatic" on every form, float type and direction,
# with bounds and scale.

[[minimizer]]
name = "AutoScalar64"
objective = "Scalar64"
derivative = "automatic"
direction = "steepest"
start = 4.0
[minimizer.bounds]
lower = 0.0
upper = 10.0
[minimizer.expect]
x = 1.5

[[minimizer]]
name = "AutoRebound"
objective = "Rebound"
derivative = "automatic"
start = [3.0, 2.0]
[minimizer.expect]
x = [1.0, -1.0]

[[minimizer]]
name = "AutoScalar32"
objective = "Scalar32"
derivative = "automatic"
direction = "bfgs"
start = 1.0
scale = 2.0
[minimizer.expect]
x = 0.25
tolerance = 1e-3

[[minimizer]]
name = "AutoArray64"
objective = "Array64"
derivative = "automatic"
direction = "lbfgs"
start = [0.0, 0.0, 0.0]
[minimizer.bounds]
lower = [-5.0, -5.0, -5.0]
upper = [5.0, 5.0, 5.0]
[minimizer.expect]
x = [1.0, -2.0, 0.5]
tolerance = 1e-5

[[minimizer]]
name = "AutoArray32"
objective = "Array32"
derivative = "automatic"
direction = "cg"
start = [0.0, 1.5]
scale = [1.0, 0.5]
[minimizer.expect]
x = [1.0, 2.0]
tolerance = 1e-3

[[minimizer]]
name = "AutoPointer64"
objective = "Pointer64"
derivative = "automatic"
direction = "bfgs"
start = [-1.2, 1.0]
[minimizer.bounds]
lower = [-2.0, -2.0]
upper = [2.0, 2.0]
[minimizer.expect]
x = [1.0, 1.0]
tolerance = 1e-5

[[minimizer]]
name = "AutoPointer32"
objective = "Pointer32"
derivative = "automatic"
direction = "steepest"
start = [0.0, 0.0]
scale = [2.0, 1.0]
[minimizer.expect]
x = [2.0, -1.0]
tolerance = 1e-3

[[minimizer]]
name = "AutoSlice64"
objective = "Slice64"
derivative = "automatic"
direction = "cg"
dim = 3
start = [0.0, 0.0, 0.0]
[minimizer.expect]
x = [1.0, -2.0, 0.5]
tolerance = 1e-5

[[minimizer]]
name = "AutoSlice32"
objective = "Slice32"
derivative = "automatic"
direction = "lbfgs"
dim = 2
start = [1.0, -1.0]
scale = [1.0, 2.0]
[minimizer.expect]
x = [0.0, 1.0]
tolerance = 1e-3

[[minimizer]]
name = "AutoWellValue"
objective = "Well.Value"
instance = "DefaultWell"
derivative = "automatic"
start = [0.0, 0.0]
[minimizer.expect]
x = [0.5, -1.5]
tolerance = 1e-5

[[minimizer]]
name = "AutoWellEnergy"
objective = "Well.Energy"
instance = "DefaultWell"
derivative = "automatic"
direction = "lbfgs"
start = [0.0, 0.0]
[minimizer.expect]
x = [0.5, -1.5]
tolerance = 1e-5

[[minimizer]]
name = "AutoWell32Value"
objective = "Well32.Value"
instance = "DefaultWell32"
derivative = "automatic"
dim = 2
start = [0.0, 0.0]
[minimizer.expect]
x = [0.5, -1.5]
tolerance = 1e-3

[[minimizer]]
name = "AutoWell32Scalar"
objective = "Well32.Scalar"
instance = "DefaultWell32"
derivative = "automatic"
direction = "cg"
start = 3.0
[minimizer.expect]
x = 0.5
tolerance = 1e-3

[[minimizer]]
name = "AutoDecay"
objective = "Decay"
derivative = "automatic"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "AutoFitResiduals"
objective = "Fit.Residuals"
derivative = "automatic"
direction = "gauss-newton"
start = [1.0, 0.0]
[minimizer.bounds]
lower = [0.0, -1.0]
upper = [5.0, 1.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "AutoDecaySlice"
objective = "DecaySlice"
derivative = "automatic"
dim = 2
residuals = 6
start = [1.0, 0.0]
[minimizer.bounds]
lower = [0.0, -1.0]
upper = [5.0, 1.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "AutoDecay32"
objective = "Decay32"
derivative = "automatic"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-3
`
