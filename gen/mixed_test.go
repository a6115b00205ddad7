package gen

import (
	"errors"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// TestPlansReportsSpecAndObjectiveErrorsTogether: a minimizer whose entry
// is valid is resolved even when another minimizer of the spec, or another
// spec, has spec problems, so one run reports both kinds. An entry with a
// problem is not resolved, nor is a spec with a problem outside every
// minimizer.
func TestPlansReportsSpecAndObjectiveErrorsTogether(t *testing.T) {
	dir := writeMisfitModule(t)
	write := func(name, data string) string {
		t.Helper()
		path := filepath.Join(dir, name)
		if err := os.WriteFile(path, []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
		return path
	}
	mixed := write("mixed.toml", `[[minimizer]]
name = "Shrinks"
objective = "ScalarObj"
start = 1.0
[minimizer.step]
shrink = 1.5

[[minimizer]]
name = "Typo"
objective = "ScalarOjb"
start = 1.0

[[minimizer]]
name = "Good"
objective = "ScalarObj"
start = 1.0

[[minimizer]]
name = "Unknown"
objective = "Missing"
start = 1.0
bogus = 2

[[minimizer]]
name = "Typo"
objective = "AlsoMissing"
start = 1.0
`)
	toplevel := write("toplevel.toml", `bogus = 1

[[minimizer]]
name = "Top"
objective = "Missing"
start = 1.0
`)
	other := write("other.toml", `[[minimizer]]
name = "Other"
objective = "NotFunc"
start = 1.0
`)
	_, err := Plans([]string{mixed, toplevel, other})
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("error is %T, want Problems: %v", err, err)
	}
	goFile := filepath.Join(dir, "obj.go")
	var got []string
	for _, p := range probs {
		got = append(got, p.Error())
	}
	want := []string{
		mixed + `:6:1: step.shrink is not used by rule "wolfe"`,
		mixed + `:10:13: objective ScalarOjb: no such function in package bad; did you mean ScalarObj?`,
		mixed + `:22:1: unknown key "minimizer.bogus"`,
		mixed + `:24:3: minimizers Typo and Typo would both write typo_min.go`,
		mixed + `:25:8: minimizer Typo is named twice in this spec`,
		goFile + `:15:5: objective NotFunc is not a function`,
		toplevel + `:1:1: unknown key "bogus"`,
	}
	// Go may report obj.go by its real path (a temporary directory can
	// be reached through a link); compare it by the test's name.
	wantReal, _ := filepath.EvalSymlinks(goFile)
	for i := range got {
		if file, rest, ok := strings.Cut(got[i], ":"); ok {
			if real, _ := filepath.EvalSymlinks(file); real == wantReal {
				got[i] = goFile + ":" + rest
			}
		}
	}
	if strings.Join(got, "\n") != strings.Join(want, "\n") {
		t.Errorf("problems:\n\t%s\nwant:\n\t%s", strings.Join(got, "\n\t"), strings.Join(want, "\n\t"))
	}
}
