// Package shapes holds objectives of every shape for thalweg's golden files.
// The functions are small closed forms; the golden files pin the
// generated text, not the numbers.
package shapes

import "math"

// Parabola is (k − 3)², minimum at k = 3.
func Parabola(k float64) float64 { return (k - 3) * (k - 3) }

// Bowl is a shifted quadratic of three unknowns in float32.
func Bowl(x []float32) float32 {
	var s float32
	for i, v := range x {
		d := v - float32(i)
		s += d * d
	}
	return s
}

// Valley carries the shift of its objective.
type Valley struct{ Shift [2]float64 }

// NewValley is the instance the generated tests use.
func NewValley() *Valley { return &Valley{Shift: [2]float64{1, -2}} }

// Depth is a shifted, scaled quadratic.
func (v *Valley) Depth(x [2]float64) float64 {
	a, b := x[0]-v.Shift[0], x[1]-v.Shift[1]
	return a*a + 4*b*b
}

// DepthGradient is Depth's gradient.
func (v *Valley) DepthGradient(x [2]float64) [2]float64 {
	return [2]float64{2 * (x[0] - v.Shift[0]), 8 * (x[1] - v.Shift[1])}
}

// Plate is f = x² + 2y² in float32, taken by pointer.
func Plate(x *[2]float32) float32 { return x[0]*x[0] + 2*x[1]*x[1] }

// PlateGradient is Plate's gradient.
func PlateGradient(x, g *[2]float32) { g[0], g[1] = 2*x[0], 4*x[1] }

// Cost is Depth and its gradient in one call, which shares the shifted
// coordinates between them.
func (v *Valley) Cost(x, g *[2]float64) float64 {
	a, b := x[0]-v.Shift[0], x[1]-v.Shift[1]
	g[0], g[1] = 2*a, 8*b
	return a*a + 4*b*b
}

// Cooling writes the residuals of Newton's law of cooling,
// a·exp(−k·t) + c, against five readings a minute apart (invented data),
// for the least-squares golden files.
func Cooling(p *[3]float64, r *[5]float64) {
	for i, y := range [5]float64{80.2, 56.1, 42.3, 33.2, 28.3} {
		r[i] = p[0]*math.Exp(-p[1]*float64(i)) + p[2] - y
	}
}

// CoolingJacobian writes Cooling's Jacobian by rows.
func CoolingJacobian(p *[3]float64, j *[5][3]float64) {
	for i := range j {
		e := math.Exp(-p[1] * float64(i))
		j[i] = [3]float64{e, -p[0] * float64(i) * e, 1}
	}
}
