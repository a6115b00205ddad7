package fuzz

import (
	"encoding/binary"
	"math"
	"slices"
	"testing"

	"github.com/thalweg-go/thalweg/gen"
)

// limits are the stop limits every fuzzed run gets: the defaults with a
// small cap, so that a run that cannot converge ends quickly.
type limits struct {
	Gradient    float64
	Step        float64
	Iterations  int
	Evaluations int
}

var fuzzLimits = limits{Gradient: 1e-8, Step: 1e-14, Iterations: 300, Evaluations: 3000}

// outcome is what the fuzz target reads of one run's result.
type outcome struct {
	x             []float64
	f             float64
	gradientLimit float64
	evaluations   int
	converged     bool
	status        string
}

// runners calls each minimizer of fuzz.toml; TestRunnersCoverSpec keeps
// the list in step with the spec.
var runners = []struct {
	name string
	dim  int
	box  *bounds // nil without bounds
	run  func(p *Poly, x0 []float64, lim limits) outcome
}{
	{"Poly1SteepestFree", 1, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1SteepestFreeWithLimits(p, [1]float64(x0), Poly1SteepestFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1SteepestBox", 1, &bounds{lower: []float64{-2.0}, upper: []float64{2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1SteepestBoxWithLimits(p, [1]float64(x0), Poly1SteepestBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1BFGSFree", 1, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1BFGSFreeWithLimits(p, [1]float64(x0), Poly1BFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1BFGSBox", 1, &bounds{lower: []float64{-2.0}, upper: []float64{2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1BFGSBoxWithLimits(p, [1]float64(x0), Poly1BFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1LBFGSFree", 1, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1LBFGSFreeWithLimits(p, [1]float64(x0), Poly1LBFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1LBFGSBox", 1, &bounds{lower: []float64{-2.0}, upper: []float64{2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1LBFGSBoxWithLimits(p, [1]float64(x0), Poly1LBFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly1CGFree", 1, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly1CGFreeWithLimits(p, [1]float64(x0), Poly1CGFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2SteepestFree", 2, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2SteepestFreeWithLimits(p, [2]float64(x0), Poly2SteepestFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2SteepestBox", 2, &bounds{lower: []float64{-2.0, -2.0}, upper: []float64{2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2SteepestBoxWithLimits(p, [2]float64(x0), Poly2SteepestBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2BFGSFree", 2, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2BFGSFreeWithLimits(p, [2]float64(x0), Poly2BFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2BFGSBox", 2, &bounds{lower: []float64{-2.0, -2.0}, upper: []float64{2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2BFGSBoxWithLimits(p, [2]float64(x0), Poly2BFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2LBFGSFree", 2, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2LBFGSFreeWithLimits(p, [2]float64(x0), Poly2LBFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2LBFGSBox", 2, &bounds{lower: []float64{-2.0, -2.0}, upper: []float64{2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2LBFGSBoxWithLimits(p, [2]float64(x0), Poly2LBFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly2CGFree", 2, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly2CGFreeWithLimits(p, [2]float64(x0), Poly2CGFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3SteepestFree", 3, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3SteepestFreeWithLimits(p, [3]float64(x0), Poly3SteepestFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3SteepestBox", 3, &bounds{lower: []float64{-2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3SteepestBoxWithLimits(p, [3]float64(x0), Poly3SteepestBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3BFGSFree", 3, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3BFGSFreeWithLimits(p, [3]float64(x0), Poly3BFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3BFGSBox", 3, &bounds{lower: []float64{-2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3BFGSBoxWithLimits(p, [3]float64(x0), Poly3BFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3LBFGSFree", 3, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3LBFGSFreeWithLimits(p, [3]float64(x0), Poly3LBFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3LBFGSBox", 3, &bounds{lower: []float64{-2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3LBFGSBoxWithLimits(p, [3]float64(x0), Poly3LBFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3CGFree", 3, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3CGFreeWithLimits(p, [3]float64(x0), Poly3CGFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5SteepestFree", 5, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5SteepestFreeWithLimits(p, [5]float64(x0), Poly5SteepestFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5SteepestBox", 5, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5SteepestBoxWithLimits(p, [5]float64(x0), Poly5SteepestBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5BFGSFree", 5, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5BFGSFreeWithLimits(p, [5]float64(x0), Poly5BFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5BFGSBox", 5, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5BFGSBoxWithLimits(p, [5]float64(x0), Poly5BFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5LBFGSFree", 5, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5LBFGSFreeWithLimits(p, [5]float64(x0), Poly5LBFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5LBFGSBox", 5, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5LBFGSBoxWithLimits(p, [5]float64(x0), Poly5LBFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly5CGFree", 5, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly5CGFreeWithLimits(p, [5]float64(x0), Poly5CGFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8SteepestFree", 8, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8SteepestFreeWithLimits(p, [8]float64(x0), Poly8SteepestFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8SteepestBox", 8, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8SteepestBoxWithLimits(p, [8]float64(x0), Poly8SteepestBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8BFGSFree", 8, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8BFGSFreeWithLimits(p, [8]float64(x0), Poly8BFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8BFGSBox", 8, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8BFGSBoxWithLimits(p, [8]float64(x0), Poly8BFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8LBFGSFree", 8, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8LBFGSFreeWithLimits(p, [8]float64(x0), Poly8LBFGSFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8LBFGSBox", 8, &bounds{lower: []float64{-2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0, -2.0}, upper: []float64{2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0, 2.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8LBFGSBoxWithLimits(p, [8]float64(x0), Poly8LBFGSBoxLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8CGFree", 8, nil, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8CGFreeWithLimits(p, [8]float64(x0), Poly8CGFreeLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3BFGSHalf", 3, &bounds{lower: []float64{0.0, 0.0, 0.0}, upper: []float64{inf, inf, inf}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3BFGSHalfWithLimits(p, [3]float64(x0), Poly3BFGSHalfLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly3SteepestPinned", 3, &bounds{lower: []float64{-1.0, 0.5, -3.0}, upper: []float64{1.0, 0.5, 3.0}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly3SteepestPinnedWithLimits(p, [3]float64(x0), Poly3SteepestPinnedLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
	{"Poly8LBFGSMixed", 8, &bounds{lower: []float64{-inf, -1.0, 0.0, -inf, -2.0, 1.0, -inf, -0.5}, upper: []float64{inf, 1.0, inf, 0.0, 2.0, 1.0, 3.0, 0.5}}, func(p *Poly, x0 []float64, lim limits) outcome {
		r := Poly8LBFGSMixedWithLimits(p, [8]float64(x0), Poly8LBFGSMixedLimits(lim))
		return outcome{r.X[:], r.F, r.GradientLimit, r.Evaluations, r.Status.Converged(), r.Status.String()}
	}},
}

// bounds is a runner's box, as its spec gives it.
type bounds struct{ lower, upper []float64 }

var inf = math.Inf(1)

// TestRunnersCoverSpec: every minimizer of fuzz.toml is fuzzed, with
// the spec's dimension and box, and nothing else.
func TestRunnersCoverSpec(t *testing.T) {
	plans, err := gen.Plans([]string{"fuzz.toml"})
	if err != nil {
		t.Fatal(err)
	}
	if len(plans) != len(runners) {
		t.Fatalf("%d minimizers in fuzz.toml, %d runners", len(plans), len(runners))
	}
	for i, p := range plans {
		r := runners[i]
		same := p.M.Name == r.name && p.M.Dim == r.dim && (p.M.Lower != nil) == (r.box != nil)
		if same && r.box != nil {
			same = slices.Equal(p.M.Lower, r.box.lower) && slices.Equal(p.M.Upper, r.box.upper)
		}
		if !same {
			t.Errorf("runner %d is %s (dim %d, box %v), the spec's minimizer %s (dim %d, box %v to %v)", i, r.name, r.dim, r.box, p.M.Name, p.M.Dim, p.M.Lower, p.M.Upper)
		}
	}
}

// FuzzGenerated runs the generated minimizers of fuzz.toml, in 1 to 8
// unknowns, without bounds, with the box [−2, 2]ⁿ, and with boxes that
// are one-sided, fix a variable or mix open and closed sides (a box is a
// constant of the generated code, so the objective and the start are
// what is drawn, placing the minimizer anywhere relative to it), on random polynomials
// ½xᵀAx + bᵀx + Σ cᵢxᵢ⁴ (A symmetric of either sign, c of either sign:
// convex, non-convex, or unbounded below) from random starts, inside or
// outside the box. The coefficients and the start come from data, two
// bytes each scaled to [−8, 8) and [−4, 4). Whatever they are, a run never
// panics, never calls the objective more often than its cap nor reports
// other than the calls it made, returns a finite X (inside the box when
// there is one) and claims convergence only where the true relative
// gradient (projected onto the box) is within ten times the limit it
// reports.
func FuzzGenerated(f *testing.F) {
	f.Add(uint8(0), []byte{})
	f.Add(uint8(9), []byte{0x40, 0x00, 0x10, 0x00, 0xc0, 0x00, 0x20, 0x00})
	f.Add(uint8(17), []byte{0x80, 0x01, 0x7f, 0xff, 0x00, 0x01, 0x33, 0x33, 0xaa, 0x55})
	f.Add(uint8(34), []byte("a quartic with walls and a saddle in eight unknowns, all drawn from these bytes"))
	f.Fuzz(func(t *testing.T, which uint8, data []byte) {
		r := runners[int(which)%len(runners)]
		next := func(scale float64) float64 {
			if len(data) < 2 {
				return 0
			}
			v := float64(int16(binary.LittleEndian.Uint16(data))) / 32768 * scale
			data = data[2:]
			return v
		}
		p := &Poly{}
		n := r.dim
		for i := 0; i < n; i++ {
			for j := i; j < n; j++ {
				p.A[i][j] = next(8)
				p.A[j][i] = p.A[i][j]
			}
			p.B[i], p.C[i] = next(8), next(8)
		}
		x0 := make([]float64, n)
		for i := range x0 {
			x0[i] = next(4)
		}
		out := r.run(p, x0, fuzzLimits)
		if p.Calls > fuzzLimits.Evaluations || out.evaluations != p.Calls {
			t.Fatalf("%s: %d objective calls, %d reported, cap %d", r.name, p.Calls, out.evaluations, fuzzLimits.Evaluations)
		}
		for i, v := range out.x {
			if math.IsNaN(v) || math.IsInf(v, 0) || r.box != nil && (v < r.box.lower[i] || v > r.box.upper[i]) {
				t.Fatalf("%s: X = %v (component %d) from the start %v, %s", r.name, out.x, i, x0, out.status)
			}
		}
		if !out.converged {
			return
		}
		g := make([]float64, n)
		p.CostGrad(out.x, g)
		scale := math.Max(math.Abs(p.Cost(out.x)), 1)
		var measure float64
		for i, gi := range g {
			if r.box != nil && (out.x[i] <= r.box.lower[i] && gi > 0 || out.x[i] >= r.box.upper[i] && gi < 0) {
				continue // pushing against the bound it sits on
			}
			measure = math.Max(measure, math.Abs(gi)*math.Max(math.Abs(out.x[i]), 1)/scale)
		}
		if !(measure <= 10*out.gradientLimit) {
			t.Fatalf("%s: converged (%s) at %v with a true gradient measure %g, over ten times the limit %g it claims", r.name, out.status, out.x, measure, out.gradientLimit)
		}
	})
}
