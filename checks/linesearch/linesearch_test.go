package linesearch

import (
	"bytes"
	"flag"
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/optimize/functions"

	"github.com/thalweg-go/thalweg/checks/internal/results"
)

var update = flag.Bool("update", false, "rewrite testdata/results.md from this run")

const resultsFile = "testdata/results.md"

// outcome is one run of a generated 1-D minimizer; runs_test.go (rendered
// by ../regen) builds it.
type outcome struct {
	X               float64
	F               float64
	Iterations      int
	Evaluations     int
	Status          string
	Converged       bool
	OutOfIterations bool
}

// reference is gonum's record of each function, the reference the
// conditions are checked against (functions.go, v0.17.0; the instances of
// optimize/linesearcher_test.go and of MT §5).
var reference = map[string]interface {
	Func([]float64) float64
	Grad([]float64, []float64)
}{
	"ConcaveRight": functions.ConcaveRight{},                               // MT (5.1), β = 2
	"ConcaveLeft":  functions.ConcaveLeft{},                                // MT (5.2), β = 0.004
	"Plassmann":    functions.Plassmann{L: 39, Beta: 0.01},                 // MT (5.3)
	"YOK1":         functions.YanaiOzawaKaneko{Beta1: 0.001, Beta2: 0.001}, // MT (5.4), Table 4
	"YOK2":         functions.YanaiOzawaKaneko{Beta1: 0.01, Beta2: 0.001},  // MT (5.4), Table 5
	"YOK3":         functions.YanaiOzawaKaneko{Beta1: 0.001, Beta2: 0.01},  // MT (5.4), Table 6
}

func phi(name string, a float64) (f, g float64) {
	x, d := []float64{a}, []float64{0}
	r := reference[name]
	r.Grad(d, x)
	return r.Func(x), d[0]
}

// TestOneLineSearch runs every case for exactly one iteration from 0 and
// checks the accepted step α against the rule's conditions, evaluated with
// gonum's Func and Grad (Nocedal & Wright 2006, eqs. 3.6 and 3.7; MT §1):
//
//	sufficient decrease  φ(α) ≤ φ(0) + c1·α·φ'(0)
//	curvature (wolfe)    φ'(α) ≥ c2·φ'(0)
//	strong curvature     |φ'(α)| ≤ c2·|φ'(0)|
//
// with the spec's c1 and c2 (cases.go: thalweg's defaults 1e-4 and 0.9, and
// MT's table constants as far as thalweg accepts them).
func TestOneLineSearch(t *testing.T) {
	var table bytes.Buffer
	table.WriteString(resultsHeader)
	for _, c := range Cases() {
		name := c.Name()
		run, ok := oneSearch[name]
		if !ok {
			t.Fatalf("%s: not generated (run `go test ./regen -update`)", name)
		}
		o := run()
		f0, g0 := phi(c.Function.Name, 0)
		if !(g0 < 0) {
			t.Fatalf("%s: φ'(0) = %v, not a descent direction", name, g0)
		}
		a := o.X
		fa, ga := phi(c.Function.Name, a)
		decrease := fa <= f0+c.C1*a*g0
		curvature := ga >= c.C2*g0
		if c.Rule == "strong-wolfe" {
			curvature = math.Abs(ga) <= c.C2*math.Abs(g0)
		}
		// MT's own (μ, η) and strong curvature, recorded for comparison
		// with the paper's tables, not asserted.
		paper := fa <= f0+c.Mu*a*g0 && math.Abs(ga) <= c.Eta*math.Abs(g0)

		switch {
		case o.Iterations != 1 || !(o.OutOfIterations || o.Converged):
			t.Errorf("%s: %d iterations, status %s; want one line search ending out of iterations or converged", name, o.Iterations, o.Status)
		case !(a > 0):
			t.Errorf("%s: accepted α = %v, want α > 0", name, a)
		case !decrease:
			t.Errorf("%s: α = %v breaks sufficient decrease: φ(α) = %v > φ(0) + c1·α·φ'(0) = %v", name, a, fa, f0+c.C1*a*g0)
		case !curvature:
			t.Errorf("%s: α = %v breaks the %s curvature condition: φ'(α) = %v, φ'(0) = %v, c2 = %v", name, a, c.Rule, ga, g0, c.C2)
		}
		if fa != o.F {
			t.Errorf("%s: F = %v, but φ(α) = %v", name, o.F, fa)
		}
		// One objective call at 0 and one trial: the trial was accepted, so
		// it must be α₀ (step.initial·|φ'(0)|).
		if o.Evaluations == 2 && math.Abs(a-c.Alpha0) > 1e-12*c.Alpha0 {
			t.Errorf("%s: first trial accepted at α = %v, want α₀ = %v", name, a, c.Alpha0)
		}
		fmt.Fprintf(&table, "| %s (%d) | %g | %s | %g | %g | %s | %d | %.6g | %.6g | %.3g | %s |\n",
			c.Function.Name, c.Table, c.Alpha0, c.Rule, c.C1, c.C2, o.Status, o.Evaluations, a, fa, ga, map[bool]string{true: "yes", false: "no"}[paper])
	}
	results.Compare(t, resultsFile, table.Bytes(), *update, "go test ./linesearch -update")
}

const resultsHeader = `# Moré–Thuente line-search functions: one line search of thalweg's generated minimizers

Written by ` + "`go test ./linesearch -update`" + ` in the checks module (recorded on linux/amd64;
compared byte for byte there). Each run is a 1-D steepest-descent minimizer
started at 0 and stopped after one iteration, whose line search tries α₀
first. "table" is the table of Moré & Thuente, ACM TOMS 20(3), 1994, §5,
that uses the function. c1 and c2 are the spec's constants: 1e-4 and 0.9
(thalweg's defaults), or the paper's (μ, η) where thalweg accepts them (c1 < c2);
where the paper has μ = η the paper's η is kept and c1 = η/10. Evaluations
count every objective call, the one at α = 0 included. The last column says
whether α also meets the paper's own conditions, strong Wolfe with (μ, η);
it is recorded, not asserted.

| function (table) | α₀ | rule | c1 | c2 | status | evaluations | α | φ(α) | φ'(α) | MT (μ, η) met |
| --- | --- | --- | --- | --- | --- | --- | --- | --- | --- | --- |
`
