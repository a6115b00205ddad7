package gen

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"sort"
	"strings"
	"testing"
)

// badSpecs pins every spec-only error: the file under testdata/bad and the
// exact problems ParseSpec reports for it, in order, as "line:col: message"
// (the file part is checked separately). Decode errors carry go-toml's
// position; errors found after decoding point at the offending value, or at
// the key for "not used" and "not supported" keys, or at the [[minimizer]]
// header (the "minimizer" in it, column 3) for a missing required key.
var badSpecs = []struct {
	file string
	want []string
}{
	// TOML syntax and decoding (go-toml/v2 positions).
	{"syntax.toml", []string{
		"3:18: basic strings cannot have new lines",
	}},
	{"syntax_array.toml", []string{
		"4:18: array is incomplete",
	}},
	// Several unknown keys, at every level, all reported in one run.
	{"unknown_keys.toml", []string{
		`1:1: unknown key "packages"; did you mean "package"?`,
		`7:1: unknown key "minimizer.derivitive"; did you mean "derivative"?`,
		`11:1: unknown key "minimizer.step.shrinkage"; did you mean "shrink"?`,
		`15:1: unknown key "minimizer.stop.evals"`,
	}},
	{"unknown_table.toml", []string{
		`6:2: unknown key "minimizer.steps"; did you mean "step"?`,
	}},
	// Type mismatches point at the value and name the spec key.
	{"type_string_for_number.toml", []string{
		"7:10: step.shrink must be a number, not a TOML string",
	}},
	{"type_float_for_int.toml", []string{
		"7:10: step.trials must be a whole number, got 2.5",
	}},
	{"type_number_for_string.toml", []string{
		"4:13: direction must be a string, not a TOML integer",
	}},
	// Infinite values are outside every range, even "(0, ∞)".
	{"infinite_values.toml", []string{
		"7:11: step.initial must be in (0, ∞), got +Inf",
		"10:12: stop.gradient must be in [0, ∞), got +Inf",
		"11:8: stop.step must be in [0, ∞), got +Inf",
	}},
	// A plain [minimizer] table would decode, but its keys would have no
	// positions: it is refused at its header.
	{"single_table.toml", []string{
		"1:2: write [[minimizer]], an array of tables, not [minimizer]",
	}},
	// A conflict with cg's default c2 points at the decrease the file sets.
	{"curvature_default_below_decrease.toml", []string{
		`9:12: step.decrease (c1 = 0.2) must be below step.curvature (c2 = 0.1, the default for direction "cg"); lower step.decrease or set step.curvature`,
	}},
	// An unknown choice does not cascade into errors about keys that
	// depend on it.
	{"cascade_unknown_enum.toml", []string{
		`4:14: derivative "exact" is not one of "analytic", "automatic", "central", "forward"`,
		`6:13: direction "l-bfgs" is not one of "bfgs", "cg", "gauss-newton", "lbfgs", "levenberg-marquardt", "steepest"; did you mean "lbfgs"?`,
	}},
	// An unknown key inside an inline table keeps the table's name.
	{"unknown_key_inline.toml", []string{
		`5:27: unknown key "minimizer.step.shrinc"; did you mean "shrink"?`,
	}},
	// Output names the go tool would ignore or build only on one platform.
	{"output_ignored_by_go.toml", []string{
		`5:10: output "_fit.go" starts with "_": the go tool ignores such files`,
		`10:10: output ".go" starts with ".": the go tool ignores such files`,
	}},

	// Top level.
	{"no_minimizer.toml", []string{
		"1:1: no [[minimizer]] table: a spec names at least one minimizer",
	}},
	{"package_absolute.toml", []string{
		`1:11: package must be a directory relative to the spec file, got "/home/me/calib"`,
	}},
	{"package_empty.toml", []string{
		`1:11: package must be a directory relative to the spec file, got ""`,
	}},

	// Names and references.
	{"missing_name.toml", []string{
		"1:3: name is required: the exported Go name of the minimizer",
	}},
	{"name_unexported.toml", []string{
		`2:8: name "fit" is not an exported Go identifier`,
	}},
	{"name_not_identifier.toml", []string{
		`2:8: name "Fit-Curve" is not an exported Go identifier`,
	}},
	{"duplicate_names.toml", []string{
		"7:8: minimizer Fit is named twice in this spec",
	}},
	// FitCurve and FitCURVE both default to fit_curve_min.go; no output key,
	// so the second [[minimizer]] header is named.
	{"duplicate_outputs.toml", []string{
		"6:3: minimizers FitCurve and FitCURVE would both write fit_curve_min.go",
	}},
	{"missing_objective.toml", []string{
		`1:3: objective is required: "Func" or "Type.Method" in the package`,
	}},
	{"objective_malformed.toml", []string{
		`3:13: objective "calib.Model.Loss" is not "Func" or "Type.Method"`,
		`8:13: objective "Loss()" is not "Func" or "Type.Method"`,
	}},
	{"instance_malformed.toml", []string{
		`4:12: instance "calib.Default" is not the name of a package-level variable or function`,
	}},
	{"missing_start.toml", []string{
		"1:3: start is required: a typical starting point",
	}},
	{"dim_range.toml", []string{
		"5:7: dim must be between 1 and 65536, got 0",
	}},

	// Enumerated keys list the accepted values.
	{"unknown_derivative.toml", []string{
		`4:14: derivative "backward" is not one of "analytic", "automatic", "central", "forward"`,
	}},
	{"unknown_direction.toml", []string{
		`4:13: direction "newton" is not one of "bfgs", "cg", "gauss-newton", "lbfgs", "levenberg-marquardt", "steepest"`,
	}},
	{"unknown_rule.toml", []string{
		`7:8: step.rule "goldstein" is not one of "armijo", "damping", "decrease", "fixed", "strong-wolfe", "wolfe"`,
	}},

	// Keys that depend on other keys.
	{"gradient_not_analytic.toml", []string{
		`5:1: gradient is only used with derivative = "analytic" (derivative is "forward")`,
		`11:1: gradient is only used with derivative = "analytic" (derivative is "central")`,
	}},
	{"gradient_malformed.toml", []string{
		`5:12: gradient "Loss.Grad.X" is not "Func" or "Type.Method"`,
	}},
	{"rule_not_for_direction.toml", []string{
		`7:8: direction "gauss-newton" goes only with step.rule "fixed" or "decrease" or "armijo": its step needs the Jacobian at the accepted trial, which only the last trial's residuals give; the backtracking rules accept the last trial, a Wolfe search may not`,
		`15:8: step.rule "damping" goes only with direction "levenberg-marquardt": its step length comes from the damping λ, which step rule damping adjusts; a line search along one damped step would fight it`,
		`23:8: direction "levenberg-marquardt" goes only with step.rule "damping": its step length comes from the damping λ, which step rule damping adjusts; a line search along one damped step would fight it`,
	}},
	{"jacobian_not_analytic.toml", []string{
		`5:1: jacobian is only used with derivative = "analytic" (derivative is "central")`,
		`12:12: jacobian "Residuals.Jacobian.X" is not "Func" or "Type.Method"`,
	}},
	{"residuals_range.toml", []string{
		"6:13: residuals must be between 1 and 65536, got 0",
	}},
	{"memory_without_lbfgs.toml", []string{
		`5:1: memory is only used with direction = "lbfgs" (direction is "bfgs")`,
	}},
	{"memory_range.toml", []string{
		"5:10: memory must be in [1, 100], got 0",
		"12:10: memory must be in [1, 100], got 101",
	}},

	// [minimizer.step] ranges (Nocedal & Wright 2006, §3.1: ρ, c1 in (0,1),
	// 0 < c1 < c2 < 1).
	{"shrink_zero.toml", []string{
		"7:10: step.shrink must be in (0, 1), got 0",
	}},
	{"shrink_one.toml", []string{
		"7:10: step.shrink must be in (0, 1), got 1",
	}},
	{"decrease_range.toml", []string{
		"7:12: step.decrease must be in (0, 1), got 0",
		"15:12: step.decrease must be in (0, 1), got 1.5",
	}},
	{"initial_range.toml", []string{
		"7:11: step.initial must be in (0, ∞), got 0",
		"15:11: step.initial must be in (0, ∞), got -0.5",
	}},
	{"trials_zero.toml", []string{
		"7:10: step.trials must be in [1, 1000], got 0",
	}},
	{"nan_values.toml", []string{
		"7:10: step.shrink must be in (0, 1), got NaN",
		"8:11: step.initial must be in (0, ∞), got NaN",
		"12:8: stop.step must be in [0, ∞), got NaN",
	}},
	{"curvature_not_wolfe.toml", []string{
		`8:1: step.curvature is not used by rule "armijo"`,
	}},
	{"curvature_below_decrease.toml", []string{
		"9:13: step.curvature (c2 = 0.5) must exceed step.decrease (c1 = 0.5)",
		"19:13: step.curvature (c2 = 0.1) must exceed step.decrease (c1 = 0.3)",
	}},
	{"interpolate_not_used.toml", []string{
		`8:1: step.interpolate is not used by rule "fixed"`,
		`17:1: step.interpolate is not used by rule "wolfe"`,
	}},
	{"fixed_unused_params.toml", []string{
		`9:1: step.shrink is not used by rule "fixed"`,
		`10:1: step.decrease is not used by rule "fixed"`,
		`11:1: step.trials is not used by rule "fixed"`,
	}},

	// [minimizer.stop]
	{"stop_range.toml", []string{
		"7:14: stop.iterations must be in [1, 1e+09], got 0",
		"8:12: stop.gradient must be in [0, ∞), got -1e-08",
		"9:8: stop.step must be in [0, ∞), got -1",
		"10:15: stop.evaluations must be in [1, 1e+09], got 0",
	}},

	// output, bounds, expect.
	{"output_bad.toml", []string{
		`5:10: output "sub/fit_min.go" must be a file name in the objective's package directory, without folders`,
		`11:10: output "fit2_min.txt" must end in .go and not in _test.go`,
		`17:10: output "fit3_min_test.go" must end in .go and not in _test.go`,
	}},
	{"bounds.toml", []string{
		`7:2: direction "cg" cannot take bounds: its directions stay conjugate, and descend, only along unbroken lines, which projection onto the box breaks; use direction "lbfgs" or "bfgs" with bounds`,
		"16:2: [minimizer.bounds] needs lower, upper or both",
	}},
	{"expect_tolerance.toml", []string{
		"8:13: expect.tolerance must be a positive number, got 0",
		"17:13: expect.tolerance must be a positive number, got -1e-06",
	}},
	{"expect_without_x.toml", []string{
		"6:2: expect needs x, the expected minimizer, or status, the expected end",
	}},
	{"expect_status_unknown.toml", []string{
		`7:10: expect.status "exploded" is not one of "gradient small", "stalled", "out of iterations", "out of evaluations", "no acceptable step", "non-finite start", "non-finite gradient", "no decrease", "diverged"`,
	}},

	// Minimizers written as inline tables keep value positions.
	{"inline_tables.toml", []string{
		"2:87: step.shrink must be in (0, 1), got 1.5",
		"3:80: stop.gradient must be in [0, ∞), got -1",
	}},
	// Many errors in two minimizers, reported together and sorted by
	// position; two at the same place keep their discovery order.
	{"many_errors.toml", []string{
		`1:3: objective is required: "Func" or "Type.Method" in the package`,
		"1:3: start is required: a typical starting point",
		`2:8: name "fit" is not an exported Go identifier`,
		`5:1: memory is only used with direction = "lbfgs" (direction is "cg")`,
		`8:8: direction "cg" needs a step rule with a curvature condition: with "fixed" its directions need not descend (Nocedal & Wright 2006, §5.2); use step.rule = "strong-wolfe"`,
		`9:1: step.shrink is not used by rule "fixed"`,
		"12:14: stop.iterations must be in [1, 1e+09], got -5",
		`15:8: name "Fit-2" is not an exported Go identifier`,
		`16:13: objective "a.b.c" is not "Func" or "Type.Method"`,
		`18:10: output "x.go.txt" must end in .go and not in _test.go`,
	}},
}

// badSpecBugs are files under testdata/bad whose errors are wrong today;
// they stay out of badSpecs so the suite is green, and each is reported.
// None is known now.
var badSpecBugs = map[string]string{}

func badSpecPath(file string) string {
	return filepath.Join("..", "testdata", "bad", file)
}

// problemLines checks err is Problems positioned in file and renders each
// as "line:col: message".
func problemLines(t *testing.T, err error, file string) []string {
	t.Helper()
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("error is %T, want Problems: %v", err, err)
	}
	var lines []string
	for _, p := range probs {
		if p.Pos.File != file {
			t.Errorf("problem %q is in file %q, want %q", p.Error(), p.Pos.File, file)
		}
		if p.Pos.Line < 1 || p.Pos.Col < 1 {
			t.Errorf("problem %q has no position", p.Error())
		}
		lines = append(lines, fmt.Sprintf("%d:%d: %s", p.Pos.Line, p.Pos.Col, p.Msg))
	}
	if !sort.SliceIsSorted(probs, func(i, j int) bool {
		a, b := probs[i].Pos, probs[j].Pos
		return a.Line < b.Line || a.Line == b.Line && a.Col < b.Col
	}) {
		t.Errorf("problems are not sorted by position:\n%v", err)
	}
	return lines
}

// allValid reports whether no minimizer of the spec has a problem; a spec
// returned beside problems that are not all at the top level must mark
// the minimizers they belong to.
func allValid(spec *Spec) bool {
	if spec.problems > 0 {
		return false
	}
	for _, m := range spec.Minimizers {
		if !m.Valid() {
			return false
		}
	}
	return len(spec.Minimizers) > 0
}

func TestBadSpecs(t *testing.T) {
	for _, c := range badSpecs {
		t.Run(strings.TrimSuffix(c.file, ".toml"), func(t *testing.T) {
			path := badSpecPath(c.file)
			spec, err := ParseSpec(path)
			if err == nil {
				t.Fatalf("ParseSpec(%s) succeeded, want %d problems", path, len(c.want))
			}
			if spec != nil && allValid(spec) {
				t.Errorf("ParseSpec returned problems but calls every minimizer valid")
			}
			got := problemLines(t, err, path)
			if strings.Join(got, "\n") != strings.Join(c.want, "\n") {
				t.Errorf("problems of %s:\ngot:\n\t%s\nwant:\n\t%s", c.file, strings.Join(got, "\n\t"), strings.Join(c.want, "\n\t"))
			}
			// The error text is exactly what the CLI prints.
			var lines []string
			for _, w := range c.want {
				lines = append(lines, path+":"+w)
			}
			if err.Error() != strings.Join(lines, "\n") {
				t.Errorf("Error() =\n%s\nwant\n%s", err.Error(), strings.Join(lines, "\n"))
			}
		})
	}
}

// TestBadSpecFilesCovered keeps testdata/bad and the tables in step.
func TestBadSpecFilesCovered(t *testing.T) {
	files, err := filepath.Glob(badSpecPath("*.toml"))
	if err != nil || len(files) == 0 {
		t.Fatalf("no bad specs found: %v", err)
	}
	listed := map[string]bool{}
	for _, c := range badSpecs {
		if listed[c.file] {
			t.Errorf("%s is listed twice", c.file)
		}
		listed[c.file] = true
		if _, bug := badSpecBugs[c.file]; bug {
			t.Errorf("%s is both pinned and a known bug", c.file)
		}
	}
	for f := range badSpecBugs {
		listed[f] = true
	}
	for _, f := range files {
		if !listed[filepath.Base(f)] {
			t.Errorf("%s is in neither badSpecs nor badSpecBugs", f)
		}
		delete(listed, filepath.Base(f))
	}
	for f := range listed {
		t.Errorf("%s is listed but missing from testdata/bad", f)
	}
}

// TestBadSpecSnippets covers small variations through parseSpecData.
func TestBadSpecSnippets(t *testing.T) {
	const head = "[[minimizer]]\nname = \"Fit\"\nobjective = \"Loss\"\nstart = 1.0\n"
	cases := []struct {
		name string
		data string
		want []string
	}{
		{"empty name and objective", "[[minimizer]]\nname = \"\"\nobjective = \"\"\nstart = 1.0\n", []string{
			"2:8: name must not be empty: it is the exported Go name of the minimizer",
			`3:13: objective must not be empty: "Func" or "Type.Method" in the package`,
		}},
		{"keyword name", "[[minimizer]]\nname = \"func\"\nobjective = \"Loss\"\nstart = 1.0\n", []string{
			`2:8: name "func" is not an exported Go identifier`,
		}},
		{"output out of the package", head + "output = \"../up_min.go\"\n", []string{
			`5:10: output "../up_min.go" must be a file name in the objective's package directory, without folders`,
		}},
		{"absolute output", head + "output = \"/tmp/abs_min.go\"\n", []string{
			`5:10: output "/tmp/abs_min.go" must be a file name in the objective's package directory, without folders`,
		}},
		{"non-UTF-8", "[[minimizer]]\nname = \"F\xff\"\n", []string{
			"2:10: invalid UTF-8 character in basic string",
		}},
		{"duplicate key", "[[minimizer]]\nname = \"Fit\"\nname = \"Fit2\"\n", []string{
			"3:1: key name is already defined",
		}},
		{"dotted keys", head + "step.shrink = 2.0\nstop.iterations = 0\nstep.rule = \"armijo\"\n", []string{
			"5:15: step.shrink must be in (0, 1), got 2",
			"6:19: stop.iterations must be in [1, 1e+09], got 0",
		}},
		{"bounds inline", head + "bounds = {}\n", []string{
			"5:1: [minimizer.bounds] needs lower, upper or both",
		}},
		{"bounds with unknown key", head + "[minimizer.bounds]\nlow = 0.0\n", []string{
			"5:2: [minimizer.bounds] needs lower, upper or both",
			`6:1: unknown key "minimizer.bounds.low"; did you mean "lower"?`,
		}},
		{"infinite tolerance", head + "[minimizer.expect]\nx = 1.0\ntolerance = inf\n", []string{
			"7:13: expect.tolerance must be a positive number, got +Inf",
		}},
		{"negative memory", head + "direction = \"lbfgs\"\nmemory = -3\n", []string{
			"6:10: memory must be in [1, 100], got -3",
		}},
		{"interpolate with strong-wolfe", head + "[minimizer.step]\nrule = \"strong-wolfe\"\ninterpolate = true\n", []string{
			`7:1: step.interpolate is not used by rule "strong-wolfe"`,
		}},
		{"instance empty", head + "instance = \"\"\n", []string{
			`5:12: instance "" is not the name of a package-level variable or function`,
		}},
		// A type error no longer hides other problems: all are reported
		// in one run.
		{"type error beside unknown key", "bogus = 1\n" + head + "direction = \"lbfgs\"\nmemory = \"x\"\n", []string{
			`1:1: unknown key "bogus"`,
			"7:10: memory must be a whole number, not a TOML string",
		}},
		// cg needs a rule with a curvature condition.
		{"cg with backtracking", head + "direction = \"cg\"\n[minimizer.step]\nrule = \"armijo\"\n", []string{
			`7:8: direction "cg" needs a step rule with a curvature condition: with "armijo" its directions need not descend (Nocedal & Wright 2006, §5.2); use step.rule = "strong-wolfe"`,
		}},
		{"unknown gradient test", head + "[minimizer.stop]\ngradient_test = \"relativ\"\n", []string{
			`6:17: stop.gradient_test "relativ" is not one of "absolute", "relative"; did you mean "relative"?`,
		}},
		// Two minimizers without a name: each is named once, with no
		// cascade about the output file they would share.
		{"two without names", "[[minimizer]]\nobjective = \"Loss\"\nstart = 1.0\n[[minimizer]]\nobjective = \"Loss\"\nstart = 2.0\n", []string{
			"1:3: name is required: the exported Go name of the minimizer",
			"4:3: name is required: the exported Go name of the minimizer",
		}},
		// Whole numbers may be written as integral floats.
		{"integral float", head + "direction = \"lbfgs\"\nmemory = 2.5\n[minimizer.stop]\nevaluations = 1e6\niterations = 1.5e3\n", []string{
			"6:10: memory must be a whole number, got 2.5",
		}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			spec, err := parseSpecData("snippet.toml", []byte(c.data))
			if err == nil {
				t.Fatalf("parseSpecData succeeded, want %d problems", len(c.want))
			}
			if spec != nil && allValid(spec) {
				t.Errorf("parseSpecData returned problems but calls every minimizer valid")
			}
			got := problemLines(t, err, "snippet.toml")
			if strings.Join(got, "\n") != strings.Join(c.want, "\n") {
				t.Errorf("got:\n\t%s\nwant:\n\t%s", strings.Join(got, "\n\t"), strings.Join(c.want, "\n\t"))
			}
		})
	}
}

// TestSpecMissingFile: an unreadable spec is a positioned problem too.
func TestSpecMissingFile(t *testing.T) {
	path := filepath.Join(t.TempDir(), "nope.toml")
	_, err := ParseSpec(path)
	got := problemLines(t, err, path)
	if len(got) != 1 || !strings.HasPrefix(got[0], "1:1: ") || !strings.Contains(got[0], "no such file") {
		t.Errorf("got %q, want one 1:1 problem naming the missing file", got)
	}
	if _, err := os.Stat(path); !os.IsNotExist(err) {
		t.Errorf("ParseSpec created %s", path)
	}
}

// A spec over the size limit is refused at its top before it is decoded
// (the decoder's duplicate-key check is quadratic: 100 000 keys took
// two minutes), and a name too long to name a file is refused at the
// name, not by the file system.
func TestOversizedSpecs(t *testing.T) {
	huge := "[[minimizer]]\nname = \"MinX\"\nobjective = \"Bowl\"\n" + strings.Repeat("k = 1 # padding\n", maxSpecBytes/16) + "start = 1.0\n"
	if _, err := parseSpecData("huge.toml", []byte(huge)); err == nil || err.Error() != fmt.Sprintf("huge.toml:1:1: the spec is %d bytes; thalweg reads specs of at most 262144 bytes (256 KiB)", len(huge)) {
		t.Errorf("huge spec: %v", err)
	}
	long := "[[minimizer]]\nname = \"" + strings.Repeat("A", 101) + "\"\nobjective = \"Bowl\"\nstart = 1.0\n"
	if _, err := parseSpecData("long.toml", []byte(long)); err == nil || !strings.Contains(err.Error(), "long.toml:2:8: name is 101 bytes long; at most 100") {
		t.Errorf("long name: %v", err)
	}
	longOut := "[[minimizer]]\nname = \"MinX\"\nobjective = \"Bowl\"\noutput = \"" + strings.Repeat("a", 200) + ".go\"\nstart = 1.0\n"
	if _, err := parseSpecData("out.toml", []byte(longOut)); err == nil || !strings.Contains(err.Error(), "out.toml:4:10: output is 203 bytes long; at most 108") {
		t.Errorf("long output: %v", err)
	}
}
