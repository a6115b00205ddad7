package bench

import (
	"testing"

	"gonum.org/v1/gonum/optimize"
	"gonum.org/v1/gonum/optimize/functions"
)

// TestReferenceConverges guards the reference the table compares with:
// gonum's BFGS with its defaults reaches Rosenbrock's minimizer (1, 1)
// (MGH 1981, problem 1; gonum's functions.ExtendedRosenbrock Minima),
// to 1e-6 (common practice for its default gradient threshold), from
// MGH's start (gonum.org/v1/gonum/optimize v0.17.0, the version the
// temporary module of TestTable requires).
func TestReferenceConverges(t *testing.T) {
	f := functions.ExtendedRosenbrock{}
	res, err := optimize.Minimize(optimize.Problem{Func: f.Func, Grad: f.Grad}, []float64{-1.2, 1}, nil, &optimize.BFGS{})
	if err != nil {
		t.Fatal(err)
	}
	for _, v := range res.X {
		if v < 1-1e-6 || v > 1+1e-6 {
			t.Fatalf("gonum's BFGS ends at %v, status %v", res.X, res.Status)
		}
	}
}
