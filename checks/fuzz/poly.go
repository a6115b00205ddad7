// Package fuzz holds the objective of the fuzzed generated minimizers: a
// random polynomial in up to eight unknowns, whose coefficients the fuzz
// target draws.
package fuzz

// Poly is f(x) = ½xᵀAx + bᵀx + Σ cᵢxᵢ⁴ over the first len(x) unknowns:
// a convex or non-convex quadratic plus a quartic of either sign, so
// bounded below or not. Calls counts the objective's calls.
type Poly struct {
	A     [8][8]float64
	B, C  [8]float64
	Calls int
}

// NewPoly is the generated tests' receiver: A = 2I, b = −(1, 2, …), c = 0.01,
// convex with its minimum inside the box [−2, 2]ⁿ for n ≤ 3 and on its
// upper side beyond.
func NewPoly() *Poly {
	p := &Poly{}
	for i := range p.A {
		p.A[i][i] = 2
		p.B[i] = -float64(i + 1)
		p.C[i] = 0.01
	}
	return p
}

// Cost is f at x.
func (p *Poly) Cost(x []float64) float64 {
	p.Calls++
	var f float64
	for i := range x {
		for j := range x {
			f += 0.5 * x[i] * p.A[i][j] * x[j]
		}
		f += p.B[i]*x[i] + p.C[i]*x[i]*x[i]*x[i]*x[i]
	}
	return f
}

// CostGrad is ∇f at x: Ax + b + 4cᵢxᵢ³ for a symmetric A.
func (p *Poly) CostGrad(x, g []float64) {
	for i := range x {
		g[i] = p.B[i] + 4*p.C[i]*x[i]*x[i]*x[i]
		for j := range x {
			g[i] += p.A[i][j] * x[j]
		}
	}
}
