// Package models holds the models of the NIST Statistical Reference
// Datasets for nonlinear regression (NIST/ITL StRD,
// https://www.itl.nist.gov/div898/strd/nls/nls_main.shtml; public domain),
// as residual objectives for thalweg: for each dataset NAME, NAME(b, r)
// writes rᵢ = f(xᵢ; b) − yᵢ (for Nelson, whose model is stated for log y,
// rᵢ = f(xᵢ; b) − log yᵢ) and NAMEJacobian(b, J) writes Jᵢⱼ = ∂f(xᵢ; b)/∂bⱼ
// by rows. The models, written below by hand from the formulas printed in
// each file, give f and its partial derivatives at one observation; the
// data and the loops over it (data.go) are generated from the files in
// ../testdata by `go test -update` in ../.
package models

import "math"

// Each model takes the parameters b, the observation's predictors x
// (x[0] the only one, or x1 and x2 for Nelson) and, when d is not nil,
// writes ∂f/∂b into it.

// misra1a: y = b1·(1 − exp(−b2·x)).
func misra1a(b *[2]float64, x []float64, d *[2]float64) float64 {
	e := math.Exp(-b[1] * x[0])
	if d != nil {
		d[0] = 1 - e
		d[1] = b[0] * x[0] * e
	}
	return b[0] * (1 - e)
}

// chwirut: y = exp(−b1·x)/(b2 + b3·x) (Chwirut1 and Chwirut2).
func chwirut(b *[3]float64, x []float64, d *[3]float64) float64 {
	e := math.Exp(-b[0] * x[0])
	den := b[1] + b[2]*x[0]
	if d != nil {
		d[0] = -x[0] * e / den
		d[1] = -e / (den * den)
		d[2] = -x[0] * e / (den * den)
	}
	return e / den
}

// lanczos: y = b1·exp(−b2·x) + b3·exp(−b4·x) + b5·exp(−b6·x) (Lanczos1–3).
func lanczos(b *[6]float64, x []float64, d *[6]float64) float64 {
	var y float64
	for k := 0; k < 6; k += 2 {
		e := math.Exp(-b[k+1] * x[0])
		y += b[k] * e
		if d != nil {
			d[k] = e
			d[k+1] = -b[k] * x[0] * e
		}
	}
	return y
}

// gauss: y = b1·exp(−b2·x) + b3·exp(−(x − b4)²/b5²) + b6·exp(−(x − b7)²/b8²)
// (Gauss1 and Gauss3).
func gauss(b *[8]float64, x []float64, d *[8]float64) float64 {
	e := math.Exp(-b[1] * x[0])
	y := b[0] * e
	if d != nil {
		d[0] = e
		d[1] = -b[0] * x[0] * e
	}
	for _, k := range [2]int{2, 5} {
		u := x[0] - b[k+1]
		w := b[k+2]
		g := math.Exp(-u * u / (w * w))
		y += b[k] * g
		if d != nil {
			d[k] = g
			d[k+1] = b[k] * g * 2 * u / (w * w)
			d[k+2] = b[k] * g * 2 * u * u / (w * w * w)
		}
	}
	return y
}

// danWood: y = b1·x^b2.
func danWood(b *[2]float64, x []float64, d *[2]float64) float64 {
	p := math.Pow(x[0], b[1])
	if d != nil {
		d[0] = p
		d[1] = b[0] * p * math.Log(x[0])
	}
	return b[0] * p
}

// misra1b: y = b1·(1 − (1 + b2·x/2)^(−2)).
func misra1b(b *[2]float64, x []float64, d *[2]float64) float64 {
	q := 1 + b[1]*x[0]/2
	if d != nil {
		d[0] = 1 - 1/(q*q)
		d[1] = b[0] * x[0] / (q * q * q)
	}
	return b[0] * (1 - 1/(q*q))
}

// kirby2: y = (b1 + b2·x + b3·x²)/(1 + b4·x + b5·x²).
func kirby2(b *[5]float64, x []float64, d *[5]float64) float64 {
	t := x[0]
	num := b[0] + b[1]*t + b[2]*t*t
	den := 1 + b[3]*t + b[4]*t*t
	if d != nil {
		d[0] = 1 / den
		d[1] = t / den
		d[2] = t * t / den
		d[3] = -num * t / (den * den)
		d[4] = -num * t * t / (den * den)
	}
	return num / den
}

// cubicRatio: y = (b1 + b2·x + b3·x² + b4·x³)/(1 + b5·x + b6·x² + b7·x³)
// (Hahn1 and Thurber).
func cubicRatio(b *[7]float64, x []float64, d *[7]float64) float64 {
	t := x[0]
	num := b[0] + b[1]*t + b[2]*t*t + b[3]*t*t*t
	den := 1 + b[4]*t + b[5]*t*t + b[6]*t*t*t
	if d != nil {
		d[0] = 1 / den
		d[1] = t / den
		d[2] = t * t / den
		d[3] = t * t * t / den
		d[4] = -num * t / (den * den)
		d[5] = -num * t * t / (den * den)
		d[6] = -num * t * t * t / (den * den)
	}
	return num / den
}

// nelson: log y = b1 − b2·x1·exp(−b3·x2).
func nelson(b *[3]float64, x []float64, d *[3]float64) float64 {
	e := math.Exp(-b[2] * x[1])
	if d != nil {
		d[0] = 1
		d[1] = -x[0] * e
		d[2] = b[1] * x[0] * x[1] * e
	}
	return b[0] - b[1]*x[0]*e
}

// mgh17: y = b1 + b2·exp(−x·b4) + b3·exp(−x·b5).
func mgh17(b *[5]float64, x []float64, d *[5]float64) float64 {
	e4, e5 := math.Exp(-x[0]*b[3]), math.Exp(-x[0]*b[4])
	if d != nil {
		d[0] = 1
		d[1] = e4
		d[2] = e5
		d[3] = -b[1] * x[0] * e4
		d[4] = -b[2] * x[0] * e5
	}
	return b[0] + b[1]*e4 + b[2]*e5
}

// misra1d: y = b1·b2·x·(1 + b2·x)^(−1).
func misra1d(b *[2]float64, x []float64, d *[2]float64) float64 {
	q := 1 + b[1]*x[0]
	if d != nil {
		d[0] = b[1] * x[0] / q
		d[1] = b[0] * x[0] / (q * q)
	}
	return b[0] * b[1] * x[0] / q
}

// roszman1: y = b1 − b2·x − arctan(b3/(x − b4))/π, π as the file defines it.
func roszman1(b *[4]float64, x []float64, d *[4]float64) float64 {
	const pi = 3.141592653589793238462643383279
	v := x[0] - b[3]
	u := b[2] / v
	if d != nil {
		d[0] = 1
		d[1] = -x[0]
		d[2] = -1 / (pi * (1 + u*u) * v)
		d[3] = -b[2] / (pi * (1 + u*u) * v * v)
	}
	return b[0] - b[1]*x[0] - math.Atan(u)/pi
}

// enso: y = b1 + b2·cos(2πx/12) + b3·sin(2πx/12) + b5·cos(2πx/b4) +
// b6·sin(2πx/b4) + b8·cos(2πx/b7) + b9·sin(2πx/b7).
func enso(b *[9]float64, x []float64, d *[9]float64) float64 {
	a := 2 * math.Pi * x[0]
	c12, s12 := math.Cos(a/12), math.Sin(a/12)
	y := b[0] + b[1]*c12 + b[2]*s12
	if d != nil {
		d[0], d[1], d[2] = 1, c12, s12
	}
	for _, k := range [2]int{3, 6} {
		period := b[k]
		c, s := math.Cos(a/period), math.Sin(a/period)
		y += b[k+1]*c + b[k+2]*s
		if d != nil {
			d[k+1], d[k+2] = c, s
			d[k] = (b[k+1]*s - b[k+2]*c) * a / (period * period) // ∂/∂period of b·cos(a/p) + b'·sin(a/p)
		}
	}
	return y
}

// mgh09: y = b1·(x² + x·b2)/(x² + x·b3 + b4).
func mgh09(b *[4]float64, x []float64, d *[4]float64) float64 {
	t := x[0]
	num := t*t + t*b[1]
	den := t*t + t*b[2] + b[3]
	if d != nil {
		d[0] = num / den
		d[1] = b[0] * t / den
		d[2] = -b[0] * num * t / (den * den)
		d[3] = -b[0] * num / (den * den)
	}
	return b[0] * num / den
}

// rat42: y = b1/(1 + exp(b2 − b3·x)).
func rat42(b *[3]float64, x []float64, d *[3]float64) float64 {
	e := math.Exp(b[1] - b[2]*x[0])
	if d != nil {
		d[0] = 1 / (1 + e)
		d[1] = -b[0] * e / ((1 + e) * (1 + e))
		d[2] = b[0] * x[0] * e / ((1 + e) * (1 + e))
	}
	return b[0] / (1 + e)
}

// bennett5: y = b1·(b2 + x)^(−1/b3).
func bennett5(b *[3]float64, x []float64, d *[3]float64) float64 {
	base := b[1] + x[0]
	p := math.Pow(base, -1/b[2])
	if d != nil {
		d[0] = p
		d[1] = -b[0] * p / (b[2] * base)
		d[2] = b[0] * p * math.Log(base) / (b[2] * b[2])
	}
	return b[0] * p
}
