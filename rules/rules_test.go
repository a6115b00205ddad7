package rules

import (
	"go/parser"
	"go/token"
	"io/fs"
	"math"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/templates"
)

func TestParamRanges(t *testing.T) {
	cases := []struct {
		p    Param
		v    float64
		want bool
	}{
		{Shrink, 0.5, true}, {Shrink, 0, false}, {Shrink, 1, false},
		{Initial, 1e300, true}, {Initial, math.Inf(1), false}, {Initial, 0, false},
		{Trials, 1, true}, {Trials, 1.5, false}, {Trials, 1000, true}, {Trials, 1001, false},
		{StopGradient, 0, true}, {StopGradient, math.NaN(), false}, {StopGradient, math.Inf(1), false},
	}
	for _, c := range cases {
		if got := c.p.Contains(c.v); got != c.want {
			t.Errorf("%s.Contains(%v) = %v, want %v", c.p.Key, c.v, got, c.want)
		}
	}
	if got := Shrink.Range(); got != "(0, 1)" {
		t.Errorf("Shrink.Range() = %q", got)
	}
	if got := Initial.Range(); got != "(0, ∞)" {
		t.Errorf("Initial.Range() = %q", got)
	}
}

// Every default lies in its own range, and every entry names a kernel
// that exists in the templates, so the tables cannot drift from the code.
func TestTablesMatchTemplates(t *testing.T) {
	declared := map[string]bool{}
	names, _ := fs.Glob(templates.Source, "*.go")
	for _, name := range names {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		data, _ := fs.ReadFile(templates.Source, name)
		f, err := parser.ParseFile(token.NewFileSet(), name, data, 0)
		if err != nil {
			t.Fatal(err)
		}
		for name := range f.Scope.Objects {
			declared[name] = true
		}
	}
	for _, list := range [][]Entry{Directions(), StepRules(), Derivatives()} {
		for _, e := range list {
			if !declared[e.Kernel] {
				t.Errorf("%s names kernel %s, which templates does not declare", e.Name, e.Kernel)
			}
			if len(e.References) == 0 {
				t.Errorf("%s has no reference", e.Name)
			}
			for _, p := range e.Params {
				if p.Key != "interpolate" && !p.Contains(p.Default) {
					t.Errorf("%s: default %v of %s is outside %s", e.Name, p.Default, p.Key, p.Range())
				}
			}
		}
	}
	for _, elem := range []string{"float32", "float64"} {
		for _, source := range []string{"analytic", "forward", "central"} {
			if g := StopDefault(StopGradient, elem, source); !(g > 0) {
				t.Errorf("no gradient default for %s %s", elem, source)
			}
		}
	}
}
