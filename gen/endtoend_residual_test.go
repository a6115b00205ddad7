package gen

// The residual part of the end-to-end module: residual objectives in
// every form and both float types, as functions and methods, with
// Jacobians by rows, by columns and from differences, every least-squares
// direction with the rules it takes, bfgs on residuals, and boxes; every
// fit is exact, so [minimizer.expect] states it. A hand-written test
// checks NAMEUncertaintyAt against the closed form of a linear fit.

const e2eResidualGo = `// Package residual holds residual objectives: the fit of a·exp(b·t) to
// data made from a = 2, b = −0.5 (times a receiver's Scale for the
// methods), whose residuals vanish exactly there.
package residual

import "math"

var ts = [6]float64{0, 0.5, 1, 1.5, 2, 3}

// ys are the data: 2·exp(−0.5·t), computed as the residuals compute the
// model, so that they vanish exactly at (2, −0.5).
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

// DecayRows is Decay's Jacobian by rows.
func DecayRows(x *[2]float64, j *[6][2]float64) {
	for i, t := range ts {
		e := math.Exp(x[1] * t)
		j[i] = [2]float64{e, x[0] * t * e}
	}
}

// DecayColumns is Decay's Jacobian by columns.
func DecayColumns(x *[2]float64, j *[2][6]float64) {
	for i, t := range ts {
		e := math.Exp(x[1] * t)
		j[0][i], j[1][i] = e, x[0]*t*e
	}
}

// DecayValue is the array form.
func DecayValue(x [2]float64, r *[6]float64) { Decay(&x, r) }

// DecayValueRows is DecayValue's Jacobian, taking x by value too.
func DecayValueRows(x [2]float64, j *[6][2]float64) { DecayRows(&x, j) }

// DecaySlice is the slice form.
func DecaySlice(x, r []float64) {
	for i, t := range ts {
		r[i] = x[0]*math.Exp(x[1]*t) - ys[i]
	}
}

// Decay32 is the pointer form in float32.
func Decay32(x *[2]float32, r *[6]float32) {
	for i, t := range ts {
		r[i] = x[0]*float32(math.Exp(float64(x[1]*float32(t)))) - ys32[i]
	}
}

// Decay32Columns is Decay32's Jacobian by columns.
func Decay32Columns(x *[2]float32, j *[2][6]float32) {
	for i, t := range ts {
		e := float32(math.Exp(float64(x[1] * float32(t))))
		j[0][i], j[1][i] = e, x[0]*float32(t)*e
	}
}

// Series scales the data: its fit is (2·Scale, −0.5).
type Series struct{ Scale float64 }

// Tripled is the instance the methods' tests use.
var Tripled = Series{Scale: 3}

// NewDoubled gives a receiver by pointer.
func NewDoubled() *Series { return &Series{Scale: 2} }

// Misfit is a method on a value receiver.
func (s Series) Misfit(x *[2]float64, r *[6]float64) {
	for i, t := range ts {
		r[i] = x[0]*math.Exp(x[1]*t) - s.Scale*ys[i]
	}
}

// MisfitRows is Misfit's Jacobian.
func (s Series) MisfitRows(x *[2]float64, j *[6][2]float64) { DecayRows(x, j) }

// ValueMisfit is a method on a value receiver, taking x by value.
func (s Series) ValueMisfit(x [2]float64, r *[6]float64) { s.Misfit(&x, r) }

// PtrMisfit is a method on a pointer receiver, taking x by value.
func (s *Series) PtrMisfit(x [2]float64, r *[6]float64) { s.Misfit(&x, r) }

// Line is a linear fit c₀ + c₁·t to (0, 1), (1, 2.9), (2, 5.2), (3, 7.1)
// (invented data), whose solution and covariance have closed forms.
func Line(x *[2]float64, r *[4]float64) {
	for i, y := range [4]float64{1, 2.9, 5.2, 7.1} {
		r[i] = x[0] + x[1]*float64(i) - y
	}
}

// LineColumns is Line's Jacobian by columns.
func LineColumns(x *[2]float64, j *[2][4]float64) {
	for i := range j[0] {
		j[0][i], j[1][i] = 1, float64(i)
	}
}
`

const e2eResidualSpec = `# Residual objectives: every form, both float types, functions and
# methods, Jacobians by rows and by columns and from differences, every
# least-squares direction and the rules it takes, bfgs on residuals, and
# boxes. Each fit's minimum is exact: (2, −0.5), or (2·Scale, −0.5).

[[minimizer]]
name = "DecayDefault"
objective = "Decay"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayRowsLM"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayRows"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayColumnsLM"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayColumns"
start = [1.0, 0.0]
[minimizer.step]
decrease = 0.25
trials = 30
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayForwardLM"
objective = "Decay"
derivative = "forward"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "DecayGN"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayRows"
direction = "gauss-newton"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayGNDecrease"
objective = "Decay"
direction = "gauss-newton"
start = [1.0, 0.0]
[minimizer.step]
rule = "decrease"
interpolate = true
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayGNFixed"
objective = "Decay"
derivative = "forward"
direction = "gauss-newton"
start = [1.8, -0.4]
[minimizer.step]
rule = "fixed"
initial = 1.0
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "DecayBFGS"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayColumns"
direction = "bfgs"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayValueLM"
objective = "DecayValue"
derivative = "analytic"
jacobian = "DecayValueRows"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecayValueGN"
objective = "DecayValue"
direction = "gauss-newton"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecaySliceLM"
objective = "DecaySlice"
dim = 2
residuals = 6
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "DecaySliceGN"
objective = "DecaySlice"
derivative = "forward"
direction = "gauss-newton"
dim = 2
residuals = 6
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "Decay32LM"
objective = "Decay32"
derivative = "analytic"
jacobian = "Decay32Columns"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-3

[[minimizer]]
name = "Decay32GN"
objective = "Decay32"
direction = "gauss-newton"
start = [1.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-3

[[minimizer]]
name = "SeriesLM"
objective = "Series.Misfit"
derivative = "analytic"
jacobian = "MisfitRows"
instance = "Tripled"
start = [4.0, 0.0]
[minimizer.expect]
x = [6.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "SeriesPtrGN"
objective = "Series.PtrMisfit"
direction = "gauss-newton"
instance = "NewDoubled"
start = [3.0, 0.0]
[minimizer.expect]
x = [4.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "SeriesValueLM"
objective = "Series.ValueMisfit"
instance = "Tripled"
start = [4.0, 0.0]
[minimizer.expect]
x = [6.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "LineGN"
objective = "Line"
derivative = "analytic"
jacobian = "LineColumns"
direction = "gauss-newton"
start = [0.0, 0.0]
[minimizer.expect]
x = [0.96, 2.06]
tolerance = 1e-9

[[minimizer]]
name = "BoxRowsGN"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayRows"
direction = "gauss-newton"
start = [6.0, 1.0]
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, -2.0]
upper = [5.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "BoxForwardGN"
objective = "Decay"
derivative = "forward"
direction = "gauss-newton"
start = [1.0, -0.5]
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, -0.5]
upper = [10.0, -0.5]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "BoxCentralGN"
objective = "Decay"
direction = "gauss-newton"
start = [6.0, 1.0]
[minimizer.step]
rule = "armijo"
[minimizer.bounds]
lower = [0.0, -2.0]
upper = [5.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "BoxRowsLM"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayRows"
direction = "levenberg-marquardt"
start = [6.0, 1.0]
[minimizer.bounds]
lower = [0.0, -2.0]
upper = [5.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "BoxForwardLM"
objective = "Decay"
derivative = "forward"
direction = "levenberg-marquardt"
start = [1.0, -0.5]
[minimizer.bounds]
lower = [0.0, -0.5]
upper = [10.0, -0.5]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "BoxCentralLM"
objective = "Decay"
direction = "levenberg-marquardt"
start = [6.0, 1.0]
[minimizer.bounds]
lower = [0.0, -2.0]
upper = [5.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "BoxDecreaseGN"
objective = "Decay"
direction = "gauss-newton"
start = [1.0, -0.5]
[minimizer.step]
rule = "decrease"
[minimizer.bounds]
lower = [0.0, -0.5]
upper = [10.0, -0.5]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-6

[[minimizer]]
name = "BoxFixedGN"
objective = "Decay"
derivative = "analytic"
jacobian = "DecayRows"
direction = "gauss-newton"
start = [1.9, -0.5]
[minimizer.step]
rule = "fixed"
[minimizer.bounds]
lower = [0.0, -0.5]
upper = [10.0, -0.5]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-5

[[minimizer]]
name = "Box32LM"
objective = "Decay32"
derivative = "analytic"
jacobian = "Decay32Columns"
start = [6.0, 1.0]
[minimizer.bounds]
lower = [0.0, -2.0]
upper = [5.0, 0.0]
[minimizer.expect]
x = [2.0, -0.5]
tolerance = 1e-3
`

const e2eResidualTest = `package residual

import (
	"math"
	"testing"
)

// The uncertainty of the linear fit is the closed form of simple linear
// regression: var(c₁) = s²/Sₜₜ, var(c₀) = s²(1/n + t̄²/Sₜₜ), s² = RSS/(n − 2)
// (Draper & Smith, Applied Regression Analysis, 3rd ed., 1998, §1.4 and
// §3.2; from memory); the fit itself is (0.96, 2.06) for this data: t̄ = 1.5, ȳ = 4.05,
// Sₜₜ = 5, Sₜᵧ = 10.3.
func TestLineUncertainty(t *testing.T) {
	r := LineGN([2]float64{0, 0})
	u := LineGNUncertaintyAt(r.X)
	ys := [4]float64{1, 2.9, 5.2, 7.1}
	var rss float64
	for i, y := range ys {
		d := 0.96 + 2.06*float64(i) - y
		rss += d * d
	}
	s2 := rss / 2
	tMean, stt := 1.5, 5.0
	want := [2]float64{math.Sqrt(s2 * (0.25 + tMean*tMean/stt)), math.Sqrt(s2 / stt)}
	if !u.Valid || u.DegreesOfFreedom != 2 || math.Abs(u.ResidualVariance-s2) > 1e-12 {
		t.Fatalf("uncertainty %+v, want valid, 2 degrees of freedom, s² = %g", u, s2)
	}
	for i := range want {
		if math.Abs(u.StandardErrors[i]-want[i]) > 1e-9*want[i] {
			t.Errorf("standard error %d = %g, want %g", i, u.StandardErrors[i], want[i])
		}
	}
	if c := u.Covariance[0][1]; math.Abs(c-(-tMean*s2/stt)) > 1e-9*math.Abs(c) {
		t.Errorf("covariance %g, want %g", c, -tMean*s2/stt)
	}
}

// A zero-residual fit has no variance to estimate.
func TestExactFitUncertainty(t *testing.T) {
	r := DecayRowsLM([2]float64{1, 0})
	u := DecayRowsLMUncertaintyAt(r.X)
	if !(u.ResidualVariance < 1e-16) || !u.Valid {
		t.Errorf("uncertainty %+v at the exact fit, want valid with s² ≈ 0", u)
	}
}
`
