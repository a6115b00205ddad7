package gen

import (
	"bytes"
	"fmt"
	"go/ast"
	"go/format"
	"go/parser"
	"go/printer"
	"go/token"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// Every declaration a generated file makes carries the minimizer's name
// (exported API) or its lowerCamel prefix (kernels, tunables), and no
// template stand-in or selector survives the rewriting: the output names
// nothing that only the templates declare.
func TestSpecializedNamesAreHygienic(t *testing.T) {
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	templateNames := map[string]bool{}
	for name := range ks.units {
		templateNames[name] = true
	}
	for _, p := range plans {
		var buf bytes.Buffer
		if err := EmitMinimizer(&buf, p); err != nil {
			t.Fatal(err)
		}
		f, err := parser.ParseFile(token.NewFileSet(), "", buf.Bytes(), parser.ParseComments)
		if err != nil {
			t.Fatal(err)
		}
		names, err := topLevelNames(buf.Bytes())
		if err != nil {
			t.Fatal(err)
		}
		for _, name := range names {
			if !strings.HasPrefix(name, p.M.Name) && !strings.HasPrefix(name, p.Prefix) {
				t.Errorf("%s: top-level %s lacks the minimizer's name or prefix", p.M.Name, name)
			}
		}
		ast.Inspect(f, func(n ast.Node) bool {
			if id, ok := n.(*ast.Ident); ok && templateNames[id.Name] && id.Name != "minimize" {
				// Field and method names may repeat template words; package
				// names may not.
				if f.Scope.Lookup(id.Name) != nil || id.Obj != nil && id.Obj.Kind != ast.Var {
					t.Errorf("%s: template name %s survives at %d", p.M.Name, id.Name, id.Pos())
				}
			}
			return true
		})
		// The observe hook is deleted, the stand-in selectors never copied.
		for _, word := range []string{"observe(", "stepRule", "directionKind", "derivativeSource", "backtrackKind", "receiver", "evaluate("} {
			if bytes.Contains(buf.Bytes(), []byte(word)) {
				t.Errorf("%s: generated code mentions %q", p.M.Name, word)
			}
		}
	}
}

// Comments of kept template declarations reach the output renamed, the
// trailing ones included: a comment whose text grows with the renaming
// once fell outside its declaration and was dropped.
func TestSpecializedCommentsSurvive(t *testing.T) {
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	want := map[string][]string{
		"MinValley":        {"count  int     // pairs held, at most minValleyLbfgsMemory", "// N&W eq. 7.20", "// N&W eq. 3.6b"},
		"MinParabola":      {"// N&W Alg. 3.5 and 3.6, first test", "// N&W eq. 6.17", "// N&W eq. 8.7, with the representable 2h"},
		"MinPlateDecrease": {"// N&W eq. 3.58"},
		"MinBowl":          {"// N&W eq. 5.45 (PR+)", "// N&W eq. 3.7b"},
	}
	for _, p := range plans {
		var buf bytes.Buffer
		if err := EmitMinimizer(&buf, p); err != nil {
			t.Fatal(err)
		}
		for _, w := range want[p.M.Name] {
			if !bytes.Contains(buf.Bytes(), []byte(w)) {
				t.Errorf("%s: the comment %q is lost", p.M.Name, w)
			}
		}
	}
}

// A combined objective has no call for its value alone and no separate
// gradient: a kernel that asked for either (here the analytic gradient's
// and the forward differences' alternatives, which no plan picks for it)
// is refused with an error, never written.
func TestCombinedRefusesValueOnlyAndGradientCalls(t *testing.T) {
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range plans {
		if !p.Shape.Combined {
			continue
		}
		for dispatcher, alternative := range map[string]string{"derivative": "analyticGradient", "calibrate": "calibrateForward"} {
			c := p.kernelChoice()
			c.pick[dispatcher] = alternative
			if _, err := specialize(c); err == nil || !strings.Contains(err.Error(), "thalweg bug") {
				t.Errorf("%s with %s picked for %s: error %v, want a thalweg bug", p.M.Name, alternative, dispatcher, err)
			}
		}
		return
	}
	t.Fatal("no golden minimizer has a combined objective")
}

// The minimizer file is assembled from the glue jennifer formatted and
// the kernels as printed, without formatting the whole: it must be the
// file go/format makes of the two, for every shape, rule, derivative and
// option of the golden specs, the examples and a mix of 41 minimizers,
// traced or not.
func TestAssembleIsFormatted(t *testing.T) {
	_, many := benchModule(t, 41)
	specs, err := filepath.Glob(filepath.Join("..", "testdata", "golden", "*", "*.toml"))
	if err != nil {
		t.Fatal(err)
	}
	examples, err := filepath.Glob(filepath.Join("..", "examples", "*", "*.toml"))
	if err != nil {
		t.Fatal(err)
	}
	specs = append(append(specs, examples...), many, longNamesModule(t))
	compared := 0
	for _, spec := range specs {
		plans, err := Plans([]string{spec})
		if err != nil {
			t.Fatal(err)
		}
		for _, p := range plans {
			for _, trace := range []bool{false, true} {
				choice := p.kernelChoice()
				if trace {
					choice.trace, choice.traceHook, choice.traceTrial = true, traceHook, traceTrial
				}
				kernels, err := specialize(choice)
				if err != nil {
					t.Fatal(err)
				}
				glue, err := renderGlue(p, kernels)
				if err != nil {
					t.Fatal(err)
				}
				got, ok := assemble(glue, kernels.source, kernels.usesMath)
				if !ok {
					t.Errorf("%s (trace %v): the glue imports more than math; assemble declined", p.M.Name, trace)
					continue
				}
				want, err := formatWhole(append(glue[:len(glue):len(glue)], kernels.source...), kernels.usesMath)
				if err != nil {
					t.Fatal(err)
				}
				if !bytes.Equal(got, want) {
					t.Errorf("%s (trace %v): assembled file differs from the formatted whole; diff:\n%s", p.M.Name, trace, diff(t, want, got))
				}
				parsed, err := topLevelNames(got)
				if err != nil {
					t.Fatalf("%s (trace %v): %v", p.M.Name, trace, err)
				}
				if read := declaredNames(got); !slices.Equal(read, parsed) {
					t.Errorf("%s (trace %v): names read from the lines %v, parsed %v", p.M.Name, trace, read, parsed)
				}
				compared++
			}
		}
	}
	if compared < 2*41 {
		t.Errorf("compared %d files, want at least %d", compared, 2*41)
	}
}

// topLevelNames lists the package-level names a Go file declares, or
// the error that it does not parse: what declaredNames must find.
func topLevelNames(src []byte) ([]string, error) {
	f, err := parser.ParseFile(token.NewFileSet(), "", src, parser.SkipObjectResolution)
	if err != nil {
		return nil, err
	}
	var names []string
	for _, d := range f.Decls {
		switch d := d.(type) {
		case *ast.FuncDecl:
			if d.Recv == nil {
				names = append(names, d.Name.Name)
			}
		case *ast.GenDecl:
			for _, s := range d.Specs {
				names = append(names, specNames(s)...)
			}
		}
	}
	return names, nil
}

// specialize writes the kernels' doc comments as they stand, which is
// what go/format writes only when they are already in its form: printed
// with go/format, every template declaration begins with its doc comment
// unchanged.
func TestKernelDocCommentsAreFormatted(t *testing.T) {
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	docs := 0
	for _, f := range ks.files {
		for _, d := range f.Decls {
			doc := docOf(d)
			if doc == nil {
				continue
			}
			docs++
			var want strings.Builder
			for _, cm := range doc.List {
				want.WriteString(cm.Text + "\n")
			}
			var got bytes.Buffer
			if err := format.Node(&got, ks.fset, &printer.CommentedNode{Node: d, Comments: commentsWithin(f, d)}); err != nil {
				t.Fatal(err)
			}
			if !strings.HasPrefix(got.String(), want.String()) {
				t.Errorf("%s: go/format rewrites the doc comment of %s:\n%s\nwant it as it stands:\n%s", ks.fset.Position(d.Pos()), declName(d), got.String()[:min(got.Len(), want.Len()+80)], want.String())
			}
		}
	}
	if docs < 20 {
		t.Errorf("%d doc comments in the templates; want at least 20", docs)
	}
}

// longNamesModule writes a module whose minimizers have 70-byte names,
// without and with bounds and with a residual objective, and returns its
// spec: long renamed identifiers must not change how the kernels print
// (a declaration near the end of a template file once did).
func longNamesModule(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	long := func(tag string) string { return "Long" + tag + strings.Repeat("x", 66-len(tag)) }
	src := "package long\n\nfunc Bowl(x *[2]float64) float64 { return x[0]*x[0] + x[1]*x[1] }\n\nfunc Res(x *[2]float64, r *[3]float64) {\n\tr[0], r[1], r[2] = x[0]-1, x[1]-2, x[0]*x[1]\n}\n"
	spec := fmt.Sprintf(`[[minimizer]]
name = %q
objective = "Bowl"
start = [1.0, 1.0]

[[minimizer]]
name = %q
objective = "Bowl"
start = [1.0, 1.0]
[minimizer.bounds]
lower = [0.5, -1.0]

[[minimizer]]
name = %q
objective = "Res"
start = [1.0, 1.0]
[minimizer.bounds]
upper = [5.0, 5.0]
`, long("Free"), long("Box"), long("Res"))
	for name, data := range map[string]string{"go.mod": "module long\n\ngo 1.24\n", "long.go": src, "long.toml": spec} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return filepath.Join(dir, "long.toml")
}
