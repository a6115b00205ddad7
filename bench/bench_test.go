// Package bench measures thalweg's generated minimizers in one go test
// -bench process against gonum.org/v1/gonum/optimize (BFGS, LBFGS, CG,
// GradientDescent), a hand-written steepest descent with Armijo
// backtracking, and the floor: the objective and gradient alone, called as
// many times as the solve called them (for bfgs also the O(N²) update
// arithmetic the method needs). It is a module of its own so that gonum
// never reaches a user of thalweg.
//
// TestTable writes the problems, a spec and the benchmarks into a
// temporary module, generates the minimizers there with thalweg's gen
// package, runs go test -bench in it and prints the table the README
// quotes:
//
//	go -C bench test -run TestTable -table -v
//
// (-solvetime sets the benchmarks' -benchtime, -only the problems; CI runs
// Well1 and Rosen2 with -solvetime 1x as a smoke test). Nothing about the
// times is asserted; that every generated minimizer allocates nothing is.
package bench

import (
	"bufio"
	"bytes"
	"flag"
	"fmt"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/gen"
)

var (
	table     = flag.Bool("table", false, "run the benchmarks and print the table (TestTable)")
	benchtime = flag.String("solvetime", "1s", "the benchmarks' -benchtime (-benchtime itself goes to this go test)")
	counts    = flag.String("instructions", "", "comma-separated benchmarks (e.g. Rosen2/bfgs/analytic) whose instructions per solve callgrind counts, thalweg against floor")
	only      = flag.String("only", "", "a regular expression for the problems to run, e.g. Well1|Rosen2 (CI's smoke run)")
)

// problem is one objective of the table: its Go name, size, start, and
// the sources and float types it is measured with.
type problem struct {
	name, what string
	n          int
	start      []float64
	central    bool // also with derivative = "central"
	single     bool // also in float32
}

var directions = []string{"steepest", "bfgs", "lbfgs", "cg"}

// gonumMethod is gonum's method of each direction.
var gonumMethod = map[string]string{"steepest": "GradientDescent", "bfgs": "BFGS", "lbfgs": "LBFGS", "cg": "CG"}

// problems are the table's problems: all, or those -only matches.
func problems() []problem {
	var kept []problem
	match := regexp.MustCompile("^(" + *only + ")$")
	for _, p := range allProblems() {
		if *only == "" || match.MatchString(p.name) {
			kept = append(kept, p)
		}
	}
	return kept
}

func allProblems() []problem {
	ps := []problem{
		{"Well1", "1-D well cosh(x − 1) + (x − 1)²/2 (our own)", 1, []float64{4}, true, false},
		{"Rosen2", "Rosenbrock, MGH (1)", 2, []float64{-1.2, 1}, true, true},
		{"ExtRosen10", "extended Rosenbrock, MGH (21), n = 10", 10, extRosenStart(10), true, true},
		{"ExtRosen100", "extended Rosenbrock, MGH (21), n = 100", 100, extRosenStart(100), true, false},
	}
	for _, n := range []int{2, 5, 10, 20, 50, 100} {
		start := make([]float64, n)
		for j := range start {
			start[j] = 1 - float64(j+1)/float64(n) // MGH (25): ξⱼ = 1 − j/n
		}
		ps = append(ps, problem{fmt.Sprintf("VarDim%d", n), fmt.Sprintf("variably dimensioned, MGH (25), n = %d", n), n, start, false, false})
	}
	return ps
}

// extRosenStart is MGH (21)'s x₀ = (−1.2, 1, −1.2, 1, …).
func extRosenStart(n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = -1.2
		if i%2 == 1 {
			x[i] = 1
		}
	}
	return x
}

func TestTable(t *testing.T) {
	if !*table {
		t.Skip("the benchmarks run with -table")
	}
	dir := t.TempDir()
	sum, err := os.ReadFile("go.sum")
	if err != nil {
		t.Fatal(err)
	}
	files := map[string][]byte{
		"go.mod":        []byte("module example.com/bench\n\ngo 1.26\n\nrequire gonum.org/v1/gonum v0.17.0\n"),
		"go.sum":        sum,
		"problems.go":   []byte(problemsSource()),
		"bench.toml":    []byte(specSource()),
		"bench_test.go": []byte(benchSource()),
	}
	for name, data := range files {
		if err := os.WriteFile(filepath.Join(dir, name), data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	outs, err := gen.Generate([]string{filepath.Join(dir, "bench.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, o := range outs {
		if err := os.WriteFile(o.Path, o.Data, 0o644); err != nil {
			t.Fatal(err)
		}
	}
	cmd := exec.Command("go", "test", "-run", "^$", "-bench", "^BenchmarkSolve$", "-benchmem", "-benchtime", *benchtime, "-timeout", "60m", ".")
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off")
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("go test -bench: %v\n%s", err, out)
	}
	res := parse(out)
	var b strings.Builder
	fmt.Fprintf(&b, "%s/%s, %d CPUs, -benchtime %s; per solve from the start: ns, bytes and allocations, objective calls (gradient calls in brackets, differences counted as objective calls).\n\n", runtime.GOOS, runtime.GOARCH, runtime.NumCPU(), *benchtime)
	b.WriteString("| problem | direction | derivative | thalweg ns | B | allocs | calls | gonum ns | gonum calls | gonum / thalweg | thalweg / floor | hand / thalweg |\n")
	b.WriteString("|---|---|---|---:|---:|---:|---:|---:|---:|---:|---:|---:|\n")
	for _, p := range problems() {
		for _, src := range sources(p) {
			for _, d := range directions {
				key := p.name + "/" + d + "/" + src
				g := res[key+"/thalweg"]
				if g == nil {
					t.Errorf("%s: no thalweg benchmark", key)
					continue
				}
				if g.allocs != 0 {
					t.Errorf("%s: the generated minimizer allocates %g times per solve", key, g.allocs)
				}
				row := []string{p.name, d, src, f0(g.ns), f0(g.bytes), f0(g.allocs), calls(g)}
				if o := res[key+"/gonum"]; o != nil {
					row = append(row, f0(o.ns), calls(o), ratio(o.ns, g.ns))
				} else {
					row = append(row, "", "", "")
				}
				if fl := res[key+"/floor"]; fl != nil {
					row = append(row, ratio(g.ns, fl.ns))
				} else {
					row = append(row, "")
				}
				if h := res[key+"/hand"]; h != nil {
					if h.evals != g.evals {
						t.Logf("%s: the hand loop made %g calls, the generated minimizer %g", key, h.evals, g.evals)
					}
					row = append(row, ratio(h.ns, g.ns))
				} else {
					row = append(row, "")
				}
				fmt.Fprintf(&b, "| %s |\n", strings.Join(row, " | "))
			}
		}
	}
	if *counts != "" {
		b.WriteString(instructionTable(t, dir, strings.Split(*counts, ",")))
	}
	t.Log("\n" + b.String())
	fmt.Print(b.String())
}

// onlyBenchmark is the -test.bench pattern that selects the one
// sub-benchmark name of BenchmarkSolve: go test splits a pattern at its
// slashes and matches each level on its own, unanchored, so every level
// is anchored here (otherwise "bfgs" also runs lbfgs, "analytic" also
// analytic32, and "ExtRosen10" also ExtRosen100).
func onlyBenchmark(name string) string {
	levels := []string{"^BenchmarkSolve$"}
	for _, level := range strings.Split(name, "/") {
		levels = append(levels, "^"+regexp.QuoteMeta(level)+"$")
	}
	return strings.Join(levels, "/")
}

// benchmarksRun lists the benchmarks a go test -bench output reports.
func benchmarksRun(out []byte) []string {
	var ran []string
	for _, line := range strings.Split(string(out), "\n") {
		if name, _, ok := strings.Cut(line, "\t"); ok && strings.HasPrefix(name, "BenchmarkSolve/") {
			ran = append(ran, strings.TrimSpace(name))
		}
	}
	return ran
}

// instructionTable counts, with valgrind's callgrind, the instructions of
// one solve (thalweg) and of its floor for each key: each benchmark runs
// at -benchtime 1x and at k+1 times (k from a first estimate at 11x, see
// perSolve), and the difference over k is per solve, free of the
// process's setup and of timing noise.
func instructionTable(t *testing.T, dir string, keys []string) string {
	bin := filepath.Join(dir, "bench.test")
	build := exec.Command("go", "test", "-c", "-o", bin, ".")
	build.Dir = dir
	build.Env = append(os.Environ(), "GOFLAGS=-mod=mod", "GOWORK=off")
	if out, err := build.CombinedOutput(); err != nil {
		t.Fatalf("go test -c: %v\n%s", err, out)
	}
	count := func(bench string, times int) float64 {
		file := filepath.Join(dir, "callgrind.out")
		cmd := exec.Command("valgrind", "--tool=callgrind", "--callgrind-out-file="+file, bin,
			"-test.run=^$", "-test.bench="+onlyBenchmark(bench), "-test.benchtime="+strconv.Itoa(times)+"x")
		// Go's preemption signals trip callgrind's signal bookkeeping
		cmd.Env = append(os.Environ(), "GODEBUG=asyncpreemptoff=1", "GOMAXPROCS=1")
		out, err := cmd.CombinedOutput()
		if err != nil {
			t.Fatalf("callgrind on %s: %v\n%s", bench, err, out)
		}
		if ran := benchmarksRun(out); len(ran) != 1 {
			t.Fatalf("callgrind on %s: the pattern ran %d benchmarks, want 1: %v", bench, len(ran), ran)
		}
		data, err := os.ReadFile(file)
		if err != nil {
			t.Fatal(err)
		}
		for _, line := range strings.Split(string(data), "\n") {
			if v, ok := strings.CutPrefix(line, "summary: "); ok {
				n, _ := strconv.ParseFloat(strings.Fields(v)[0], 64)
				return n
			}
		}
		t.Fatalf("callgrind on %s: no summary", bench)
		return 0
	}
	// The process's own work (the benchmark framework, the runtime's
	// background) adds a few hundred thousand instructions that vary from
	// run to run; the difference is taken over enough solves, at least 40
	// and about 2·10⁸ instructions, that this stays below 0.2 %.
	perSolve := func(bench string) float64 {
		once := count(bench, 1)
		estimate := (count(bench, 11) - once) / 10
		solves := 40
		if estimate > 0 {
			solves = max(40, min(100000, int(2e8/estimate)))
		}
		return (count(bench, solves+1) - once) / float64(solves)
	}
	var b strings.Builder
	b.WriteString("\nInstructions per solve (valgrind --tool=callgrind, the difference between 1 solve and enough more for about 2·10⁸ instructions, at least 40, per solve; for steepest also the hand-written loop):\n\n| benchmark | thalweg | floor | thalweg / floor | hand | hand / thalweg |\n|---|---:|---:|---:|---:|---:|\n")
	for _, key := range keys {
		g, f := perSolve(key+"/thalweg"), perSolve(key+"/floor")
		row := fmt.Sprintf("| %s | %.0f | %.0f | %.2f |", key, g, f, g/f)
		if strings.Contains(key, "/steepest/") {
			h := perSolve(key + "/hand")
			row += fmt.Sprintf(" %.0f | %.2f |", h, h/g)
		} else {
			row += "  |  |"
		}
		b.WriteString(row + "\n")
	}
	return b.String()
}

func sources(p problem) []string {
	s := []string{"analytic"}
	if p.central {
		s = append(s, "central")
	}
	if p.single {
		s = append(s, "analytic32")
	}
	return s
}

func f0(v float64) string { return strconv.FormatFloat(v, 'f', 0, 64) }

func ratio(a, b float64) string {
	if b == 0 {
		return ""
	}
	return strconv.FormatFloat(a/b, 'f', 2, 64)
}

// calls is a run's calls, marked † when it did not converge.
func calls(r *result) string {
	s := f0(r.evals)
	if r.grads > 0 {
		s = fmt.Sprintf("%.0f (%.0f)", r.evals, r.grads)
	}
	if !r.converged {
		s += " †"
	}
	return s
}

// result is one benchmark's line.
type result struct {
	ns, bytes, allocs, evals, grads float64
	converged                       bool
}

// parse reads go test -bench's lines: BenchmarkSolve/KEY-P n v unit ….
func parse(out []byte) map[string]*result {
	got := map[string]*result{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Fields(sc.Text())
		if len(f) < 4 || !strings.HasPrefix(f[0], "BenchmarkSolve/") {
			continue
		}
		name := strings.TrimPrefix(f[0], "BenchmarkSolve/")
		if i := strings.LastIndexByte(name, '-'); i > 0 {
			name = name[:i]
		}
		r := &result{}
		for k := 2; k+1 < len(f); k += 2 {
			v, err := strconv.ParseFloat(f[k], 64)
			if err != nil {
				continue
			}
			switch f[k+1] {
			case "ns/op":
				r.ns = v
			case "B/op":
				r.bytes = v
			case "allocs/op":
				r.allocs = v
			case "calls/op":
				r.evals = v
			case "gradients/op":
				r.grads = v
			case "converged":
				r.converged = v == 1
			}
		}
		got[name] = r
	}
	return got
}

// problemsSource renders the objectives and their gradients, in float64
// and (for some) float32, each counting its calls.
func problemsSource() string {
	var b strings.Builder
	b.WriteString(`package bench

import "math"

// Calls counts objective and gradient calls, for the floor.
var Calls struct{ F, G int }

func Well1(x float64) float64 {
	Calls.F++
	return math.Cosh(x-1) + 0.5*(x-1)*(x-1)
}

func Well1Grad(x float64) float64 {
	Calls.G++
	return math.Sinh(x-1) + (x - 1)
}
`)
	for _, elem := range []string{"float64", "float32"} {
		suffix := map[string]string{"float64": "", "float32": "32"}[elem]
		fmt.Fprintf(&b, `
func Rosen2%[2]s(x *[2]%[1]s) %[1]s {
	Calls.F++
	a, c := 1-x[0], x[1]-x[0]*x[0]
	return a*a + 100*c*c
}

func Rosen2%[2]sGrad(x, g *[2]%[1]s) {
	Calls.G++
	c := x[1] - x[0]*x[0]
	g[0] = -2*(1-x[0]) - 400*x[0]*c
	g[1] = 200 * c
}
`, elem, suffix)
		for _, n := range []int{10, 100} {
			fmt.Fprintf(&b, `
// ExtRosen%[3]d%[2]s is MGH (21): Σ 100(x₂ᵢ − x₂ᵢ₋₁²)² + (1 − x₂ᵢ₋₁)².
func ExtRosen%[3]d%[2]s(x *[%[3]d]%[1]s) %[1]s {
	Calls.F++
	var f %[1]s
	for i := 0; i < %[3]d; i += 2 {
		a, c := x[i+1]-x[i]*x[i], 1-x[i]
		f += 100*a*a + c*c
	}
	return f
}

func ExtRosen%[3]d%[2]sGrad(x, g *[%[3]d]%[1]s) {
	Calls.G++
	for i := 0; i < %[3]d; i += 2 {
		a, c := x[i+1]-x[i]*x[i], 1-x[i]
		g[i] = -400*x[i]*a - 2*c
		g[i+1] = 200 * a
	}
}
`, elem, suffix, n)
		}
	}
	for _, p := range problems() {
		if !strings.HasPrefix(p.name, "VarDim") {
			continue
		}
		fmt.Fprintf(&b, `
// VarDim%[1]d is MGH (25): Σ(xⱼ − 1)² + s² + s⁴, s = Σ j(xⱼ − 1).
func VarDim%[1]d(x *[%[1]d]float64) float64 {
	Calls.F++
	var f, s float64
	for j := range x {
		d := x[j] - 1
		f += d * d
		s += float64(j+1) * d
	}
	return f + s*s + s*s*s*s
}

func VarDim%[1]dGrad(x, g *[%[1]d]float64) {
	Calls.G++
	var s float64
	for j := range x {
		s += float64(j+1) * (x[j] - 1)
	}
	c := 2*s + 4*s*s*s
	for j := range x {
		g[j] = 2*(x[j]-1) + float64(j+1)*c
	}
}
`, p.n)
	}
	return b.String()
}

// objective is a problem's Go names in one float type.
func objective(p problem, src string) (name, grad string) {
	name = p.name
	if src == "analytic32" {
		name += "32"
	}
	return name, name + "Grad"
}

func minimizerName(p problem, d, src string) string {
	return p.name + strings.ToUpper(d[:1]) + d[1:] + strings.ToUpper(src[:1]) + src[1:]
}

func specSource() string {
	var b strings.Builder
	for _, p := range problems() {
		for _, src := range sources(p) {
			for _, d := range directions {
				name, grad := objective(p, src)
				fmt.Fprintf(&b, "[[minimizer]]\nname = %q\nobjective = %q\ndirection = %q\n", minimizerName(p, d, src), name, d)
				if src == "central" {
					b.WriteString("derivative = \"central\"\n")
				} else {
					fmt.Fprintf(&b, "derivative = \"analytic\"\ngradient = %q\n", grad)
				}
				start := make([]string, len(p.start))
				for i, v := range p.start {
					start[i] = strconv.FormatFloat(v, 'f', -1, 64)
					if !strings.ContainsAny(start[i], ".e") {
						start[i] += ".0"
					}
				}
				if p.n == 1 {
					fmt.Fprintf(&b, "start = %s\n\n", start[0])
				} else {
					fmt.Fprintf(&b, "start = [%s]\n\n", strings.Join(start, ", "))
				}
			}
		}
	}
	return b.String()
}

// bfgsArithmeticSource renders, per dimension of the problems, the
// floor's share of a BFGS iteration: the inverse-Hessian product and the
// rank-two update, 3N² multiply-adds (N&W 2006, eq. 6.17), on arrays of
// that dimension so that the compiler knows every bound (no bounds checks,
// as in the generated code) and the floor is as low as plain Go makes it.
func bfgsArithmeticSource() string {
	var b strings.Builder
	seen := map[int]bool{}
	for _, p := range problems() {
		if seen[p.n] {
			continue
		}
		seen[p.n] = true
		fmt.Fprintf(&b, `func bfgsArithmetic%[1]d(h *[%[1]d][%[1]d]float64, y *[%[1]d]float64) {
	for i := range h {
		var s float64
		for j := range y {
			s += h[i][j] * y[j]
		}
		for j := range y {
			h[i][j] += 1e-300*s*y[j] + 1e-300*y[i]*y[j]
		}
	}
}

`, p.n)
	}
	return b.String()
}

// benchSource renders BenchmarkSolve: per problem, source and direction,
// the generated minimizer (thalweg), gonum's method of that direction
// with the same objective and gradient (gonum; for central differences
// gonum's fd.Gradient with its central formula), the floor (the same
// numbers of objective and gradient calls the generated solve made, and
// for bfgs its iterations' N² update arithmetic) and, for steepest, the
// hand-written loop (hand).
func benchSource() string {
	var b strings.Builder
	b.WriteString(`package bench

import (
	"math"
	"testing"

	"gonum.org/v1/gonum/diff/fd"
	"gonum.org/v1/gonum/optimize"
)

var sink float64

`)
	b.WriteString(bfgsArithmeticSource())
	b.WriteString("func BenchmarkSolve(b *testing.B) {\n")
	for _, p := range problems() {
		for _, src := range sources(p) {
			name, grad := objective(p, src)
			elem := "float64"
			if src == "analytic32" {
				elem = "float32"
			}
			for _, d := range directions {
				m := minimizerName(p, d, src)
				key := p.name + "/" + d + "/" + src
				start := make([]string, len(p.start))
				for i, v := range p.start {
					start[i] = strconv.FormatFloat(v, 'f', -1, 64)
					if !strings.ContainsAny(start[i], ".e") {
						start[i] += ".0"
					}
				}
				x0 := fmt.Sprintf("[%d]%s{%s}", p.n, elem, strings.Join(start, ", "))
				call := m + "(x0)"
				if p.n == 1 {
					x0 = start[0]
				}
				fmt.Fprintf(&b, "\t{\n\t\tx0 := %s\n", x0)
				// one counted run for the floor and the metrics
				fmt.Fprintf(&b, "\t\tCalls.F, Calls.G = 0, 0\n\t\tr := %s\n\t\tnf, ng, iterations := Calls.F, Calls.G, r.Iterations\n\t\tconverged := 0.0\n\t\tif r.Status.Converged() {\n\t\t\tconverged = 1\n\t\t}\n", call)
				fmt.Fprintf(&b, "\t\tb.Run(%q, func(b *testing.B) {\n\t\t\tb.ReportAllocs()\n\t\t\tfor b.Loop() {\n\t\t\t\tr = %s\n\t\t\t}\n\t\t\tb.ReportMetric(float64(nf), \"calls/op\")\n\t\t\tb.ReportMetric(float64(ng), \"gradients/op\")\n\t\t\tb.ReportMetric(converged, \"converged\")\n\t\t})\n", key+"/thalweg", call)
				// the floor
				fmt.Fprintf(&b, "\t\tb.Run(%q, func(b *testing.B) {\n", key+"/floor")
				if p.n == 1 {
					fmt.Fprintf(&b, "\t\t\tx := x0\n\t\t\tfor b.Loop() {\n\t\t\t\tfor k := 0; k < nf; k++ {\n\t\t\t\t\tsink += float64(%s(x))\n\t\t\t\t}\n\t\t\t\tfor k := 0; k < ng; k++ {\n\t\t\t\t\tsink += float64(%s(x))\n\t\t\t\t}\n\t\t\t}\n", name, grad)
				} else {
					fmt.Fprintf(&b, "\t\t\tx := x0\n\t\t\tvar g [%d]%s\n\t\t\tvar h [%d][%d]float64\n\t\t\tvar y [%d]float64\n\t\t\tfor b.Loop() {\n\t\t\t\tfor k := 0; k < nf; k++ {\n\t\t\t\t\tsink += float64(%s(&x))\n\t\t\t\t}\n\t\t\t\tfor k := 0; k < ng; k++ {\n\t\t\t\t\t%s(&x, &g)\n\t\t\t\t}\n", p.n, elem, p.n, p.n, p.n, name, grad)
					if d == "bfgs" {
						fmt.Fprintf(&b, "\t\t\t\tfor k := 0; k < iterations; k++ {\n\t\t\t\t\tbfgsArithmetic%d(&h, &y)\n\t\t\t\t}\n", p.n)
					}
					b.WriteString("\t\t\t}\n\t\t\tsink += float64(g[0]) + h[0][0] + y[0]\n")
				}
				b.WriteString("\t\t\t_ = iterations\n\t\t})\n")
				// gonum, float64 only
				if elem == "float64" {
					var fn, gr string
					if p.n == 1 {
						fn = fmt.Sprintf("func(x []float64) float64 { return %s(x[0]) }", name)
						gr = fmt.Sprintf("func(g, x []float64) { g[0] = %s(x[0]) }", grad)
					} else {
						fn = fmt.Sprintf("func(x []float64) float64 { return %s((*[%d]float64)(x)) }", name, p.n)
						gr = fmt.Sprintf("func(g, x []float64) { %s((*[%d]float64)(x), (*[%d]float64)(g)) }", grad, p.n, p.n)
					}
					if src == "central" {
						gr = "func(g, x []float64) { fd.Gradient(g, fn, x, &fd.Settings{Formula: fd.Central}) }"
					}
					fmt.Fprintf(&b, "\t\tb.Run(%q, func(b *testing.B) {\n\t\t\tb.ReportAllocs()\n\t\t\tfn := %s\n\t\t\tproblem := optimize.Problem{Func: fn, Grad: %s}\n\t\t\tstart := make([]float64, %d)\n\t\t\tvar evaluations, gradients int\n\t\t\tfor b.Loop() {\n", key+"/gonum", fn, gr, p.n)
					if p.n == 1 {
						b.WriteString("\t\t\t\tstart[0] = x0\n")
					} else {
						b.WriteString("\t\t\t\tcopy(start, x0[:])\n")
					}
					fmt.Fprintf(&b, "\t\t\t\tres, err := optimize.Minimize(problem, start, nil, &optimize.%s{})\n\t\t\t\tconverged = 0\n\t\t\t\tif err == nil && res.Status == optimize.GradientThreshold {\n\t\t\t\t\tconverged = 1\n\t\t\t\t}\n\t\t\t\tevaluations, gradients = res.FuncEvaluations, res.GradEvaluations\n\t\t\t}\n\t\t\tb.ReportMetric(converged, \"converged\")\n", gonumMethod[d])
					if src == "central" {
						fmt.Fprintf(&b, "\t\t\tevaluations += %d * gradients\n\t\t\tgradients = 0\n", 2*p.n)
					}
					b.WriteString("\t\t\tb.ReportMetric(float64(evaluations), \"calls/op\")\n\t\t\tb.ReportMetric(float64(gradients), \"gradients/op\")\n\t\t})\n")
				}
				if d == "steepest" && src == "analytic" && p.n > 1 {
					fmt.Fprintf(&b, "\t\tb.Run(%q, func(b *testing.B) {\n\t\t\tvar calls int\n\t\t\tfor b.Loop() {\n\t\t\t\t_, calls = handSteepest%s(x0)\n\t\t\t}\n\t\t\tb.ReportMetric(float64(calls), \"calls/op\")\n\t\t})\n", key+"/hand", p.name)
				}
				b.WriteString("\t}\n")
			}
		}
	}
	b.WriteString("}\n")
	b.WriteString(handSource())
	return b.String()
}

// handSource renders the hand-written steepest descent with Armijo
// backtracking per size, with the generated minimizer's rules: the first
// trial step 1 at the first iteration and α₋₁(g₋₁ᵀd₋₁)/(gᵀd) after (N&W
// eq. 3.60), halving, c1 = 1e-4, at most 48 trials, and its stop tests:
// the relative gradient measure max|gᵢ|·max(|xᵢ|, 1)/max(|f|, 1) ≤ 1e-8,
// or a step with every |Δxᵢ| ≤ 1e-14(|xᵢ| + 1).
func handSource() string {
	var b strings.Builder
	for _, p := range problems() {
		if p.n == 1 {
			continue
		}
		grad := p.name + "Grad"
		fmt.Fprintf(&b, `
func handSteepest%[2]s(x [%[1]d]float64) ([%[1]d]float64, int) {
	f := %[2]s(&x)
	calls := 1
	var g, d, xt [%[1]d]float64
	%[3]s(&x, &g)
	prevStep, prevSlope := 0.0, 0.0
	for iter := 0; iter < 20000 && calls < 200000; iter++ {
		measure, slope := 0.0, 0.0
		for i := range g {
			measure = math.Max(measure, math.Abs(g[i])*math.Max(math.Abs(x[i]), 1))
			d[i] = -g[i]
			slope += g[i] * d[i]
		}
		if measure/math.Max(math.Abs(f), 1) <= 1e-8 {
			break
		}
		t := 1.0
		if iter > 0 {
			t = prevStep * prevSlope / slope
		}
		accepted := false
		var ft float64
		for trial := 0; trial < 48; trial++ {
			for i := range x {
				xt[i] = x[i] + t*d[i]
			}
			ft = %[2]s(&xt)
			calls++
			if ft <= f+1e-4*t*slope {
				accepted = true
				break
			}
			t *= 0.5
		}
		if !accepted {
			break
		}
		small := true
		for i := range x {
			if math.Abs(xt[i]-x[i]) > 1e-14*(math.Abs(x[i])+1) {
				small = false
			}
		}
		x, f = xt, ft
		%[3]s(&x, &g)
		prevStep, prevSlope = t, slope
		if small {
			break
		}
	}
	return x, calls
}
`, p.n, p.name, grad)
	}
	return b.String()
}

// The instruction counts once ran every benchmark whose levels contained
// the key's (lbfgs for bfgs, analytic32 for analytic): each level of the
// pattern must match its own level exactly.
func TestOnlyBenchmarkAnchorsEveryLevel(t *testing.T) {
	pattern := strings.Split(onlyBenchmark("ExtRosen10/bfgs/analytic/thalweg"), "/")
	matches := func(name string) bool {
		levels := append([]string{"BenchmarkSolve"}, strings.Split(name, "/")...)
		if len(levels) != len(pattern) {
			return false
		}
		for i, level := range levels {
			if !regexp.MustCompile(pattern[i]).MatchString(level) {
				return false
			}
		}
		return true
	}
	if !matches("ExtRosen10/bfgs/analytic/thalweg") {
		t.Errorf("%v does not select its own benchmark", pattern)
	}
	for _, other := range []string{"ExtRosen10/lbfgs/analytic/thalweg", "ExtRosen10/bfgs/analytic32/thalweg", "ExtRosen100/bfgs/analytic/thalweg", "ExtRosen10/bfgs/analytic/floor"} {
		if matches(other) {
			t.Errorf("%v also selects %s", pattern, other)
		}
	}
}
