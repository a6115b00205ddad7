// Package float32 checks the promise of the convergence test in float32
// with finite differences: a run that reports converged has a true
// gradient at X within the limit it states (Result.GradientLimit). The
// problems are four of Moré, Garbow & Hillstrom, ACM TOMS 7(1):17–41,
// 1981, written here in float32 from the formulas gonum.org/v1/gonum/
// optimize/functions v0.17.0 records, whose float64 Func and Grad are the
// reference for the true gradient at X.
package float32

import (
	"bufio"
	"fmt"
	"math"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/optimize/functions"

	"github.com/thalweg-go/thalweg/gen"
)

// objectives is the package of float32 objectives, after functions.go's
// ExtendedRosenbrock (n = 2), Beale, HelicalValley and Wood.
const objectives = `// Package f32 holds float32 versions of four MGH problems.
package f32

import "math"

// Rosenbrock is MGH (1): 100(x₂ − x₁²)² + (1 − x₁)².
func Rosenbrock(x *[2]float32) float32 {
	a, b := x[1]-x[0]*x[0], 1-x[0]
	return 100*a*a + b*b
}

// Beale is MGH (5).
func Beale(x *[2]float32) float32 {
	f1 := 1.5 - x[0]*(1-x[1])
	f2 := 2.25 - x[0]*(1-x[1]*x[1])
	f3 := 2.625 - x[0]*(1-x[1]*x[1]*x[1])
	return f1*f1 + f2*f2 + f3*f3
}

// HelicalValley is MGH (7), θ as functions.go computes it.
func HelicalValley(x *[3]float32) float32 {
	theta := float32(0.5 * math.Atan(float64(x[1]/x[0])) / math.Pi)
	if x[0] < 0 {
		theta += 0.5
	}
	f1 := 10 * (x[2] - 10*theta)
	f2 := 10 * (float32(math.Hypot(float64(x[0]), float64(x[1]))) - 1)
	return f1*f1 + f2*f2 + x[2]*x[2]
}

// Wood is MGH (14).
func Wood(x *[4]float32) float32 {
	f1 := x[1] - x[0]*x[0]
	f2 := 1 - x[0]
	f3 := x[3] - x[2]*x[2]
	f4 := 1 - x[2]
	f5 := x[1] + x[3] - 2
	f6 := x[1] - x[3]
	return 100*f1*f1 + f2*f2 + 90*f3*f3 + f4*f4 + 10*f5*f5 + 0.1*f6*f6
}
`

// problem is one objective with its standard start (MGH 1981, §3) and its
// float64 reference.
type problem struct {
	name      string
	start     []float64
	reference interface {
		Func([]float64) float64
		Grad(g, x []float64)
	}
}

var problems = []problem{
	{"Rosenbrock", []float64{-1.2, 1}, functions.ExtendedRosenbrock{}},
	{"Beale", []float64{1, 1}, functions.Beale{}},
	{"HelicalValley", []float64{-1, 0, 0}, functions.HelicalValley{}},
	{"Wood", []float64{-3, -1, -3, -1}, functions.Wood{}},
}

// TestFloat32DifferencesKeepTheirWord generates, for each problem, a float32
// minimizer with forward and one with central differences, every other key
// at its default, runs each from the standard start, and requires of every
// converged run that the relative gradient measure computed from gonum's
// float64 gradient at X be at most the limit the run states.
func TestFloat32DifferencesKeepTheirWord(t *testing.T) {
	if testing.Short() {
		t.Skip("generates and runs a module; skipped with -short")
	}
	dir := t.TempDir()
	var spec, harness strings.Builder
	harness.WriteString("package f32\n\nimport (\n\t\"fmt\"\n\t\"testing\"\n)\n\nfunc TestReport(t *testing.T) {\n")
	for _, p := range problems {
		for _, der := range []string{"forward", "central"} {
			name := p.name + strings.ToUpper(der[:1]) + der[1:]
			fmt.Fprintf(&spec, "[[minimizer]]\nname = %q\nobjective = %q\nderivative = %q\nstart = [%s]\n\n", name, p.name, der, floats(p.start))
			fmt.Fprintf(&harness, "\t{\n\t\tr := %s([%d]float32{%s})\n\t\tfmt.Printf(\"result %s %%v %%v %%v %%v\\n\", r.Status.Converged(), r.Status, r.GradientLimit, r.X)\n\t}\n", name, len(p.start), floats(p.start), name)
		}
	}
	harness.WriteString("}\n")
	files := map[string]string{
		"go.mod":         "module f32\n\ngo 1.24\n",
		"f32.go":         objectives,
		"f32.toml":       spec.String(),
		"report_test.go": harness.String(),
	}
	for name, text := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	outs, err := gen.Generate([]string{filepath.Join(dir, "f32.toml")})
	if err != nil {
		t.Fatalf("generating: %v", err)
	}
	if err := gen.Write(outs); err != nil {
		t.Fatal(err)
	}
	cmd := exec.Command("go", "test", "-count=1", "-v", "-run", "^TestReport$", ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOWORK=off", "GOFLAGS=-mod=mod")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go test: %v\n%s", err, out)
	}
	seen := 0
	sc := bufio.NewScanner(strings.NewReader(string(out)))
	for sc.Scan() {
		fields := strings.Fields(strings.NewReplacer("[", " ", "]", " ").Replace(sc.Text()))
		if len(fields) < 5 || fields[0] != "result" {
			continue
		}
		seen++
		name, converged := fields[1], fields[2] == "true"
		status := strings.Join(fields[3:len(fields)-1-dimOf(name)], " ")
		limit, _ := strconv.ParseFloat(fields[len(fields)-1-dimOf(name)], 64)
		var x []float64
		for _, f := range fields[len(fields)-dimOf(name):] {
			v, _ := strconv.ParseFloat(f, 64)
			x = append(x, v)
		}
		p := problemOf(name)
		measure := trueMeasure(p, x)
		t.Logf("%-20s %-15s converged %-5v limit %-9.3g true measure %-9.3g x = %v", name, status, converged, limit, measure, x)
		if converged && !(measure <= limit) {
			t.Errorf("%s: converged stating a gradient measure ≤ %g, but gonum's gradient at X gives %g", name, limit, measure)
		}
	}
	if seen != 2*len(problems) {
		t.Fatalf("%d results for %d runs:\n%s", seen, 2*len(problems), out)
	}
}

// trueMeasure is the relative gradient measure (Dennis & Schnabel 1983,
// §7.2) from gonum's float64 gradient at x.
func trueMeasure(p problem, x []float64) float64 {
	g := make([]float64, len(x))
	p.reference.Grad(g, x)
	scale := math.Max(math.Abs(p.reference.Func(x)), 1)
	m := 0.0
	for i := range g {
		m = math.Max(m, math.Abs(g[i])*math.Max(math.Abs(x[i]), 1)/scale)
	}
	return m
}

func problemOf(name string) problem {
	for _, p := range problems {
		if strings.HasPrefix(name, p.name) {
			return p
		}
	}
	return problem{}
}

func dimOf(name string) int { return len(problemOf(name).start) }

func floats(v []float64) string {
	s := make([]string, len(v))
	for i, x := range v {
		s[i] = strconv.FormatFloat(x, 'g', -1, 64)
	}
	return strings.Join(s, ", ")
}
