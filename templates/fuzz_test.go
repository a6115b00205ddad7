package templates

import (
	"math"
	"testing"
)

// FuzzMinimize runs the descent loop, under every direction × rule ×
// derivative source (everyPolicy), on random objectives in two unknowns
// from random starts: quadratics ½xᵀAx + bᵀx with A of either sign
// (convex, saddle or concave, so unbounded below) plus a quartic term
// Σ cᵢxᵢ⁴ of either sign. Whatever the objective, a run never panics,
// never calls the objective more often than its cap nor reports other
// than the calls it made, returns a finite X from a finite start, and
// reports convergence only where the true relative gradient at X is
// within ten times the limit it claims (the MGH check's margin). Bounds
// are not fuzzed here: the kernels' box is a constant of the generated
// code. Findings go to testdata/fuzz/FuzzMinimize.
func FuzzMinimize(f *testing.F) {
	f.Add(uint8(0), 2.0, 0.5, 1.0, -1.0, 0.5, 0.0, 0.0, 3.0, -2.0)     // convex quadratic
	f.Add(uint8(7), 1.0, 3.0, 1.0, 0.0, 0.0, 0.0, 0.0, 1.0, 1.0)       // saddle: unbounded below
	f.Add(uint8(13), -1.0, 0.0, 2.0, 1.0, 1.0, 0.1, 0.1, -0.5, 0.25)   // quartic walls around a concave part
	f.Add(uint8(29), 1e-6, 0.0, 1e3, 0.0, 0.0, 0.0, 1.0, 100.0, 100.0) // badly scaled, quartic in x₂
	f.Add(uint8(41), 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 0.0, 1.0, 2.0)      // constant
	policies := everyPolicy()
	f.Fuzz(func(t *testing.T, which uint8, a11, a12, a22, b1, b2, c1, c2, x1, x2 float64) {
		coefficients := []*float64{&a11, &a12, &a22, &b1, &b2, &c1, &c2, &x1, &x2}
		for _, v := range coefficients {
			if math.IsNaN(*v) || math.IsInf(*v, 0) {
				t.Skip("coefficients and start are finite")
			}
			*v = math.Max(-1e3, math.Min(1e3, *v))
		}
		p := policies[int(which)%len(policies)]
		p.use(t)
		recv := &receiver{
			valueFunc: func(x *vec) elem {
				return 0.5*(a11*x[0]*x[0]+2*a12*x[0]*x[1]+a22*x[1]*x[1]) + b1*x[0] + b2*x[1] + c1*x[0]*x[0]*x[0]*x[0] + c2*x[1]*x[1]*x[1]*x[1]
			},
			gradientFunc: func(x, g *vec) {
				g[0] = a11*x[0] + a12*x[1] + b1 + 4*c1*x[0]*x[0]*x[0]
				g[1] = a12*x[0] + a22*x[1] + b2 + 4*c2*x[1]*x[1]*x[1]
			},
		}
		lim := limits{Gradient: 1e-8, Step: 1e-14, Iterations: 300, Evaluations: 2000}
		out := minimize(recv, vec{x1, x2}, lim, box{})
		if recv.calls > lim.Evaluations || out.evaluations != recv.calls {
			t.Fatalf("%v: %d objective calls, %d reported, cap %d", p, recv.calls, out.evaluations, lim.Evaluations)
		}
		if !finiteVec(&out.x) {
			t.Fatalf("%v: X = %v from the finite start (%g, %g), status %d", p, out.x, x1, x2, out.status)
		}
		if out.status == statusGradientSmall {
			var g vec
			recv.gradientFunc(&out.x, &g)
			scale := math.Max(math.Abs(recv.valueFunc(&out.x)), 1)
			var measure float64
			for i := range g {
				measure = math.Max(measure, math.Abs(g[i])*math.Max(math.Abs(out.x[i]), 1)/scale)
			}
			if !(measure <= 10*out.gradientLimit) {
				t.Fatalf("%v: converged (status %d) at %v with a true gradient measure %g, over ten times the limit %g it claims", p, out.status, out.x, measure, out.gradientLimit)
			}
		}
	})
}
