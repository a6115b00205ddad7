package gen

import (
	"bytes"
	"fmt"
	"go/parser"
	"go/token"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"sort"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/internal/targets"
	"github.com/thalweg-go/thalweg/rules"
)

// TestEndToEnd builds a throwaway module in a temporary directory whose
// objectives cover every accepted signature form (function, value-receiver
// method, pointer-receiver method; scalar, array, pointer to array, slice;
// float32 and float64), every analytic gradient form, every combined
// objective form, every way to name an instance, and every derivative
// source, direction and step rule. It
// generates the minimizers with Generate and Write, then checks the files
// (header, no absolute paths, imports, gofmt), determinism and Stale, runs
// go vet and go test (the generated tests assert convergence to the
// closed-form minimum of each objective), proves with -gcflags=-m that the
// generated code moves nothing to the heap, vets for 32-bit arm, and runs
// the generated tests again on every target of internal/targets: under
// emulation for arm64, riscv64, ppc64le, s390x, arm (GOARM=7 and 5) and
// js/wasm, and on amd64 v3, where multiply-adds are fused.
//
// It runs the go command many times, so `go test -short` skips it; CI runs
// it without -short.
func TestEndToEnd(t *testing.T) {
	if testing.Short() {
		t.Skip("end-to-end test of generated code (go vet, go test, -gcflags=-m, cross builds); skipped with -short")
	}
	root := t.TempDir()
	writeTree(t, root, e2eModule())
	var specs []string
	for _, rel := range e2eSpecs {
		specs = append(specs, filepath.Join(root, filepath.FromSlash(rel)))
	}

	plans, err := Plans(specs)
	if err != nil {
		t.Fatalf("planning the end-to-end specs: %v", err)
	}
	e2eCheckCoverage(t, plans)

	outs, err := Generate(specs)
	if err != nil {
		t.Fatalf("generating: %v", err)
	}
	if len(outs) != 2*len(plans) {
		t.Fatalf("%d outputs for %d minimizers, want two each", len(outs), len(plans))
	}
	again, err := Generate(specs)
	if err != nil {
		t.Fatalf("generating a second time: %v", err)
	}
	e2eSameOutputs(t, "a second generation", outs, again)
	if err := Write(outs); err != nil {
		t.Fatalf("writing: %v", err)
	}

	t.Run("files", func(t *testing.T) { e2eCheckFiles(t, root, plans, outs) })
	t.Run("determinism", func(t *testing.T) { e2eCheckDeterminism(t, specs, outs) })
	t.Run("vet", func(t *testing.T) { e2eGo(t, root, nil, "vet", "./...") })
	t.Run("test", func(t *testing.T) {
		out := e2eGo(t, root, nil, "test", "-count=1", "-v", "-bench=.", "-benchtime=1x", "./...")
		for _, pkg := range e2ePackages {
			if !regexp.MustCompile(`(?m)^ok\s+` + regexp.QuoteMeta(pkg) + `\s`).MatchString(out) {
				t.Errorf("go test did not report ok for %s:\n%s", pkg, out)
			}
		}
		// Every generated test and benchmark ran: converges, allocates
		// nothing, respects the cap, the gradient check when analytic.
		want := map[string]int{"Benchmark": len(plans)}
		for _, p := range plans {
			want["Test"] += 5 // converges, allocates nothing, cap, solver ticks, solver allocates nothing
			if p.Derivative.Exact {
				want["Test"]++ // the gradient check, or the Jacobian check of a residual objective
			}
			if p.Shape.Residuals > 0 {
				want["Test"]++ // the uncertainty at the fit
			}
		}
		want["Test"] += strings.Count(strings.Join(e2eModuleTests(), ""), "func Test")
		got := map[string]int{
			"Test":      len(regexp.MustCompile(`(?m)^--- PASS: Test`).FindAllString(out, -1)),
			"Benchmark": len(regexp.MustCompile(`(?m)^Benchmark\S+\s+1\s`).FindAllString(out, -1)),
		}
		if got["Test"] != want["Test"] || got["Benchmark"] != want["Benchmark"] || strings.Contains(out, "--- SKIP") {
			t.Errorf("go test ran %d tests and %d benchmarks, want %d and %d, none skipped:\n%s", got["Test"], got["Benchmark"], want["Test"], want["Benchmark"], out)
		}
	})
	t.Run("escape", func(t *testing.T) { e2eCheckEscape(t, root) })
	t.Run("targets", func(t *testing.T) {
		// The generated tests again, cross-compiled and run on every
		// emulated target, and on amd64 with fused multiply-adds.
		for _, target := range append([]targets.Target{targets.Fused}, targets.All...) {
			t.Run(target.Name, func(t *testing.T) {
				out, err := target.Test(root, "-count=1", "./...")
				if err != nil {
					t.Fatalf("%v\n%s", err, out)
				}
				for _, pkg := range e2ePackages {
					if !regexp.MustCompile(`(?m)^ok\s+` + regexp.QuoteMeta(pkg) + `\s`).MatchString(out) {
						t.Errorf("go test did not report ok for %s:\n%s", pkg, out)
					}
				}
			})
		}
	})
	t.Run("vet-32-bit", func(t *testing.T) {
		// Type-check the generated tests on a 32-bit target too, where int
		// is 32 bits wide.
		e2eGo(t, root, []string{"GOOS=linux", "GOARCH=arm", "GOARM=7"}, "vet", "./...")
	})
}

// writeTree writes files, by slash-separated path below root, making the
// folders they need.
func writeTree(t *testing.T, root string, files map[string]string) {
	t.Helper()
	for rel, text := range files {
		path := filepath.Join(root, filepath.FromSlash(rel))
		if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(path, []byte(text), 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

// e2eGo runs the go command in the module and fails with its combined
// output when it fails.
func e2eGo(t *testing.T, dir string, env []string, args ...string) string {
	t.Helper()
	cmd := exec.Command("go", args...)
	cmd.Dir = dir
	cmd.Env = append(os.Environ(), "GOFLAGS=-mod=mod "+os.Getenv("GOFLAGS"), "GOWORK=off", "GOTOOLCHAIN=local")
	cmd.Env = append(cmd.Env, env...)
	out, err := cmd.CombinedOutput()
	if err != nil {
		t.Fatalf("%s go %s: %v\n%s", strings.Join(env, " "), strings.Join(args, " "), err, out)
	}
	return string(out)
}

// e2eSameOutputs requires two generations to name the same files with the
// same bytes.
func e2eSameOutputs(t *testing.T, what string, want, got []Output) {
	t.Helper()
	if len(want) != len(got) {
		t.Fatalf("%s gave %d outputs, the first %d", what, len(got), len(want))
	}
	for i := range want {
		if want[i].Path != got[i].Path {
			t.Errorf("%s: output %d is %s, the first time %s", what, i, got[i].Path, want[i].Path)
		} else if !bytes.Equal(want[i].Data, got[i].Data) {
			t.Errorf("%s: %s differs from the first generation", what, got[i].Path)
		}
	}
}

var e2eHeader = regexp.MustCompile(`^// Code generated by thalweg from .*; DO NOT EDIT\.$`)

// e2eCheckFiles checks every generated file on its own: the header line,
// no absolute path, the imports, gofmt, and the tests it must hold.
func e2eCheckFiles(t *testing.T, root string, plans []*Plan, outs []Output) {
	wd, _ := os.Getwd()
	forbidden := []string{root, filepath.Dir(root), wd}
	var paths []string
	for i, o := range outs {
		p := plans[i/2]
		isTest := i%2 == 1
		paths = append(paths, o.Path)
		data, err := os.ReadFile(o.Path)
		if err != nil {
			t.Fatal(err)
		}
		if !bytes.Equal(data, o.Data) {
			t.Errorf("%s on disk differs from the Output written", o.Path)
		}
		wantName := snakeCase(p.M.Name) + "_min.go"
		if isTest {
			wantName = snakeCase(p.M.Name) + "_min_test.go"
		}
		if filepath.Base(o.Path) != wantName || filepath.Dir(o.Path) != p.pkg.dir {
			t.Errorf("%s: want %s beside the objective in %s", o.Path, wantName, p.pkg.dir)
		}
		first, _, _ := strings.Cut(string(data), "\n")
		if !e2eHeader.MatchString(first) {
			t.Errorf("%s: first line %q is not thalweg's header", o.Path, first)
		}
		for _, dir := range forbidden {
			if dir != "" && dir != "/" && bytes.Contains(data, []byte(dir)) {
				t.Errorf("%s contains the absolute path %s", o.Path, dir)
			}
		}
		f, err := parser.ParseFile(token.NewFileSet(), o.Path, data, parser.ImportsOnly)
		if err != nil {
			t.Errorf("%s: %v", o.Path, err)
			continue
		}
		allowed := map[string]bool{`"math"`: true, `"testing"`: isTest}
		for _, imp := range f.Imports {
			if !allowed[imp.Path.Value] {
				t.Errorf("%s imports %s; generated code may import only math (and testing in tests)", o.Path, imp.Path.Value)
			}
		}
		text := string(data)
		if isTest {
			var want []string
			for _, fn := range []string{"Converges", "AllocatesNothing", "RespectsEvaluationCap", "SolverTicks", "SolverAllocatesNothing"} {
				want = append(want, "func Test"+p.M.Name+fn+"(t *testing.T)")
			}
			want = append(want, "func Benchmark"+p.M.Name+"(b *testing.B)")
			if p.M.Expect != nil {
				want = append(want, "want := ")
			}
			switch {
			case p.Derivative == rules.Analytic && p.Shape.Residuals > 0:
				want = append(want, "func Test"+p.M.Name+"JacobianMatchesDifferences(t *testing.T)")
			case p.Derivative == rules.Analytic:
				want = append(want, "func Test"+p.M.Name+"GradientMatchesDifferences(t *testing.T)")
			}
			if p.Shape.Residuals > 0 {
				want = append(want, "func Test"+p.M.Name+"UncertaintyAtTheFit(t *testing.T)")
			}
			if p.M.Instance != "" {
				want = append(want, "instance "+p.M.Instance)
			}
			for _, w := range want {
				if !strings.Contains(text, w) {
					t.Errorf("%s lacks %q", o.Path, w)
				}
			}
		} else if !strings.Contains(text, "func "+p.M.Name+"(") || !strings.Contains(text, "func "+p.M.Name+"WithLimits(") {
			t.Errorf("%s lacks the entry points %s and %sWithLimits", o.Path, p.M.Name, p.M.Name)
		} else if p.Shape.Residuals > 0 && !strings.Contains(text, "func "+p.M.Name+"UncertaintyAt(") {
			t.Errorf("%s lacks %sUncertaintyAt", o.Path, p.M.Name)
		}
	}
	gofmt := "gofmt"
	if goroot, err := exec.Command("go", "env", "GOROOT").Output(); err == nil {
		if p := filepath.Join(strings.TrimSpace(string(goroot)), "bin", "gofmt"); e2eExists(p) {
			gofmt = p
		}
	}
	out, err := exec.Command(gofmt, append([]string{"-l"}, paths...)...).CombinedOutput()
	if err != nil || len(bytes.TrimSpace(out)) != 0 {
		t.Errorf("gofmt -l on the generated files: %v\n%s", err, out)
	}
}

func e2eExists(path string) bool {
	_, err := os.Stat(path)
	return err == nil
}

// e2eCheckDeterminism regenerates over the written files (which the loader
// must ignore), checks Stale, then edits and removes a file.
func e2eCheckDeterminism(t *testing.T, specs []string, outs []Output) {
	over, err := Generate(specs)
	if err != nil {
		t.Fatalf("generating over the written files: %v", err)
	}
	e2eSameOutputs(t, "generating over the written files", outs, over)
	if stale := Stale(over); len(stale) != 0 {
		t.Fatalf("Stale right after Write: %v", stale)
	}

	edited, removed := outs[0], outs[3]
	defer func() { // put the files back for the subtests that follow, even after a failure
		if err := Write(outs); err != nil {
			t.Fatalf("rewriting: %v", err)
		}
		if stale := Stale(outs); len(stale) != 0 {
			t.Fatalf("Stale after rewriting: %v", stale)
		}
	}()
	if err := os.WriteFile(edited.Path, append(bytes.Clone(edited.Data), "// edited\n"...), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.Remove(removed.Path); err != nil {
		t.Fatal(err)
	}
	stale := Stale(outs)
	want := []string{displayPath(edited.Path) + ": stale", displayPath(removed.Path) + ": missing"}
	if strings.Join(stale, "\n") != strings.Join(want, "\n") {
		t.Errorf("Stale after editing %s and removing %s:\n%s\nwant:\n%s", edited.Path, removed.Path, strings.Join(stale, "\n"), strings.Join(want, "\n"))
	}
	// The edited file still carries the header, so the deferred Write
	// replaces it.
}

// e2eCheckEscape asks the compiler for its escape analysis and requires
// that nothing in a generated minimizer is moved or escapes to the heap.
func e2eCheckEscape(t *testing.T, root string) {
	out := e2eGo(t, root, nil, "build", "-gcflags=-m", "./...")
	mentioned := 0
	for _, line := range strings.Split(out, "\n") {
		file, _, _ := strings.Cut(line, ":")
		if !strings.HasSuffix(file, "_min.go") {
			continue // the user's objectives, package headers; go build compiles no test files
		}
		mentioned++
		if strings.Contains(line, "moved to heap") || strings.Contains(line, "escapes to heap") {
			t.Errorf("heap use in generated code: %s", line)
		}
	}
	if mentioned == 0 {
		t.Fatalf("go build -gcflags=-m said nothing about the generated files; the check would be vacuous:\n%s", out)
	}
}

// e2eCheckCoverage proves, from the resolved plans, that the specs cover
// every accepted form and every policy, so that editing the specs cannot
// silently drop a case. It logs the table of minimizers.
func e2eCheckCoverage(t *testing.T, plans []*Plan) {
	have := map[string]bool{}
	argNames := map[ArgForm]string{ArgScalar: "scalar", ArgArray: "array", ArgPointer: "pointer", ArgSlice: "slice"}
	gradNames := map[GradForm]string{GradScalar: "scalar", GradPointer: "pointer", GradArray: "array", GradSlice: "slice"}
	var rows []string
	for _, p := range plans {
		s, m := p.Shape, p.M
		kind := "func"
		if s.Receiver != "" {
			kind = map[bool]string{false: "value", true: "pointer"}[s.Pointer]
		}
		have["objective "+argNames[s.Arg]+" "+s.Elem+" "+kind] = true
		grad := "-"
		switch {
		case s.Combined:
			grad = "combined"
			have["combined "+argNames[s.Arg]+" "+s.Elem] = true
			have["combined "+kind] = true
			have["combined direction "+p.Direction.Name] = true
			have["combined rule "+p.Rule.Name] = true
			if p.Bounded {
				have["combined bounds "+s.Elem] = true
			}
		case p.Derivative == rules.Analytic:
			grad = gradNames[s.Grad]
			have["gradient "+grad+" "+s.Elem+" "+map[bool]string{false: "func", true: "method"}[s.Receiver != ""]] = true
		}
		if s.Residuals > 0 {
			grad = "residuals"
			have["residual "+argNames[s.Arg]+" "+s.Elem+" "+kind] = true
			have["residual derivative "+p.Derivative.Name] = true
			have["residual direction "+p.Direction.Name] = true
			have["residual rule "+p.Rule.Name] = true
			if p.Derivative == rules.Analytic {
				have["jacobian "+map[bool]string{false: "rows", true: "columns"}[s.JacobianColumns]+" "+s.Elem] = true
			}
			if p.Bounded {
				have["residual bounds "+s.Elem] = true
			}
		}
		inst := "-"
		if s.Receiver != "" {
			inst = "zero"
			if s.Instance.Name != "" {
				inst = map[bool]string{false: "var", true: "func"}[s.Instance.Call] + s.Instance.Adjust
			}
			have["instance "+kind+" "+inst] = true
		}
		have["derivative "+p.Derivative.Name] = true
		if p.Derivative.Derived {
			form := argNames[s.Arg]
			if s.Residuals > 0 {
				form = "residual " + form
			}
			have["automatic "+form+" "+s.Elem+" "+kind] = true
			have["automatic "+form+" "+s.Elem] = true
		}
		have["direction "+p.Direction.Name] = true
		rule := p.Rule.Name
		for _, q := range p.Rule.Params {
			if q.Kind == rules.Switch && p.Switch(q) {
				rule += "+" + q.Key
			}
		}
		have["rule "+rule] = true
		if p.Bounded {
			have["bounds "+p.Direction.Name+" "+p.Derivative.Name] = true
			have["bounds rule "+p.Rule.Name] = true
			have["bounds "+s.Elem+" "+argNames[s.Arg]] = true
		}
		if p.Scaled() {
			have["scale "+p.Direction.Name+" "+p.Derivative.Name] = true
			have["scale "+s.Elem+" "+argNames[s.Arg]] = true
			if p.Bounded {
				have["scale bounds"] = true
			}
			if s.Receiver != "" {
				have["scale method"] = true
			}
			if s.Combined {
				have["scale combined "+argNames[s.Arg]] = true
			}
		}
		for q := range m.Given {
			have["set "+q.Path()] = true
		}
		if p.Direction.NeedsCurvature && !p.Rule.Curvature {
			t.Errorf("%s pairs %s with %s, which does not guarantee descent directions", m.Name, p.Direction.Name, p.Rule.Name)
		}
		dir := p.Direction.Name
		if p.Direction.Reads(rules.Memory) {
			dir = fmt.Sprintf("%s(%d)", dir, int(p.Value(rules.Memory)))
		}
		rows = append(rows, fmt.Sprintf("%-16s %-8s %-7s %-7s %-8s %-10s %-8s %-9s %s", m.Name, argNames[s.Arg], s.Elem, kind, inst, p.Derivative.Name, grad, dir, rule))
	}
	t.Logf("%d minimizers:\n%-16s %-8s %-7s %-7s %-8s %-10s %-8s %-9s %s\n%s", len(plans),
		"name", "form", "elem", "kind", "instance", "derivative", "gradient", "direction", "rule", strings.Join(rows, "\n"))

	var want []string
	for _, form := range []string{"scalar", "array", "pointer", "slice"} {
		for _, elem := range []string{"float32", "float64"} {
			for _, kind := range []string{"func", "value", "pointer"} {
				want = append(want, "objective "+form+" "+elem+" "+kind)
			}
			for _, kind := range []string{"func", "method"} {
				want = append(want, "gradient "+form+" "+elem+" "+kind)
			}
		}
	}
	for _, inst := range []string{"zero", "var", "func"} {
		want = append(want, "instance value "+inst, "instance pointer "+inst)
	}
	want = append(want, "instance value var*", "instance value func*", "instance pointer var&", "instance pointer func&")
	// Every entry of the registry, every switch both ways, and every
	// parameter set by a spec at least once.
	for _, e := range rules.Derivative.Entries {
		want = append(want, "derivative "+e.Name)
	}
	for _, e := range rules.Direction.Entries {
		want = append(want, "direction "+e.Name)
	}
	for _, e := range rules.StepRule.Entries {
		want = append(want, "rule "+e.Name)
		for _, q := range e.Params {
			if q.Kind == rules.Switch {
				want = append(want, "rule "+e.Name+"+"+q.Key)
			}
		}
	}
	for _, q := range rules.Params() {
		want = append(want, "set "+q.Path())
	}
	// Bounds with every direction that takes them, every derivative
	// source and every step rule, in both float types.
	for _, d := range rules.Direction.Entries {
		for _, src := range rules.Derivative.Entries {
			if d.NoBounds == "" {
				want = append(want, "bounds "+d.Name+" "+src.Name)
			}
		}
	}
	for _, e := range rules.StepRule.Entries {
		want = append(want, "bounds rule "+e.Name)
	}
	want = append(want, "bounds float32 scalar", "bounds float64 scalar", "bounds float32 array", "bounds float64 array", "bounds float64 pointer")
	// scale with every direction and derivative source, every argument
	// form, bounds and a method.
	for _, d := range rules.Direction.Entries {
		for _, src := range rules.Derivative.Entries {
			if !d.Residual { // scale is refused for residual objectives
				want = append(want, "scale "+d.Name+" "+src.Name)
			}
		}
	}
	want = append(want, "scale float64 scalar", "scale float32 scalar", "scale float64 array", "scale float32 pointer", "scale float64 pointer", "scale float64 slice", "scale bounds", "scale method", "scale combined scalar", "scale combined pointer")
	// Combined objectives in every form and float type, as functions and
	// methods on both receivers, with every direction and rule, on a box
	// in both float types.
	for _, form := range []string{"scalar", "array", "pointer", "slice"} {
		for _, elem := range []string{"float32", "float64"} {
			want = append(want, "combined "+form+" "+elem)
		}
	}
	want = append(want, "combined func", "combined value", "combined pointer", "combined bounds float32", "combined bounds float64")
	for _, e := range rules.Direction.Entries {
		if !e.Residual {
			want = append(want, "combined direction "+e.Name)
		}
	}
	for _, e := range rules.StepRule.Entries {
		if !e.Exclusive {
			want = append(want, "combined rule "+e.Name)
		}
	}
	// Residual objectives in their forms and float types, as functions
	// and methods, with Jacobians by rows and columns, every source, the
	// least-squares directions and every rule they take, bfgs, and boxes.
	for _, form := range []string{"array", "pointer"} {
		for _, kind := range []string{"func", "value", "pointer"} {
			if form == "array" || kind != "pointer" {
				want = append(want, "residual "+form+" float64 "+kind)
			}
		}
	}
	want = append(want, "residual pointer float32 func", "residual slice float64 func", "jacobian rows float64", "jacobian columns float64", "jacobian columns float32",
		"residual bounds float64", "residual bounds float32", "residual direction bfgs")
	for _, src := range rules.Derivative.Entries {
		want = append(want, "residual derivative "+src.Name)
	}
	for _, d := range rules.Direction.Entries {
		if !d.Residual {
			continue
		}
		want = append(want, "residual direction "+d.Name)
		for _, r := range d.Pairs {
			want = append(want, "residual rule "+r.Name)
		}
	}
	// derivative = "automatic" on every objective form in both float
	// types, on value and pointer receivers in both, and on the residual
	// forms.
	for _, form := range []string{"scalar", "array", "pointer", "slice"} {
		for _, elem := range []string{"float32", "float64"} {
			want = append(want, "automatic "+form+" "+elem)
		}
	}
	for _, elem := range []string{"float32", "float64"} {
		want = append(want, "automatic pointer "+elem+" func")
	}
	want = append(want, "automatic pointer float64 value", "automatic array float64 pointer", "automatic slice float32 value", "automatic scalar float32 pointer",
		"automatic residual pointer float64", "automatic residual pointer float32", "automatic residual array float64 value", "automatic residual slice float64")
	var missing []string
	for _, w := range want {
		if !have[w] {
			missing = append(missing, w)
		}
	}
	sort.Strings(missing)
	if len(missing) > 0 {
		t.Errorf("the end-to-end specs do not cover:\n%s", strings.Join(missing, "\n"))
	}
}

// The temporary module. Every objective has a closed-form minimum that
// the spec's [minimizer.expect] states, so the generated tests check that
// the minimizer found it; methods read their receiver's shift A, so a test
// run on the wrong receiver misses the expected point.

var e2eSpecs = []string{"plain/plain.toml", "grad/grad.toml", "methods/methods.toml", "boxed/boxed.toml", "scaled/scaled.toml", "combined/combined.toml", "ticks/ticks.toml", "residual/residual.toml", "auto/auto.toml"}

// e2ePackages are the module's packages whose tests must pass.
var e2ePackages = []string{"e2e/plain", "e2e/grad", "e2e/methods/recv", "e2e/boxed", "e2e/scaled", "e2e/combined", "e2e/ticks", "e2e/residual", "e2e/auto"}

func e2eModule() map[string]string {
	files := map[string]string{
		"go.mod":                    "module e2e\n\ngo 1.24\n",
		"plain/plain.go":            e2ePlainGo,
		"plain/plain.toml":          e2ePlainSpec,
		"grad/grad.go":              e2eGradGo,
		"grad/grad.toml":            e2eGradSpec,
		"methods/methods.toml":      e2eMethodsSpec,
		"boxed/boxed.go":            e2eBoxedGo,
		"boxed/boxed.toml":          e2eBoxedSpec,
		"boxed/boxed_test.go":       e2eBoxedTest,
		"scaled/scaled.go":          e2eScaledGo,
		"scaled/scaled.toml":        e2eScaledSpec,
		"scaled/scaled_test.go":     e2eScaledTest,
		"combined/combined.go":      e2eCombinedGo,
		"combined/combined.toml":    e2eCombinedSpec,
		"combined/combined_test.go": e2eCombinedTest,
		"ticks/ticks.go":            e2eTicksGo,
		"ticks/ticks.toml":          e2eTicksSpec(),
		"ticks/ticks_test.go":       e2eTicksTest(),
		"residual/residual.go":      e2eResidualGo,
		"residual/residual.toml":    e2eResidualSpec,
		"residual/residual_test.go": e2eResidualTest,
		"auto/auto.go":              e2eAutoGo,
		"auto/auto.toml":            e2eAutoSpec,
	}
	var recv strings.Builder
	recv.WriteString(e2eRecvHead)
	for _, r := range []struct{ typ, elem, recv, kind, base string }{
		{"Val64", "float64", "v Val64", "value", "64"},
		{"Ptr64", "float64", "v *Ptr64", "pointer", "64"},
		{"Val32", "float32", "v Val32", "value", "32"},
		{"Ptr32", "float32", "v *Ptr32", "pointer", "32"},
		// Receivers without fields, whose zero value is all there is:
		// the only ones thalweg lets the tests use without an instance.
		{"Bare64", "float64", "v Bare64", "value", "64"},
		{"BareP64", "float64", "v *BareP64", "pointer", "64"},
		{"Bare32", "float32", "v Bare32", "value", "32"},
		{"BareP32", "float32", "v *BareP32", "pointer", "32"},
	} {
		decl, target := "struct{ A [4]$T }", "base$B[i] + v.A[i]"
		if strings.HasPrefix(r.typ, "Bare") {
			decl, target = "struct{}", "base$B[i]"
		}
		methods := strings.NewReplacer("$DECL", decl, "$TARGET", target).Replace(e2eRecvMethods)
		recv.WriteString(strings.NewReplacer("$N", r.typ, "$T", r.elem, "$R", r.recv, "$K", r.kind, "$B", r.base).Replace(methods))
	}
	files["methods/recv/recv.go"] = recv.String()
	return files
}

// e2eModuleTests returns the hand-written test files of the module.
func e2eModuleTests() []string {
	var tests []string
	for path, src := range e2eModule() {
		if strings.HasSuffix(path, "_test.go") {
			tests = append(tests, src)
		}
	}
	return tests
}

// Plain functions, one per objective form and element type.
const e2ePlainGo = `// Package plain holds objectives that are plain functions.
package plain

// Bowl64 is 3(x − 1.5)² + 2: f′ = 6(x − 1.5) vanishes at 1.5 and f″ = 6 > 0,
// so 1.5 is the minimizer (second-order sufficient conditions, Nocedal &
// Wright 2006, Theorem 2.4).
func Bowl64(x float64) float64 {
	d := x - 1.5
	return 3*d*d + 2
}

// Bowl32 is 3(x − 1.5)², minimum at 1.5 (as Bowl64).
func Bowl32(x float32) float32 {
	d := x - 1.5
	return 3 * d * d
}

// Shifted quadratics Σ cᵢ(xᵢ − aᵢ)² with every cᵢ > 0: the gradient
// 2cᵢ(xᵢ − aᵢ) vanishes only at a and the Hessian diag(2c) is positive
// definite, so a is the unique minimizer (Nocedal & Wright 2006, Theorem 2.4).
var (
	quad3A = [3]float64{1, -2, 0.5}
	quad3C = [3]float64{1, 2, 3}
	quad4A = [4]float64{2, -1, 0, 3}
	quad4C = [4]float64{1, 1.5, 2, 0.5}
	unit2A = [2]float64{0.5, -1.25}
	ptr2A  = [2]float32{-0.5, 1.5}
	ptr2C  = [2]float32{2, 1}
)

// Quad3 is Σ cᵢ(xᵢ − aᵢ)² with a = quad3A, c = quad3C; minimum at a.
func Quad3(x [3]float64) float64 {
	var s float64
	for i := range x {
		d := x[i] - quad3A[i]
		s += quad3C[i] * d * d
	}
	return s
}

// Quad3f is Quad3 in float32.
func Quad3f(x [3]float32) float32 {
	var s float32
	for i := range x {
		d := x[i] - float32(quad3A[i])
		s += float32(quad3C[i]) * d * d
	}
	return s
}

// Rosen64 is Rosenbrock's function (1 − x₀)² + 100(x₁ − x₀²)², minimum 0 at
// (1, 1), standard start (−1.2, 1): J. J. Moré, B. S. Garbow and K. E.
// Hillstrom, Testing unconstrained optimization software, ACM TOMS 7(1):17–41,
// 1981, problem 1.
func Rosen64(x *[2]float64) float64 {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	return a*a + 100*b*b
}

// Quad2Ptr32 is Σ cᵢ(xᵢ − aᵢ)² with a = ptr2A, c = ptr2C; minimum at a.
func Quad2Ptr32(x *[2]float32) float32 {
	var s float32
	for i := range x {
		d := x[i] - ptr2A[i]
		s += ptr2C[i] * d * d
	}
	return s
}

// Quad4 is Σ cᵢ(xᵢ − aᵢ)² over four unknowns, a = quad4A, c = quad4C;
// minimum at a.
func Quad4(x []float64) float64 {
	var s float64
	for i := range quad4A {
		d := x[i] - quad4A[i]
		s += quad4C[i] * d * d
	}
	return s
}

// Quad4f is Quad4 in float32.
func Quad4f(x []float32) float32 {
	var s float32
	for i := range quad4A {
		d := x[i] - float32(quad4A[i])
		s += float32(quad4C[i]) * d * d
	}
	return s
}

// Tilted is 0.3·((x₀ − 1)² + 4(x₁ + 0.5)² + 5), minimum 1.5 at (1, −0.5)
// (a shifted quadratic, as above). It ends in a product: inlined into the
// kernels, compilers that fuse multiply-adds (arm64, ppc64le, s390x,
// riscv64, amd64 v3) may fold that product into the kernels' arithmetic,
// which once made a finiteness test built on v − v == 0 fail at the start.
func Tilted(x [2]float64) float64 {
	a, b := x[0]-1, x[1]+0.5
	s := a*a + 4*b*b + 5
	return 0.3 * s
}

// Unit2 is Σ (xᵢ − aᵢ)², a = unit2A; minimum at a. Its gradient 2(x − a)
// has Lipschitz constant 2, so steepest descent with the fixed step 0.25
// (< 2/L = 1) converges: each step halves x − a (Nocedal & Wright 2006, §3.3).
func Unit2(x [2]float64) float64 {
	var s float64
	for i := range x {
		d := x[i] - unit2A[i]
		s += d * d
	}
	return s
}
`

const e2ePlainSpec = `# Plain functions: every objective form, float64 and float32.

# Every key at its default, on objectives ending in a multiplication, the
# case fused multiply-adds once broke (see Tilted and Bowl32).
[[minimizer]]
name = "TiltedDefaults"
objective = "Tilted"
start = [3.0, 1.0]
[minimizer.expect]
x = [1.0, -0.5]               # shifted quadratic: minimum at (1, −0.5)

[[minimizer]]
name = "BowlF32Defaults"
objective = "Bowl32"
start = 0.0
[minimizer.expect]
x = 1.5                       # 3(x − 1.5)², f′(1.5) = 0
tolerance = 1e-3              # the float32 central-difference gradient limit 1e-3 allows |x − 1.5| ≤ 1.7e-4

[[minimizer]]
name = "BowlF64"
objective = "Bowl64"
derivative = "central"
direction = "bfgs"
start = 0.0
[minimizer.step]
rule = "armijo"
shrink = 0.6
decrease = 1e-3
trials = 60
[minimizer.stop]
step = 1e-13
iterations = 800
evaluations = 2e4             # a whole number may be written as a float
[minimizer.expect]
x = 1.5                       # 3(x − 1.5)² + 2, f′(1.5) = 0, f″ = 6 > 0
tolerance = 1e-6

[[minimizer]]
name = "Quad3F64"
objective = "Quad3"
derivative = "forward"
direction = "lbfgs"
memory = 3
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "armijo"
interpolate = true
[minimizer.stop]
gradient = 1e-6               # forward differences are accurate to about √u·f″ ≈ 1e-7 here
[minimizer.expect]
x = [1.0, -2.0, 0.5]          # shifted quadratic: minimum at its shift a
tolerance = 1e-5

[[minimizer]]
name = "RosenF64"
objective = "Rosen64"
derivative = "central"
direction = "bfgs"
start = [-1.2, 1.0]           # Moré, Garbow & Hillstrom 1981, problem 1, standard start
[minimizer.step]
rule = "strong-wolfe"
curvature = 0.5
[minimizer.stop]
gradient = 1e-6               # central differences on Rosenbrock err by about h²·f‴/6 ≈ 1e-8
[minimizer.expect]
x = [1.0, 1.0]                # Rosenbrock: f = 0 at (1, 1), MGH 1981 problem 1
tolerance = 1e-5

[[minimizer]]
name = "Quad4F64"
objective = "Quad4"
derivative = "central"
direction = "cg"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [2.0, -1.0, 0.0, 3.0]     # shifted quadratic: minimum at a
tolerance = 1e-6

[[minimizer]]
name = "Unit2F64"
objective = "Unit2"
derivative = "central"
direction = "steepest"
start = [3.0, 2.0]
[minimizer.step]
rule = "fixed"
initial = 0.25                # < 2/L = 1 for f = Σ(x − a)²: each step halves x − a
[minimizer.expect]
x = [0.5, -1.25]              # shifted quadratic: minimum at a
tolerance = 1e-6

[[minimizer]]
name = "BowlF32"
objective = "Bowl32"
derivative = "forward"
direction = "steepest"
start = 0.0
[minimizer.step]
rule = "decrease"
[minimizer.stop]
gradient = 1e-3               # float32 forward differences err by c·h, h = √u·|x| ≈ 3.7e-4, so ≈ 1.1e-3 here
[minimizer.expect]
x = 1.5                       # 3(x − 1.5)², f′(1.5) = 0
tolerance = 2e-3

[[minimizer]]
name = "Quad3F32"
objective = "Quad3f"
derivative = "central"
direction = "bfgs"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "decrease"
interpolate = true
[minimizer.expect]
x = [1.0, -2.0, 0.5]          # shifted quadratic: minimum at a
tolerance = 1e-3

[[minimizer]]
name = "Quad2F32"
objective = "Quad2Ptr32"
derivative = "central"
direction = "lbfgs"
start = [1.0, 0.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [-0.5, 1.5]               # shifted quadratic: minimum at a
tolerance = 1e-3

[[minimizer]]
name = "Quad4F32"
objective = "Quad4f"
derivative = "central"
direction = "cg"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [2.0, -1.0, 0.0, 3.0]     # shifted quadratic: minimum at a
tolerance = 1e-3
`

// Plain functions with analytic gradients, one per gradient form and
// element type.
const e2eGradGo = `// Package grad holds plain-function objectives with analytic gradients.
package grad

import "math"

// ExpLin is eˣ − 2x: f′ = eˣ − 2 vanishes at ln 2 and f″ = eˣ > 0, so ln 2
// is the minimizer (Nocedal & Wright 2006, Theorem 2.4).
func ExpLin(x float64) float64 { return math.Exp(x) - 2*x }

// ExpLinGrad is ExpLin's derivative.
func ExpLinGrad(x float64) float64 { return math.Exp(x) - 2 }

// ExpLin32 is ExpLin in float32.
func ExpLin32(x float32) float32 { return float32(math.Exp(float64(x))) - 2*x }

// ExpLin32Grad is ExpLin32's derivative.
func ExpLin32Grad(x float32) float32 { return float32(math.Exp(float64(x))) - 2 }

// Rosenbrock is (1 − x₀)² + 100(x₁ − x₀²)², minimum 0 at (1, 1), standard
// start (−1.2, 1): Moré, Garbow and Hillstrom, ACM TOMS 7(1):17–41, 1981,
// problem 1.
func Rosenbrock(x *[2]float64) float64 {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	return a*a + 100*b*b
}

// RosenbrockGrad is Rosenbrock's gradient.
func RosenbrockGrad(x, g *[2]float64) {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	g[0] = -2*a - 400*x[0]*b
	g[1] = 200 * b
}

// RosenbrockSliceGrad is Rosenbrock's gradient in the slice form.
func RosenbrockSliceGrad(x, g []float64) {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	g[0] = -2*a - 400*x[0]*b
	g[1] = 200 * b
}

// Rosenbrock32 is Rosenbrock in float32.
func Rosenbrock32(x *[2]float32) float32 {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	return a*a + 100*b*b
}

// Rosenbrock32Grad is Rosenbrock32's gradient.
func Rosenbrock32Grad(x, g *[2]float32) {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	g[0] = -2*a - 400*x[0]*b
	g[1] = 200 * b
}

// Beale is Σᵢ (yᵢ − x₀(1 − x₁ⁱ))², y = (1.5, 2.25, 2.625), minimum 0 at
// (3, 0.5), standard start (1, 1): Moré, Garbow and Hillstrom 1981, problem 5.
func Beale(x [2]float64) float64 {
	t1 := 1.5 - x[0] + x[0]*x[1]
	t2 := 2.25 - x[0] + x[0]*x[1]*x[1]
	t3 := 2.625 - x[0] + x[0]*x[1]*x[1]*x[1]
	return t1*t1 + t2*t2 + t3*t3
}

// BealeGrad is Beale's gradient, returned by value.
func BealeGrad(x [2]float64) [2]float64 {
	y := x[1]
	t1 := 1.5 - x[0] + x[0]*y
	t2 := 2.25 - x[0] + x[0]*y*y
	t3 := 2.625 - x[0] + x[0]*y*y*y
	return [2]float64{
		2*t1*(y-1) + 2*t2*(y*y-1) + 2*t3*(y*y*y-1),
		2*t1*x[0] + 4*t2*x[0]*y + 6*t3*x[0]*y*y,
	}
}

// Shifted quadratics Σ cᵢ(xᵢ − aᵢ)², every cᵢ > 0: unique minimizer a
// (Nocedal & Wright 2006, Theorem 2.4).
var (
	weightedA = [3]float64{-1, 2, 0.5}
	weightedC = [3]float64{2, 1, 4}
	bowl3A    = [3]float32{0.5, 1, -2}
	bowl3C    = [3]float32{1, 3, 2}
)

// Weighted is Σ cᵢ(xᵢ − aᵢ)² over three unknowns, a = weightedA.
func Weighted(x []float64) float64 {
	var s float64
	for i := range weightedA {
		d := x[i] - weightedA[i]
		s += weightedC[i] * d * d
	}
	return s
}

// WeightedGrad is Weighted's gradient.
func WeightedGrad(x, g []float64) {
	for i := range weightedA {
		g[i] = 2 * weightedC[i] * (x[i] - weightedA[i])
	}
}

// Weighted32 is Weighted in float32.
func Weighted32(x []float32) float32 {
	var s float32
	for i := range weightedA {
		d := x[i] - float32(weightedA[i])
		s += float32(weightedC[i]) * d * d
	}
	return s
}

// Weighted32Grad is Weighted32's gradient.
func Weighted32Grad(x, g []float32) {
	for i := range weightedA {
		g[i] = 2 * float32(weightedC[i]) * (x[i] - float32(weightedA[i]))
	}
}

// Bowl3 is Σ cᵢ(xᵢ − aᵢ)², a = bowl3A, c = bowl3C.
func Bowl3(x [3]float32) float32 {
	var s float32
	for i := range x {
		d := x[i] - bowl3A[i]
		s += bowl3C[i] * d * d
	}
	return s
}

// Bowl3Grad is Bowl3's gradient, returned by value.
func Bowl3Grad(x [3]float32) [3]float32 {
	var g [3]float32
	for i := range x {
		g[i] = 2 * bowl3C[i] * (x[i] - bowl3A[i])
	}
	return g
}
`

const e2eGradSpec = `# Analytic gradients of plain functions: every gradient form, float64 and float32.

[[minimizer]]
name = "ExpLinF64"
objective = "ExpLin"
derivative = "analytic"
gradient = "ExpLinGrad"
direction = "steepest"
start = 2.0
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = 0.6931471805599453        # ln 2: f′ = eˣ − 2 = 0, f″ = eˣ > 0
tolerance = 1e-6

[[minimizer]]
name = "RosenbrockF64"
objective = "Rosenbrock"
derivative = "analytic"
gradient = "RosenbrockGrad"
direction = "bfgs"
start = [-1.2, 1.0]           # MGH 1981 problem 1, standard start
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [1.0, 1.0]                # Rosenbrock: f = 0 at (1, 1), MGH 1981 problem 1
tolerance = 1e-6

[[minimizer]]
name = "RosenMixF64"
objective = "Rosenbrock"      # pointer objective with a slice gradient
derivative = "analytic"
gradient = "RosenbrockSliceGrad"
direction = "bfgs"
start = [-1.2, 1.0]
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = [1.0, 1.0]                # Rosenbrock: f = 0 at (1, 1), MGH 1981 problem 1
tolerance = 1e-6

[[minimizer]]
name = "BealeF64"
objective = "Beale"
derivative = "analytic"
gradient = "BealeGrad"
direction = "lbfgs"
memory = 7
start = [1.0, 1.0]            # MGH 1981 problem 5, standard start
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [3.0, 0.5]                # Beale: f = 0 at (3, 0.5), MGH 1981 problem 5
tolerance = 1e-6

[[minimizer]]
name = "WeightedF64"
objective = "Weighted"
derivative = "analytic"
gradient = "WeightedGrad"
direction = "cg"
dim = 3
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [-1.0, 2.0, 0.5]          # shifted quadratic: minimum at a
tolerance = 1e-6

[[minimizer]]
name = "ExpLinF32"
objective = "ExpLin32"
derivative = "analytic"
gradient = "ExpLin32Grad"
direction = "lbfgs"
start = 2.0
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = 0.6931472                 # ln 2: f′ = eˣ − 2 = 0
tolerance = 1e-3

[[minimizer]]
name = "RosenbrockF32"
objective = "Rosenbrock32"
derivative = "analytic"
gradient = "Rosenbrock32Grad"
direction = "bfgs"
start = [-1.2, 1.0]           # MGH 1981 problem 1, standard start
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [1.0, 1.0]                # Rosenbrock: f = 0 at (1, 1), MGH 1981 problem 1
tolerance = 1e-3

[[minimizer]]
name = "Bowl3F32"
objective = "Bowl3"
derivative = "analytic"
gradient = "Bowl3Grad"
direction = "cg"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [0.5, 1.0, -2.0]          # shifted quadratic: minimum at a
tolerance = 1e-3

[[minimizer]]
name = "WeightedF32"
objective = "Weighted32"
derivative = "analytic"
gradient = "Weighted32Grad"
direction = "steepest"
dim = 3
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "armijo"
interpolate = true
[minimizer.expect]
x = [-1.0, 2.0, 0.5]          # shifted quadratic: minimum at a
tolerance = 1e-3
`

// The methods package: four receiver types (value and pointer receivers,
// float64 and float32) share one set of methods, written once below.
const e2eRecvHead = `// Package recv holds objectives that are methods. Every receiver carries a
// shift A, and each objective's minimum is at tᵢ = baseᵢ + Aᵢ, so the
// generated tests find the expected point only on the right receiver.
package recv

var (
	base64 = [4]float64{1, -1, 0.5, 2}
	base32 = [4]float32{1, -1, 0.5, 2}
)

// Instances the specs name. Targets t = base + A are in the comments.
var (
	ValVar64    = Val64{A: [4]float64{0.5, 1, -1, 0.25}}      // t = (1.5, 0, -0.5, 2.25)
	PtrVar64    = &Ptr64{A: [4]float64{1, 1, 1, 1}}           // t = (2, 0, 1.5, 3)
	ValVar32    = Val32{A: [4]float32{0.5, 0.5, 0.5, 0.5}}    // t = (1.5, -0.5, 1, 2.5)
	ValPtrVar32 = &Val32{A: [4]float32{1, -1, 1, -1}}         // t = (2, -2, 1.5, 1)
	PtrValVar32 = Ptr32{A: [4]float32{-0.5, -0.5, -0.5, -0.5}} // t = (0.5, -1.5, 0, 1.5)
)

// NewVal64 returns a value for value receivers; t = (0.5, -0.5, 1.5, 1).
func NewVal64() Val64 { return Val64{A: [4]float64{-0.5, 0.5, 1, -1}} }

// NewVal64Ptr returns a pointer for value receivers; t = (3, -3, 0.5, 3).
func NewVal64Ptr() *Val64 { return &Val64{A: [4]float64{2, -2, 0, 1}} }

// NewPtr64 returns a pointer for pointer receivers; t = (1.25, -1.75, 2, 0).
func NewPtr64() *Ptr64 { return &Ptr64{A: [4]float64{0.25, -0.75, 1.5, -2}} }

// NewPtr64Value returns a value for pointer receivers; t = (0, 1, 0, 2.5).
func NewPtr64Value() Ptr64 { return Ptr64{A: [4]float64{-1, 2, -0.5, 0.5}} }

// NewVal32Ptr returns a pointer for value receivers; t = (0, 0, -0.5, 3).
func NewVal32Ptr() *Val32 { return &Val32{A: [4]float32{-1, 1, -1, 1}} }

// NewPtr32 returns a pointer for pointer receivers; t = (1.5, -1, 0.5, 2).
func NewPtr32() *Ptr32 { return &Ptr32{A: [4]float32{0.5, 0, 0, 0}} }

// NewPtr32Value returns a value for pointer receivers; t = (2, 0, 1.5, 3).
func NewPtr32Value() Ptr32 { return Ptr32{A: [4]float32{1, 1, 1, 1}} }
`

// e2eRecvMethods is expanded per receiver type: $N the type, $T its
// element type, $R the receiver, $K "value" or "pointer", $B the suffix of
// its base variable. Every objective
// is a convex quadratic in d = x − t with a positive definite Hessian, so
// t is its unique minimizer (Nocedal & Wright 2006, Theorem 2.4).
const e2eRecvMethods = `
// $N has $K-receiver methods; its objectives have their minimum at its
// target, base + A (base alone for the types without fields).
type $N $DECL

func ($R) target(i int) $T { return $TARGET }

// Scalar is 2(x − t₀)², minimum at t₀.
func ($R) Scalar(x $T) $T {
	d := x - v.target(0)
	return 2 * d * d
}

// ScalarGrad is Scalar's derivative.
func ($R) ScalarGrad(x $T) $T { return 4 * (x - v.target(0)) }

// Array is Σᵢ (i+1)(xᵢ − tᵢ)² over i < 3, minimum at t.
func ($R) Array(x [3]$T) $T {
	var s $T
	for i := range x {
		d := x[i] - v.target(i)
		s += $T(i+1) * d * d
	}
	return s
}

// ArrayGrad is Array's gradient, returned by value.
func ($R) ArrayGrad(x [3]$T) [3]$T {
	var g [3]$T
	for i := range x {
		g[i] = 2 * $T(i+1) * (x[i] - v.target(i))
	}
	return g
}

// Pointer is d₀² + 4d₁² + d₀d₁, d = x − t: Hessian [[2 1] [1 8]] is
// positive definite, so t is the minimizer.
func ($R) Pointer(x *[2]$T) $T {
	d0, d1 := x[0]-v.target(0), x[1]-v.target(1)
	return d0*d0 + 4*d1*d1 + d0*d1
}

// PointerGrad is Pointer's gradient.
func ($R) PointerGrad(x, g *[2]$T) {
	d0, d1 := x[0]-v.target(0), x[1]-v.target(1)
	g[0] = 2*d0 + d1
	g[1] = 8*d1 + d0
}

// Slice is Σᵢ (xᵢ − tᵢ)² over i < 4: unit weights, so steepest descent with
// the fixed step 0.25 halves x − t every iteration.
func ($R) Slice(x []$T) $T {
	var s $T
	for i := range 4 {
		d := x[i] - v.target(i)
		s += d * d
	}
	return s
}

// SliceGrad is Slice's gradient.
func ($R) SliceGrad(x, g []$T) {
	for i := range 4 {
		g[i] = 2 * (x[i] - v.target(i))
	}
}
`

const e2eMethodsSpec = `# Methods, in the package ./recv below this spec: every objective form with
# value and pointer receivers, float64 and float32, and every way to name
# the receiver. The expected points are t = base + A of the receiver used
# (see recv.go); the zero receiver's is base = (1, -1, 0.5, 2).
package = "./recv"

[[minimizer]]
name = "V64Scalar"
objective = "Bare64.Scalar"
derivative = "analytic"
gradient = "ScalarGrad"
direction = "steepest"
start = 3.0
[minimizer.step]
rule = "armijo"
interpolate = true
[minimizer.expect]
x = 1.0                       # zero receiver: t₀ = base₀
tolerance = 1e-6

[[minimizer]]
name = "V64Array"
objective = "Val64.Array"
instance = "ValVar64"
derivative = "central"
direction = "bfgs"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "decrease"
interpolate = true
[minimizer.expect]
x = [1.5, 0.0, -0.5]          # ValVar64's t
tolerance = 1e-6

[[minimizer]]
name = "V64Pointer"
objective = "Val64.Pointer"
instance = "NewVal64"
derivative = "analytic"
gradient = "Val64.PointerGrad"
direction = "cg"
start = [2.0, 2.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [0.5, -0.5]               # NewVal64's t
tolerance = 1e-6

[[minimizer]]
name = "V64Slice"
objective = "Val64.Slice"
instance = "NewVal64Ptr"      # *Val64 for a value receiver
derivative = "forward"
direction = "lbfgs"
memory = 2
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.stop]
gradient = 1e-6               # forward differences err by about h = √u·max(1, |x|) ≤ 5e-8
[minimizer.expect]
x = [3.0, -3.0, 0.5, 3.0]     # NewVal64Ptr's t
tolerance = 1e-5

[[minimizer]]
name = "P64Scalar"
objective = "BareP64.Scalar"
derivative = "central"
direction = "lbfgs"
start = -2.0
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = 1.0                       # zero receiver: t₀ = base₀
tolerance = 1e-6

[[minimizer]]
name = "P64Array"
objective = "Ptr64.Array"
instance = "PtrVar64"
derivative = "analytic"
gradient = "ArrayGrad"
direction = "bfgs"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [2.0, 0.0, 1.5]           # PtrVar64's t
tolerance = 1e-6

[[minimizer]]
name = "P64Pointer"
objective = "Ptr64.Pointer"
instance = "NewPtr64Value"    # Ptr64 for a pointer receiver
derivative = "central"
direction = "steepest"
start = [2.0, -1.0]
[minimizer.step]
rule = "decrease"
[minimizer.expect]
x = [0.0, 1.0]                # NewPtr64Value's t
tolerance = 1e-6

[[minimizer]]
name = "P64Slice"
objective = "Ptr64.Slice"
instance = "NewPtr64"
derivative = "analytic"
gradient = "SliceGrad"
direction = "cg"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [1.25, -1.75, 2.0, 0.0]   # NewPtr64's t
tolerance = 1e-6

[[minimizer]]
name = "V32Scalar"
objective = "Val32.Scalar"
instance = "ValVar32"
derivative = "central"
direction = "bfgs"
start = 0.0
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = 1.5                       # ValVar32's t₀
tolerance = 1e-3

[[minimizer]]
name = "V32Array"
objective = "Bare32.Array"
derivative = "analytic"
gradient = "ArrayGrad"
direction = "lbfgs"
start = [0.0, 0.0, 0.0]
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = [1.0, -1.0, 0.5]          # zero receiver: t = base
tolerance = 1e-3

[[minimizer]]
name = "V32Pointer"
objective = "Val32.Pointer"
instance = "NewVal32Ptr"      # *Val32 for a value receiver
derivative = "central"
direction = "cg"
start = [1.0, 1.0]
[minimizer.step]
rule = "strong-wolfe"
[minimizer.expect]
x = [0.0, 0.0]                # NewVal32Ptr's t
tolerance = 1e-3

[[minimizer]]
name = "V32Slice"
objective = "Val32.Slice"
instance = "ValPtrVar32"      # a *Val32 variable for a value receiver
derivative = "analytic"
gradient = "SliceGrad"
direction = "steepest"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "fixed"
initial = 0.25                # < 2/L = 1 for f = Σ(x − t)²: each step halves x − t
[minimizer.expect]
x = [2.0, -2.0, 1.5, 1.0]     # ValPtrVar32's t
tolerance = 1e-3

[[minimizer]]
name = "P32Scalar"
objective = "Ptr32.Scalar"
instance = "NewPtr32"
derivative = "analytic"
gradient = "ScalarGrad"
direction = "bfgs"
start = -1.0
[minimizer.step]
rule = "decrease"
[minimizer.expect]
x = 1.5                       # NewPtr32's t₀
tolerance = 1e-3

[[minimizer]]
name = "P32Array"
objective = "Ptr32.Array"
instance = "PtrValVar32"      # a Ptr32 variable for a pointer receiver
derivative = "central"
direction = "steepest"
start = [0.0, 0.0, 1.0]
[minimizer.step]
rule = "armijo"
[minimizer.expect]
x = [0.5, -1.5, 0.0]          # PtrValVar32's t
tolerance = 1e-3

[[minimizer]]
name = "P32Pointer"
objective = "BareP32.Pointer"
derivative = "analytic"
gradient = "PointerGrad"
direction = "lbfgs"
memory = 4
start = [0.0, 0.0]
[minimizer.step]
rule = "wolfe"
[minimizer.expect]
x = [1.0, -1.0]               # zero receiver: t = base
tolerance = 1e-3

[[minimizer]]
name = "P32Slice"
objective = "Ptr32.Slice"
instance = "NewPtr32Value"    # Ptr32 for a pointer receiver
derivative = "forward"
direction = "bfgs"
dim = 4
start = [0.0, 0.0, 0.0, 0.0]
[minimizer.step]
rule = "armijo"
interpolate = true
[minimizer.stop]
gradient = 1e-3               # float32 forward differences err by about h = √u·max(1, |x|) ≤ 7.3e-4
[minimizer.expect]
x = [2.0, 0.0, 1.5, 3.0]      # NewPtr32Value's t
tolerance = 2e-3
`
