package gen

import (
	"bytes"
	"go/ast"
	"go/constant"
	"go/importer"
	"go/parser"
	"go/printer"
	"go/token"
	"go/types"
	"io/fs"
	"path/filepath"
	"reflect"
	"strings"
	"sync"
	"testing"
	"testing/fstest"

	"github.com/thalweg-go/thalweg/templates"
)

// The kernels are type-checked against gen's declaration of math, not the
// real package: every name it declares must be the real one, with the
// same type and, for constants, the same exact value.
func TestKernelMathMatchesMath(t *testing.T) {
	fake, err := kernelMath()
	if err != nil {
		t.Fatal(err)
	}
	real, err := importer.ForCompiler(token.NewFileSet(), "source", nil).Import("math")
	if err != nil {
		t.Fatal(err)
	}
	names := fake.Scope().Names()
	if len(names) == 0 {
		t.Fatal("the declaration of math is empty")
	}
	for _, name := range names {
		f := fake.Scope().Lookup(name)
		r := real.Scope().Lookup(name)
		if r == nil || !r.Exported() {
			t.Errorf("math.%s: not in package math", name)
			continue
		}
		if reflect.TypeOf(f) != reflect.TypeOf(r) {
			t.Errorf("math.%s: declared as %T, math has %T", name, f, r)
			continue
		}
		if !types.Identical(f.Type(), r.Type()) {
			t.Errorf("math.%s: declared as %s, math has %s", name, f.Type(), r.Type())
		}
		if fc, ok := f.(*types.Const); ok {
			rc := r.(*types.Const)
			if fc.Val().Kind() != rc.Val().Kind() || !constant.Compare(fc.Val(), token.EQL, rc.Val()) {
				t.Errorf("math.%s = %s, math has %s", name, fc.Val().ExactString(), rc.Val().ExactString())
			}
		}
	}
}

// Every math function or constant the templates use is declared, and
// gen's declaration of math is the package the kernels see.
func TestKernelsSeeDeclaredMath(t *testing.T) {
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	used := 0
	for id, obj := range ks.info.Uses {
		if obj.Pkg() != nil && obj.Pkg().Path() == "math" {
			used++
			if _, ok := obj.(*types.PkgName); !ok && obj.Pkg().Scope().Lookup(obj.Name()) != obj {
				t.Errorf("%s: math.%s is not gen's declaration", ks.fset.Position(id.Pos()), obj.Name())
			}
		}
	}
	if used == 0 {
		t.Error("the kernels use nothing of math; is vector.go's norm gone?")
	}
}

// parseKernels refuses kernels that import anything but math, or use
// something of math that gen does not declare, and names the remedy.
func TestParseKernelsRefusesOtherImports(t *testing.T) {
	base := fstest.MapFS{}
	names, err := fs.Glob(templates.Source, "*.go")
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range names {
		data, err := fs.ReadFile(templates.Source, name)
		if err != nil {
			t.Fatal(err)
		}
		base[name] = &fstest.MapFile{Data: data}
	}
	if _, err := parseKernels(base); err != nil {
		t.Fatalf("the templates themselves: %v", err)
	}
	for _, tc := range []struct{ src, want string }{
		{"package templates\n\nimport \"fmt\"\n\nvar _ = fmt.Sprint\n", `imports "fmt": the kernels may import only math`},
		{"package templates\n\nimport \"embed\"\n\nvar _ embed.FS\n", `imports "embed"`},
		{"package templates\n\nimport \"math\"\n\nvar _ = math.Floor(1)\n", "undefined: math.Floor (declare it in gen/kernelmath.go)"},
	} {
		fsys := fstest.MapFS{"zz.go": &fstest.MapFile{Data: []byte(tc.src)}}
		for name, f := range base {
			fsys[name] = f
		}
		_, err := parseKernels(fsys)
		if err == nil || !strings.Contains(err.Error(), tc.want) {
			t.Errorf("with %q: got %v, want an error containing %q", tc.src, err, tc.want)
		}
	}
}

// The file gen leaves out of the kernels declares Source and nothing else.
func TestEmbedFileDeclaresOnlySource(t *testing.T) {
	data, err := fs.ReadFile(templates.Source, embedFile)
	if err != nil {
		t.Fatal(err)
	}
	f, err := parser.ParseFile(token.NewFileSet(), embedFile, data, 0)
	if err != nil {
		t.Fatal(err)
	}
	var declared []string
	for _, d := range f.Decls {
		if g, ok := d.(*ast.GenDecl); ok && g.Tok == token.IMPORT {
			continue
		}
		declared = append(declared, declName(d))
	}
	if len(declared) != 1 || declared[0] != "Source" || !standIns["Source"] {
		t.Errorf("templates/%s declares %v, want only the stand-in Source", embedFile, declared)
	}
}

func TestKernelsLoadedOnce(t *testing.T) {
	a, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	b, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	if a != b {
		t.Error("loadKernels parsed the templates again")
	}
}

// A copy is equal to its original, shares no node or comment with it, and
// carries the original's type information that the passes read: every
// identifier's object, and the type of every call's sole argument.
func TestKernelCopyIsDeep(t *testing.T) {
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	for _, f := range ks.files {
		for _, d := range f.Decls {
			name := ks.fset.Position(d.Pos()).String()
			cp := newKernelCopier(ks.info, 0)
			comments := cp.comments(commentsWithin(f, d))
			c := cp.decl(d)
			if !reflect.DeepEqual(d, c) {
				t.Errorf("%s: the copy differs from the original", name)
			}
			orig := map[any]bool{}
			ast.Inspect(d, func(n ast.Node) bool {
				orig[n] = true
				if g, ok := n.(*ast.CommentGroup); ok {
					for _, cm := range g.List {
						orig[cm] = true
					}
				}
				return true
			})
			for _, g := range commentsWithin(f, d) {
				orig[g] = true
				for _, cm := range g.List {
					orig[cm] = true
				}
			}
			var typed, uses, defs int
			ast.Inspect(c, func(n ast.Node) bool {
				if n != nil && orig[n] {
					t.Errorf("%s: the copy shares a %T with the original", name, n)
				}
				if call, ok := n.(*ast.CallExpr); ok && len(call.Args) == 1 {
					if _, ok := cp.info.Types[call.Args[0]]; ok {
						typed++
					}
				}
				return true
			})
			for _, g := range comments {
				if orig[g] {
					t.Errorf("%s: a copied comment group is the original", name)
				}
				for _, cm := range g.List {
					if orig[cm] {
						t.Errorf("%s: a copied comment is the original", name)
					}
				}
			}
			ast.Inspect(d, func(n ast.Node) bool {
				if call, ok := n.(*ast.CallExpr); ok && len(call.Args) == 1 {
					if _, ok := ks.info.Types[call.Args[0]]; ok {
						typed--
					}
				}
				if id, ok := n.(*ast.Ident); ok {
					if _, ok := ks.info.Uses[id]; ok {
						uses++
					}
					if _, ok := ks.info.Defs[id]; ok { // a blank identifier defines nil
						defs++
					}
				}
				return true
			})
			if typed != 0 || uses != len(cp.info.Uses) || defs != len(cp.info.Defs) {
				t.Errorf("%s: types carried for %+d sole arguments of calls, %d of %d uses, %d of %d definitions", name, -typed, len(cp.info.Uses), uses, len(cp.info.Defs), defs)
			}
			// The sole arguments' types are the originals'.
			var wantTypes []types.TypeAndValue
			ast.Inspect(d, func(n ast.Node) bool {
				if call, ok := n.(*ast.CallExpr); ok && len(call.Args) == 1 {
					wantTypes = append(wantTypes, ks.info.Types[call.Args[0]])
				}
				return true
			})
			k := 0
			ast.Inspect(c, func(n ast.Node) bool {
				if call, ok := n.(*ast.CallExpr); ok && len(call.Args) == 1 {
					if got := cp.info.Types[call.Args[0]]; got != wantTypes[k] {
						t.Errorf("%s: the copied argument %d has type %v, the original %v", name, k, got.Type, wantTypes[k].Type)
					}
					k++
				}
				return true
			})
			if len(cp.info.Types) != k {
				t.Errorf("%s: types carried for %d expressions, %d of them sole arguments of calls", name, len(cp.info.Types), k)
			}
			// The copy's identifiers resolve to the original's objects.
			var want []types.Object
			ast.Inspect(d, func(n ast.Node) bool {
				if id, ok := n.(*ast.Ident); ok {
					want = append(want, ks.info.ObjectOf(id))
				}
				return true
			})
			i := 0
			ast.Inspect(c, func(n ast.Node) bool {
				if id, ok := n.(*ast.Ident); ok {
					if got := cp.info.ObjectOf(id); got != want[i] {
						t.Errorf("%s: %s resolves to %v, the original to %v", name, id.Name, got, want[i])
					}
					i++
				}
				return true
			})
		}
	}
}

// kernelsText prints the shared kernels, comments included, with their
// type information's size.
func kernelsText(t *testing.T, ks *kernelSource) string {
	t.Helper()
	var buf bytes.Buffer
	for _, f := range ks.files {
		if err := printer.Fprint(&buf, ks.fset, f); err != nil {
			t.Fatal(err)
		}
	}
	return buf.String() + "\n" + strings.Repeat("x", len(ks.info.Types)+len(ks.info.Uses)+len(ks.info.Defs))
}

// Generating every golden spec, also with the trace hook and from several
// goroutines at once, leaves the shared kernels as they were and gives the
// same bytes as one generation alone (go test -race checks the sharing).
func TestSpecializeSharesKernelsSafely(t *testing.T) {
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	before := kernelsText(t, ks)
	specs, err := filepath.Glob(filepath.Join("..", "testdata", "golden", "*", "*.toml"))
	if err != nil || len(specs) == 0 {
		t.Fatalf("no golden specs: %v", err)
	}
	want, err := Generate(specs)
	if err != nil {
		t.Fatal(err)
	}
	plans, err := Plans(specs)
	if err != nil {
		t.Fatal(err)
	}
	var wg sync.WaitGroup
	for range 4 {
		wg.Go(func() {
			got, err := Generate(specs)
			if err != nil {
				t.Error(err)
				return
			}
			if len(got) != len(want) {
				t.Errorf("%d outputs, want %d", len(got), len(want))
				return
			}
			for i := range got {
				if got[i].Path != want[i].Path || !bytes.Equal(got[i].Data, want[i].Data) {
					t.Errorf("%s: a concurrent generation differs", got[i].Path)
				}
			}
		})
		wg.Go(func() {
			for _, p := range plans {
				c := p.kernelChoice()
				c.trace, c.traceHook = true, "traceHook"
				if _, err := specialize(c); err != nil {
					t.Error(err)
				}
			}
		})
	}
	wg.Wait()
	if after := kernelsText(t, ks); after != before {
		t.Error("specializing modified the shared kernels")
	}
}
