// Package objectives holds the Moré–Garbow–Hillstrom test functions (J. J.
// Moré, B. S. Garbow and K. E. Hillstrom, "Testing Unconstrained Optimization
// Software", ACM TOMS 7(1):17–41, 1981; MGH below) checked in ../../mgh, as
// plain Go source over fixed-size arrays, so that a source-to-source
// differentiator can read them.
//
// Each function is transcribed from the Func method of the matching type in
// gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go, keeping gonum's
// order of operations so that the values agree with gonum's to rounding
// (objectives_test.go checks them against gonum). The code keeps to the
// subset of Go the differentiator accepts: float64 arithmetic, if/else,
// three-clause for loops, local scalars, read-only package tables, x indexed
// element by element or passed whole as a slice (watson, penaltyI and
// penaltyII serve both sizes of their problem), and calls into package math
// only. Gonum's dimension checks (panics) are dropped: the array types fix
// the dimension.
package objectives

import "math"

// Rosenbrock is MGH problem (1), Rosenbrock, n = 2, m = 2: gonum's
// ExtendedRosenbrock at n = 2 (one term of its chain).
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Rosenbrock(x *[2]float64) float64 {
	sum := 0.0
	for i := 0; i < 2-1; i++ {
		a := 1 - x[i]
		b := x[i+1] - x[i]*x[i]
		sum += a*a + 100*b*b
	}
	return sum
}

// PowellBadlyScaled is MGH problem (3), Powell badly scaled, n = 2, m = 2.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PowellBadlyScaled(x *[2]float64) float64 {
	f1 := 1e4*x[0]*x[1] - 1
	f2 := math.Exp(-x[0]) + math.Exp(-x[1]) - 1.0001
	return f1*f1 + f2*f2
}

// BrownBadlyScaled is MGH problem (4), Brown badly scaled, n = 2, m = 3.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func BrownBadlyScaled(x *[2]float64) float64 {
	f1 := x[0] - 1e6
	f2 := x[1] - 2e-6
	f3 := x[0]*x[1] - 2
	return f1*f1 + f2*f2 + f3*f3
}

// Beale is MGH problem (5), Beale, n = 2, m = 3.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Beale(x *[2]float64) float64 {
	f1 := 1.5 - x[0]*(1-x[1])
	f2 := 2.25 - x[0]*(1-x[1]*x[1])
	f3 := 2.625 - x[0]*(1-x[1]*x[1]*x[1])
	return f1*f1 + f2*f2 + f3*f3
}

// HelicalValley is MGH problem (7), helical valley, n = 3, m = 3.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
//
// θ is computed as gonum does, from math.Atan(x₂/x₁) with 1/2 added when
// x₁ < 0. Gonum panics at x₁ = 0, where MGH leaves θ undefined; this
// version does not panic there and returns whatever the formula gives
// (x₂/x₁ = ±Inf gives θ = ±1/4, and x₁ = x₂ = 0 gives NaN). Away from
// x₁ = 0 the value is gonum's.
func HelicalValley(x *[3]float64) float64 {
	theta := 0.5 * math.Atan(x[1]/x[0]) / math.Pi
	if x[0] < 0 {
		theta += 0.5
	}
	f1 := 10 * (x[2] - 10*theta)
	f2 := 10 * (math.Hypot(x[0], x[1]) - 1)
	f3 := x[2]
	return f1*f1 + f2*f2 + f3*f3
}

// gaussianY is y_i, i = 1, …, 15, of MGH problem (9), as gonum's Gaussian.y
// records it (gaussianY[i-1] is y_i).
var gaussianY = [15]float64{
	0.0009, 0.0044, 0.0175, 0.0540, 0.1295, 0.2420, 0.3521, 0.3989,
	0.3521, 0.2420, 0.1295, 0.0540, 0.0175, 0.0044, 0.0009,
}

// Gaussian is MGH problem (9), Gaussian, n = 3, m = 15.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go
// (gonum's switch in Gaussian.y is the table gaussianY).
func Gaussian(x *[3]float64) float64 {
	sum := 0.0
	for i := 1; i <= 15; i++ {
		c := 0.5 * float64(8-i)
		b := c - x[2]
		d := b * b
		e := math.Exp(-0.5 * x[1] * d)
		f := x[0]*e - gaussianY[i-1]
		sum += f * f
	}
	return sum
}

// GulfRD is MGH problem (11), Gulf research and development, n = 3, m = 99
// (gonum's choice of m; MGH allows n ≤ m ≤ 100): gonum's
// GulfResearchAndDevelopment.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func GulfRD(x *[3]float64) float64 {
	sum := 0.0
	for i := 1; i <= 99; i++ {
		arg := float64(i) / 100
		r := math.Pow(-50*math.Log(arg), 2.0/3.0) + 25 - x[1]
		t1 := math.Pow(math.Abs(r), x[2]) / x[0]
		t2 := math.Exp(-t1)
		t := t2 - arg
		sum += t * t
	}
	return sum
}

// Box3D is MGH problem (12), Box three-dimensional, n = 3, m = 10 (gonum's
// choice of m).
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Box3D(x *[3]float64) float64 {
	sum := 0.0
	for i := 1; i <= 10; i++ {
		c := -float64(i) / 10
		y := math.Exp(c) - math.Exp(10*c)
		f := math.Exp(c*x[0]) - math.Exp(c*x[1]) - x[2]*y
		sum += f * f
	}
	return sum
}

// PowellSingular is MGH problem (13), Powell singular, n = 4, m = 4: gonum's
// ExtendedPowellSingular at n = 4 (one block).
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PowellSingular(x *[4]float64) float64 {
	sum := 0.0
	for i := 0; i < 4; i += 4 {
		f1 := x[i] + 10*x[i+1]
		f2 := x[i+2] - x[i+3]
		t := x[i+1] - 2*x[i+2]
		f3 := t * t
		t = x[i] - x[i+3]
		f4 := t * t
		sum += f1*f1 + 5*f2*f2 + f3*f3 + 10*f4*f4
	}
	return sum
}

// Wood is MGH problem (14), Wood, n = 4, m = 6.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Wood(x *[4]float64) float64 {
	f1 := x[1] - x[0]*x[0]
	f2 := 1 - x[0]
	f3 := x[3] - x[2]*x[2]
	f4 := 1 - x[2]
	f5 := x[1] + x[3] - 2
	f6 := x[1] - x[3]
	return 100*f1*f1 + f2*f2 + 90*f3*f3 + f4*f4 + 10*f5*f5 + 0.1*f6*f6
}

// BrownDennis is MGH problem (16), Brown and Dennis, n = 4, m = 20: gonum's
// BrownAndDennis.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func BrownDennis(x *[4]float64) float64 {
	sum := 0.0
	for i := 1; i <= 20; i++ {
		c := float64(i) / 5
		f1 := x[0] + c*x[1] - math.Exp(c)
		f2 := x[2] + x[3]*math.Sin(c) - math.Cos(c)
		f := f1*f1 + f2*f2
		sum += f * f
	}
	return sum
}

// BiggsEXP6 is MGH problem (18), Biggs EXP6, n = 6, m = 13.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func BiggsEXP6(x *[6]float64) float64 {
	sum := 0.0
	for i := 1; i <= 13; i++ {
		z := float64(i) / 10
		y := math.Exp(-z) - 5*math.Exp(-10*z) + 3*math.Exp(-4*z)
		f := x[2]*math.Exp(-x[0]*z) - x[3]*math.Exp(-x[1]*z) + x[5]*math.Exp(-x[4]*z) - y
		sum += f * f
	}
	return sum
}

// Watson6 is MGH problem (20), Watson, n = 6, m = 31: gonum's Watson at
// n = 6.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Watson6(x *[6]float64) float64 { return watson(x[:]) }

// Watson9 is MGH problem (20), Watson, n = 9, m = 31: gonum's Watson at
// n = 9.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Watson9(x *[9]float64) float64 { return watson(x[:]) }

// watson is Watson at len(x) unknowns, for Watson6 and Watson9; the
// unknowns pass to it whole, as a slice.
func watson(x []float64) float64 {
	sum := 0.0
	for i := 1; i <= 29; i++ {
		d1 := float64(i) / 29

		d2 := 1.0
		s1 := 0.0
		for j := 1; j < len(x); j++ {
			s1 += float64(j) * d2 * x[j]
			d2 *= d1
		}

		d2 = 1.0
		s2 := 0.0
		for j := 0; j < len(x); j++ {
			s2 += d2 * x[j]
			d2 *= d1
		}

		t := s1 - s2*s2 - 1
		sum += t * t
	}
	t := x[1] - x[0]*x[0] - 1
	sum += x[0]*x[0] + t*t
	return sum
}

// PenaltyI4 is MGH problem (23), penalty function I, n = 4, m = 5: gonum's
// PenaltyI at n = 4.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PenaltyI4(x *[4]float64) float64 { return penaltyI(x[:]) }

// PenaltyI10 is MGH problem (23), penalty function I, n = 10, m = 11:
// gonum's PenaltyI at n = 10.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PenaltyI10(x *[10]float64) float64 { return penaltyI(x[:]) }

// penaltyI is penalty function I at len(x) unknowns, for PenaltyI4 and
// PenaltyI10.
func penaltyI(x []float64) float64 {
	sum := 0.0
	for i := 0; i < len(x); i++ {
		sum += (x[i] - 1) * (x[i] - 1)
	}
	sum *= 1e-5

	s := 0.0
	for i := 0; i < len(x); i++ {
		s += x[i] * x[i]
	}
	sum += (s - 0.25) * (s - 0.25)
	return sum
}

// PenaltyII4 is MGH problem (24), penalty function II, n = 4, m = 8:
// gonum's PenaltyII at n = 4.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PenaltyII4(x *[4]float64) float64 { return penaltyII(x[:]) }

// PenaltyII10 is MGH problem (24), penalty function II, n = 10, m = 20:
// gonum's PenaltyII at n = 10.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func PenaltyII10(x *[10]float64) float64 { return penaltyII(x[:]) }

// penaltyII is penalty function II at len(x) unknowns, for PenaltyII4
// and PenaltyII10.
func penaltyII(x []float64) float64 {
	sum := 0.0
	s := -1.0
	for i := 0; i < len(x); i++ {
		s += float64(len(x)-i) * x[i] * x[i]
	}
	for i := 1; i < len(x); i++ {
		yi := math.Exp(float64(i+1)/10) + math.Exp(float64(i)/10)
		f := math.Exp(x[i]/10) + math.Exp(x[i-1]/10) - yi
		sum += f * f
	}
	for i := 1; i < len(x); i++ {
		f := math.Exp(x[i]/10) - math.Exp(-1.0/10)
		sum += f * f
	}
	sum *= 1e-5
	sum += (x[0] - 0.2) * (x[0] - 0.2)
	sum += s * s
	return sum
}

// VariablyDimensioned10 is MGH problem (25), variably dimensioned, n = 10,
// m = 12: gonum's VariablyDimensioned at n = 10.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func VariablyDimensioned10(x *[10]float64) float64 {
	sum := 0.0
	for i := 0; i < 10; i++ {
		t := x[i] - 1
		sum += t * t
	}

	s := 0.0
	for i := 0; i < 10; i++ {
		s += float64(i+1) * (x[i] - 1)
	}
	s *= s
	sum += s
	s *= s
	sum += s
	return sum
}

// Trigonometric10 is MGH problem (26), trigonometric, n = 10, m = 10:
// gonum's Trigonometric at n = 10.
// Transcribed from gonum.org/v1/gonum/optimize/functions v0.17.0 functions.go.
func Trigonometric10(x *[10]float64) float64 {
	sum := 0.0
	s1 := 0.0
	for i := 0; i < 10; i++ {
		s1 += math.Cos(x[i])
	}
	for i := 0; i < 10; i++ {
		f := float64(10+i+1) - float64(i+1)*math.Cos(x[i]) - math.Sin(x[i]) - s1
		sum += f * f
	}
	return sum
}
