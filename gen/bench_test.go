package gen

import (
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/thalweg-go/thalweg/templates"
)

// The generator's own speed. The targets: gen on the quickstart
// within 3× the time of loading its package alone, and under 5 ms per
// extra minimizer of a spec. Run them with
//
//	go test -run '^$' -bench 'Quickstart|PerMinimizer' -count 6 ./gen
//
// (the figures are in the README, "How thalweg is built and checked").
// Those that generate in this process set the collector as the thalweg
// command does (RoomyHeap), so they measure what a run of it pays.

var quickstartSpec = filepath.Join("..", "examples", "quickstart", "quickstart.toml")

// BenchmarkLoadQuickstart loads the quickstart's package as gen does
// (go/packages, which runs go list, then type-checks from source), and
// nothing else: the floor of any gen run.
func BenchmarkLoadQuickstart(b *testing.B) {
	dir := filepath.Dir(quickstartSpec)
	var probs Problems
	loadPackage(dir, &probs) // warm up: the first go list is slower
	for b.Loop() {
		var probs Problems
		if loadPackage(dir, &probs) == nil || probs.Err() != nil {
			b.Fatalf("loading %s: %v", dir, probs.Err())
		}
	}
}

// BenchmarkGenerateQuickstart generates the quickstart's two minimizers
// and their tests in memory, as gen and check do before writing.
func BenchmarkGenerateQuickstart(b *testing.B) {
	defer RoomyHeap()()
	Generate([]string{quickstartSpec}) // warm up
	for b.Loop() {
		if _, err := Generate([]string{quickstartSpec}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkGenerateQuickstartCold is BenchmarkGenerateQuickstart as a
// run of thalweg pays for it: every iteration parses and type-checks the
// kernels again, which a process does once.
func BenchmarkGenerateQuickstartCold(b *testing.B) {
	defer RoomyHeap()()
	defer func() { kernelCache = newKernelCache() }()
	Generate([]string{quickstartSpec}) // warm up go list
	for b.Loop() {
		kernelCache = newKernelCache() // benchmarks run alone: no test shares it now
		if _, err := Generate([]string{quickstartSpec}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCheckQuickstartCommand runs thalweg check on the quickstart as
// a process: the whole cost a user waits for, start-up included.
func BenchmarkCheckQuickstartCommand(b *testing.B) {
	bin := filepath.Join(b.TempDir(), "thalweg")
	if out, err := exec.Command("go", "build", "-o", bin, "../cmd/thalweg").CombinedOutput(); err != nil {
		b.Fatalf("building thalweg: %v\n%s", err, out)
	}
	run := func() {
		if out, err := exec.Command(bin, "check", quickstartSpec).CombinedOutput(); err != nil {
			b.Fatalf("thalweg check: %v\n%s", err, out)
		}
	}
	run() // warm up
	for b.Loop() {
		run()
	}
}

// BenchmarkGeneratePerMinimizer reports the cost of one more minimizer in
// a spec: a package with one objective, a spec of 1 and one of 41
// minimizers (a mix of directions, step rules and derivative sources),
// ns/extra-minimizer = (t₄₁ − t₁)/40.
func BenchmarkGeneratePerMinimizer(b *testing.B) {
	defer RoomyHeap()()
	one, many := benchModule(b, 41)
	// generate returns the wall and CPU time (this process's threads, GC
	// included; go list's child process excluded) of one generation.
	generate := func(spec string) (wall, cpu time.Duration) {
		cpu0, start := processCPU(b), time.Now()
		outs, err := Generate([]string{spec})
		if err != nil {
			b.Fatal(err)
		}
		if len(outs) == 0 {
			b.Fatal("no outputs")
		}
		return time.Since(start), processCPU(b) - cpu0
	}
	generate(one) // warm up
	generate(many)
	var wallOne, wallMany, cpuOne, cpuMany time.Duration
	n := 0
	for b.Loop() {
		w, c := generate(one)
		wallOne, cpuOne = wallOne+w, cpuOne+c
		w, c = generate(many)
		wallMany, cpuMany = wallMany+w, cpuMany+c
		n++
	}
	b.ReportMetric(float64(wallOne)/float64(n), "ns/1-minimizer-spec")
	b.ReportMetric(float64(wallMany-wallOne)/float64(40*n), "ns/extra-minimizer")
	if cpuMany > 0 {
		b.ReportMetric(float64(cpuMany-cpuOne)/float64(40*n), "cpu-ns/extra-minimizer")
	}
}

// BenchmarkSpecialize copies and rewrites the kernels for each of 41
// minimizers, the part of a minimizer's cost that specialize.go owns.
func BenchmarkSpecialize(b *testing.B) {
	_, many := benchModule(b, 41)
	plans, err := Plans([]string{many})
	if err != nil {
		b.Fatal(err)
	}
	if _, err := loadKernels(); err != nil {
		b.Fatal(err)
	}
	for b.Loop() {
		for _, p := range plans {
			if _, err := specialize(p.kernelChoice()); err != nil {
				b.Fatal(err)
			}
		}
	}
	b.ReportMetric(float64(b.Elapsed())/float64(b.N*len(plans)), "ns/minimizer")
}

// BenchmarkKernelCopy deep-copies every declaration of the kernels, with
// their type information.
func BenchmarkKernelCopy(b *testing.B) {
	ks, err := loadKernels()
	if err != nil {
		b.Fatal(err)
	}
	exprs := 0
	for _, name := range ks.order {
		exprs += ks.units[name].exprs
	}
	for b.Loop() {
		cp := newKernelCopier(ks.info, exprs)
		for _, f := range ks.files {
			for _, d := range f.Decls {
				cp.decl(d)
			}
		}
	}
}

// BenchmarkParseKernels parses and type-checks the templates, once per
// process.
func BenchmarkParseKernels(b *testing.B) {
	for b.Loop() {
		if _, err := parseKernels(templates.Source); err != nil {
			b.Fatal(err)
		}
	}
}

// benchModule writes a module with one objective and its gradient, and
// two specs: the first minimizer alone, and all n of them.
func benchModule(tb testing.TB, n int) (one, many string) {
	tb.Helper()
	dir := tb.TempDir()
	files := map[string]string{
		"go.mod": "module bench\n\ngo 1.24\n",
		"objective.go": `package bench

// Rosen is the Rosenbrock function.
func Rosen(x *[2]float64) float64 {
	a, b := 1-x[0], x[1]-x[0]*x[0]
	return a*a + 100*b*b
}

// RosenGrad is Rosen's gradient.
func RosenGrad(x, g *[2]float64) {
	b := x[1] - x[0]*x[0]
	g[0] = -2*(1-x[0]) - 400*x[0]*b
	g[1] = 200 * b
}
`,
	}
	// The direction × step rule pairs thalweg tune tries, cycled with the
	// three derivative sources.
	combos := []struct{ direction, step string }{
		{"bfgs", `rule = "armijo"`},
		{"steepest", `rule = "armijo"`},
		{"steepest", "rule = \"armijo\"\ninterpolate = true"},
		{"steepest", `rule = "wolfe"`},
		{"bfgs", `rule = "wolfe"`},
		{"bfgs", `rule = "strong-wolfe"`},
		{"lbfgs", `rule = "armijo"`},
		{"lbfgs", `rule = "wolfe"`},
		{"lbfgs", `rule = "strong-wolfe"`},
		{"cg", `rule = "wolfe"`},
		{"cg", `rule = "strong-wolfe"`},
	}
	derivatives := []string{"central", "analytic", "forward"}
	var specs []string
	for i := range n {
		c := combos[i%len(combos)]
		d := derivatives[i%len(derivatives)]
		grad := ""
		if d == "analytic" {
			grad = "gradient = \"RosenGrad\"\n"
		}
		specs = append(specs, fmt.Sprintf("[[minimizer]]\nname = \"Min%02d\"\nobjective = \"Rosen\"\nderivative = %q\n%sdirection = %q\nstart = [-1.2, 1.0]\n\n[minimizer.step]\n%s\n",
			i, d, grad, c.direction, c.step))
	}
	files["one.toml"] = specs[0]
	files["many.toml"] = strings.Join(specs, "\n")
	for name, src := range files {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(src), 0o644); err != nil {
			tb.Fatal(err)
		}
	}
	return filepath.Join(dir, "one.toml"), filepath.Join(dir, "many.toml")
}
