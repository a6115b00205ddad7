package gen

import (
	"fmt"
	"go/ast"
	"go/parser"
	"go/printer"
	"go/token"
	"path/filepath"
	"strings"
	"testing"
)

// specializedFuncs specializes the golden spec's minimizer name for dim
// unknowns and returns its kernels' functions by generated name.
func specializedFuncs(t *testing.T, name string, dim int) (map[string]*ast.FuncDecl, *token.FileSet) {
	t.Helper()
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	for _, p := range plans {
		if p.M.Name != name {
			continue
		}
		choice := p.kernelChoice()
		choice.shape.Dim = dim
		kernels, err := specialize(choice)
		if err != nil {
			t.Fatal(err)
		}
		fset := token.NewFileSet()
		f, err := parser.ParseFile(fset, "kernels.go", append([]byte("package p\n"), kernels.source...), 0)
		if err != nil {
			t.Fatalf("the specialized kernels do not parse: %v", err)
		}
		funcs := map[string]*ast.FuncDecl{}
		for _, d := range f.Decls {
			if fd, ok := d.(*ast.FuncDecl); ok {
				key := fd.Name.Name
				if fd.Recv != nil {
					var b strings.Builder
					printer.Fprint(&b, fset, fd.Recv.List[0].Type)
					key = b.String() + "." + key
				}
				funcs[key] = fd
			}
		}
		return funcs, fset
	}
	t.Fatalf("no minimizer %s in the golden spec", name)
	return nil, nil
}

func source(t *testing.T, fset *token.FileSet, n ast.Node) string {
	t.Helper()
	var b strings.Builder
	if err := printer.Fprint(&b, fset, n); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

func hasRange(n ast.Node) bool {
	found := false
	ast.Inspect(n, func(m ast.Node) bool {
		if _, ok := m.(*ast.RangeStmt); ok {
			found = true
		}
		return !found
	})
	return found
}

// Up to unrollLimit unknowns the dot product is unrolled into one
// statement per index, in the loop's order and form (s += a[k] * b[k], so
// that what a compiler fuses is unchanged); past it the loop stays. The
// BFGS update's nested loops over the matrix unroll to its dim² elements.
func TestShortVectorLoopsAreUnrolled(t *testing.T) {
	for _, dim := range []int{1, 2, 4, 5, 8, 10} {
		funcs, fset := specializedFuncs(t, "MinValleyCost", dim)
		dot := funcs["minValleyCostDot"]
		if dot == nil {
			t.Fatalf("dim %d: no minValleyCostDot among the kernels", dim)
		}
		got := source(t, fset, dot.Body)
		if dim > unrollLimit {
			// Past unrollLimit: a counted loop of unrollBy copies, then
			// the rest as constants.
			passes := dim - dim%unrollBy
			want := fmt.Sprintf("for i := 0; i < %d; i += %d {\n\ts += a[i] * b[i]\n\ts += a[i+1] * b[i+1]\n\ts += a[i+2] * b[i+2]\n\ts += a[i+3] * b[i+3]\n}", passes, unrollBy)
			for k := passes; k < dim; k++ {
				want += fmt.Sprintf("\ns += a[%d] * b[%d]", k, k)
			}
			words := func(s string) string { return strings.Join(strings.Fields(s), " ") }
			if hasRange(dot.Body) || !strings.Contains(words(got), words(want)) {
				t.Errorf("dim %d: dot is not unrolled by %d; want\n%s\ngot\n%s", dim, unrollBy, want, got)
			}
			continue
		}
		if hasRange(dot.Body) {
			t.Errorf("dim %d: dot keeps its loop:\n%s", dim, got)
		}
		var want []string
		for k := 0; k < dim; k++ {
			want = append(want, fmt.Sprintf("s += a[%d] * b[%d]", k, k))
		}
		at := 0
		for _, w := range want {
			i := strings.Index(got[at:], w)
			if i < 0 {
				t.Fatalf("dim %d: dot lacks %q in order:\n%s", dim, w, got)
			}
			at += i + len(w)
		}
		if n := strings.Count(got, "s +="); n != dim {
			t.Errorf("dim %d: %d accumulations in dot, want %d:\n%s", dim, n, dim, got)
		}
		update := funcs["*minValleyCostDirection.update"]
		if update == nil {
			t.Fatalf("dim %d: no bfgs update among the kernels", dim)
		}
		body := source(t, fset, update.Body)
		// The rows' inner loops always unroll; at 2 unknowns the loop
		// over the rows does too, and at 4 its body, four element
		// updates, is past unrollBodyLimit.
		if dim <= 2 && hasRange(update.Body) {
			t.Errorf("dim %d: the bfgs update keeps a loop:\n%s", dim, body)
		}
		wantElements := dim * dim
		if dim > 2 {
			wantElements = dim
		}
		last := fmt.Sprintf("] += a*step[%d] - b*hy[%d]", dim-1, dim-1)
		if n := strings.Count(body, "] += a*step["); n != wantElements || !strings.Contains(body, last) {
			t.Errorf("dim %d: the update has %d element updates (want %d, the last ending %q):\n%s", dim, n, wantElements, last, body)
		}
	}
}

// A loop whose meaning a copy could change stays a loop: the probes of
// central differences continue past coordinates fixed by equal bounds.
func TestLoopsWithBranchesStayLoops(t *testing.T) {
	funcs, _ := specializedFuncs(t, "MinPlateDecrease", 2)
	found := false
	for _, fd := range funcs {
		ast.Inspect(fd.Body, func(m ast.Node) bool {
			if r, ok := m.(*ast.RangeStmt); ok {
				ast.Inspect(r.Body, func(b ast.Node) bool {
					if br, ok := b.(*ast.BranchStmt); ok && br.Tok == token.CONTINUE {
						found = true
					}
					return true
				})
			}
			return true
		})
	}
	if !found {
		t.Errorf("no range loop with a continue survived specialization at dim 2; the difference probes should")
	}
}

// unrollable refuses every body whose copies could differ from the loop,
// and bodies past unrollBodyLimit.
func TestUnrollable(t *testing.T) {
	long := strings.Repeat("x[i] = x[i] + 1\n", unrollBodyLimit/5)
	for _, c := range []struct {
		body string
		want bool
	}{
		{"s += a[i] * b[i]", true},
		{"v := a[i]\nb[i] = v * v", true},
		{"if a[i] > 0 { return }", true},
		{"if a[i] > 0 { continue }", false},
		{"if a[i] > 0 { break }", false},
		{"L: for { break L }", false},
		{"f := func() { _ = i }\nf()", false},
		{"i = 2", false},
		{"i++", false},
		{"p := &i\n_ = p", false},
		{"defer g(i)", false},
		{"go g(i)", false},
		{long, false},
	} {
		src := "package p\nfunc f(a, b, x *[2]float64) { var s float64; for i := range a {\n" + c.body + "\n}; _ = s }"
		f, err := parser.ParseFile(token.NewFileSet(), "", src, 0)
		if err != nil {
			t.Fatalf("%q: %v", c.body, err)
		}
		var loop *ast.RangeStmt
		ast.Inspect(f, func(m ast.Node) bool {
			if r, ok := m.(*ast.RangeStmt); ok && loop == nil {
				loop = r
			}
			return true
		})
		key := loop.Key.(*ast.Ident)
		isIndex := func(id *ast.Ident) bool { return id.Name == key.Name }
		if got := unrollable(loop.Body, unrollBodyLimit, isIndex); got != c.want {
			t.Errorf("unrollable(%q) = %v, want %v", c.body, got, c.want)
		}
	}
}

// isDimRange takes an array of as many vecs as vec has elements for an
// array of dim vecs, so the templates must give every other array of vecs
// a length that differs from dim's: a named constant of another value
// (lbfgsMemory), never a literal.
func TestTemplatesSpellArraysOfVecsWithDim(t *testing.T) {
	files, err := filepath.Glob(filepath.Join("..", "templates", "*.go"))
	if err != nil {
		t.Fatal(err)
	}
	fset := token.NewFileSet()
	var parsed []*ast.File
	constants := map[string]string{} // the templates' constants with a literal value
	for _, name := range files {
		if strings.HasSuffix(name, "_test.go") {
			continue
		}
		f, err := parser.ParseFile(fset, name, nil, 0)
		if err != nil {
			t.Fatal(err)
		}
		parsed = append(parsed, f)
		ast.Inspect(f, func(n ast.Node) bool {
			if v, ok := n.(*ast.ValueSpec); ok && len(v.Names) == len(v.Values) {
				for i, id := range v.Names {
					if lit, ok := v.Values[i].(*ast.BasicLit); ok {
						constants[id.Name] = lit.Value
					}
				}
			}
			return true
		})
	}
	if constants["dim"] == "" {
		t.Fatal("the templates declare no literal dim")
	}
	checked := 0
	for _, f := range parsed {
		ast.Inspect(f, func(n ast.Node) bool {
			a, ok := n.(*ast.ArrayType)
			if !ok || a.Len == nil {
				return true
			}
			if elt, ok := a.Elt.(*ast.Ident); ok && elt.Name == "vec" {
				checked++
				id, ok := a.Len.(*ast.Ident)
				if !ok || id.Name != "dim" && (constants[id.Name] == "" || constants[id.Name] == constants["dim"]) {
					t.Errorf("%s: an array of vec whose length is neither dim nor a constant of another value", fset.Position(a.Pos()))
				}
			}
			return true
		})
	}
	if checked == 0 {
		t.Error("no array of vec found in the templates: the test reads the wrong files")
	}
}
