// Package leastsquares checks thalweg's least-squares directions on the
// least-squares problems of Moré, Garbow & Hillstrom (ACM TOMS
// 7(1):17–41, 1981; MGH below) in residual form (./problems): for each,
// it generates levenberg-marquardt (a residual objective's default),
// gauss-newton (with its default, Armijo) and bfgs (with its default,
// Wolfe) on the same residual objective with central differences of the
// residuals, in a temporary module, runs them from MGH's standard start
// and holds them to the published minima; testdata/results.md is the
// table, rewritten with -update and otherwise compared on the platform
// it was recorded on.
package leastsquares

import (
	"bufio"
	"bytes"
	"flag"
	"fmt"
	"maps"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/optimize/functions"

	"github.com/thalweg-go/thalweg/checks/internal/results"
	"github.com/thalweg-go/thalweg/checks/internal/tempmodule"
	"github.com/thalweg-go/thalweg/checks/leastsquares/problems"
)

var update = flag.Bool("update", false, "rewrite testdata/results.md")

// problem is one MGH least-squares problem.
type problem struct {
	name      string
	mgh       int // MGH's number
	n, m      int
	start     []float64
	residuals func(x []float64) []float64
	gonum     interface{ Func([]float64) float64 } // nil where gonum does not record it
	minima    []float64                            // published minima of Σrᵢ²
	source    string
}

// residualsOf adapts a fixed-size residual function to slices.
func residualsOf[X, R any](f func(*X, *R), x2a func([]float64) X, r2s func(*R) []float64) func([]float64) []float64 {
	return func(x []float64) []float64 {
		a := x2a(x)
		var r R
		f(&a, &r)
		return r2s(&r)
	}
}

func a2(x []float64) (a [2]float64) { copy(a[:], x); return }
func a3(x []float64) (a [3]float64) { copy(a[:], x); return }
func a4(x []float64) (a [4]float64) { copy(a[:], x); return }
func a5(x []float64) (a [5]float64) { copy(a[:], x); return }
func a6(x []float64) (a [6]float64) { copy(a[:], x); return }

const gonumMinima = "gonum optimize/functions Minima"
const mghMemory = "MGH 1981 (from memory)"

var all = []problem{
	{"Rosenbrock", 1, 2, 2, []float64{-1.2, 1}, residualsOf(problems.Rosenbrock, a2, func(r *[2]float64) []float64 { return r[:] }), functions.ExtendedRosenbrock{}, []float64{0}, gonumMinima},
	{"Beale", 5, 2, 3, []float64{1, 1}, residualsOf(problems.Beale, a2, func(r *[3]float64) []float64 { return r[:] }), functions.Beale{}, []float64{0}, gonumMinima},
	{"HelicalValley", 7, 3, 3, []float64{-1, 0, 0}, residualsOf(problems.HelicalValley, a3, func(r *[3]float64) []float64 { return r[:] }), functions.HelicalValley{}, []float64{0}, gonumMinima},
	{"Bard", 8, 3, 15, []float64{1, 1, 1}, residualsOf(problems.Bard, a3, func(r *[15]float64) []float64 { return r[:] }), nil, []float64{8.21487e-3}, mghMemory},
	{"Gaussian", 9, 3, 15, []float64{0.4, 1, 0}, residualsOf(problems.Gaussian, a3, func(r *[15]float64) []float64 { return r[:] }), functions.Gaussian{}, []float64{1.12793276961912e-08}, gonumMinima},
	{"Meyer", 10, 3, 16, []float64{0.02, 4000, 250}, residualsOf(problems.Meyer, a3, func(r *[16]float64) []float64 { return r[:] }), nil, []float64{87.9458}, mghMemory},
	{"Box3D", 12, 3, 10, []float64{0, 10, 20}, residualsOf(problems.Box3D, a3, func(r *[10]float64) []float64 { return r[:] }), functions.Box3D{}, []float64{0}, gonumMinima},
	{"PowellSingular", 13, 4, 4, []float64{3, -1, 0, 1}, residualsOf(problems.PowellSingular, a4, func(r *[4]float64) []float64 { return r[:] }), functions.ExtendedPowellSingular{}, []float64{0}, gonumMinima},
	{"Wood", 14, 4, 6, []float64{-3, -1, -3, -1}, residualsOf(problems.Wood, a4, func(r *[6]float64) []float64 { return r[:] }), functions.Wood{}, []float64{0}, gonumMinima},
	{"BrownDennis", 16, 4, 20, []float64{25, 5, -5, -1}, residualsOf(problems.BrownDennis, a4, func(r *[20]float64) []float64 { return r[:] }), functions.BrownAndDennis{}, []float64{85822.20162635634}, gonumMinima},
	{"Osborne1", 17, 5, 33, []float64{0.5, 1.5, -1, 0.01, 0.02}, residualsOf(problems.Osborne1, a5, func(r *[33]float64) []float64 { return r[:] }), nil, []float64{5.46489e-5}, mghMemory},
	{"BiggsEXP6", 18, 6, 13, []float64{1, 2, 1, 1, 1, 1}, residualsOf(problems.BiggsEXP6, a6, func(r *[13]float64) []float64 { return r[:] }), functions.BiggsEXP6{}, []float64{0, 0.005655649925499929}, gonumMinima},
}

// slowerThanBFGS are the problems where levenberg-marquardt needs more
// residual calls than bfgs, with the measured cause. Each must still
// reach the published minimum, and the test fails should one of them turn
// faster (the list would then be stale). None since levenberg-marquardt
// keeps the structured secant model of Dennis, Gay & Welsch (templates'
// structuredModel): before it, Wood needed 413 calls against bfgs's 373
// (the Gauss–Newton model misses r₁'s curvature on Wood's plateau) and
// Brown–Dennis 3662 against 331 (large residuals); now 370 and 222.
var slowerThanBFGS = map[string]string{}

// slowerThanBFGSOnF are the problems where levenberg-marquardt needs more
// residual calls than the MGH check's bfgs on f with calibrated central
// differences of f, with the cause; the test fails should that change.
// None: Brown–Dennis, listed here with 3662 calls against 427 before the
// structured model, now needs 222.
var slowerThanBFGSOnF = map[string]string{}

// listed names the problems of an exception list with their cause, for
// the table's text ("" when there are none).
func listed(exceptions map[string]string) string {
	if len(exceptions) == 0 {
		return ""
	}
	var parts []string
	for _, name := range slices.Sorted(maps.Keys(exceptions)) {
		parts = append(parts, name+": "+exceptions[name])
	}
	return " but " + strings.Join(parts, "; ")
}

// directions are the policies compared, each at its defaults.
var directions = []struct{ suffix, key string }{
	{"LM", "levenberg-marquardt"},
	{"GN", "gauss-newton"},
	{"BFGS", "bfgs"},
}

// The residuals are gonum's functions: Σrᵢ² equals gonum's Func at the
// start and at three nearby points, within 1e-12 relative.
func TestResidualsAreGonums(t *testing.T) {
	for _, p := range all {
		if p.gonum == nil {
			continue
		}
		for k := 0; k < 4; k++ {
			x := append([]float64(nil), p.start...)
			for i := range x {
				x[i] += 0.1 * float64(k) * float64(i+1)
			}
			var sum float64
			for _, ri := range p.residuals(x) {
				sum += ri * ri
			}
			want := p.gonum.Func(x)
			if math.Abs(sum-want) > 1e-12*math.Max(1, math.Abs(want)) {
				t.Errorf("%s at %v: Σr² = %.17g, gonum's Func %.17g", p.name, x, sum, want)
			}
		}
	}
}

func specText() []byte {
	var b bytes.Buffer
	b.WriteString("# The MGH least-squares problems of ./problems, each with levenberg-marquardt,\n# gauss-newton and bfgs at their defaults, central differences of the residuals.\n")
	for _, p := range all {
		items := make([]string, len(p.start))
		for i, v := range p.start {
			items[i] = strconv.FormatFloat(v, 'f', -1, 64)
			if !strings.ContainsAny(items[i], ".e") {
				items[i] += ".0"
			}
		}
		for _, d := range directions {
			fmt.Fprintf(&b, "\n[[minimizer]]\nname = %q\nobjective = %q\ndirection = %q\nstart = [%s]\n", p.name+d.suffix, p.name, d.key, strings.Join(items, ", "))
		}
	}
	return b.Bytes()
}

func driverText() []byte {
	var b bytes.Buffer
	b.WriteString("package problems\n\nimport (\n\t\"fmt\"\n\t\"testing\"\n)\n\nfunc TestDrive(t *testing.T) {\n")
	for _, p := range all {
		items := make([]string, len(p.start))
		for i, v := range p.start {
			items[i] = strconv.FormatFloat(v, 'g', -1, 64)
		}
		for _, d := range directions {
			fmt.Fprintf(&b, "\t{\n\t\tr := %s%s([%d]float64{%s})\n\t\tfmt.Printf(\"fit\\t%s\\t%s\\t%%v\\t%%v\\t%%d\\t%%d\\t%%.17g\\n\", r.Status, r.Status.Converged(), r.Iterations, r.Evaluations, 2*r.F)\n\t}\n",
				p.name, d.suffix, p.n, strings.Join(items, ", "), p.name, d.suffix)
		}
	}
	b.WriteString("}\n")
	return b.Bytes()
}

type run struct {
	status     string
	converged  bool
	iterations int
	calls      int
	sum        float64 // Σrᵢ² at the end
}

// TestPublishedMinima generates and runs the minimizers and holds each
// to its problem's published minimum: levenberg-marquardt on every
// problem, and each direction that converges; levenberg-marquardt needs
// fewer residual calls than bfgs wherever bfgs reaches the minimum, but
// on the problems slowerThanBFGS lists with their cause.
func TestPublishedMinima(t *testing.T) {
	if testing.Short() {
		t.Skip("generates and runs 36 minimizers")
	}
	src, err := os.ReadFile(filepath.Join("problems", "problems.go"))
	if err != nil {
		t.Fatal(err)
	}
	out := tempmodule.GenerateAndTest(t, map[string][]byte{
		"go.mod":        []byte("module example.com/lsq\n\ngo 1.26\n"),
		"problems.go":   src,
		"lsq.toml":      specText(),
		"drive_test.go": driverText(),
	}, "lsq.toml", "-run", "TestDrive")
	runs := map[string]run{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Split(sc.Text(), "\t")
		if len(f) != 8 || f[0] != "fit" {
			continue
		}
		var r run
		r.status, r.converged = f[3], f[4] == "true"
		r.iterations, _ = strconv.Atoi(f[5])
		r.calls, _ = strconv.Atoi(f[6])
		r.sum, _ = strconv.ParseFloat(f[7], 64)
		runs[f[1]+f[2]] = r
	}
	if len(runs) != len(all)*len(directions) {
		t.Fatalf("the driver reported %d runs, want %d:\n%s", len(runs), len(all)*len(directions), out)
	}
	reached := func(p problem, r run) bool {
		for _, best := range p.minima {
			if math.Abs(r.sum-best) <= 1e-5*best+1e-10 {
				return true
			}
		}
		return false
	}
	var table bytes.Buffer
	table.WriteString("# MGH least-squares problems: levenberg-marquardt, gauss-newton and bfgs on the same residual objective\n\n")
	table.WriteString("Written by `go test ./leastsquares -update` (checks module). Each problem of Moré, Garbow & Hillstrom (ACM TOMS 7(1):17–41, 1981) in residual form, from MGH's standard start, every direction at its defaults (levenberg-marquardt with damping, gauss-newton with Armijo, bfgs with Wolfe) and the Jacobian by central differences of the residuals, so every column counts the same residual calls. A run reaches the published minimum when Σrᵢ² is within 1e-5 relative (plus 1e-10) of one of the minima listed; a cell with a status or another minimum did not.\n\n")
	fmt.Fprintf(&table, "Recorded on %s.\n\n", results.Recorded)
	onF := bfgsOnF(t)
	table.WriteString("| problem | MGH | n | m | published Σr² (source) | levenberg-marquardt calls | gauss-newton calls | bfgs calls | bfgs / levenberg-marquardt | bfgs on f, central differences of f (checks/mgh) |\n|---|---:|---:|---:|---|---:|---:|---:|---:|---:|\n")
	cell := func(p problem, r run) string {
		switch {
		case r.converged && reached(p, r):
			return strconv.Itoa(r.calls)
		case r.converged:
			return fmt.Sprintf("%d (other minimum, Σr² %.6g)", r.calls, r.sum)
		}
		return fmt.Sprintf("%s (%d)", r.status, r.calls)
	}
	for _, p := range all {
		lm, gn, bfgs := runs[p.name+"LM"], runs[p.name+"GN"], runs[p.name+"BFGS"]
		if !lm.converged || !reached(p, lm) {
			t.Errorf("%s: levenberg-marquardt %s after %d calls at Σr² = %g, published %v (%s)", p.name, lm.status, lm.calls, lm.sum, p.minima, p.source)
		}
		for _, d := range directions[1:] {
			if r := runs[p.name+d.suffix]; r.converged && !reached(p, r) && r.sum < p.minima[0] {
				t.Errorf("%s: %s converged at Σr² = %g, below the published minimum %v", p.name, d.key, r.sum, p.minima)
			}
		}
		faster := lm.calls < bfgs.calls
		if why, known := slowerThanBFGS[p.name]; known && bfgs.converged && reached(p, bfgs) && faster {
			t.Errorf("%s: levenberg-marquardt now needs fewer calls than bfgs (%d < %d); drop it from slowerThanBFGS (%s)", p.name, lm.calls, bfgs.calls, why)
		} else if !known && bfgs.converged && reached(p, bfgs) && !faster {
			t.Errorf("%s: levenberg-marquardt needs %d calls, bfgs %d", p.name, lm.calls, bfgs.calls)
		}
		ratio := "—"
		if bfgs.converged && reached(p, bfgs) {
			ratio = fmt.Sprintf("%.1f×", float64(bfgs.calls)/float64(lm.calls))
		}
		minima := make([]string, len(p.minima))
		for i, v := range p.minima {
			minima[i] = strconv.FormatFloat(v, 'g', 6, 64)
		}
		other := "—"
		if v, ok := onF[p.mgh]; ok {
			other = fmt.Sprintf("%d (%s)", v.calls, v.status)
			_, known := slowerThanBFGSOnF[p.name]
			if v.status == "gradient small" && known == (lm.calls < v.calls) {
				t.Errorf("%s: levenberg-marquardt %d calls, bfgs on f %d; slowerThanBFGSOnF lists it: %v", p.name, lm.calls, v.calls, known)
			}
		}
		fmt.Fprintf(&table, "| %s | %d | %d | %d | %s (%s) | %s | %s | %s | %s | %s |\n", p.name, p.mgh, p.n, p.m, strings.Join(minima, " or "), p.source, cell(p, lm), cell(p, gn), cell(p, bfgs), ratio, other)
	}
	table.WriteString("\nThe last column is bfgs with Wolfe on the same problems written as f (gonum's functions) with calibrated central differences of f, from ../mgh/testdata/results.md: \"evaluations (status)\"; levenberg-marquardt needs fewer calls than it on every problem both tables hold" + listed(slowerThanBFGSOnF) + ".\n")
	table.WriteString("\nlevenberg-marquardt needs fewer calls than bfgs on the same residual objective on every problem where bfgs reaches a published minimum" + listed(slowerThanBFGS) + ". It solves with the Gauss–Newton model JᵀJ or, where that predicted the last step worse, with JᵀJ + S, S a secant estimate of the residuals' curvature Σrᵢ∇²rᵢ (Dennis, Gay & Welsch 1981): on the large-residual Brown–Dennis (Σr² = 85822 at the minimizer) Gauss–Newton's model alone needed 3662 calls. gauss-newton, which keeps JᵀJ only, stalls there; Meyer, where bfgs stalls, both least-squares directions solve.\n")
	results.Compare(t, filepath.Join("testdata", "results.md"), table.Bytes(), *update, "go test ./leastsquares -update")
}

// fRun is one bfgs run of the MGH check on f.
type fRun struct {
	calls  int
	status string
}

// bfgsOnF reads, from the MGH check's committed table, bfgs's evaluations
// with central differences on each problem written as f, by MGH number.
func bfgsOnF(t *testing.T) map[int]fRun {
	data, err := os.ReadFile(filepath.Join("..", "mgh", "testdata", "results.md"))
	if err != nil {
		t.Fatal(err)
	}
	row := regexp.MustCompile(`(?m)^\| \w+ \((\d+)\) \| \d+ \| bfgs \| central \| ([^|]+) \| \d+ \| (\d+) \|`)
	out := map[int]fRun{}
	for _, m := range row.FindAllStringSubmatch(string(data), -1) {
		k, _ := strconv.Atoi(m[1])
		calls, _ := strconv.Atoi(m[3])
		out[k] = fRun{calls, strings.TrimSpace(m[2])}
	}
	if len(out) == 0 {
		t.Fatal("no bfgs central rows in ../mgh/testdata/results.md; its layout changed")
	}
	return out
}
