package models

import "math"

// The models of models.go as a user writes them when no derivative is
// wanted: the value f(x; b) alone, the same formulas with the partial
// derivatives left out. The residuals NAMEPlain in data.go call them,
// and the nist check fits those with derivative = "automatic", which
// differentiates this source; the check compares the Jacobian it derives
// with NAMEJacobian's hand-derived one.

// misra1aValue: y = b1·(1 − exp(−b2·x)).
func misra1aValue(b *[2]float64, x []float64) float64 {
	e := math.Exp(-b[1] * x[0])
	return b[0] * (1 - e)
}

// chwirutValue: y = exp(−b1·x)/(b2 + b3·x) (Chwirut1 and Chwirut2).
func chwirutValue(b *[3]float64, x []float64) float64 {
	e := math.Exp(-b[0] * x[0])
	den := b[1] + b[2]*x[0]
	return e / den
}

// lanczosValue: y = b1·exp(−b2·x) + b3·exp(−b4·x) + b5·exp(−b6·x) (Lanczos1–3).
func lanczosValue(b *[6]float64, x []float64) float64 {
	var y float64
	for k := 0; k < 6; k += 2 {
		e := math.Exp(-b[k+1] * x[0])
		y += b[k] * e
	}
	return y
}

// gaussValue: y = b1·exp(−b2·x) + b3·exp(−(x − b4)²/b5²) + b6·exp(−(x − b7)²/b8²)
// (Gauss1 and Gauss3).
func gaussValue(b *[8]float64, x []float64) float64 {
	e := math.Exp(-b[1] * x[0])
	y := b[0] * e
	for _, k := range [2]int{2, 5} {
		u := x[0] - b[k+1]
		w := b[k+2]
		g := math.Exp(-u * u / (w * w))
		y += b[k] * g
	}
	return y
}

// danWoodValue: y = b1·x^b2.
func danWoodValue(b *[2]float64, x []float64) float64 {
	p := math.Pow(x[0], b[1])
	return b[0] * p
}

// misra1bValue: y = b1·(1 − (1 + b2·x/2)^(−2)).
func misra1bValue(b *[2]float64, x []float64) float64 {
	q := 1 + b[1]*x[0]/2
	return b[0] * (1 - 1/(q*q))
}

// kirby2Value: y = (b1 + b2·x + b3·x²)/(1 + b4·x + b5·x²).
func kirby2Value(b *[5]float64, x []float64) float64 {
	t := x[0]
	num := b[0] + b[1]*t + b[2]*t*t
	den := 1 + b[3]*t + b[4]*t*t
	return num / den
}

// cubicRatioValue: y = (b1 + b2·x + b3·x² + b4·x³)/(1 + b5·x + b6·x² + b7·x³)
// (Hahn1 and Thurber).
func cubicRatioValue(b *[7]float64, x []float64) float64 {
	t := x[0]
	num := b[0] + b[1]*t + b[2]*t*t + b[3]*t*t*t
	den := 1 + b[4]*t + b[5]*t*t + b[6]*t*t*t
	return num / den
}

// nelsonValue: log y = b1 − b2·x1·exp(−b3·x2).
func nelsonValue(b *[3]float64, x []float64) float64 {
	e := math.Exp(-b[2] * x[1])
	return b[0] - b[1]*x[0]*e
}

// mgh17Value: y = b1 + b2·exp(−x·b4) + b3·exp(−x·b5).
func mgh17Value(b *[5]float64, x []float64) float64 {
	e4, e5 := math.Exp(-x[0]*b[3]), math.Exp(-x[0]*b[4])
	return b[0] + b[1]*e4 + b[2]*e5
}

// misra1dValue: y = b1·b2·x·(1 + b2·x)^(−1).
func misra1dValue(b *[2]float64, x []float64) float64 {
	q := 1 + b[1]*x[0]
	return b[0] * b[1] * x[0] / q
}

// roszman1Value: y = b1 − b2·x − arctan(b3/(x − b4))/π, π as the file defines it.
func roszman1Value(b *[4]float64, x []float64) float64 {
	const pi = 3.141592653589793238462643383279
	v := x[0] - b[3]
	u := b[2] / v
	return b[0] - b[1]*x[0] - math.Atan(u)/pi
}

// ensoValue: y = b1 + b2·cos(2πx/12) + b3·sin(2πx/12) + b5·cos(2πx/b4) +
// b6·sin(2πx/b4) + b8·cos(2πx/b7) + b9·sin(2πx/b7).
func ensoValue(b *[9]float64, x []float64) float64 {
	a := 2 * math.Pi * x[0]
	c12, s12 := math.Cos(a/12), math.Sin(a/12)
	y := b[0] + b[1]*c12 + b[2]*s12
	for _, k := range [2]int{3, 6} {
		period := b[k]
		c, s := math.Cos(a/period), math.Sin(a/period)
		y += b[k+1]*c + b[k+2]*s
	}
	return y
}

// mgh09Value: y = b1·(x² + x·b2)/(x² + x·b3 + b4).
func mgh09Value(b *[4]float64, x []float64) float64 {
	t := x[0]
	num := t*t + t*b[1]
	den := t*t + t*b[2] + b[3]
	return b[0] * num / den
}

// rat42Value: y = b1/(1 + exp(b2 − b3·x)).
func rat42Value(b *[3]float64, x []float64) float64 {
	e := math.Exp(b[1] - b[2]*x[0])
	return b[0] / (1 + e)
}

// bennett5Value: y = b1·(b2 + x)^(−1/b3).
func bennett5Value(b *[3]float64, x []float64) float64 {
	base := b[1] + x[0]
	p := math.Pow(base, -1/b[2])
	return b[0] * p
}
