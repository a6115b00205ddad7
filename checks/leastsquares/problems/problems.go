// Package problems holds the least-squares problems of J. J. Moré,
// B. S. Garbow and K. E. Hillstrom, "Testing Unconstrained Optimization
// Software", ACM TOMS 7(1):17–41, 1981 (MGH below), in residual form
// r(x) ∈ ℝᴹ with f = Σrᵢ² in MGH's convention. Where
// gonum.org/v1/gonum/optimize/functions records a problem, the check in
// ../ holds Σrᵢ² to gonum's Func at the start and at nearby points, so
// that the residuals written here are gonum's function; Bard, Meyer and
// Osborne 1, which gonum does not record, are written from MGH's
// definitions (from memory).
package problems

import "math"

// Rosenbrock is MGH (1), n = m = 2.
func Rosenbrock(x *[2]float64, r *[2]float64) {
	r[0] = 10 * (x[1] - x[0]*x[0])
	r[1] = 1 - x[0]
}

// Beale is MGH (5), n = 2, m = 3.
func Beale(x *[2]float64, r *[3]float64) {
	for i, y := range [3]float64{1.5, 2.25, 2.625} {
		r[i] = y - x[0]*(1-math.Pow(x[1], float64(i+1)))
	}
}

// HelicalValley is MGH (7), n = m = 3, with θ = arctan(x₂/x₁)/(2π), plus ½
// for x₁ < 0.
func HelicalValley(x *[3]float64, r *[3]float64) {
	theta := math.Atan(x[1]/x[0]) / (2 * math.Pi)
	if x[0] < 0 {
		theta += 0.5
	}
	r[0] = 10 * (x[2] - 10*theta)
	r[1] = 10 * (math.Hypot(x[0], x[1]) - 1)
	r[2] = x[2]
}

// Bard is MGH (8), n = 3, m = 15: yᵢ − (x₁ + uᵢ/(vᵢx₂ + wᵢx₃)), uᵢ = i,
// vᵢ = 16 − i, wᵢ = min(uᵢ, vᵢ) (MGH; from memory).
func Bard(x *[3]float64, r *[15]float64) {
	y := [15]float64{0.14, 0.18, 0.22, 0.25, 0.29, 0.32, 0.35, 0.39, 0.37, 0.58, 0.73, 0.96, 1.34, 2.10, 4.39}
	for i := range r {
		u := float64(i + 1)
		v := 16 - u
		w := math.Min(u, v)
		r[i] = y[i] - (x[0] + u/(v*x[1]+w*x[2]))
	}
}

// Gaussian is MGH (9), n = 3, m = 15.
func Gaussian(x *[3]float64, r *[15]float64) {
	y := [15]float64{0.0009, 0.0044, 0.0175, 0.0540, 0.1295, 0.2420, 0.3521, 0.3989, 0.3521, 0.2420, 0.1295, 0.0540, 0.0175, 0.0044, 0.0009}
	for i := range r {
		t := (7 - float64(i)) / 2
		d := t - x[2]
		r[i] = x[0]*math.Exp(-0.5*x[1]*d*d) - y[i]
	}
}

// Meyer is MGH (10), n = 3, m = 16: x₁·exp(x₂/(tᵢ + x₃)) − yᵢ,
// tᵢ = 45 + 5i (MGH; from memory).
func Meyer(x *[3]float64, r *[16]float64) {
	y := [16]float64{34780, 28610, 23650, 19630, 16370, 13720, 11540, 9744, 8261, 7030, 6005, 5147, 4427, 3820, 3307, 2872}
	for i := range r {
		t := 45 + 5*float64(i+1)
		r[i] = x[0]*math.Exp(x[1]/(t+x[2])) - y[i]
	}
}

// Box3D is MGH (12), n = 3, m = 10 (gonum's m).
func Box3D(x *[3]float64, r *[10]float64) {
	for i := range r {
		t := 0.1 * float64(i+1)
		r[i] = math.Exp(-t*x[0]) - math.Exp(-t*x[1]) - x[2]*(math.Exp(-t)-math.Exp(-10*t))
	}
}

// PowellSingular is MGH (13), n = m = 4.
func PowellSingular(x *[4]float64, r *[4]float64) {
	r[0] = x[0] + 10*x[1]
	r[1] = math.Sqrt(5) * (x[2] - x[3])
	r[2] = (x[1] - 2*x[2]) * (x[1] - 2*x[2])
	r[3] = math.Sqrt(10) * (x[0] - x[3]) * (x[0] - x[3])
}

// Wood is MGH (14), n = 4, m = 6.
func Wood(x *[4]float64, r *[6]float64) {
	r[0] = 10 * (x[1] - x[0]*x[0])
	r[1] = 1 - x[0]
	r[2] = math.Sqrt(90) * (x[3] - x[2]*x[2])
	r[3] = 1 - x[2]
	r[4] = math.Sqrt(10) * (x[1] + x[3] - 2)
	r[5] = (x[1] - x[3]) / math.Sqrt(10)
}

// BrownDennis is MGH (16), n = 4, m = 20.
func BrownDennis(x *[4]float64, r *[20]float64) {
	for i := range r {
		t := float64(i+1) / 5
		a := x[0] + t*x[1] - math.Exp(t)
		b := x[2] + x[3]*math.Sin(t) - math.Cos(t)
		r[i] = a*a + b*b
	}
}

// Osborne1 is MGH (17), n = 5, m = 33: yᵢ − (x₁ + x₂·exp(−tᵢx₄) +
// x₃·exp(−tᵢx₅)), tᵢ = 10(i − 1) (MGH; from memory).
func Osborne1(x *[5]float64, r *[33]float64) {
	y := [33]float64{0.844, 0.908, 0.932, 0.936, 0.925, 0.908, 0.881, 0.850, 0.818, 0.784, 0.751, 0.718, 0.685, 0.658, 0.628, 0.603, 0.580, 0.558, 0.538, 0.522, 0.506, 0.490, 0.478, 0.467, 0.457, 0.448, 0.438, 0.431, 0.424, 0.420, 0.414, 0.411, 0.406}
	for i := range r {
		t := 10 * float64(i)
		r[i] = y[i] - (x[0] + x[1]*math.Exp(-t*x[3]) + x[2]*math.Exp(-t*x[4]))
	}
}

// BiggsEXP6 is MGH (18), n = 6, m = 13 (gonum's m).
func BiggsEXP6(x *[6]float64, r *[13]float64) {
	for i := range r {
		t := 0.1 * float64(i+1)
		y := math.Exp(-t) - 5*math.Exp(-10*t) + 3*math.Exp(-4*t)
		r[i] = x[2]*math.Exp(-t*x[0]) - x[3]*math.Exp(-t*x[1]) + x[5]*math.Exp(-t*x[4]) - y
	}
}
