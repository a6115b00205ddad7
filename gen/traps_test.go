package gen

import (
	"bytes"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"
)

// TestTrapsEndToEnd generates minimizers for the traps that once gave
// dishonest or poor answers, runs them in a temporary module, and checks
// each ends as it now must. Each case failed before the change that
// fixed it (named beside it):
//
//   - lbfgs on Rosenbrock with every key at its default took 702 calls
//     and ran out of iterations under armijo: now wolfe, converged in few;
//   - a large minimum value (as Brown and Dennis's 8.6e4) could never meet
//     an absolute gradient limit: the relative test converges;
//   - a fixed step too long for the objective reported the diverged point
//     as X: now "diverged", X the start, the best point seen;
//   - a wrong analytic gradient ended "no acceptable step" with the
//     default trials and "no decrease" only with more: now "no decrease"
//     with both the backtracking and the Wolfe rules;
//   - a stationary start converged in 0 iterations and every generated
//     test passed: the generated convergence test now fails, saying why;
//   - cg took armijo by default: now strong-wolfe, and armijo is refused;
//   - gradients near 1e200 made ∇fᵀd overflow to −Inf, and every
//     direction ended "no acceptable step" at the start: now the search
//     direction is shortened until the slope is finite, and all converge.
//
// (A method on a receiver with data, which ran its tests on the zero
// value, is refused by gen; cmd/thalweg's TestInit covers it.)
func TestTrapsEndToEnd(t *testing.T) {
	if testing.Short() {
		t.Skip("generates and runs a module; skipped with -short")
	}
	dir := t.TempDir()
	files := map[string]string{
		"go.mod": "module traps\n\ngo 1.24\n",
		"traps.go": `// Package traps holds objectives for the end-to-end traps.
package traps

// Rosen is Rosenbrock's function, MGH (1): minimum 0 at (1, 1).
func Rosen(x *[2]float64) float64 {
	a, b := x[1]-x[0]*x[0], 1-x[0]
	return 100*a*a + b*b
}

// Heavy is 86 000 + Σ 1000(xᵢ − i)²: a large minimum value, as MGH (16)'s.
func Heavy(x [3]float64) float64 {
	s := 86000.0
	for i := range x {
		d := x[i] - float64(i)
		s += 1000 * d * d
	}
	return s
}

// Bowl is 2(x₀² + x₁²); its gradient's Lipschitz constant is 4, so a fixed
// step of 1 > 2/4 diverges (each step multiplies x by −3).
func Bowl(x [2]float64) float64 { return 2 * (x[0]*x[0] + x[1]*x[1]) }

// BowlGrad is Bowl's gradient.
func BowlGrad(x [2]float64) [2]float64 { return [2]float64{4 * x[0], 4 * x[1]} }

// Huge is 1e200·((x₀ − 1)² + (x₁ + 2)²), with gradients near 1e200 at
// the start, where ∇fᵀd overflowed to −Inf and every trial was rejected.
func Huge(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+2
	return 1e200 * (a*a + b*b)
}

// HugeGrad is Huge's gradient.
func HugeGrad(x [2]float64) [2]float64 {
	return [2]float64{2e200 * (x[0] - 1), 2e200 * (x[1] + 2)}
}

// WrongGrad flips the sign of Bowl's first gradient component.
func WrongGrad(x [2]float64) [2]float64 { return [2]float64{-4 * x[0], 4 * x[1]} }
`,
		"traps.toml": `[[minimizer]]
name = "LbfgsDefaults"
objective = "Rosen"
direction = "lbfgs"
start = [-1.2, 1.0]

[[minimizer]]
name = "HeavyDefaults"
objective = "Heavy"
start = [3.0, -2.0, 5.0]

[[minimizer]]
name = "TooLong"
objective = "Bowl"
derivative = "analytic"
gradient = "BowlGrad"
direction = "steepest"
start = [1.0, 1.0]
[minimizer.step]
rule = "fixed"
initial = 1.0
[minimizer.expect]
status = "diverged"
x = [1.0, 1.0]

[[minimizer]]
name = "WrongArmijo"
objective = "Bowl"
derivative = "analytic"
gradient = "WrongGrad"
direction = "steepest"
start = [1.0, 0.5]
[minimizer.expect]
status = "no decrease"

[[minimizer]]
name = "WrongWolfe"
objective = "Bowl"
derivative = "analytic"
gradient = "WrongGrad"
direction = "bfgs"
start = [1.0, 0.5]
[minimizer.expect]
status = "no decrease"

[[minimizer]]
name = "Stationary"
objective = "Bowl"
derivative = "analytic"
gradient = "BowlGrad"
start = [0.0, 0.0]

[[minimizer]]
name = "HugeSteepest"
objective = "Huge"
derivative = "analytic"
gradient = "HugeGrad"
direction = "steepest"
start = [3.0, 3.0]
[minimizer.expect]
x = [1.0, -2.0]
tolerance = 1e-9

[[minimizer]]
name = "HugeBfgs"
objective = "Huge"
derivative = "analytic"
gradient = "HugeGrad"
direction = "bfgs"
start = [3.0, 3.0]
[minimizer.expect]
x = [1.0, -2.0]
tolerance = 1e-9

[[minimizer]]
name = "HugeLbfgs"
objective = "Huge"
derivative = "analytic"
gradient = "HugeGrad"
direction = "lbfgs"
start = [3.0, 3.0]
[minimizer.expect]
x = [1.0, -2.0]
tolerance = 1e-9

[[minimizer]]
name = "HugeCg"
objective = "Huge"
derivative = "analytic"
gradient = "HugeGrad"
direction = "cg"
start = [3.0, 3.0]
[minimizer.expect]
x = [1.0, -2.0]
tolerance = 1e-9

[[minimizer]]
name = "CgDefaults"
objective = "Rosen"
direction = "cg"
start = [-1.2, 1.0]
`,
	}
	writeTree(t, dir, files)
	plans, err := Plans([]string{filepath.Join(dir, "traps.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range plans {
		if p.M.Name == "CgDefaults" && p.Rule.Name != "strong-wolfe" {
			t.Errorf("cg's default rule is %s, want strong-wolfe", p.Rule.Name)
		}
	}
	outs, err := Generate([]string{filepath.Join(dir, "traps.toml")})
	if err != nil {
		t.Fatal(err)
	}
	if err := Write(outs); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("go", "test", "-count=1", "-v", "-run", "Converges|EndsWith", ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOWORK=off", "GOFLAGS=-mod=mod")
	out, _ := cmd.CombinedOutput() // the stationary start's test must fail
	text := string(out)
	for _, pass := range []string{"TestLbfgsDefaultsConverges", "TestHeavyDefaultsConverges", "TestTooLongEndsWithDiverged", "TestWrongArmijoEndsWithNoDecrease", "TestWrongWolfeEndsWithNoDecrease", "TestCgDefaultsConverges", "TestHugeSteepestConverges", "TestHugeBfgsConverges", "TestHugeLbfgsConverges", "TestHugeCgConverges"} {
		if !regexp.MustCompile(`(?m)^--- PASS: ` + pass + ` `).MatchString(text) {
			t.Errorf("%s did not pass:\n%s", pass, text)
		}
	}
	if !regexp.MustCompile(`(?m)^--- FAIL: TestStationaryConverges `).MatchString(text) || !strings.Contains(text, "converged in 0 iterations") {
		t.Errorf("the stationary start's convergence test did not fail saying why:\n%s", text)
	}

	// Converged in few calls with lbfgs's defaults (702 under armijo).
	probe := exec.Command("go", "test", "-count=1", "-run", "^$", "-bench", "LbfgsDefaults", "-benchtime=1x", ".")
	probe.Dir, probe.Env = dir, cmd.Env
	bench, err := probe.CombinedOutput()
	if err != nil {
		t.Fatalf("benchmark: %v\n%s", err, bench)
	}
	calls := 1e9
	if m := regexp.MustCompile(`([0-9.]+) evaluations/op`).FindStringSubmatch(string(bench)); m != nil {
		calls, _ = strconv.ParseFloat(m[1], 64)
	}
	if calls >= 1000 {
		t.Errorf("lbfgs with defaults on Rosenbrock: want fewer than 1000 evaluations, got:\n%s", bench)
	}

	// The trace shows the test the run used: Heavy's f of 86 000 makes the
	// relative gradient 1/86 000 of the largest |∂f/∂xᵢ|, which the trace
	// once showed against the limit, so that a converged run's last row
	// stood far above it.
	for _, p := range plans {
		if p.M.Name != "HeavyDefaults" {
			continue
		}
		res, err := Trace(p)
		if err != nil {
			t.Fatal(err)
		}
		var table bytes.Buffer
		if err := WriteTraceTable(&table, p, res); err != nil {
			t.Fatal(err)
		}
		last := res.Rows[len(res.Rows)-1]
		if !res.Converged || !(last.Gradient <= res.Limits.Gradient) || !strings.Contains(table.String(), "stops when the relative gradient max |∂f/∂xᵢ|·max(|xᵢ|, 1)/max(|f|, 1) ≤ 1e-8") {
			t.Errorf("HeavyDefaults traced: %s, last row's gradient measure %g over a limit of %g\n%s", res.Status, last.Gradient, res.Limits.Gradient, table.String())
		}
	}

	// cg with armijo is refused.
	refused := filepath.Join(dir, "refused.toml")
	if err := os.WriteFile(refused, []byte("[[minimizer]]\nname = \"CgArmijo\"\nobjective = \"Rosen\"\ndirection = \"cg\"\nstart = [-1.2, 1.0]\n[minimizer.step]\nrule = \"armijo\"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	if _, err := Generate([]string{refused}); err == nil || !strings.Contains(err.Error(), `direction "cg" needs a step rule with a curvature condition`) {
		t.Errorf("cg with armijo: %v", err)
	}
}
