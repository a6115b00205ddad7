package mgh

import (
	"testing"

	"gonum.org/v1/gonum/optimize"
	"gonum.org/v1/gonum/optimize/functions"
)

// Speed and memory against a general-purpose reference, in one run: the
// generated BFGS + Wolfe minimizer and gonum.org/v1/gonum/optimize's BFGS
// (its default Wolfe line search) on Rosenbrock (MGH problem 1) from the
// standard start (−1.2, 1). Compare ns/op and allocs/op with
//
//	go test -run '^$' -bench Rosenbrock -benchmem ./mgh
//
// in the checks module. Both use the analytic gradient; the stop tests
// differ in detail (thalweg: largest gradient component ≤ 1e-8; gonum: its
// default gradient threshold), so the evaluation counts are reported too.
func BenchmarkRosenbrockThalwegBFGS(b *testing.B) {
	b.ReportAllocs()
	var r RosenbrockBFGSAnalyticResult
	for i := 0; i < b.N; i++ {
		r = RosenbrockBFGSAnalytic([2]float64{-1.2, 1})
	}
	if !r.Status.Converged() {
		b.Fatalf("status %v", r.Status)
	}
	b.ReportMetric(float64(r.Evaluations), "evaluations/op")
}

func BenchmarkRosenbrockGonumBFGS(b *testing.B) {
	b.ReportAllocs()
	f := functions.ExtendedRosenbrock{}
	problem := optimize.Problem{Func: f.Func, Grad: f.Grad}
	var evaluations int
	for i := 0; i < b.N; i++ {
		res, err := optimize.Minimize(problem, []float64{-1.2, 1}, nil, &optimize.BFGS{})
		if err != nil {
			b.Fatal(err)
		}
		evaluations = res.FuncEvaluations
	}
	b.ReportMetric(float64(evaluations), "evaluations/op")
}
