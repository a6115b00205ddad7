package gen

import (
	"path/filepath"
	"testing"
)

// TestHostileObjectives generates default minimizers (central
// differences, bfgs, unless the spec says otherwise) for objectives that
// try to break them, and runs a test in the temporary module that pins
// each outcome the README documents (Hostile objectives): status,
// iterations and evaluations, and f or x where they mean something.
func TestHostileObjectives(t *testing.T) {
	if testing.Short() {
		t.Skip("generates and runs a module; skipped with -short")
	}
	dir := t.TempDir()
	writeTree(t, dir, map[string]string{
		"go.mod":          "module hostile\n\ngo 1.24\n",
		"hostile.go":      hostileGo,
		"hostile.toml":    hostileSpec,
		"outcome_test.go": hostileTest,
	})
	outs, err := Generate([]string{filepath.Join(dir, "hostile.toml")})
	if err != nil {
		t.Fatal(err)
	}
	if err := Write(outs); err != nil {
		t.Fatal(err)
	}
	e2eGo(t, dir, nil, "vet", ".")
	e2eGo(t, dir, nil, "test", "-count=1", "-run", "^TestHostile$", ".")
	e2eGo(t, dir, nil, "test", "-race", "-count=1", "-run", "^TestConcurrent$", ".")
}

const hostileGo = `// Package hostile holds objectives that try to break a minimizer.
package hostile

import "math"

// NaNNear is (x₀−1)² + (x₁−1)², but NaN where x₀ > 1.05: a region with
// no value next to the minimum at (1, 1).
func NaNNear(x [2]float64) float64 {
	if x[0] > 1.05 {
		return math.NaN()
	}
	a, b := x[0]-1, x[1]-1
	return a*a + b*b
}

// Walled is (x−2)² inside (0, 3) and +Inf outside: walls around the minimum.
func Walled(x float64) float64 {
	if x <= 0 || x >= 3 {
		return math.Inf(1)
	}
	return (x - 2) * (x - 2)
}

// Unbounded is −x₀ + x₁²: no minimum, f → −∞ along x₀.
func Unbounded(x [2]float64) float64 { return -x[0] + x[1]*x[1] }

// Step jumps by 1 at x = 1: 1 + (1−x)² to the left, 2 + (x−1)² from 1
// on; its infimum 1 is approached from the left and not attained.
func Step(x float64) float64 {
	if x < 1 {
		return 1 + (1-x)*(1-x)
	}
	return 2 + (x-1)*(x-1)
}

// Flat is constant: every point is stationary.
func Flat(x [2]float64) float64 { return 7 }

// Big is 1e300·(1 + (x₀−1)² + (x₁+1)²): values near 1e300.
func Big(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+1
	return 1e300 * (1 + a*a + b*b)
}

// Tiny is 1e-300·((x₀−1)² + (x₁+1)²): values near 1e-300.
func Tiny(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+1
	return 1e-300 * (a*a + b*b)
}

// Bowl is (x₀−1)² + (x₁+1)².
func Bowl(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+1
	return a*a + b*b
}

// BowlNaNGrad writes NaN into the gradient.
func BowlNaNGrad(x [2]float64) [2]float64 { return [2]float64{math.NaN(), 2 * (x[1] + 1)} }

// BowlGrad is Bowl's gradient.
func BowlGrad(x [2]float64) [2]float64 { return [2]float64{2 * (x[0] - 1), 2 * (x[1] + 1)} }

// Stiff is (x₀−1)² + 1e12·(x₁+1)²: condition number 1e12.
func Stiff(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+1
	return a*a + 1e12*b*b
}

// StiffGrad is Stiff's gradient.
func StiffGrad(x [2]float64) [2]float64 { return [2]float64{2 * (x[0] - 1), 2e12 * (x[1] + 1)} }

// Panics panics when x₀ < 0.
func Panics(x [2]float64) float64 {
	if x[0] < 0 {
		panic("hostile: negative x₀")
	}
	return (x[0]+1)*(x[0]+1) + x[1]*x[1]
}
`

const hostileSpec = `[[minimizer]]
name = "MinNaNNear"
objective = "NaNNear"
start = [0.0, 0.0]

[[minimizer]]
name = "MinWalled"
objective = "Walled"
start = 0.5

[[minimizer]]
name = "MinUnbounded"
objective = "Unbounded"
start = [0.0, 1.0]

[[minimizer]]
name = "MinStep"
objective = "Step"
start = 3.0

[[minimizer]]
name = "MinFlat"
objective = "Flat"
start = [1.0, 2.0]

[[minimizer]]
name = "MinBig"
objective = "Big"
start = [3.0, 3.0]

[[minimizer]]
name = "MinTiny"
objective = "Tiny"
start = [3.0, 3.0]

[[minimizer]]
name = "MinNaNGrad"
objective = "Bowl"
derivative = "analytic"
gradient = "BowlNaNGrad"
start = [3.0, 3.0]

[[minimizer]]
name = "MinOptimal"
objective = "Bowl"
derivative = "analytic"
gradient = "BowlGrad"
start = [1.0, -1.0]

[[minimizer]]
name = "MinStiff"
objective = "Stiff"
derivative = "analytic"
gradient = "StiffGrad"
start = [3.0, 3.0]

[[minimizer]]
name = "MinPanics"
objective = "Panics"
start = [1.0, 1.0]
`

const hostileTest = `package hostile

import (
	"math"
	"sync"
	"testing"
)

// outcome is what one run ended with.
type outcome struct {
	status      string
	converged   bool
	iterations  int
	evaluations int
	f           float64
	x           []float64
}

func TestHostile(t *testing.T) {
	cases := []struct {
		name string
		run  func() outcome
		want outcome // f and x checked within 1e-6 where set
	}{
		// The NaN region starts 0.05 past the minimum: trials in it fail
		// like any trial, and the run converges at (1, 1).
		{"NaNNear", func() outcome { r := MinNaNNear([2]float64{0, 0}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, r.X[:]} },
			outcome{"gradient small", true, 1, 35, 0, []float64{1, 1}}},
		// +Inf outside (0, 3): the walls reject trials, the run converges at 2.
		{"Walled", func() outcome { r := MinWalled(0.5); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, []float64{r.X}} },
			outcome{"gradient small", true, 2, 22, 0, []float64{2}}},
		// No minimum: f falls without bound until a search finds no step,
		// not converged, X the lowest point seen.
		{"Unbounded", func() outcome { r := MinUnbounded([2]float64{0, 1}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, nil} },
			outcome{"no acceptable step", false, 40, 534, math.NaN(), nil}},
		// A jump at x = 1: the run ends just left of it, at the infimum 1.
		{"Step", func() outcome { r := MinStep(3); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, []float64{r.X}} },
			outcome{"gradient small", true, 7, 94, 1, []float64{1}}},
		// Constant: the start is stationary, converged in 0 iterations
		// (the generated convergence test flags that).
		{"Flat", func() outcome { r := MinFlat([2]float64{1, 2}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, r.X[:]} },
			outcome{"gradient small", true, 0, 29, 7, []float64{1, 2}}},
		// Values near 1e300: no overflow, converged at (1, −1).
		{"Big", func() outcome { r := MinBig([2]float64{3, 3}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, math.NaN(), r.X[:]} },
			outcome{"gradient small", true, 4, 49, math.NaN(), []float64{1, -1}}},
		// Values near 1e-300: every gradient test sees a gradient of
		// 1e-300 as zero, so the start passes; scale f (or set
		// stop.gradient) for such an objective. The generated
		// convergence test fails on this 0-iteration run.
		{"Tiny", func() outcome { r := MinTiny([2]float64{3, 3}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, math.NaN(), r.X[:]} },
			outcome{"gradient small", true, 0, 29, math.NaN(), []float64{3, 3}}},
		// A gradient that writes NaN ends the run at once with its own status.
		{"NaNGrad", func() outcome { r := MinNaNGrad([2]float64{3, 3}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, r.X[:]} },
			outcome{"non-finite gradient", false, 0, 1, 20, []float64{3, 3}}},
		// Already optimal: converged on the first gradient.
		{"Optimal", func() outcome { r := MinOptimal([2]float64{1, -1}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, r.X[:]} },
			outcome{"gradient small", true, 0, 1, 0, []float64{1, -1}}},
		// Condition number 1e12: BFGS converges in 3 steps.
		{"Stiff", func() outcome { r := MinStiff([2]float64{3, 3}); return outcome{r.Status.String(), r.Status.Converged(), r.Iterations, r.Evaluations, r.F, r.X[:]} },
			outcome{"gradient small", true, 3, 34, 0, []float64{1, -1}}},
	}
	for _, c := range cases {
		got := c.run()
		w := c.want
		if got.status != w.status || got.converged != w.converged || got.iterations != w.iterations || got.evaluations != w.evaluations {
			t.Errorf("%s: %s (converged %v) after %d iterations and %d evaluations, want %s (converged %v) after %d and %d",
				c.name, got.status, got.converged, got.iterations, got.evaluations, w.status, w.converged, w.iterations, w.evaluations)
		}
		if !math.IsNaN(w.f) && !(math.Abs(got.f-w.f) <= 1e-6) {
			t.Errorf("%s: f = %g, want %g", c.name, got.f, w.f)
		}
		for i := range w.x {
			if !(math.Abs(got.x[i]-w.x[i]) <= 1e-6) {
				t.Errorf("%s: x = %v, want %v", c.name, got.x, w.x)
				break
			}
		}
	}
	// Unbounded below: X is the lowest point seen, far down the slope.
	if r := MinUnbounded([2]float64{0, 1}); !(r.F < -1e30) || r.F != Unbounded(r.X) {
		t.Errorf("Unbounded: f = %g at %v", r.F, r.X)
	}
	// An objective that panics: the panic propagates to the caller.
	func() {
		defer func() {
			if p := recover(); p != "hostile: negative x₀" {
				t.Errorf("Panics: recovered %v, want the objective's panic", p)
			}
		}()
		MinPanics([2]float64{1, 1})
		t.Errorf("Panics: the run returned")
	}()
}

// TestConcurrent runs minimizers from many goroutines at once (under
// -race): each run's state lives in its own call, so every result equals
// the sequential one.
func TestConcurrent(t *testing.T) {
	want1, want2 := MinStiff([2]float64{3, 3}), MinNaNNear([2]float64{0, 0})
	var wg sync.WaitGroup
	for range 16 {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for range 20 {
				if got := MinStiff([2]float64{3, 3}); got != want1 {
					t.Errorf("MinStiff concurrently: %+v, alone %+v", got, want1)
				}
				if got := MinNaNNear([2]float64{0, 0}); got != want2 {
					t.Errorf("MinNaNNear concurrently: %+v, alone %+v", got, want2)
				}
			}
		}()
	}
	wg.Wait()
}
`
