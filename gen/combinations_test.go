package gen

import (
	"fmt"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
)

// TestEveryCombination generates a minimizer for every combination of
// objective form (scalar, array, pointer, slice, method on a value
// receiver, method on a pointer receiver, combined value and gradient) ×
// float type × derivative source × direction × step rule × bounds on or
// off that gen accepts (cg takes neither a backtracking rule nor bounds;
// a combined objective brings its own gradient), 1 600 in all, into one
// temporary module, then vets it and runs every generated test in one go
// test run. Each objective is the quadratic (x₁ − 1.5)² + 3(x₂ + 0.5)²
// (for the scalar form (x − 1.5)²), minimum at (1.5, −0.5); with bounds
// the box 0 ≤ x ≤ 10 (x ≤ 1 for the scalar) holds the minimum at
// (1.5, 0) (at 1), on the bound. The fixed rule steps 0.25, inside 2/L =
// 1/3 (L = 6, the largest curvature).
func TestEveryCombination(t *testing.T) {
	if testing.Short() {
		t.Skip("generates, vets and tests 1 600 minimizers; skipped with -short")
	}
	root := t.TempDir()
	files := map[string]string{"go.mod": "module every\n\ngo 1.24\n"}
	var specs []string
	count := 0
	for _, form := range combinationForms {
		src, spec, n := combinationPackage(form)
		files[form+"/"+form+".go"] = src
		files[form+"/"+form+".toml"] = spec
		specs = append(specs, filepath.Join(root, form, form+".toml"))
		count += n
	}
	if count != 1600 {
		t.Fatalf("%d combinations, want 1600", count)
	}
	writeTree(t, root, files)
	outs, err := Generate(specs)
	if err != nil {
		t.Fatal(err)
	}
	if len(outs) != 2*count {
		t.Fatalf("%d outputs for %d minimizers", len(outs), count)
	}
	if err := Write(outs); err != nil {
		t.Fatal(err)
	}
	e2eGo(t, root, nil, "vet", "./...")
	out := e2eGo(t, root, nil, "test", "-count=1", "-v", "./...")
	for _, form := range combinationForms {
		if !regexp.MustCompile(`(?m)^ok\s+every/` + form + `\s`).MatchString(out) {
			t.Errorf("go test did not report ok for every/%s", form)
		}
	}
	if n := len(regexp.MustCompile(`(?m)^--- PASS: Test\w+Converges `).FindAllString(out, -1)); n != count {
		t.Errorf("%d convergence tests passed, want %d", n, count)
	}
}

var combinationForms = []string{"scalar", "array", "pointer", "slice", "value", "pointer_method", "combined"}

// combinationPackage returns the source and spec of one form's package,
// both float types, and the number of minimizers in the spec.
func combinationPackage(form string) (src, spec string, n int) {
	var s, sp strings.Builder
	fmt.Fprintf(&s, "// Package %s holds the %s objectives of the combination test.\npackage %s\n", form, strings.ReplaceAll(form, "_", " "), form)
	for _, elem := range []string{"float64", "float32"} {
		bits := elem[len(elem)-2:]
		s.WriteString(strings.NewReplacer("$T", elem, "$B", bits).Replace(combinationSources[form]))
		objective, gradient, instance := combinationNames(form, bits)
		sources := []string{"analytic", "automatic", "forward", "central"}
		if form == "combined" {
			sources = []string{"analytic"}
		}
		for _, source := range sources {
			for _, direction := range []string{"steepest", "bfgs", "lbfgs", "cg"} {
				for _, rule := range []string{"fixed", "decrease", "armijo", "wolfe", "strong-wolfe"} {
					if direction == "cg" && rule != "wolfe" && rule != "strong-wolfe" {
						continue
					}
					for _, boxed := range []bool{false, true} {
						if boxed && direction == "cg" {
							continue
						}
						n++
						name := fmt.Sprintf("M%s%s%s%s%s", bits, camel(source), camel(direction), camel(rule), map[bool]string{false: "Free", true: "Box"}[boxed])
						fmt.Fprintf(&sp, "\n[[minimizer]]\nname = %q\nobjective = %q\nderivative = %q\n", name, objective, source)
						if source == "analytic" && form != "combined" {
							fmt.Fprintf(&sp, "gradient = %q\n", gradient)
						}
						if instance != "" {
							fmt.Fprintf(&sp, "instance = %q\n", instance)
						}
						if form == "slice" {
							sp.WriteString("dim = 2\n")
						}
						fmt.Fprintf(&sp, "direction = %q\n", direction)
						start, want, lower, upper := "[3.0, 3.0]", "[1.5, -0.5]", "[0.0, 0.0]", "[10.0, 10.0]"
						if form == "scalar" {
							start, want, lower, upper = "3.0", "1.5", "-10.0", "1.0"
						}
						if boxed {
							want = "[1.5, 0.0]"
							if form == "scalar" {
								want = "1.0"
							}
						}
						fmt.Fprintf(&sp, "start = %s\n[minimizer.step]\nrule = %q\n", start, rule)
						if rule == "fixed" {
							sp.WriteString("initial = 0.25\n")
						}
						if boxed {
							fmt.Fprintf(&sp, "[minimizer.bounds]\nlower = %s\nupper = %s\n", lower, upper)
						}
						tolerance := "1e-6"
						if elem == "float32" {
							tolerance = "1e-2"
						}
						fmt.Fprintf(&sp, "[minimizer.expect]\nx = %s\ntolerance = %s\n", want, tolerance)
					}
				}
			}
		}
	}
	return s.String(), sp.String(), n
}

// combinationNames are the spec's names of one form's objective, its
// gradient and its receiver's instance for one float type.
func combinationNames(form, bits string) (objective, gradient, instance string) {
	switch form {
	case "value":
		return "Val" + bits + ".Cost", "Val" + bits + ".CostGrad", "NewVal" + bits
	case "pointer_method":
		return "Ptr" + bits + ".Cost", "Ptr" + bits + ".CostGrad", "NewPtr" + bits
	}
	return "Cost" + bits, "Cost" + bits + "Grad", ""
}

// camel turns "strong-wolfe" into "StrongWolfe".
func camel(s string) string {
	var b strings.Builder
	for _, part := range strings.Split(s, "-") {
		b.WriteString(strings.ToUpper(part[:1]) + part[1:])
	}
	return b.String()
}

// combinationSources holds each form's objective (and gradient) with $T
// the float type and $B its bits.
var combinationSources = map[string]string{
	"scalar": `
// Cost$B is (x − 1.5)².
func Cost$B(x $T) $T { return (x - 1.5) * (x - 1.5) }

// Cost$BGrad is Cost$B's derivative.
func Cost$BGrad(x $T) $T { return 2 * (x - 1.5) }
`,
	"array": `
// Cost$B is (x₁ − 1.5)² + 3(x₂ + 0.5)².
func Cost$B(x [2]$T) $T {
	a, b := x[0]-1.5, x[1]+0.5
	return a*a + 3*b*b
}

// Cost$BGrad is Cost$B's gradient.
func Cost$BGrad(x [2]$T) [2]$T { return [2]$T{2 * (x[0] - 1.5), 6 * (x[1] + 0.5)} }
`,
	"pointer": `
// Cost$B is (x₁ − 1.5)² + 3(x₂ + 0.5)².
func Cost$B(x *[2]$T) $T {
	a, b := x[0]-1.5, x[1]+0.5
	return a*a + 3*b*b
}

// Cost$BGrad is Cost$B's gradient.
func Cost$BGrad(x, g *[2]$T) { g[0], g[1] = 2*(x[0]-1.5), 6*(x[1]+0.5) }
`,
	"slice": `
// Cost$B is (x₁ − 1.5)² + 3(x₂ + 0.5)².
func Cost$B(x []$T) $T {
	a, b := x[0]-1.5, x[1]+0.5
	return a*a + 3*b*b
}

// Cost$BGrad is Cost$B's gradient.
func Cost$BGrad(x, g []$T) { g[0], g[1] = 2*(x[0]-1.5), 6*(x[1]+0.5) }
`,
	"value": `
// Val$B carries the minimizer.
type Val$B struct{ At [2]$T }

// NewVal$B returns the receiver of the tests.
func NewVal$B() Val$B { return Val$B{At: [2]$T{1.5, -0.5}} }

// Cost is (x₁ − At₁)² + 3(x₂ − At₂)².
func (v Val$B) Cost(x [2]$T) $T {
	a, b := x[0]-v.At[0], x[1]-v.At[1]
	return a*a + 3*b*b
}

// CostGrad is Cost's gradient.
func (v Val$B) CostGrad(x [2]$T) [2]$T { return [2]$T{2 * (x[0] - v.At[0]), 6 * (x[1] - v.At[1])} }
`,
	"pointer_method": `
// Ptr$B carries the minimizer.
type Ptr$B struct{ At [2]$T }

// NewPtr$B returns the receiver of the tests.
func NewPtr$B() *Ptr$B { return &Ptr$B{At: [2]$T{1.5, -0.5}} }

// Cost is (x₁ − At₁)² + 3(x₂ − At₂)².
func (p *Ptr$B) Cost(x *[2]$T) $T {
	a, b := x[0]-p.At[0], x[1]-p.At[1]
	return a*a + 3*b*b
}

// CostGrad is Cost's gradient.
func (p *Ptr$B) CostGrad(x, g *[2]$T) { g[0], g[1] = 2*(x[0]-p.At[0]), 6*(x[1]-p.At[1]) }
`,
	"combined": `
// Cost$B is (x₁ − 1.5)² + 3(x₂ + 0.5)², its gradient written into g.
func Cost$B(x, g *[2]$T) $T {
	a, b := x[0]-1.5, x[1]+0.5
	g[0], g[1] = 2*a, 6*b
	return a*a + 3*b*b
}
`,
}
