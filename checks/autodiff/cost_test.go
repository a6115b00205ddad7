package autodiff

import (
	"bufio"
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/gen"
)

var (
	cost      = flag.Bool("cost", false, "run the gradient cost benchmarks (TestGradientCost) and print their table")
	benchtime = flag.String("costtime", "1s", "the gradient cost benchmarks' -benchtime (-benchtime itself goes to this go test)")
)

// costSizes are the dimensions of the cost benchmark.
var costSizes = []int{2, 4, 10, 50}

// costObjectives are its objectives: one whose statements each read two
// unknowns (the chained Rosenbrock function f = Σ 100(x_{i+1} − x_i²)² +
// (1 − x_i)², gonum's ExtendedRosenbrock), where forward mode keeps
// tangents sparse, and one whose every residual reads all N (MGH (26),
// trigonometric, rᵢ = N − Σⱼ cos xⱼ + i(1 − cos xᵢ) − sin xᵢ), where a
// forward-mode tangent is dense and the gradient costs O(N²) against the
// hand-written O(N).
var costObjectives = []struct{ name, what string }{{"Rosen", "chained Rosenbrock"}, {"Trig", "trigonometric"}}

// TestGradientCost measures, with go test -bench in a temporary module,
// one gradient of each of costObjectives by the derived code
// (derivative = "automatic"), by central differences (2N objective calls,
// what derivative = "central" pays per gradient), and by a hand-written
// gradient, at N = 2, 4, 10, 50. It runs only with -cost (benchmarks, not
// a timed test: nothing is asserted of the times) and prints the table
// the README quotes; CI runs it with -costtime 200x as a smoke test.
func TestGradientCost(t *testing.T) {
	if !*cost {
		t.Skip("the gradient cost benchmarks run with -cost")
	}
	dir := t.TempDir()
	files := map[string]string{
		"go.mod":        "module example.com/cost\n\ngo 1.26\n",
		"rosen.go":      costSource(),
		"cost.toml":     costSpec(),
		"bench_test.go": costBench(),
	}
	for name, data := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	outs, err := gen.Generate([]string{filepath.Join(dir, "cost.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range outs {
		if err := os.WriteFile(o.Path, o.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	cmd := exec.Command("go", "test", "-run", "^$", "-bench", ".", "-benchmem", "-benchtime", *benchtime, ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOWORK=off")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go test -bench: %v\n%s", err, out)
	}
	ns := map[string]float64{}
	allocs := map[string]string{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) < 5 || !strings.HasPrefix(f[0], "BenchmarkGradient/") {
			continue
		}
		name := strings.TrimPrefix(f[0], "BenchmarkGradient/")
		if i := strings.LastIndexByte(name, '-'); i > 0 {
			name = name[:i] // the GOMAXPROCS suffix
		}
		v, _ := strconv.ParseFloat(f[2], 64)
		ns[name] = v
		for k := range f {
			if f[k] == "allocs/op" {
				allocs[name] = f[k-1]
			}
		}
	}
	var table strings.Builder
	table.WriteString("| objective | N | automatic ns | central ns | hand-written ns | central / automatic | automatic / hand-written | allocs (automatic) |\n|---|---:|---:|---:|---:|---:|---:|---:|\n")
	for _, obj := range costObjectives {
		for _, n := range costSizes {
			key := fmt.Sprintf("%s/N=%d/", obj.name, n)
			a, c, h := ns[key+"automatic"], ns[key+"central"], ns[key+"hand"]
			if a == 0 || c == 0 || h == 0 {
				t.Fatalf("%s: a benchmark is missing:\n%s", key, out)
			}
			if al := allocs[key+"automatic"]; al != "0" {
				t.Errorf("%s: the derived gradient allocates (%s allocs/op)", key, al)
			}
			fmt.Fprintf(&table, "| %s | %d | %.0f | %.0f | %.0f | %.1f | %.1f | %s |\n", obj.what, n, a, c, h, c/a, a/h, allocs[key+"automatic"])
		}
	}
	t.Logf("gradient of each objective, one call (go test -bench, -benchtime %s):\n%s", *benchtime, table.String())
	fmt.Print(table.String())
}

// costSource renders the objectives, one per size, and their
// hand-written gradients.
func costSource() string {
	var b strings.Builder
	b.WriteString("package cost\n\nimport \"math\"\n\n")
	for _, n := range costSizes {
		fmt.Fprintf(&b, `// Rosen%[1]d is the chained Rosenbrock function of %[1]d unknowns.
func Rosen%[1]d(x *[%[1]d]float64) float64 {
	sum := 0.0
	for i := 0; i < %[1]d-1; i++ {
		a := 1 - x[i]
		b := x[i+1] - x[i]*x[i]
		sum += a*a + 100*b*b
	}
	return sum
}

// Rosen%[1]dGrad is Rosen%[1]d's gradient, written by hand.
func Rosen%[1]dGrad(x, g *[%[1]d]float64) {
	*g = [%[1]d]float64{}
	for i := 0; i < %[1]d-1; i++ {
		b := x[i+1] - x[i]*x[i]
		g[i] += -2*(1-x[i]) - 400*x[i]*b
		g[i+1] += 200 * b
	}
}

// Trig%[1]d is MGH (26), the trigonometric function of %[1]d unknowns.
func Trig%[1]d(x *[%[1]d]float64) float64 {
	s := 0.0
	for j := 0; j < %[1]d; j++ {
		s += math.Cos(x[j])
	}
	f := 0.0
	for i := 0; i < %[1]d; i++ {
		r := %[1]d - s + float64(i+1)*(1-math.Cos(x[i])) - math.Sin(x[i])
		f += r * r
	}
	return f
}

// Trig%[1]dGrad is Trig%[1]d's gradient, written by hand:
// ∂f/∂xⱼ = 2 sin xⱼ·Σᵢ rᵢ + 2rⱼ((j+1) sin xⱼ − cos xⱼ).
func Trig%[1]dGrad(x, g *[%[1]d]float64) {
	s := 0.0
	for j := 0; j < %[1]d; j++ {
		s += math.Cos(x[j])
	}
	var r [%[1]d]float64
	sum := 0.0
	for i := 0; i < %[1]d; i++ {
		r[i] = %[1]d - s + float64(i+1)*(1-math.Cos(x[i])) - math.Sin(x[i])
		sum += r[i]
	}
	for j := 0; j < %[1]d; j++ {
		g[j] = 2*math.Sin(x[j])*sum + 2*r[j]*(float64(j+1)*math.Sin(x[j])-math.Cos(x[j]))
	}
}

`, n)
	}
	return b.String()
}

func costSpec() string {
	var b strings.Builder
	for _, n := range costSizes {
		start := make([]string, n)
		for i := range start {
			start[i] = "-1.2"
			if i%2 == 1 {
				start[i] = "1.0"
			}
		}
		for _, obj := range costObjectives {
			fmt.Fprintf(&b, "[[minimizer]]\nname = \"Cost%s%d\"\nobjective = \"%s%d\"\nderivative = \"automatic\"\nstart = [%s]\n\n", obj.name, n, obj.name, n, strings.Join(start, ", "))
		}
	}
	return b.String()
}

// costBench renders the benchmarks. Central differences use the interval
// h = ∛u·max(1, |xᵢ|) and cost 2N objective calls, what one gradient of
// derivative = "central" costs once its intervals are chosen.
func costBench() string {
	var b strings.Builder
	b.WriteString("package cost\n\nimport (\n\t\"math\"\n\t\"testing\"\n)\n\nvar sink float64\n\nfunc BenchmarkGradient(b *testing.B) {\n")
	for _, n := range costSizes {
		for _, obj := range costObjectives {
			fmt.Fprintf(&b, `	{
		var x, g [%[1]d]float64
		for i := range x {
			x[i] = -1.2 + 0.1*float64(i%%3)
		}
		b.Run("%[2]s/N=%[1]d/automatic", func(b *testing.B) {
			for b.Loop() {
				cost%[2]s%[1]dAutoGradient(&x, &g)
			}
			sink += g[0]
		})
		b.Run("%[2]s/N=%[1]d/central", func(b *testing.B) {
			for b.Loop() {
				for i := range x {
					h := 6.055454452393343e-06 * math.Max(1, math.Abs(x[i]))
					up, down := x, x
					up[i] += h
					down[i] -= h
					g[i] = (%[2]s%[1]d(&up) - %[2]s%[1]d(&down)) / (up[i] - down[i])
				}
			}
			sink += g[0]
		})
		b.Run("%[2]s/N=%[1]d/hand", func(b *testing.B) {
			for b.Loop() {
				%[2]s%[1]dGrad(&x, &g)
			}
			sink += g[0]
		})
	}
`, n, obj.name)
		}
	}
	b.WriteString("}\n")
	return b.String()
}
