package main

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io/fs"
	"os"
	"path/filepath"
	"regexp"
	"runtime"
	"sort"
	"strconv"
	"strings"
	"testing"
	"time"

	"github.com/thalweg-go/thalweg/gen"
	"github.com/thalweg-go/thalweg/rules"
)

// The quickstart example's outputs, generated from quickstart.toml.
var quickstartOutputs = []string{
	"calibrate_min.go",
	"calibrate_min_test.go",
	"tune_gain_min.go",
	"tune_gain_min_test.go",
}

var (
	headerRE  = regexp.MustCompile(`^// Code generated .* DO NOT EDIT\.$`)
	problemRE = regexp.MustCompile(`^[^:\s]+:\d+:\d+: \S.*$`)
)

// quickstartModule copies the quickstart example's hand-written files into
// root/qs with its own go.mod (module qs), changes into that directory and
// returns the temporary root.
func quickstartModule(t *testing.T) string {
	t.Helper()
	_, self, _, _ := runtime.Caller(0)
	example := filepath.Join(filepath.Dir(self), "..", "..", "examples", "quickstart")
	root := t.TempDir()
	dir := filepath.Join(root, "qs")
	if err := os.Mkdir(dir, 0o755); err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"quickstart.go", "quickstart.toml"} {
		data, err := os.ReadFile(filepath.Join(example, name))
		if err != nil {
			t.Fatal(err)
		}
		writeFile(t, filepath.Join(dir, name), string(data))
	}
	writeFile(t, filepath.Join(dir, "go.mod"), "module qs\n\ngo 1.24\n")
	t.Chdir(dir)
	return root
}

func writeFile(t *testing.T, path, data string) {
	t.Helper()
	if err := os.MkdirAll(filepath.Dir(path), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
		t.Fatal(err)
	}
}

// snapshot maps every file below root, hidden ones included, to its bytes.
func snapshot(t *testing.T, root string) map[string]string {
	t.Helper()
	files := map[string]string{}
	err := filepath.WalkDir(root, func(path string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() {
			return err
		}
		data, err := os.ReadFile(path)
		rel, _ := filepath.Rel(root, path)
		files[filepath.ToSlash(rel)] = string(data)
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return files
}

// sameFiles reports how two snapshots differ, or "" when they are equal.
func sameFiles(before, after map[string]string) string {
	var diffs []string
	for name, data := range before {
		got, ok := after[name]
		switch {
		case !ok:
			diffs = append(diffs, name+" removed")
		case got != data:
			diffs = append(diffs, name+" changed")
		}
	}
	for name := range after {
		if _, ok := before[name]; !ok {
			diffs = append(diffs, name+" added")
		}
	}
	sort.Strings(diffs)
	return strings.Join(diffs, ", ")
}

// thalweg runs the CLI in-process.
func thalweg(args ...string) (code int, stdout, stderr string) {
	var out, errb bytes.Buffer
	code = run(args, &out, &errb)
	return code, out.String(), errb.String()
}

// problemLines checks that stderr is one path:line:col: message per line.
func problemLines(t *testing.T, stderr string) []string {
	t.Helper()
	lines := strings.Split(strings.TrimRight(stderr, "\n"), "\n")
	for _, l := range lines {
		if !problemRE.MatchString(l) {
			t.Errorf("stderr line %q is not path:line:col: message", l)
		}
	}
	return lines
}

func TestGenWritesBothFilesAndIsStable(t *testing.T) {
	root := quickstartModule(t)
	code, _, stderr := thalweg("gen", "quickstart.toml")
	if code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	if stderr != "" {
		t.Errorf("gen succeeded but wrote to stderr:\n%s", stderr)
	}
	first := snapshot(t, root)
	for _, name := range quickstartOutputs {
		data, ok := first["qs/"+name]
		if !ok {
			t.Errorf("gen did not write %s", name)
			continue
		}
		head, _, _ := strings.Cut(data, "\n")
		if !headerRE.MatchString(head) {
			t.Errorf("%s starts with %q, want thalweg's header", name, head)
		}
		if strings.Contains(data, root) {
			t.Errorf("%s contains the absolute path %s", name, root)
		}
	}
	if len(first) != 3+len(quickstartOutputs) {
		t.Errorf("files after gen: %v", keys(first))
	}

	// A second run rewrites the same bytes and leaves no temporary file.
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("second gen exited %d:\n%s", code, stderr)
	}
	if d := sameFiles(first, snapshot(t, root)); d != "" {
		t.Errorf("second gen changed files: %s", d)
	}

	// So does a run from another working directory.
	t.Chdir(root)
	if code, _, stderr := thalweg("gen", filepath.Join("qs", "quickstart.toml")); code != 0 {
		t.Fatalf("gen from the parent directory exited %d:\n%s", code, stderr)
	}
	if d := sameFiles(first, snapshot(t, root)); d != "" {
		t.Errorf("gen from the parent directory changed files: %s", d)
	}
}

func TestCheck(t *testing.T) {
	root := quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	fresh := snapshot(t, root)

	code, _, stderr := thalweg("check", "quickstart.toml")
	if code != 0 {
		t.Fatalf("check on fresh files exited %d:\n%s", code, stderr)
	}
	if d := sameFiles(fresh, snapshot(t, root)); d != "" {
		t.Errorf("check changed files: %s", d)
	}

	// One file deleted, one edited: exit 1, each named, nothing written.
	if err := os.Remove("tune_gain_min_test.go"); err != nil {
		t.Fatal(err)
	}
	edited := fresh["qs/calibrate_min.go"] + "\n// edited by hand\n"
	writeFile(t, "calibrate_min.go", edited)
	before := snapshot(t, root)
	code, _, stderr = thalweg("check", "quickstart.toml")
	if code != 1 {
		t.Fatalf("check with a missing and an edited file exited %d, want 1:\n%s", code, stderr)
	}
	for _, want := range []string{"tune_gain_min_test.go: missing", "calibrate_min.go: stale"} {
		if !containsLine(stderr, want) {
			t.Errorf("check's stderr does not name %q:\n%s", want, stderr)
		}
	}
	for _, fine := range []string{"tune_gain_min.go", "calibrate_min_test.go"} {
		if strings.Contains(stderr, fine+":") {
			t.Errorf("check names the fresh file %s:\n%s", fine, stderr)
		}
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("check changed files: %s", d)
	}

	// Only the edit left: still 1.
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	writeFile(t, "tune_gain_min.go", fresh["qs/tune_gain_min.go"]+" ")
	code, _, stderr = thalweg("check", "quickstart.toml")
	if code != 1 || !containsLine(stderr, "tune_gain_min.go: stale") {
		t.Errorf("check with one edited file exited %d, want 1 naming it:\n%s", code, stderr)
	}

	// A hand-written file at an output path is refused by check as by gen.
	writeFile(t, "tune_gain_min.go", "package quickstart\n")
	code, _, stderr = thalweg("check", "quickstart.toml")
	if code != 2 || !strings.Contains(stderr, "tune_gain_min.go:1:1: refusing to overwrite") {
		t.Errorf("check over a hand-written file exited %d, want 2 with the refusal:\n%s", code, stderr)
	}
}

func TestBadSpecChangesNothing(t *testing.T) {
	root := quickstartModule(t)
	writeFile(t, "bad.toml", `[[minimizer]]
name = "tune"
objective = "GainCost"
start = 1.0

[minimizer.step]
shrink = 1.5
bogus = 1
`)
	before := snapshot(t, root)
	for _, verb := range []string{"gen", "check"} {
		code, _, stderr := thalweg(verb, "bad.toml")
		if code != 2 {
			t.Fatalf("%s on a bad spec exited %d, want 2:\n%s", verb, code, stderr)
		}
		got := problemLines(t, stderr)
		want := []string{
			`bad.toml:2:8: name "tune" is not an exported Go identifier`,
			`bad.toml:7:1: step.shrink is not used by rule "wolfe"`,
			`bad.toml:8:1: unknown key "minimizer.step.bogus"`,
		}
		if strings.Join(got, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s: stderr\n%s\nwant\n%s", verb, strings.Join(got, "\n"), strings.Join(want, "\n"))
		}
		if d := sameFiles(before, snapshot(t, root)); d != "" {
			t.Errorf("%s on a bad spec changed files: %s", verb, d)
		}
	}

	// An objective problem is reported at the Go declaration.
	writeFile(t, "bad.toml", `[[minimizer]]
name = "Tune"
objective = "rawReadings"
start = 1.0
`)
	before = snapshot(t, root)
	code, _, stderr := thalweg("gen", "bad.toml")
	if code != 2 {
		t.Fatalf("gen with a non-function objective exited %d, want 2:\n%s", code, stderr)
	}
	if got := problemLines(t, stderr); len(got) != 1 || got[0] != "quickstart.go:18:2: objective rawReadings is not a function" {
		t.Errorf("stderr = %q", got)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("gen with a bad objective changed files: %s", d)
	}

	// A spec that does not exist.
	code, _, stderr = thalweg("gen", "missing.toml")
	if code != 2 || !strings.HasPrefix(stderr, "missing.toml:1:1: ") {
		t.Errorf("gen missing.toml exited %d:\n%s", code, stderr)
	}
}

func TestGenRefusesHandWrittenFile(t *testing.T) {
	root := quickstartModule(t)
	// The last output refused: none of the earlier ones may be written.
	hand := "package quickstart\n\n// Written by hand.\n"
	writeFile(t, "tune_gain_min_test.go", hand)
	before := snapshot(t, root)
	code, _, stderr := thalweg("gen", "quickstart.toml")
	if code != 2 {
		t.Fatalf("gen over a hand-written file exited %d, want 2:\n%s", code, stderr)
	}
	got := problemLines(t, stderr)
	if len(got) != 1 || !strings.HasPrefix(got[0], "tune_gain_min_test.go:1:1: refusing to overwrite") {
		t.Errorf("stderr = %q, want one refusal naming tune_gain_min_test.go", got)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("refused gen changed files: %s", d)
	}
}

func TestGenTwoSpecsSecondBad(t *testing.T) {
	root := quickstartModule(t)
	// A second package whose spec names a missing objective.
	writeFile(t, filepath.Join("other", "other.go"), "package other\n\nfunc Loss(x float64) float64 { return x * x }\n")
	writeFile(t, filepath.Join("other", "other.toml"), `[[minimizer]]
name = "Other"
objective = "Lost"
start = 1.0
`)
	// A spec-level error in the same package.
	writeFile(t, "second.toml", `[[minimizer]]
name = "Second"
objective = "GainCost"
`)
	before := snapshot(t, root)
	code, _, stderr := thalweg("gen", "quickstart.toml", filepath.Join("other", "other.toml"))
	if code != 2 {
		t.Fatalf("gen with a bad second spec exited %d, want 2:\n%s", code, stderr)
	}
	if got := problemLines(t, stderr); len(got) != 1 || got[0] != filepath.Join("other", "other.toml")+":3:13: objective Lost: no such function in package other; did you mean Loss?" {
		t.Errorf("stderr = %q", got)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("gen wrote files for the good spec: %s", d)
	}

	code, _, stderr = thalweg("gen", "quickstart.toml", "second.toml")
	if code != 2 {
		t.Fatalf("gen with a bad second spec exited %d, want 2:\n%s", code, stderr)
	}
	if got := problemLines(t, stderr); len(got) != 1 || got[0] != "second.toml:1:3: start is required: a typical starting point" {
		t.Errorf("stderr = %q", got)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("gen wrote files for the good spec: %s", d)
	}

	// A good second spec whose output is a hand-written file: refused
	// before anything is written for the first.
	writeFile(t, "second.toml", `[[minimizer]]
name = "Second"
objective = "GainCost"
start = 1.0
output = "handwritten.go"
`)
	writeFile(t, "handwritten.go", "package quickstart\n")
	before = snapshot(t, root)
	code, _, stderr = thalweg("gen", "quickstart.toml", "second.toml")
	if code != 2 {
		t.Fatalf("gen over a hand-written file exited %d, want 2:\n%s", code, stderr)
	}
	if got := problemLines(t, stderr); len(got) != 1 || !strings.HasPrefix(got[0], "handwritten.go:1:1: refusing to overwrite") {
		t.Errorf("stderr = %q", got)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("refused gen changed files: %s", d)
	}
}

// Usage errors exit 2 with the command's short usage on stderr, or the
// overview when there is no command to speak of.
func TestUsageErrors(t *testing.T) {
	for _, c := range []struct {
		args []string
		want string // on stderr
	}{
		{nil, "thalweg gen SPEC..."},
		{[]string{"frobnicate"}, `thalweg: unknown command "frobnicate"`},
		{[]string{"--bogus"}, "thalweg: unknown flag: --bogus"},
		{[]string{"gen"}, "thalweg gen: name at least one spec file"},
		{[]string{"check"}, "thalweg check: name at least one spec file"},
		{[]string{"gen", "x.toml", "--bogus"}, "thalweg gen: unknown flag: --bogus"},
		{[]string{"gen", "--delete-orphans=maybe", "x.toml"}, "thalweg gen: invalid argument"},
		{[]string{"init"}, "thalweg init: name one objective"},
		{[]string{"init", "F", "--out"}, "thalweg init: flag needs an argument: --out"},
		{[]string{"tune"}, "thalweg tune: name one spec"},
		{[]string{"trace", "a.toml", "b.toml"}, "thalweg trace: name one spec"},
		{[]string{"rules", "extra"}, "thalweg rules: takes no arguments"},
		{[]string{"version", "extra"}, "thalweg version: takes no arguments"},
		{[]string{"help", "frobnicate"}, `thalweg help: unknown command "frobnicate"`},
		{[]string{"help", "gen", "check"}, "thalweg help: name at most one command"},
	} {
		code, stdout, stderr := thalweg(c.args...)
		if code != 2 {
			t.Errorf("thalweg %q exited %d, want 2", c.args, code)
		}
		if !strings.Contains(stderr, c.want) {
			t.Errorf("thalweg %q: stderr lacks %q:\n%s", c.args, c.want, stderr)
		}
		usage := "usage:\n  thalweg gen SPEC..." // the overview
		if len(c.args) > 0 && lookupCommand(c.args[0]) != nil {
			usage = "usage: " + lookupCommand(c.args[0]).usageLine() + "\nRun \"thalweg help " + c.args[0] + "\""
		}
		if !strings.Contains(stderr, usage) {
			t.Errorf("thalweg %q: stderr lacks the usage %q:\n%s", c.args, usage, stderr)
		}
		if stdout != "" {
			t.Errorf("thalweg %q wrote to stdout:\n%s", c.args, stdout)
		}
	}
}

// Every form of help exits 0 and prints to stdout: the overview, or the
// command's usage line, description, arguments and every flag.
func TestHelp(t *testing.T) {
	flagsOf := map[string][]string{
		"gen":     {"--delete-orphans", "SPEC..."},
		"check":   {"SPEC..."},
		"init":    {"--out FILE", "OBJECTIVE"},
		"tune":    {"--name NAME", "SPEC"},
		"trace":   {"--name NAME", "--csv FILE", "--svg FILE", "SPEC"},
		"rules":   nil,
		"version": nil,
		"help":    {"COMMAND"},
	}
	if len(flagsOf) != len(commands) {
		t.Errorf("the test covers %d commands, the CLI has %d", len(flagsOf), len(commands))
	}
	check := func(args []string, want ...string) {
		t.Helper()
		code, stdout, stderr := thalweg(args...)
		if code != 0 || stderr != "" {
			t.Errorf("thalweg %q exited %d, stderr:\n%s", args, code, stderr)
		}
		for _, w := range want {
			if !strings.Contains(stdout, w) {
				t.Errorf("thalweg %q: stdout lacks %q:\n%s", args, w, stdout)
			}
		}
		if strings.Contains(stdout, "pflag") || strings.Contains(stdout, "[=true|false]") {
			t.Errorf("thalweg %q: stdout shows pflag's own texts:\n%s", args, stdout)
		}
	}
	overview := []string{"usage:\n"}
	for _, c := range commands {
		overview = append(overview, "\n  "+c.usageLine()+"\n      "+c.summary+"\n")
	}
	for _, args := range [][]string{{"help"}, {"--help"}, {"-h"}} {
		check(args, overview...)
	}
	for _, c := range commands {
		want := append([]string{
			"usage: " + c.usageLine() + "\n\n" + upperFirst(c.summary) + ".\n",
			"\nflags:\n",
			"  -h, --help ",
		}, flagsOf[c.name]...)
		for _, args := range [][]string{
			{"help", c.name},
			{c.name, "-h"},
			{c.name, "--help"},
			{"--help", c.name},
			{"-h", c.name},
			{c.name, "extra", "arguments", "-h"}, // help wins over a misuse
		} {
			check(args, want...)
		}
	}
}

func TestVersionAndRules(t *testing.T) {
	code, stdout, stderr := thalweg("version")
	if code != 0 || !strings.HasPrefix(stdout, "thalweg ") || stderr != "" {
		t.Errorf("version: exit %d, stdout %q, stderr %q", code, stdout, stderr)
	}

	code, stdout, stderr = thalweg("rules")
	if code != 0 || stderr != "" {
		t.Fatalf("rules: exit %d, stderr %q", code, stderr)
	}
	names := []string{
		"steepest", "bfgs", "lbfgs", "cg",
		"fixed", "decrease", "armijo", "wolfe", "strong-wolfe",
		"analytic", "forward", "central",
	}
	for _, c := range rules.Choices() {
		names = append(names, c.Names()...)
	}
	for _, p := range rules.Params() {
		names = append(names, p.Key)
	}
	for _, name := range names {
		if !regexp.MustCompile(`(?m)^\s+` + regexp.QuoteMeta(name) + `\s`).MatchString(stdout) {
			t.Errorf("rules output has no entry for %q", name)
		}
	}
	for _, feature := range []*rules.Feature{rules.Bounds, rules.Combined} {
		if !strings.Contains(stdout, feature.Summary) || !strings.Contains(stdout, feature.Math) {
			t.Errorf("rules output lacks a feature: %q", feature.Summary)
		}
	}
}

func containsLine(text, line string) bool {
	for _, l := range strings.Split(text, "\n") {
		if l == line {
			return true
		}
	}
	return false
}

func keys(m map[string]string) []string {
	var ks []string
	for k := range m {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	return ks
}

// A user declaration that clashes with a generated name is one line at
// the user's declaration, also when an older generated file already
// declares the name (the compiler's "redeclared" error is not repeated).
func TestGenReportsNameClashOnce(t *testing.T) {
	quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	writeFile(t, "clash.go", "package quickstart\n\ntype CalibrateStatus int\n")
	code, _, stderr := thalweg("gen", "quickstart.toml")
	want := "clash.go:3:6: CalibrateStatus is already declared in package quickstart; minimizer Calibrate generates a declaration of that name (rename one of them)"
	if code != 2 || strings.TrimSpace(stderr) != want {
		t.Errorf("gen exited %d, want 2 with exactly\n%s\ngot:\n%s", code, want, stderr)
	}
}

// A second spec whose minimizer takes a name that another spec's output
// already declares is refused at that declaration, and nothing is
// written: the package would no longer compile.
func TestGenRefusesNameTakenByAnotherSpec(t *testing.T) {
	root := quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	writeFile(t, "second.toml", "[[minimizer]]\nname = \"TuneGain\"\nobjective = \"GainCost\"\noutput = \"second_min.go\"\nstart = 3.0\n")
	before := snapshot(t, root)
	code, _, stderr := thalweg("gen", "second.toml")
	want := "tune_gain_min.go:"
	if code != 2 || !strings.HasPrefix(strings.TrimSpace(stderr), want) || !strings.Contains(stderr, "is already declared here, in a file thalweg generated from quickstart.toml; minimizer TuneGain of second.toml generates a declaration of that name") {
		t.Errorf("gen exited %d, want 2 with a problem at %s…, got:\n%s", code, want, stderr)
	}
	if diff := sameFiles(before, snapshot(t, root)); diff != "" {
		t.Errorf("a refused gen changed files:\n%s", diff)
	}
	// Regenerating the first spec alone still works: its own files are
	// replaced, not counted as taken.
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Errorf("regenerating quickstart.toml exited %d:\n%s", code, stderr)
	}
}

// init writes a starter spec with every key, proposes a fitting gradient
// and instance, and never overwrites. Its start is nan, which gen refuses
// until the user writes a real one: a start of zeros is often stationary.
func TestInit(t *testing.T) {
	quickstartModule(t)
	writeFile(t, "plant.go", `package quickstart

type Plant struct{ Target [2]float64 }

func NewPlant() *Plant { return &Plant{Target: [2]float64{1, 2}} }

func (p *Plant) Cost(x [2]float64) float64 {
	a, b := x[0]-p.Target[0], x[1]-p.Target[1]
	return a*a + b*b
}

func (p *Plant) CostGrad(x, g *[2]float64) {
	g[0], g[1] = 2*(x[0]-p.Target[0]), 2*(x[1]-p.Target[1])
}
`)
	code, stdout, stderr := thalweg("init", "Plant.Cost")
	if code != 0 || !strings.Contains(stdout, "plant_cost.toml") {
		t.Fatalf("init exited %d:\n%s%s", code, stdout, stderr)
	}
	data, err := os.ReadFile("plant_cost.toml")
	if err != nil {
		t.Fatal(err)
	}
	spec := string(data)
	for _, want := range []string{
		`name = "MinimizePlantCost"`, `objective = "Plant.Cost"`, `derivative = "analytic"`,
		`gradient = "Plant.CostGrad"`, `instance = "NewPlant"`, `start = [nan, nan]`,
		`rule = "wolfe"`, "# shrink = 0.5", `evaluations = 200000`, "# memory = 5", "curvature = 0.9", `gradient_test = "relative"`,
	} {
		if !strings.Contains(spec, want) {
			t.Errorf("starter spec lacks %q:\n%s", want, spec)
		}
	}
	code, _, stderr = thalweg("gen", "plant_cost.toml")
	if code != 2 || !strings.Contains(stderr, "plant_cost.toml:12:1") && !strings.Contains(stderr, "start must be finite: replace it with a typical starting point") {
		t.Fatalf("gen on the starter spec as written exited %d, want 2 asking for a start:\n%s", code, stderr)
	}
	writeFile(t, "plant_cost.toml", strings.Replace(spec, "[nan, nan]", "[3.0, -1.0]", 1))
	if code, _, stderr := thalweg("gen", "plant_cost.toml"); code != 0 {
		t.Fatalf("gen on the starter spec with a start exited %d:\n%s", code, stderr)
	}
	// A receiver with data and no New<Type>: init asks for the instance,
	// and gen refuses the zero value.
	writeFile(t, "rig.go", `package quickstart

type Rig struct{ Offset float64 }

func (r Rig) Cost(x float64) float64 { return (x - r.Offset) * (x - r.Offset) }
`)
	if code, _, stderr := thalweg("init", "Rig.Cost"); code != 0 {
		t.Fatalf("init Rig.Cost exited %d:\n%s", code, stderr)
	}
	rig, _ := os.ReadFile("rig_cost.toml")
	if !strings.Contains(string(rig), `instance = ""`) || !strings.Contains(string(rig), "REQUIRED") {
		t.Errorf("init for a receiver with data does not ask for the instance:\n%s", rig)
	}
	writeFile(t, "rig_cost.toml", strings.Replace(strings.Replace(string(rig), "nan", "2.0", 1), `instance = ""`, "", 1))
	code, _, stderr = thalweg("gen", "rig_cost.toml")
	if code != 2 || !strings.Contains(stderr, "objective Rig.Cost is a method of Rig, which holds a field: set instance") {
		t.Errorf("gen without an instance for a receiver with data exited %d:\n%s", code, stderr)
	}
	if code, _, stderr := thalweg("init", "GainCost", "--out", "gain.toml"); code != 0 {
		t.Fatalf("init --out exited %d:\n%s", code, stderr)
	}
	writeFile(t, "gain.toml", "# mine\n")
	code, _, stderr = thalweg("init", "GainCost", "--out", "gain.toml")
	if got, _ := os.ReadFile("gain.toml"); code != 2 || string(got) != "# mine\n" || !strings.Contains(stderr, "gain.toml:1:1: refusing to overwrite") {
		t.Errorf("init over an existing file exited %d and left %q:\n%s", code, got, stderr)
	}
	// Without a gradient: derivative = "automatic" when thalweg can
	// differentiate the source (Rig.Cost above), "central" with the reason
	// when it cannot.
	if !strings.Contains(string(rig), `derivative = "automatic"`) {
		t.Errorf("init without a gradient does not propose automatic for a differentiable objective:\n%s", rig)
	}
	writeFile(t, "gamma.go", "package quickstart\n\nimport \"math\"\n\nfunc Spread(x float64) float64 { return math.Gamma(x) }\n")
	if code, _, stderr := thalweg("init", "Spread"); code != 0 {
		t.Fatalf("init Spread exited %d:\n%s", code, stderr)
	}
	if data, _ := os.ReadFile("spread.toml"); !strings.Contains(string(data), `derivative = "central"`) || !strings.Contains(string(data), `not "automatic": gamma.go:5 has math.Gamma: no derivative rule`) {
		t.Errorf("init for an objective automatic refuses does not say why it proposes central:\n%s", data)
	}
	// Too many unknowns for bfgs's matrix on the stack: init proposes
	// lbfgs, and refuses when not even a vector fits.
	writeFile(t, "big.go", "package quickstart\n\nfunc Wide(x *[200]float64) float64 { return x[0] * x[0] }\n\nfunc Huge(x *[20000]float64) float64 { return x[0] * x[0] }\n")
	if code, _, stderr := thalweg("init", "Wide"); code != 0 {
		t.Fatalf("init Wide exited %d:\n%s", code, stderr)
	}
	if data, _ := os.ReadFile("wide.toml"); !strings.Contains(string(data), `direction = "lbfgs"`) {
		t.Errorf("init for 200 unknowns does not propose lbfgs:\n%s", data)
	}
	// From 20 unknowns lbfgs solves faster than bfgs (README, Performance):
	// init proposes it there, and bfgs below.
	writeFile(t, "mid.go", "package quickstart\n\nfunc Mid(x *[20]float64) float64 { return x[0] * x[0] }\n\nfunc Few(x *[19]float64) float64 { return x[0] * x[0] }\n")
	for name, want := range map[string]string{"Mid": "lbfgs", "Few": "bfgs"} {
		if code, _, stderr := thalweg("init", name); code != 0 {
			t.Fatalf("init %s exited %d:\n%s", name, code, stderr)
		}
		if data, _ := os.ReadFile(strings.ToLower(name) + ".toml"); !strings.Contains(string(data), `direction = "`+want+`"`) {
			t.Errorf("init for %s does not propose %s:\n%s", name, want, data)
		}
	}
	if code, _, stderr := thalweg("init", "Huge"); code != 2 || !strings.Contains(stderr, "big.go:5:6: objective Huge has 20000 unknowns") {
		t.Errorf("init for 20000 unknowns exited %d:\n%s", code, stderr)
	}
	// --start writes the start and proposes scale from it: |startᵢ|, 1
	// where startᵢ is 0; gen takes the spec as written.
	writeFile(t, "coil.go", "package quickstart\n\nfunc Coil(x [3]float64) float64 {\n\ta, b := (x[0]-2e-3)/1e-3, (x[1]-3e5)/1e5\n\treturn a*a + b*b + x[2]*x[2]\n}\n")
	if code, _, stderr := thalweg("init", "Coil", "--start", "1e-3,-2e5,0"); code != 0 {
		t.Fatalf("init --start exited %d:\n%s", code, stderr)
	}
	coil, _ := os.ReadFile("coil.toml")
	for _, want := range []string{"start = [0.001, -200000, 0]", "scale = [0.001, 200000, 1]"} {
		if !strings.Contains(string(coil), want) {
			t.Errorf("init --start does not write %q:\n%s", want, coil)
		}
	}
	if code, _, stderr := thalweg("gen", "coil.toml"); code != 0 {
		t.Errorf("gen on the starter spec from init --start exited %d:\n%s", code, stderr)
	}
	if code, _, stderr := thalweg("init", "Coil", "--start", "1,2", "--out", "coil2.toml"); code != 2 || !strings.Contains(stderr, "--start has 2 values, objective Coil has 3 unknowns") {
		t.Errorf("init with a start of the wrong length exited %d:\n%s", code, stderr)
	}
	if code, _, stderr := thalweg("init", "NoSuchFunc"); code != 2 || !strings.Contains(stderr, "objective NoSuchFunc: no such function") {
		t.Errorf("init of a missing objective exited %d:\n%s", code, stderr)
	}
	if _, err := os.Stat("no_such_func.toml"); err == nil {
		t.Errorf("a failed init left a file behind")
	}
}

// trace runs a minimizer once through an overlay, prints one row per
// iteration and writes the CSV and SVG, leaving the package untouched.
func TestTrace(t *testing.T) {
	quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	// The package's own tests do not even compile: trace leaves them out.
	writeFile(t, "broken_test.go", "package quickstart\n\nfunc TestBroken() { nope }\n")
	before := snapshot(t, ".")
	csvPath := filepath.Join(t.TempDir(), "calibrate.csv")
	svgPath := filepath.Join(t.TempDir(), "calibrate.svg")
	code, stdout, stderr := thalweg("trace", "quickstart.toml", "--name", "Calibrate", "--csv", csvPath, "--svg", svgPath)
	if code != 0 {
		t.Fatalf("trace exited %d:\n%s%s", code, stdout, stderr)
	}
	if d := sameFiles(before, snapshot(t, ".")); d != "" {
		t.Errorf("trace changed the package: %s", d)
	}
	if !strings.Contains(stdout, "gradient small (converged) after") {
		t.Errorf("trace output lacks the outcome:\n%s", stdout)
	}
	// The table's header: trials, calls left, decrease against prediction,
	// both stop measures over their limits; no column for differences with
	// Calibrate's analytic gradient.
	var header []string
	for _, line := range strings.Split(stdout, "\n") {
		if f := strings.Fields(line); len(f) > 0 && f[0] == "move" {
			header = f
		}
	}
	if want := "move trials calls left f decrease/predicted step t step/limit gradient/limit"; strings.Join(header, " ") != want {
		t.Errorf("table header %q, want %q:\n%s", strings.Join(header, " "), want, stdout)
	}
	data, err := os.ReadFile(csvPath)
	if err != nil {
		t.Fatal(err)
	}
	lines := strings.Split(strings.TrimSpace(string(data)), "\n")
	if lines[0] != "move,trials,difference_calls,calls_left,f,decrease_ratio,step_t,step_over_limit,gradient_over_limit,x1,x2" {
		t.Errorf("CSV header %q", lines[0])
	}
	// One row for the start and one per iteration; the iteration count is
	// the one the outcome line reports.
	var iterations, evaluations int
	for _, line := range strings.Split(stdout, "\n") {
		if strings.Contains(line, "(converged) after") {
			fmt.Sscanf(line[strings.Index(line, "after")+len("after"):], "%d iterations and %d", &iterations, &evaluations)
		}
	}
	if iterations == 0 || len(lines) != iterations+2 {
		t.Fatalf("CSV has %d lines for %d iterations", len(lines), iterations)
	}
	// The calls left fall by each move's trials (no differences here), and
	// at the end they are the cap (2000) less the run's calls; the last
	// move's gradient is within its limit (≤ 1), every Armijo step's
	// decrease ratio at least c1 = 1e-4.
	left := 2000 - 1
	for i, line := range lines[1:] {
		cells := strings.Split(line, ",")
		if cells[0] != strconv.Itoa(i) {
			t.Errorf("CSV row %d is move %s", i, cells[0])
		}
		trials, _ := strconv.Atoi(cells[1])
		callsLeft, _ := strconv.Atoi(cells[3])
		if left -= trials; cells[2] != "0" || callsLeft != left {
			t.Errorf("move %d: %d trials, %s difference calls, %d calls left; want %d left", i, trials, cells[2], callsLeft, left)
		}
		if i > 0 {
			if ratio, err := strconv.ParseFloat(cells[5], 64); err != nil || !(ratio >= 1e-4) || trials < 1 {
				t.Errorf("move %d: decrease ratio %q after %d trials", i, cells[5], trials)
			}
		}
	}
	if left != 2000-evaluations {
		t.Errorf("the rows leave %d calls, the run made %d of 2000", left, evaluations)
	}
	last := strings.Split(lines[len(lines)-1], ",")
	if g, _ := strconv.ParseFloat(last[8], 64); !(g <= 1) {
		t.Errorf("converged on the gradient, but the last gradient/limit is %s", last[8])
	}
	svg, err := os.ReadFile(svgPath)
	if err != nil {
		t.Fatal(err)
	}
	// Calibrate has two unknowns: the chart has contours and the path.
	for _, want := range []string{"<svg", `<line class="limit"`, `class="marker"`, `<path class="contour"`, `<circle class="iterate"`, `<rect class="start"`} {
		if !strings.Contains(string(svg), want) {
			t.Errorf("the SVG lacks %s", want)
		}
	}
	if err := xml.Unmarshal(svg, new(struct{})); err != nil {
		t.Errorf("the SVG is not well-formed: %v", err)
	}
	// TuneGain has one: no contour panel, and a column for its central
	// differences.
	code, stdout, stderr = thalweg("trace", "quickstart.toml", "--name", "TuneGain", "--svg", svgPath)
	if code != 0 {
		t.Fatalf("trace TuneGain exited %d:\n%s%s", code, stdout, stderr)
	}
	if !strings.Contains(stdout, "difference calls") {
		t.Errorf("TuneGain's table has no column for differences:\n%s", stdout)
	}
	if svg, _ := os.ReadFile(svgPath); !strings.Contains(string(svg), `class="marker"`) || strings.Contains(string(svg), "contour") {
		t.Errorf("TuneGain's SVG lacks markers or has contours")
	}

	code, _, stderr = thalweg("trace", "quickstart.toml")
	if code != 2 || !strings.Contains(stderr, "quickstart.toml:1:1: the spec has several minimizers; choose one with --name: TuneGain, Calibrate") {
		t.Errorf("trace without --name on two minimizers exited %d:\n%s", code, stderr)
	}
}

// tune ranks every sensible policy plus the spec's own, marks both the
// recommended row and the spec's choice, and leaves the package untouched.
func TestTune(t *testing.T) {
	quickstartModule(t)
	before := snapshot(t, ".")
	code, stdout, stderr := thalweg("tune", "quickstart.toml", "--name", "Calibrate")
	if code != 0 {
		t.Fatalf("tune exited %d:\n%s%s", code, stdout, stderr)
	}
	if d := sameFiles(before, snapshot(t, ".")); d != "" {
		t.Errorf("tune changed the package: %s", d)
	}
	var rows []string
	for _, line := range strings.Split(stdout, "\n") {
		if strings.Contains(line, " + ") {
			rows = append(rows, line)
		}
	}
	// Every sensible policy once; the spec's bfgs + armijo is one of them.
	if want := len(gen.TunePolicies(false, false)); want < 11 || len(rows) != want {
		t.Fatalf("tune printed %d policy rows, want %d (at least 11):\n%s", len(rows), want, stdout)
	}
	if !strings.Contains(rows[0], "← recommended") || !strings.Contains(rows[0], "gradient small") {
		t.Errorf("first row is not the recommended, converged one: %q", rows[0])
	}
	if n := strings.Count(stdout, "the spec's choice"); n != 1 {
		t.Errorf("the spec's choice is marked %d times", n)
	}
	for _, r := range rows {
		if strings.HasPrefix(r, "bfgs + armijo ") && !strings.HasPrefix(r, "bfgs + armijo (") && !strings.Contains(r, "the spec's choice") {
			t.Errorf("the spec's bfgs + armijo row is not marked: %q", r)
		}
	}
}

// An objective without a gradient goes through every command with
// derivative = "automatic": init proposes it, gen writes the derived
// gradient beside the minimizer, trace accounts for every call with no
// column for differences, and tune builds its variants (each with its own
// copy of the derived code) beside the spec's own file and ranks them.
func TestAutomaticObjective(t *testing.T) {
	quickstartModule(t)
	writeFile(t, "plain.go", `package quickstart

// CalibrationPlain is the calibration's sum of squares, value alone.
func CalibrationPlain(p *[2]float64) float64 {
	var sum float64
	for i, raw := range rawReadings {
		r := p[0]*raw + p[1] - refSpeeds[i]
		sum += r * r
	}
	return sum
}
`)
	if code, _, stderr := thalweg("init", "CalibrationPlain"); code != 0 {
		t.Fatalf("init exited %d:\n%s", code, stderr)
	}
	data, err := os.ReadFile("calibration_plain.toml")
	if err != nil {
		t.Fatal(err)
	}
	spec := string(data)
	if !strings.Contains(spec, `derivative = "automatic"`) {
		t.Fatalf("init does not propose derivative = \"automatic\":\n%s", spec)
	}
	writeFile(t, "calibration_plain.toml", strings.Replace(spec, "[nan, nan]", "[1.0, 0.0]", 1))
	if code, _, stderr := thalweg("gen", "calibration_plain.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	out, err := os.ReadFile("minimize_calibration_plain_min.go")
	if err != nil || !strings.Contains(string(out), "func minimizeCalibrationPlainAutoGradient(p *[2]float64, grad *[2]float64) {") {
		t.Fatalf("the generated file lacks the derived gradient (%v)", err)
	}
	code, stdout, stderr := thalweg("trace", "calibration_plain.toml")
	if code != 0 || !strings.Contains(stdout, "gradient small (converged) after") || strings.Contains(stdout, "difference calls") {
		t.Fatalf("trace exited %d, or did not converge, or shows difference calls:\n%s%s", code, stdout, stderr)
	}
	code, stdout, stderr = thalweg("tune", "calibration_plain.toml")
	if code != 0 || !strings.Contains(stdout, "← recommended") {
		t.Fatalf("tune exited %d:\n%s%s", code, stdout, stderr)
	}
}

// A combined objective, which returns its value and writes its gradient
// through g, goes through every command: init proposes derivative =
// "analytic" without a gradient key, gen writes a minimizer whose tests
// pass, trace accounts for every call with no column for differences,
// and tune ranks every policy with it.
func TestCombinedObjective(t *testing.T) {
	quickstartModule(t)
	writeFile(t, "both.go", `package quickstart

// CalibrationBoth is CalibrationError and its gradient in one call.
func CalibrationBoth(p, g *[2]float64) float64 {
	var sum float64
	g[0], g[1] = 0, 0
	for i, raw := range rawReadings {
		r := p[0]*raw + p[1] - refSpeeds[i]
		sum += r * r
		g[0] += 2 * r * raw
		g[1] += 2 * r
	}
	return sum
}
`)
	if code, _, stderr := thalweg("init", "CalibrationBoth"); code != 0 {
		t.Fatalf("init exited %d:\n%s", code, stderr)
	}
	data, err := os.ReadFile("calibration_both.toml")
	if err != nil {
		t.Fatal(err)
	}
	spec := string(data)
	if !strings.Contains(spec, `derivative = "analytic"`) || !strings.Contains(spec, "the objective writes its gradient through g") || strings.Contains(spec, `gradient = "`) {
		t.Errorf("the starter spec for a combined objective does not ask for derivative = \"analytic\" without a gradient key:\n%s", spec)
	}
	writeFile(t, "calibration_both.toml", strings.Replace(spec, "[nan, nan]", "[1.0, 0.0]", 1))
	if code, _, stderr := thalweg("gen", "calibration_both.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	code, stdout, stderr := thalweg("trace", "calibration_both.toml")
	if code != 0 || !strings.Contains(stdout, "gradient with each value (combined objective)") || !strings.Contains(stdout, "gradient small (converged) after") || strings.Contains(stdout, "difference calls") {
		t.Fatalf("trace exited %d, or did not converge, or shows difference calls:\n%s%s", code, stdout, stderr)
	}
	code, stdout, stderr = thalweg("tune", "calibration_both.toml")
	if code != 0 {
		t.Fatalf("tune exited %d:\n%s%s", code, stdout, stderr)
	}
	var rows []string
	for _, line := range strings.Split(stdout, "\n") {
		if strings.Contains(line, " + ") {
			rows = append(rows, line)
		}
	}
	if len(rows) != len(gen.TunePolicies(false, false)) || !strings.Contains(rows[0], "← recommended") || !strings.Contains(stdout, "Each objective call gives the value and the gradient together") {
		t.Errorf("tune printed %d rows for %d policies, or no recommendation, or not the note on combined calls:\n%s", len(rows), len(gen.TunePolicies(false, false)), stdout)
	}
}

// TestGenReplacesFormerHeader: files generated before the project was
// renamed carry the former tool name in their header; gen recognises them
// as its own and replaces them with thalweg's header.
func TestGenReplacesFormerHeader(t *testing.T) {
	root := quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	fresh := snapshot(t, root)
	former := strings.Replace(fresh["qs/tune_gain_min.go"], "by thalweg from", "by "+reverseString("ridan")+" from", 1)
	if former == fresh["qs/tune_gain_min.go"] {
		t.Fatal("the generated file has no header to rewrite")
	}
	writeFile(t, "tune_gain_min.go", former)
	if code, _, stderr := thalweg("check", "quickstart.toml"); code != 1 || !containsLine(stderr, "tune_gain_min.go: stale") {
		t.Errorf("check over a file with the former header exited %d, want 1 calling it stale:\n%s", code, stderr)
	}
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen over a file with the former header exited %d:\n%s", code, stderr)
	}
	if d := sameFiles(fresh, snapshot(t, root)); d != "" {
		t.Errorf("gen did not restore thalweg's header: %s", d)
	}
}

func reverseString(s string) string {
	r := []rune(s)
	for i, j := 0, len(r)-1; i < j; i, j = i+1, j-1 {
		r[i], r[j] = r[j], r[i]
	}
	return string(r)
}

// gen prints one "wrote PATH" line per file it writes and leaves files
// that already hold the right bytes untouched, modification time included.
func TestGenReportsWritesAndKeepsIdenticalFiles(t *testing.T) {
	quickstartModule(t)
	code, stdout, stderr := thalweg("gen", "quickstart.toml")
	if code != 0 || stderr != "" {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	want := "wrote tune_gain_min.go\nwrote tune_gain_min_test.go\nwrote calibrate_min.go\nwrote calibrate_min_test.go\n"
	if stdout != want {
		t.Errorf("first gen printed\n%swant\n%s", stdout, want)
	}

	old := time.Now().Add(-time.Hour).Truncate(time.Second)
	for _, name := range quickstartOutputs {
		if err := os.Chtimes(name, old, old); err != nil {
			t.Fatal(err)
		}
	}
	modTimes := func() map[string]time.Time {
		times := map[string]time.Time{}
		for _, name := range quickstartOutputs {
			info, err := os.Stat(name)
			if err != nil {
				t.Fatal(err)
			}
			times[name] = info.ModTime()
		}
		return times
	}

	code, stdout, stderr = thalweg("gen", "quickstart.toml")
	if code != 0 || stdout != "" || stderr != "" {
		t.Errorf("gen over fresh files exited %d, stdout %q, stderr %q; want 0 and silence", code, stdout, stderr)
	}
	for name, mt := range modTimes() {
		if !mt.Equal(old) {
			t.Errorf("gen touched the identical file %s", name)
		}
	}

	data, err := os.ReadFile("calibrate_min.go")
	if err != nil {
		t.Fatal(err)
	}
	writeFile(t, "calibrate_min.go", string(data)+"// edited\n")
	if err := os.Chtimes("calibrate_min.go", old, old); err != nil {
		t.Fatal(err)
	}
	code, stdout, stderr = thalweg("gen", "quickstart.toml")
	if code != 0 || stdout != "wrote calibrate_min.go\n" || stderr != "" {
		t.Errorf("gen over one edited file exited %d, stdout %q, stderr %q; want only that file written", code, stdout, stderr)
	}
	for name, mt := range modTimes() {
		if mt.Equal(old) != (name != "calibrate_min.go") {
			t.Errorf("%s: modification time %v, old %v", name, mt, old)
		}
	}
	if got, _ := os.ReadFile("calibrate_min.go"); string(got) != string(data) {
		t.Errorf("gen did not restore calibrate_min.go")
	}
}

// After a minimizer is renamed, its old files are orphans: check names
// them and exits 1, gen keeps them unless --delete-orphans is given, and
// files without the spec's header are never deleted.
func TestOrphansAfterRename(t *testing.T) {
	root := quickstartModule(t)
	if code, _, stderr := thalweg("gen", "quickstart.toml"); code != 0 {
		t.Fatalf("gen exited %d:\n%s", code, stderr)
	}
	writeFile(t, "hand.go", "package quickstart\n\n// Written by hand.\n")
	writeFile(t, "other_min.go", "// Code generated by thalweg from other.toml; DO NOT EDIT.\n\npackage quickstart\n")
	writeFile(t, "late.go", "package quickstart\n\n// Code generated by thalweg from quickstart.toml; DO NOT EDIT.\n")
	spec, err := os.ReadFile("quickstart.toml")
	if err != nil {
		t.Fatal(err)
	}
	renamed := strings.Replace(string(spec), `name = "TuneGain"`, `name = "SetGain"`, 1)
	if renamed == string(spec) {
		t.Fatal("quickstart.toml has no minimizer TuneGain to rename")
	}
	writeFile(t, "quickstart.toml", renamed)
	orphans := []string{
		"tune_gain_min.go: orphan (generated from quickstart.toml, no longer produced)",
		"tune_gain_min_test.go: orphan (generated from quickstart.toml, no longer produced)",
	}

	before := snapshot(t, root)
	code, stdout, stderr := thalweg("check", "quickstart.toml")
	want := strings.Join(append(append([]string{"set_gain_min.go: missing", "set_gain_min_test.go: missing"}, orphans...),
		"run thalweg gen --delete-orphans to regenerate and delete the orphans"), "\n") + "\n"
	if code != 1 || stdout != "" || stderr != want {
		t.Errorf("check after the rename exited %d, stderr\n%swant 1 and\n%s", code, stderr, want)
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("check changed files: %s", d)
	}

	code, stdout, stderr = thalweg("gen", "quickstart.toml")
	want = strings.Join(append(orphans, "thalweg gen: orphans kept; run again with --delete-orphans to delete them"), "\n") + "\n"
	if code != 0 || stdout != "wrote set_gain_min.go\nwrote set_gain_min_test.go\n" || stderr != want {
		t.Errorf("gen after the rename exited %d, stdout\n%sstderr\n%swant 0 and\n%s", code, stdout, stderr, want)
	}
	for _, name := range []string{"tune_gain_min.go", "tune_gain_min_test.go"} {
		if _, err := os.Stat(name); err != nil {
			t.Errorf("gen without --delete-orphans deleted %s", name)
		}
	}

	code, _, stderr = thalweg("check", "quickstart.toml")
	want = strings.Join(append(orphans, "run thalweg gen --delete-orphans to delete the orphans"), "\n") + "\n"
	if code != 1 || stderr != want {
		t.Errorf("check with orphans only exited %d, stderr\n%swant 1 and\n%s", code, stderr, want)
	}

	before = snapshot(t, root)
	code, stdout, stderr = thalweg("gen", "quickstart.toml", "--delete-orphans")
	if code != 0 || stdout != "deleted tune_gain_min.go\ndeleted tune_gain_min_test.go\n" || stderr != "" {
		t.Errorf("gen --delete-orphans exited %d, stdout %q, stderr %q", code, stdout, stderr)
	}
	after := snapshot(t, root)
	if d := sameFiles(before, after); d != "qs/tune_gain_min.go removed, qs/tune_gain_min_test.go removed" {
		t.Errorf("gen --delete-orphans changed: %s", d)
	}
	if code, _, stderr := thalweg("check", "quickstart.toml"); code != 0 {
		t.Errorf("check after deleting the orphans exited %d:\n%s", code, stderr)
	}
}

// An objective name with a typo is reported at the spec's value with the
// closest name the package declares.
func TestObjectiveTypoSuggestsName(t *testing.T) {
	quickstartModule(t)
	writeFile(t, "typo.toml", `[[minimizer]]
name = "Tune"
objective = "GainCots"
start = 1.0
`)
	code, _, stderr := thalweg("gen", "typo.toml")
	want := "typo.toml:3:13: objective GainCots: no such function in package quickstart; did you mean GainCost?\n"
	if code != 2 || stderr != want {
		t.Errorf("gen with an objective typo exited %d, stderr\n%swant 2 and\n%s", code, stderr, want)
	}
}

// Spec errors of one minimizer and objective errors of others, in the
// same spec or another, come in one run, sorted by file and position.
func TestSpecAndObjectiveErrorsInOneRun(t *testing.T) {
	root := quickstartModule(t)
	writeFile(t, "bad.toml", `[[minimizer]]
name = "Tune"
objective = "GainCots"
start = 1.0

[[minimizer]]
name = "Calib"
objective = "CalibrationError"
start = [1.0, 1.0]
[minimizer.step]
shrink = 1.5
`)
	writeFile(t, "worse.toml", `[[minimizer]]
name = "Raw"
objective = "rawReadings"
start = 1.0
`)
	before := snapshot(t, root)
	for _, verb := range []string{"gen", "check"} {
		code, _, stderr := thalweg(verb, "bad.toml", "quickstart.toml", "worse.toml")
		want := []string{
			"bad.toml:3:13: objective GainCots: no such function in package quickstart; did you mean GainCost?",
			`bad.toml:11:1: step.shrink is not used by rule "wolfe"`,
			"quickstart.go:18:2: objective rawReadings is not a function",
		}
		if got := problemLines(t, stderr); code != 2 || strings.Join(got, "\n") != strings.Join(want, "\n") {
			t.Errorf("%s exited %d, stderr\n%s\nwant 2 and\n%s", verb, code, strings.Join(got, "\n"), strings.Join(want, "\n"))
		}
	}
	if d := sameFiles(before, snapshot(t, root)); d != "" {
		t.Errorf("a run with errors changed files: %s", d)
	}
}
