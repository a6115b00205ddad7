// Package autodiff checks derivative = "automatic" against the gradients
// gonum.org/v1/gonum/optimize/functions v0.17.0 records for the
// Moré–Garbow–Hillstrom problems of ../mgh (J. J. Moré, B. S. Garbow and
// K. E. Hillstrom, ACM TOMS 7(1):17–41, 1981).
//
// ./objectives holds the problems as plain Go (transcribed from gonum's
// Func, their values checked equal to gonum's there). The check generates,
// into a temporary module, two bfgs minimizers of each (default rules):
// one with gonum's Grad as the analytic gradient, one with the gradient
// thalweg derives from the source, and runs there:
//
//   - the derived gradient against gonum's at MGH's start and at 10
//     deterministic pseudo-random points around it, held within 1e-13
//     (relative, see gradientAgreement);
//   - both minimizers from the start: the automatic one must end as the
//     analytic one does, at the same minimum; the table records whether
//     the counts are the same;
//   - in float32, Rosenbrock, Beale and Wood with a hand-derived float32
//     gradient against the derived one, and against central differences:
//     the derived gradient must reach the analytic one's accuracy.
//
// The table testdata/results.md is rewritten with -update and otherwise
// compared on the platform it was recorded on.
package autodiff

import (
	"bufio"
	"bytes"
	"flag"
	"fmt"
	"math"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/checks/internal/results"
	"github.com/thalweg-go/thalweg/checks/internal/tempmodule"
	"github.com/thalweg-go/thalweg/checks/mgh"
	"github.com/thalweg-go/thalweg/gen"
)

var update = flag.Bool("update", false, "rewrite testdata/results.md")

// gonumType is the gonum type whose Grad is each problem's recorded
// gradient (../mgh/problems.go pairs them the same way).
var gonumType = map[string]string{
	"Rosenbrock": "ExtendedRosenbrock", "PowellBadlyScaled": "PowellBadlyScaled", "BrownBadlyScaled": "BrownBadlyScaled",
	"Beale": "Beale", "HelicalValley": "HelicalValley", "Gaussian": "Gaussian", "GulfRD": "GulfResearchAndDevelopment",
	"Box3D": "Box3D", "PowellSingular": "ExtendedPowellSingular", "Wood": "Wood", "BrownDennis": "BrownAndDennis",
	"BiggsEXP6": "BiggsEXP6", "Watson6": "Watson", "Watson9": "Watson", "PenaltyI4": "PenaltyI", "PenaltyI10": "PenaltyI",
	"PenaltyII4": "PenaltyII", "PenaltyII10": "PenaltyII", "VariablyDimensioned10": "VariablyDimensioned", "Trigonometric10": "Trigonometric",
}

// gradientAgreement is the most the derived gradient may differ from
// gonum's in the normwise relative sense, ‖g − g_gonum‖∞/‖g_gonum‖∞: a
// component that vanishes by symmetry (Gaussian's third at MGH's start,
// 3e-20 in gonum's code) is rounding noise of the terms it sums in both
// codes, so a componentwise comparison would compare two noises. 1e-13
// is issue 11's requirement: both gradients are exact to rounding, a few
// hundred units of u = 1.1e-16 at most (common practice for comparing
// two roundings of the same sums).
const gradientAgreement = 1e-13

// single are the float32 instances: objective, its minimizer, start.
var single = []struct {
	name, gonum string
	min         []float64
	start       []float64
}{
	{"Rosenbrock32", "ExtendedRosenbrock", []float64{1, 1}, []float64{-1.2, 1}},
	{"Beale32", "Beale", []float64{3, 0.5}, []float64{1, 1}},
	{"Wood32", "Wood", []float64{1, 1, 1, 1}, []float64{-3, -1, -3, -1}},
}

func TestAutomaticAgainstGonum(t *testing.T) {
	if testing.Short() {
		t.Skip("generates and runs 49 minimizers")
	}
	files := map[string][]byte{
		"go.mod":        []byte("module example.com/autodiff\n\ngo 1.26\n\nrequire gonum.org/v1/gonum v0.17.0\n"),
		"grads.go":      gradsFile(),
		"autodiff.toml": specFile(),
		"drive_test.go": driverFile(),
	}
	for _, name := range []string{"objectives.go", "float32.go"} {
		src, err := os.ReadFile(filepath.Join("objectives", name))
		if err != nil {
			t.Fatal(err)
		}
		files[name] = src
	}
	sum, err := os.ReadFile(filepath.Join("..", "go.sum"))
	if err != nil {
		t.Fatal(err)
	}
	files["go.sum"] = sum
	out := tempmodule.GenerateAndTest(t, files, "autodiff.toml")
	lines := parse(out)

	var table bytes.Buffer
	table.WriteString("# derivative = \"automatic\" on the MGH problems\n\n")
	table.WriteString("Written by `go test ./autodiff -update` (checks module). For each problem of ../mgh, the gradient thalweg derives from objectives/objectives.go (plain Go transcribed from gonum's Func) against gonum's recorded Grad (gonum.org/v1/gonum/optimize/functions v0.17.0), at MGH's start and 10 pseudo-random points around it: the largest normwise relative difference ‖g − g_gonum‖∞/‖g_gonum‖∞ (required: at most 1e-13); then the bfgs minimizer (default rules, wolfe) with each gradient from the start.\n\n")
	fmt.Fprintf(&table, "Recorded on %s.\n\n", results.Recorded)
	table.WriteString("| problem | n | gradient difference | analytic: status | iterations | calls | automatic: status | iterations | calls | same counts | max abs(x − x_analytic) |\n")
	table.WriteString("|---|---:|---:|---|---:|---:|---|---:|---:|---|---:|\n")
	same := 0
	for _, p := range mgh.Problems {
		g, ok := lines["grad\t"+p.Name]
		if !ok {
			t.Errorf("%s: no gradient comparison reported", p.Name)
			continue
		}
		worst := number(t, g[1])
		if !(worst <= gradientAgreement) {
			t.Errorf("%s: the derived gradient differs from gonum's by %.2g relative (at %s), want at most %g", p.Name, worst, g[2], gradientAgreement)
		}
		an, au := lines["run\t"+p.Name+"\tanalytic"], lines["run\t"+p.Name+"\tautomatic"]
		if an == nil || au == nil {
			t.Errorf("%s: runs not reported", p.Name)
			continue
		}
		// an, au: status, converged, iterations, calls, f, x
		if an[0] != au[0] {
			t.Errorf("%s: analytic ends %s, automatic %s", p.Name, an[0], au[0])
		}
		xa, xu := vector(t, an[5]), vector(t, au[5])
		dx := 0.0
		for i := range xa {
			dx = math.Max(dx, math.Abs(xa[i]-xu[i]))
		}
		fa, fu := number(t, an[4]), number(t, au[4])
		// 1e-10 as ../mgh's fTol: f − f* is second order in x − x*
		// (common practice for runs stopped at the default limit).
		if an[1] == "true" && !(math.Abs(fa-fu) <= 1e-10*math.Max(math.Abs(fa), 1)) {
			t.Errorf("%s: analytic reaches f = %g, automatic %g", p.Name, fa, fu)
		}
		counts := an[2] == au[2] && an[3] == au[3]
		if counts {
			same++
		}
		fmt.Fprintf(&table, "| %s | %d | %.1e | %s | %s | %s | %s | %s | %s | %v | %.1e |\n", p.Name, p.N, worst, an[0], an[2], an[3], au[0], au[2], au[3], map[bool]string{true: "yes", false: "no"}[counts], dx)
	}
	fmt.Fprintf(&table, "\nThe counts are the same in %d of %d problems. Both gradients are exact to rounding; where they differ in their last bits (another order of operations), a run whose stop test sits near rounding may take another iteration or line-search trial.\n", same, len(mgh.Problems))

	table.WriteString("\n## float32\n\nRosenbrock, Beale and Wood in float32 (objectives/float32.go). The gradient's accuracy: at MGH's start and 10 pseudo-random points around it, the normwise relative error of the hand-derived float32 gradient and of the derived one against gonum's float64 gradient at the same (float32) point; required: the derived one's at most 4 times the hand-derived one's or 4u (u = 2⁻²⁴), whichever is larger (both are rounding: another order of operations may double it either way). Then bfgs with default rules from MGH's start with each gradient and with central differences, the error max |xᵢ − x*ᵢ| at the end (where the stop test, not the gradient, sets it); required: the derived gradient's run converges.\n\n")
	table.WriteString("| problem | gradient error: analytic | automatic | analytic: status | error | automatic: status | error | central: status | error |\n|---|---:|---:|---|---:|---|---:|---|---:|\n")
	for _, s := range single {
		acc := lines["acc32\t"+s.name]
		if acc == nil {
			t.Errorf("%s: gradient accuracy not reported", s.name)
			continue
		}
		hand, derived := number(t, acc[0]), number(t, acc[1])
		if !(derived <= 4*math.Max(hand, 0x1p-24)) {
			t.Errorf("%s in float32: the derived gradient's error is %.2g, the hand-derived one's %.2g", s.name, derived, hand)
		}
		row := []string{s.name, fmt.Sprintf("%.1e", hand), fmt.Sprintf("%.1e", derived)}
		errs := map[string]float64{}
		for _, source := range []string{"analytic", "automatic", "central"} {
			r := lines["f32\t"+s.name+"\t"+source]
			if r == nil {
				t.Errorf("%s %s: not reported", s.name, source)
				continue
			}
			x := vector(t, r[1])
			e := 0.0
			for i := range x {
				e = math.Max(e, math.Abs(x[i]-s.min[i]))
			}
			errs[source] = e
			row = append(row, r[0], fmt.Sprintf("%.1e", e))
		}
		if r := lines["f32\t"+s.name+"\tautomatic"]; r != nil && r[0] != "gradient small" {
			t.Errorf("%s in float32 with the derived gradient: %s", s.name, r[0])
		}
		fmt.Fprintf(&table, "| %s |\n", strings.Join(row, " | "))
	}
	results.Compare(t, filepath.Join("testdata", "results.md"), table.Bytes(), *update, "go test ./autodiff -update")
}

// parse reads the driver's tab-separated lines, keyed by their first
// two (or three, for runs) fields.
func parse(out []byte) map[string][]string {
	got := map[string][]string{}
	sc := bufio.NewScanner(bytes.NewReader(out))
	for sc.Scan() {
		f := strings.Split(sc.Text(), "\t")
		switch {
		case len(f) == 4 && f[0] == "grad":
			got[f[0]+"\t"+f[1]] = f[1:]
		case len(f) == 9 && f[0] == "run":
			got[strings.Join(f[:3], "\t")] = f[3:]
		case len(f) == 5 && f[0] == "f32":
			got[strings.Join(f[:3], "\t")] = f[3:]
		case len(f) == 4 && f[0] == "acc32":
			got[f[0]+"\t"+f[1]] = f[2:]
		}
	}
	return got
}

// number parses one figure of a driver line; a malformed one fails the
// test rather than reading as 0, which every bound here would accept.
func number(t *testing.T, s string) float64 {
	t.Helper()
	x, err := strconv.ParseFloat(s, 64)
	if err != nil {
		t.Fatalf("driver line: %v", err)
	}
	return x
}

func vector(t *testing.T, s string) []float64 {
	var v []float64
	for _, f := range strings.Fields(strings.Trim(s, "[]")) {
		x, err := strconv.ParseFloat(f, 64)
		if err != nil {
			t.Fatalf("driver line: %v", err)
		}
		v = append(v, x)
	}
	return v
}

// gradsFile renders gonum's gradients as analytic gradients.
func gradsFile() []byte {
	var b strings.Builder
	b.WriteString("package objectives\n\nimport \"gonum.org/v1/gonum/optimize/functions\"\n\n// The gradients gonum records, as analytic gradients of the objectives.\n\n")
	for _, p := range mgh.Problems {
		fmt.Fprintf(&b, "func %sGrad(x, g *[%d]float64) { functions.%s{}.Grad(g[:], x[:]) }\n\n", p.Name, p.N, gonumType[p.Name])
	}
	return []byte(b.String())
}

// specFile renders two bfgs minimizers per problem, analytic and
// automatic, and three per float32 instance.
func specFile() []byte {
	var b strings.Builder
	b.WriteString("# Generated by the autodiff check.\n")
	add := func(name, objective, source, gradient string, start []float64) {
		fmt.Fprintf(&b, "\n[[minimizer]]\nname = %q\nobjective = %q\nderivative = %q\n", name, objective, source)
		if gradient != "" {
			fmt.Fprintf(&b, "gradient = %q\n", gradient)
		}
		fmt.Fprintf(&b, "start = [%s]\n", floats(start, true))
	}
	for _, p := range mgh.Problems {
		add(p.Name+"Analytic", p.Name, "analytic", p.Name+"Grad", p.Start)
		add(p.Name+"Automatic", p.Name, "automatic", "", p.Start)
	}
	for _, s := range single {
		add(s.name+"Analytic", s.name, "analytic", s.name+"Grad", s.start)
		add(s.name+"Automatic", s.name, "automatic", "", s.start)
		add(s.name+"Central", s.name, "central", "", s.start)
	}
	return []byte(b.String())
}

func floats(v []float64, toml bool) string {
	items := make([]string, len(v))
	for k, x := range v {
		items[k] = strconv.FormatFloat(x, 'g', -1, 64)
		if toml && !strings.ContainsAny(items[k], ".e") {
			items[k] += ".0"
		}
	}
	return strings.Join(items, ", ")
}

// driverFile renders TestDrive: the gradient comparisons (points from a
// linear congruential generator with Knuth's MMIX constants, from
// memory: start + (v − 0.5)·max(1, |startᵢ|), v uniform in [0, 1)), the
// runs, and the float32 runs.
func driverFile() []byte {
	var b strings.Builder
	b.WriteString(`package objectives

import (
	"fmt"
	"math"
	"testing"

	"gonum.org/v1/gonum/optimize/functions"
)

func lcg(state *uint64) float64 {
	*state = *state*6364136223846793005 + 1442695040888963407
	return float64(*state>>11) / (1 << 53)
}

// worst is ‖got − want‖∞/‖want‖∞.
func worst(got, want []float64) float64 {
	scale := 0.0
	for _, w := range want {
		scale = math.Max(scale, math.Abs(w))
	}
	out := 0.0
	for i, w := range want {
		d := math.Abs(got[i]-w) / scale
		if scale == 0 {
			d = math.Abs(got[i])
		}
		if !(d <= out) {
			out = d
		}
	}
	return out
}

func widen(v []float32) []float64 {
	out := make([]float64, len(v))
	for i, x := range v {
		out[i] = float64(x)
	}
	return out
}

func TestDrive(t *testing.T) {
`)
	for _, p := range mgh.Problems {
		auto := gen.MinimizerPrefix(p.Name+"Automatic") + "AutoGradient"
		fmt.Fprintf(&b, "\t{\n\t\tstart := [%d]float64{%s}\n\t\tpoints := [][%d]float64{start}\n\t\tstate := uint64(%d)\n", p.N, floats(p.Start, false), p.N, p.MGH)
		b.WriteString("\t\tfor k := 0; k < 10; k++ {\n\t\t\tp := start\n\t\t\tfor i := range p {\n\t\t\t\tp[i] += (lcg(&state) - 0.5) * math.Max(1, math.Abs(start[i]))\n\t\t\t}\n\t\t\tpoints = append(points, p)\n\t\t}\n")
		fmt.Fprintf(&b, "\t\tw, at := 0.0, \"\"\n\t\tfor _, p := range points {\n\t\t\tvar recorded, derived [%d]float64\n\t\t\t%sGrad(&p, &recorded)\n\t\t\t%s(&p, &derived)\n", p.N, p.Name, auto)
		b.WriteString("\t\t\tif d := worst(derived[:], recorded[:]); !(d <= w) {\n\t\t\t\tw, at = d, fmt.Sprint(p)\n\t\t\t}\n\t\t}\n")
		fmt.Fprintf(&b, "\t\tfmt.Printf(\"grad\\t%%s\\t%%.17g\\t%%s\\n\", %q, w, at)\n", p.Name)
		for _, source := range []string{"analytic", "automatic"} {
			name := p.Name + strings.ToUpper(source[:1]) + source[1:]
			fmt.Fprintf(&b, "\t\tr%s := %s(start)\n\t\tfmt.Printf(\"run\\t%%s\\t%%s\\t%%v\\t%%v\\t%%d\\t%%d\\t%%.17g\\t%%v\\n\", %q, %q, r%s.Status, r%s.Status.Converged(), r%s.Iterations, r%s.Evaluations, r%s.F, r%s.X)\n", source, name, p.Name, source, source, source, source, source, source, source)
		}
		b.WriteString("\t}\n")
	}
	for _, s := range single {
		n := len(s.start)
		fmt.Fprintf(&b, "\t{\n\t\tstart := [%d]float32{%s}\n\t\tpoints := [][%d]float32{start}\n\t\tstate := uint64(%d)\n", n, floats(s.start, false), n, len(s.name))
		b.WriteString("\t\tfor k := 0; k < 10; k++ {\n\t\t\tp := start\n\t\t\tfor i := range p {\n\t\t\t\tp[i] += float32((lcg(&state) - 0.5) * math.Max(1, math.Abs(float64(start[i]))))\n\t\t\t}\n\t\t\tpoints = append(points, p)\n\t\t}\n")
		fmt.Fprintf(&b, "\t\thand, derived := 0.0, 0.0\n\t\tfor _, p := range points {\n\t\t\tvar x, exact [%d]float64\n\t\t\tfor i := range p {\n\t\t\t\tx[i] = float64(p[i])\n\t\t\t}\n\t\t\tfunctions.%s{}.Grad(exact[:], x[:])\n", n, s.gonum)
		fmt.Fprintf(&b, "\t\t\tvar gh, gd [%d]float32\n\t\t\t%sGrad(&p, &gh)\n\t\t\t%s(&p, &gd)\n", n, s.name, gen.MinimizerPrefix(s.name+"Automatic")+"AutoGradient")
		b.WriteString("\t\t\thand = math.Max(hand, worst(widen(gh[:]), exact[:]))\n\t\t\tderived = math.Max(derived, worst(widen(gd[:]), exact[:]))\n\t\t}\n")
		fmt.Fprintf(&b, "\t\tfmt.Printf(\"acc32\\t%%s\\t%%.3g\\t%%.3g\\n\", %q, hand, derived)\n\t}\n", s.name)
		for _, source := range []string{"analytic", "automatic", "central"} {
			name := s.name + strings.ToUpper(source[:1]) + source[1:]
			fmt.Fprintf(&b, "\t{\n\t\tr := %s([%d]float32{%s})\n\t\tfmt.Printf(\"f32\\t%%s\\t%%s\\t%%v\\t%%v\\n\", %q, %q, r.Status, r.X)\n\t}\n", name, len(s.start), floats(s.start, false), s.name, source)
		}
	}
	b.WriteString("}\n")
	return []byte(b.String())
}
