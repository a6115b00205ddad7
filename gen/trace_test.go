package gen

import (
	"bytes"
	"go/ast"
	"go/parser"
	"go/token"
	"math"
	"path/filepath"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/rules"
)

// parseTrace reads the harness's lines, assigns each trial to the move its
// search was for, and derives each row's calls for differences, decrease,
// predicted decrease and step measure from the row before it.
func TestParseTrace(t *testing.T) {
	out := strings.Join([]string{
		"=== RUN   TestThalwegTrace",
		"thalweg-limits\t1e-08\t1e-14\t500\t100",
		"thalweg-trace\t0\t5\t0\t24.2\t215.6\t0\t0\t-1.2\t1",
		"thalweg-trial\t300\t3\t5",
		"thalweg-trial\t5.1\t-1\t1.25",
		"thalweg-trace\t1\t12\t2\t5.1\t38\t0.5\t-100\t-1\t1.25",
		"thalweg-trial\t6\t-1\t2",
		"thalweg-result\tgradient small\ttrue\t1\t13\t5.1\t1",
		"thalweg-grid\t2\t-2\t2\t0\t4",
		"thalweg-gridrow\t1\t2\t3",
		"thalweg-gridrow\t4\tNaN\t+Inf",
		"thalweg-gridrow\t7\t8\t9",
		"--- PASS: TestThalwegTrace (0.00s)",
	}, "\n")
	res, err := parseTrace([]byte(out))
	if err != nil {
		t.Fatal(err)
	}
	if res.Limits != (TraceLimits{Gradient: 1e-8, Step: 1e-14, Iterations: 500, Evaluations: 100}) {
		t.Errorf("limits %+v", res.Limits)
	}
	if res.Status != "gradient small" || !res.Converged || res.Iterations != 1 || res.Evaluations != 13 || res.F != 5.1 || res.LastTrials != 1 {
		t.Errorf("result %+v", res)
	}
	if len(res.Rows) != 2 {
		t.Fatalf("%d rows, want 2", len(res.Rows))
	}
	r0, r1 := res.Rows[0], res.Rows[1]
	if r0.GradientCalls != 4 || !math.IsNaN(r0.Decrease) || !math.IsNaN(r0.StepMeasure) || res.CallsLeft(r0) != 95 {
		t.Errorf("start row %+v", r0)
	}
	// 12 − 5 calls, 2 of them trials; f fell by 19.1 where −t·∇fᵀd = 50;
	// the step moved x₂ by 0.25 at |x₂| = 1.25 and x₁ by 0.2 at |x₁| = 1.
	if r1.Trials != 2 || r1.GradientCalls != 5 || math.Abs(r1.Decrease-19.1) > 1e-12 || r1.Predicted != 50 ||
		math.Abs(r1.DecreaseRatio()-0.382) > 1e-12 || math.Abs(r1.StepMeasure-0.11111111111111) > 1e-12 || res.CallsLeft(r1) != 88 {
		t.Errorf("row 1 %+v, ratio %g", r1, r1.DecreaseRatio())
	}
	if len(res.Trials) != 3 || res.Trials[0].Iteration != 1 || res.Trials[1].Iteration != 1 || res.Trials[2].Iteration != 2 || res.Trials[0].F != 300 || res.Trials[0].X[1] != 5 {
		t.Errorf("trials %+v", res.Trials)
	}
	g := res.Grid
	if g == nil || len(g.X) != 3 || g.X[1] != 0 || g.Y[2] != 4 || len(g.F) != 3 || !math.IsNaN(g.F[1][1]) || !math.IsInf(g.F[1][2], 1) || g.F[2][0] != 7 {
		t.Errorf("grid %+v", g)
	}

	// A missing grid row, a short trace line and a missing result fail.
	for _, bad := range []string{
		strings.Replace(out, "thalweg-gridrow\t7\t8\t9\n", "", 1),
		strings.Replace(out, "\t0.5\t-100\t-1\t1.25", "", 1),
		strings.Replace(out, "thalweg-result", "something", 1),
	} {
		if _, err := parseTrace([]byte(bad)); err == nil {
			t.Errorf("no error for\n%s", bad)
		}
	}
}

// The table: its own column names, "—" where a cell does not apply to the
// start, "difference calls" only for differences, "rounding" for a
// decrease within rounding of f, and what the run did after its last row.
func TestTraceTable(t *testing.T) {
	res := syntheticTrace(false)
	res.Rows = append(res.Rows, TraceRow{Iteration: 4, Evaluations: 7, Trials: 2, F: 0, Gradient: 1e-10, Step: 1, Slope: -1e-40, X: []float64{0, 0}})
	res.Iterations, res.Evaluations, res.LastTrials, res.Status = 4, 10, 3, "gradient small"
	res.derive()
	var buf bytes.Buffer
	if err := WriteTraceTable(&buf, tracePlan(2), res); err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(buf.String(), "\n")
	if lines[0] != "Fit: bfgs direction, armijo step rule, analytic gradient, from [0, 0]" ||
		lines[1] != "stops when the largest |∂f/∂xᵢ| ≤ 1e-6 or every |Δxᵢ| ≤ 1e-14·(|xᵢ| + 1), after at most 100 moves and 50 objective calls" {
		t.Errorf("heading:\n%s\n%s", lines[0], lines[1])
	}
	want := [][]string{
		{"move", "trials", "calls", "left", "f", "decrease/predicted", "step", "t", "step/limit", "gradient/limit"},
		{"0", "—", "49", "5", "—", "—", "—", "8e6"},
		{"1", "2", "47", "0.5", "0.9", "0.5", "1e14", "2e6"}, // x₂ moved by 1.25 to −0.25
		{"2", "1", "46", "0.0001", "0.555", "1", "4.85e13", "1e3"},
		{"3", "1", "45", "0", "0.5", "1", "1e12", "0.001"},
		{"4", "2", "43", "0", "rounding", "1", "0", "0.0001"}, // f did not change
	}
	for i, w := range want {
		if got := strings.Fields(lines[3+i]); strings.Join(got, " ") != strings.Join(w, " ") {
			t.Errorf("table line %d: %q, want %q", i, got, w)
		}
	}
	if !strings.Contains(buf.String(), "\ngradient small (converged) after 4 iterations and 10 objective calls; f = 0\nthe last line search spent 3 trials and accepted none\n") {
		t.Errorf("outcome lines missing:\n%s", buf.String())
	}

	// A run that ended before its first gradient still states its limits.
	empty := &TraceResult{Limits: res.Limits, Status: "non-finite start", Evaluations: 1, F: math.NaN()}
	buf.Reset()
	WriteTraceTable(&buf, tracePlan(2), empty)
	if !strings.Contains(buf.String(), "≤ 1e-6 or every") || !strings.HasSuffix(buf.String(), "f = NaN\nno rows: the run ended before its first gradient\n") {
		t.Errorf("table of a run without rows:\n%s", buf.String())
	}

	// Differences add their column.
	p := tracePlan(2)
	p.M.Derivative = rules.Central
	p.Context = resolveContext(p.M, "float64", 2)
	for i := 1; i < len(res.Rows); i++ {
		res.Rows[i].Evaluations += 4 // four calls went to differences in move 1
	}
	res.derive()
	buf.Reset()
	WriteTraceTable(&buf, p, res)
	lines = strings.Split(buf.String(), "\n")
	if got := strings.Fields(lines[3]); got[2] != "difference" || got[3] != "calls" {
		t.Errorf("header with differences: %q", got)
	}
	if got := strings.Fields(lines[5]); got[2] != "4" {
		t.Errorf("move 1 with differences: %q", got)
	}
}

func TestTraceCSV(t *testing.T) {
	res := syntheticTrace(false)
	var buf bytes.Buffer
	if err := WriteTraceCSV(&buf, res); err != nil {
		t.Fatal(err)
	}
	want := "move,trials,difference_calls,calls_left,f,decrease_ratio,step_t,step_over_limit,gradient_over_limit,x1,x2\n" +
		"0,,0,49,5,,,,8e+06,1,1\n" +
		"1,2,0,47,0.5,0.9,0.5,1e+14,2e+06,0.5,-0.25\n" +
		"2,1,0,46,0.0001,0.5554444444444444,1,4.8514851485148516e+13,1000.0000000000001,0.01,0\n" +
		"3,1,0,45,0,0.5,1,1e+12,0.001,0,0\n"
	if buf.String() != want {
		t.Errorf("CSV:\n%s\nwant:\n%s", buf.String(), want)
	}
}

// The traced copy keeps both observe calls, pointed at the recorder, and
// wraps every value call of the line search (its trials), and only those,
// in the trial recorder; the copy gen writes has none of it.
func TestTracedKernels(t *testing.T) {
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range plans {
		var plain, traced bytes.Buffer
		if err := EmitMinimizer(&plain, p); err != nil {
			t.Fatal(err)
		}
		choice := p.kernelChoice()
		choice.trace, choice.traceHook, choice.traceTrial = true, traceHook, traceTrial
		if _, err := emitMinimizer(&traced, p, choice); err != nil {
			t.Fatal(err)
		}
		if bytes.Contains(plain.Bytes(), []byte("thalwegTrace")) {
			t.Errorf("%s: the generated minimizer mentions the trace hooks", p.M.Name)
		}
		search := p.Prefix + "LineSearch"
		objectiveCalls := callsIn(t, plain.Bytes(), search, p.Prefix+"Value")
		if objectiveCalls == 0 {
			t.Fatalf("%s: no value call in %s", p.M.Name, search)
		}
		if n := callsIn(t, traced.Bytes(), search, traceTrial); n != objectiveCalls {
			t.Errorf("%s: %d trials recorded in %s, which calls the objective %d times", p.M.Name, n, search, objectiveCalls)
		}
		if n := callsIn(t, traced.Bytes(), "", traceTrial); n != objectiveCalls {
			t.Errorf("%s: the trial recorder is called outside %s", p.M.Name, search)
		}
		// One after the start (descent.begin), one after each step (descent.search).
		if n := callsIn(t, traced.Bytes(), "", traceHook); n != 2 {
			t.Errorf("%s: %d observe calls in the traced kernel, want 2", p.M.Name, n)
		}
	}
}

// callsIn counts calls of fn (by its name, or recv.fn) inside the function
// named in, or in the whole file when in is "".
func callsIn(t *testing.T, src []byte, in, fn string) int {
	t.Helper()
	f, err := parser.ParseFile(token.NewFileSet(), "", src, 0)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, d := range f.Decls {
		if fd, ok := d.(*ast.FuncDecl); ok && (in == "" || fd.Name.Name == in) {
			ast.Inspect(fd, func(node ast.Node) bool {
				if call, ok := node.(*ast.CallExpr); ok {
					switch f := call.Fun.(type) {
					case *ast.Ident:
						if f.Name == fn {
							n++
						}
					case *ast.SelectorExpr:
						if f.Sel.Name == fn {
							n++
						}
					}
				}
				return true
			})
		}
	}
	return n
}

// Trace runs every golden shape (scalar, a float32 slice, a method on a
// pointer receiver, a float32 pointer with the fixed and the decrease
// rules): the rows account for every objective call, the limits are the
// spec's, the stop test that ended the run shows in the last row, and for
// two unknowns the grid covers the whole path.
func TestTraceShapes(t *testing.T) {
	if testing.Short() {
		t.Skip("builds and runs five instrumented minimizers")
	}
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range plans {
		t.Run(p.M.Name, func(t *testing.T) {
			t.Parallel()
			res, err := Trace(p)
			if err != nil {
				t.Fatal(err)
			}
			if !res.Converged || len(res.Rows) != res.Iterations+1 {
				t.Fatalf("%s after %d iterations with %d rows", res.Status, res.Iterations, len(res.Rows))
			}
			if res.Limits.Gradient != float64(float32ify(p.Shape.Elem, p.Value(rules.StopGradient))) || res.Limits.Evaluations != int(p.Value(rules.StopEvaluations)) || res.Limits.Iterations != int(p.Value(rules.StopIterations)) {
				t.Errorf("limits %+v, spec's gradient %v, iterations %v, evaluations %v", res.Limits, p.Value(rules.StopGradient), p.Value(rules.StopIterations), p.Value(rules.StopEvaluations))
			}
			// Differences also spend a calibration and two gradients on each
			// confirmation of the gradient test, counted in the next move's
			// difference calls, or after the last row.
			// With bounds a variable fixed by equal bounds costs nothing and
			// a calibration at a bound fewer calls, so only the totals are
			// held to the counts.
			cost, confirmation := p.GradientCalls(), p.Derivative.CalibrationCalls(p.Dim)+2*p.GradientCalls()
			if p.Shape.Residuals > 0 {
				confirmation = p.GradientCalls() // a Jacobian with twice the intervals (settleResiduals), the residuals at hand
			}
			calls := 1 + res.LastTrials
			for _, r := range res.Rows {
				calls += r.Trials + r.GradientCalls
				extra := r.GradientCalls - cost
				if r.Iteration > 0 && (r.Trials < 1 || r.GradientCalls < 0 || !p.Bounded && !p.Rule.Curvature && extra != 0 && (confirmation == 0 || extra%confirmation != 0)) {
					t.Errorf("move %d: %d trials, %d calls for differences (a gradient costs %d, a confirmation %d)", r.Iteration, r.Trials, r.GradientCalls, cost, confirmation)
				}
			}
			if tail := res.Evaluations - calls; tail < 0 || tail > 0 && !p.Bounded && (confirmation == 0 || tail%confirmation != 0) {
				t.Errorf("the rows account for %d objective calls, the run made %d, and confirmations cost %d", calls, res.Evaluations, confirmation)
			}
			if last := res.Rows[len(res.Rows)-1]; res.Status == "gradient small" && !(last.Gradient <= res.Limits.Gradient) {
				t.Errorf("gradient small, but the last row's gradient is %g over a limit of %g", last.Gradient, res.Limits.Gradient)
			}
			if (res.Grid != nil) != (p.Shape.Dim == 2) || (len(res.Trials) > 0) != (p.Shape.Dim == 2) {
				t.Fatalf("%d unknowns: grid %v, %d trial points", p.Shape.Dim, res.Grid != nil, len(res.Trials))
			}
			if g := res.Grid; g != nil {
				if len(g.X) != traceGridSize+1 || len(g.F) != traceGridSize+1 {
					t.Errorf("grid of %d×%d points", len(g.X), len(g.F))
				}
				for _, r := range res.Rows {
					if r.X[0] < g.X[0] || r.X[0] > g.X[traceGridSize] || r.X[1] < g.Y[0] || r.X[1] > g.Y[traceGridSize] {
						t.Errorf("move %d at %v lies outside the grid [%g, %g]×[%g, %g]", r.Iteration, r.X, g.X[0], g.X[traceGridSize], g.Y[0], g.Y[traceGridSize])
					}
				}
			}
		})
	}
}

// float32ify rounds v as the generated code stores a limit of type elem.
func float32ify(elem string, v float64) float64 {
	if elem == "float32" {
		return float64(float32(v))
	}
	return v
}

// With scale the step measure is the kernel's: on zᵢ = xᵢ/sᵢ.
func TestTraceStepMeasureScaled(t *testing.T) {
	res := &TraceResult{Rows: []TraceRow{{X: []float64{1e-3, 1e5}}, {X: []float64{3e-3, 1.5e5}}}, Scale: []float64{1e-3, 1e5}}
	res.derive()
	// z moves from (1, 1) to (3, 1.5): max(2/4, 0.5/2.5) = 0.5.
	if got := res.Rows[1].StepMeasure; got != 0.5 {
		t.Errorf("scaled step measure %v, want 0.5", got)
	}
	res.Scale = nil
	res.derive()
	// Unscaled, x₁'s change dominates: 5e4/(1.5e5 + 1).
	if got, want := res.Rows[1].StepMeasure, 5e4/(1.5e5+1); got != want {
		t.Errorf("unscaled step measure %v, want %v", got, want)
	}
}
