package gen

import (
	"bytes"
	"fmt"
	"go/ast"
	"go/format"
	"go/parser"
	"go/printer"
	"go/token"
	"go/types"
	"io/fs"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"

	"github.com/thalweg-go/thalweg/templates"
)

// kernelSource is the templates package, parsed and type-checked once per
// process (see loadKernels). It is shared by every specialization, also
// across goroutines, and never modified: specialize rewrites copies.
type kernelSource struct {
	fset  *token.FileSet
	files []*ast.File
	info  *types.Info
	pkg   *types.Package
	units map[string]*unit // by package-level name
	order []string         // unit names in source order
	// dispatch caches dispatchers by the names a choice provides (they
	// depend on nothing else): provided names, sorted and joined by
	// spaces → map[string][]string, never modified.
	dispatch *sync.Map
	// printSets holds copies of fset for printing: go/token locks a
	// file's line table at every position the printer looks up, which
	// goroutines printing at once would contend for.
	printSets *sync.Pool
}

// unit is one top-level declaration of the templates, with the methods of
// a type, or a whole const/var group.
type unit struct {
	name     string
	decls    []ast.Decl
	comments []declComments // of each of decls
	exprs    int            // expressions in decls, to size a copy's type information
	// refs are the package-level objects of the templates that the
	// identifiers in decls use, in source order, repeats included.
	refs []types.Object
}

// declComments are the comments within a declaration, doc comment
// included, with the words in them that renameComments may rename: the
// template names written in camelCase, and the declaration's own name
// opening a comment group. words[g][c] are those of groups[g].List[c].
type declComments struct {
	groups []*ast.CommentGroup
	words  [][][]commentWord
}

// commentWord is a template name at text[start:end] of a comment.
type commentWord struct {
	start, end int
	word       string
}

// kernelCache parses and type-checks the embedded templates on first use.
var kernelCache = newKernelCache()

func newKernelCache() func() (*kernelSource, error) {
	return sync.OnceValues(func() (*kernelSource, error) {
		return parseKernels(templates.Source)
	})
}

// loadKernels returns the templates, parsed and type-checked once per
// process. The result is shared: never modify it.
func loadKernels() (*kernelSource, error) {
	return kernelCache()
}

// fileRoom pads each template file past any renamed identifier's end
// (see parseKernels): blank lines, longer than any generated name.
var fileRoom = bytes.Repeat([]byte("\n"), 1024)

// embedFile is the templates' file that embeds their source. It imports
// embed, whose dependencies go/types would have to load from source, so it
// is not part of the kernels; it declares only Source, a stand-in.
const embedFile = "source.go"

func parseKernels(src fs.FS) (*kernelSource, error) {
	ks := &kernelSource{fset: token.NewFileSet(), units: map[string]*unit{}, dispatch: new(sync.Map)}
	ks.printSets = &sync.Pool{New: func() any { return cloneFileSet(ks.fset) }}
	names, err := fs.Glob(src, "*.go")
	if err != nil {
		return nil, err
	}
	sort.Strings(names)
	for _, name := range names {
		if strings.HasSuffix(name, "_test.go") || name == embedFile {
			continue
		}
		data, err := fs.ReadFile(src, name)
		if err != nil {
			return nil, err
		}
		// Room after the file's end: a renamed identifier ends at its
		// position plus its new, longer name, and go/printer reads the
		// line of that end; without the room, an identifier near the
		// end of one file would end in the next file's lines, and the
		// printer would take a one-line parameter list for a broken one
		// (a trailing comma gofmt removes).
		data = append(data[:len(data):len(data)], fileRoom...)
		f, err := parser.ParseFile(ks.fset, name, data, parser.ParseComments)
		if err != nil {
			return nil, err
		}
		for _, imp := range f.Imports {
			if path, _ := strconv.Unquote(imp.Path.Value); path != "math" {
				return nil, fmt.Errorf("templates/%s imports %s: the kernels may import only math", name, imp.Path.Value)
			}
		}
		ks.files = append(ks.files, f)
	}
	ks.info = &types.Info{
		Types: map[ast.Expr]types.TypeAndValue{},
		Defs:  map[*ast.Ident]types.Object{},
		Uses:  map[*ast.Ident]types.Object{},
	}
	math, err := kernelMath()
	if err != nil {
		return nil, fmt.Errorf("gen's declaration of math does not type-check: %v", err)
	}
	conf := types.Config{Importer: kernelImporter{math}}
	ks.pkg, err = conf.Check("templates", ks.fset, ks.files, ks.info)
	if err != nil {
		if strings.Contains(err.Error(), "undefined: math.") {
			return nil, fmt.Errorf("templates do not type-check: %v (declare it in gen/kernelmath.go)", err)
		}
		return nil, fmt.Errorf("templates do not type-check: %v", err)
	}
	for _, f := range ks.files {
		for _, d := range f.Decls {
			var name string
			switch d := d.(type) {
			case *ast.FuncDecl:
				name = d.Name.Name
				if d.Recv != nil {
					name = receiverBase(d.Recv.List[0].Type)
				}
			case *ast.GenDecl:
				if d.Tok == token.IMPORT {
					continue
				}
				name = specNames(d.Specs[0])[0]
				for _, s := range d.Specs {
					for _, n := range specNames(s) {
						ks.units[n] = ks.unitFor(name)
					}
				}
			}
			u := ks.unitFor(name)
			u.decls = append(u.decls, d)
			u.comments = append(u.comments, ks.declComments(f, d))
			ast.Inspect(d, func(n ast.Node) bool {
				if _, ok := n.(ast.Expr); ok {
					u.exprs++
				}
				if id, ok := n.(*ast.Ident); ok {
					if obj := ks.info.Uses[id]; obj != nil && obj.Pkg() == ks.pkg && obj.Parent() == ks.pkg.Scope() {
						u.refs = append(u.refs, obj)
					}
				}
				return true
			})
		}
	}
	return ks, nil
}

// declComments indexes the comments within d, which f declares.
func (ks *kernelSource) declComments(f *ast.File, d ast.Decl) declComments {
	own := declName(d)
	dc := declComments{groups: commentsWithin(f, d)}
	dc.words = make([][][]commentWord, len(dc.groups))
	for g, cg := range dc.groups {
		dc.words[g] = make([][]commentWord, len(cg.List))
		for c, cm := range cg.List {
			for i, loc := range wordPattern.FindAllStringIndex(cm.Text, -1) {
				w := cm.Text[loc[0]:loc[1]]
				opening := c == 0 && i == 0 && w == own
				if (opening || strings.ToLower(w) != w) && ks.pkg.Scope().Lookup(w) != nil {
					dc.words[g][c] = append(dc.words[g][c], commentWord{loc[0], loc[1], w})
				}
			}
		}
	}
	return dc
}

func (ks *kernelSource) unitFor(name string) *unit {
	u, ok := ks.units[name]
	if !ok {
		u = &unit{name: name}
		ks.units[name] = u
		ks.order = append(ks.order, name)
	}
	return u
}

func receiverBase(e ast.Expr) string {
	if s, ok := e.(*ast.StarExpr); ok {
		e = s.X
	}
	return e.(*ast.Ident).Name
}

func specNames(s ast.Spec) []string {
	switch s := s.(type) {
	case *ast.TypeSpec:
		return []string{s.Name.Name}
	case *ast.ValueSpec:
		var names []string
		for _, n := range s.Names {
			names = append(names, n.Name)
		}
		return names
	}
	return nil
}

// kernelChoice is what a plan asks of the templates.
type kernelChoice struct {
	shape Shape
	// pick maps each dispatcher to the alternative the spec chose, e.g.
	// "lineSearch" → "wolfeSearch".
	pick map[string]string
	// provided are names the glue emits: stand-in types and constants,
	// mapped to their names in the generated file.
	provided map[string]string
	prefix   string // lowerCamel minimizer name
	// trace keeps the calls of the observe hook, renamed to traceHook;
	// otherwise they are deleted. It also wraps every value call of the
	// chosen line search, each a trial, as traceTrial(xt, value(…)), so
	// that the recorder counts and sees the trials.
	trace      bool
	traceHook  string
	traceTrial string
	// valueAt and gradientAt, when set, are the glue's adapters that the
	// objective and gradient calls go through instead of the user's
	// functions (scale: the kernels' point is zᵢ = xᵢ/sᵢ).
	valueAt, gradientAt string
}

// specializedKernels holds the rewritten declarations and what they need.
type specializedKernels struct {
	source    []byte          // printed declarations
	uses      map[string]bool // provided names the kernels reference
	usesMath  bool
	entryName string // the generated name of minimize
	stateName string // the generated name of descent, the resumable run
	// uncertaintyName is the generated name of uncertainty, for a
	// residual objective; "" otherwise.
	uncertaintyName string
}

// Stand-ins of the templates that gen never copies: gen replaces them or
// the glue emits them. (Selectors and their values are never reached:
// every dispatcher that reads them is replaced by its alternative.)
var standIns = map[string]bool{
	"elem": true, "dim": true, "vec": true, "residuals": true, "rvec": true, "receiver": true, "status": true, "limits": true, "box": true,
	"statusGradientSmall": true, "Source": true, "observe": true,
}

// specialize copies the declarations the plan needs, in the order they are
// first reached from minimize, and rewrites them for the spec's shape.
func specialize(c kernelChoice) (*specializedKernels, error) {
	ks, err := loadKernels()
	if err != nil {
		return nil, err
	}
	out := &specializedKernels{uses: map[string]bool{}}
	dispatchers := ks.cachedDispatchers(c.provided)
	var unpicked []string
	// Decide the generated name of every template object reached.
	newName := map[types.Object]string{}
	var reached []*unit
	seen := map[*unit]bool{}
	var visit func(u *unit)
	visitObj := func(obj types.Object) {
		if obj == nil || obj.Pkg() != ks.pkg || obj.Parent() != ks.pkg.Scope() {
			return
		}
		if _, done := newName[obj]; done {
			return
		}
		name := obj.Name()
		target := name
		if alt, ok := c.pick[name]; ok {
			target = alt
		} else if _, dispatcher := dispatchers[name]; dispatcher {
			unpicked = append(unpicked, name)
			return
		}
		if gen, ok := c.provided[name]; ok {
			newName[obj] = gen
			out.uses[name] = true
			return
		}
		if standIns[ks.units[name].name] {
			return
		}
		newName[obj] = c.prefix + upperFirst(name)
		if alt := ks.pkg.Scope().Lookup(target); alt != obj {
			newName[alt] = c.prefix + upperFirst(name)
		}
		visit(ks.units[target])
	}
	visit = func(u *unit) {
		if seen[u] {
			return
		}
		seen[u] = true
		reached = append(reached, u)
		for _, obj := range u.refs {
			visitObj(obj)
		}
	}
	root := ks.pkg.Scope().Lookup("minimize")
	newName[root] = c.prefix + "Minimize"
	out.entryName = newName[root]
	visit(ks.units["minimize"])
	out.stateName = newName[ks.pkg.Scope().Lookup("descent")]
	if c.shape.Residuals > 0 {
		// A residual objective's fit also reports its uncertainty.
		root := ks.pkg.Scope().Lookup("uncertainty")
		newName[root] = c.prefix + "Uncertainty"
		out.uncertaintyName = newName[root]
		visit(ks.units["uncertainty"])
	}
	if len(unpicked) > 0 {
		return nil, fmt.Errorf("no registry entry picks an alternative for the templates' dispatcher(s) %s (a thalweg bug)", strings.Join(unpicked, ", "))
	}

	// The passes rewrite copies of the declarations, as they are made, and
	// of their comments, and see a view of the kernels whose type
	// information is the copies'.
	exprs := 0
	for _, u := range reached {
		exprs += u.exprs
	}
	cp := newKernelCopier(ks.info, exprs)
	view := *ks
	view.info = cp.info
	rw := &rewriter{ks: &view, c: c, newName: newName}
	names := make(map[string]string, len(newName))
	for o, n := range newName {
		names[o.Name()] = n
	}
	fset := ks.printSets.Get().(*token.FileSet)
	defer ks.printSets.Put(fset)
	// The copies print about as long as the templates' source, doc
	// comments included: sized once, the buffer is not grown and copied.
	size := 0
	for _, u := range reached {
		for i, d := range u.decls {
			size += int(d.End() - d.Pos())
			if doc := u.comments[i].groups; len(doc) > 0 {
				size += int(doc[0].End() - doc[0].Pos())
			}
		}
	}
	var buf bytes.Buffer
	buf.Grow(size + size/8)
	for _, u := range reached {
		for i, d := range u.decls {
			dc := u.comments[i]
			comments := cp.comments(dc.groups)
			rw.notes = nil
			copyDecl := rw.rewrite(cp, d)
			if rw.err != nil {
				return nil, rw.err
			}
			renameComments(comments, dc.words, names)
			if len(rw.notes) > 0 {
				comments = append(comments, rw.notes...)
				sort.SliceStable(comments, func(i, j int) bool { return comments[i].Pos() < comments[j].Pos() })
			}
			// The doc comment is written as it stands: the templates are
			// gofmt'ed, so it is already in the form go/format would give
			// it, and renaming words changes none of its structure.
			if doc := docOf(copyDecl); doc != nil && len(comments) > 0 && comments[0] == doc {
				for _, cm := range doc.List {
					buf.WriteString(cm.Text)
					buf.WriteByte('\n')
				}
				comments = comments[1:]
				setDoc(copyDecl, nil)
			}
			// Printed as go/format prints it, so the file needs no
			// formatting as a whole (see assemble).
			if err := format.Node(&buf, fset, &printer.CommentedNode{Node: copyDecl, Comments: comments}); err != nil {
				return nil, err
			}
			buf.WriteString("\n\n")
		}
	}
	out.source = buf.Bytes()
	out.usesMath = rw.usesMath
	return out, nil
}

// cloneFileSet returns a file set with the files of src, at the same
// bases and with the same lines.
func cloneFileSet(src *token.FileSet) *token.FileSet {
	dst := token.NewFileSet()
	src.Iterate(func(f *token.File) bool {
		dst.AddFile(f.Name(), f.Base(), f.Size()).SetLines(f.Lines())
		return true
	})
	return dst
}

// docOf returns the doc comment of a declaration.
func docOf(d ast.Decl) *ast.CommentGroup {
	switch d := d.(type) {
	case *ast.FuncDecl:
		return d.Doc
	case *ast.GenDecl:
		return d.Doc
	}
	return nil
}

func setDoc(d ast.Decl, doc *ast.CommentGroup) {
	switch d := d.(type) {
	case *ast.FuncDecl:
		d.Doc = doc
	case *ast.GenDecl:
		d.Doc = doc
	}
}

// commentsWithin returns the file's comments that lie inside d, doc
// comment included.
func commentsWithin(f *ast.File, d ast.Decl) []*ast.CommentGroup {
	start := d.Pos()
	switch d := d.(type) {
	case *ast.FuncDecl:
		if d.Doc != nil {
			start = d.Doc.Pos()
		}
	case *ast.GenDecl:
		if d.Doc != nil {
			start = d.Doc.Pos()
		}
	}
	var out []*ast.CommentGroup
	for _, cg := range f.Comments {
		if cg.Pos() >= start && cg.End() <= d.End() {
			out = append(out, cg)
		}
	}
	return out
}

// rewriter applies the specialization passes to one declaration.
type rewriter struct {
	ks       *kernelSource
	c        kernelChoice
	newName  map[types.Object]string
	usesMath bool
	trials   bool  // the declaration being rewritten is the line search, and trials are traced
	err      error // a kernel call the objective's form cannot make (a thalweg bug)
	// notes are comments the passes add to the declaration being
	// rewritten, each at the end of the line it explains.
	notes []*ast.CommentGroup
	// cp is the copier of the declaration being rewritten (see unroll).
	cp *kernelCopier
}

func (rw *rewriter) obj(id *ast.Ident) types.Object {
	if o := rw.ks.info.Uses[id]; o != nil {
		return o
	}
	return rw.ks.info.Defs[id]
}

// rewrite copies d with cp (see kernelCopier) and rewrites the copy as it
// is made, and returns it. The passes, in order:
//
//   - rewrite recv.objective(p), recv.gradient(p, g) and
//     recv.evaluate(p, g) to calls of the user's functions in the form
//     their signatures take: evaluate is the objective's value call, to
//     which a combined objective adds g;
//   - rewrite T(x) to x when elem is float64 and x is already float64;
//   - drop the recv parameter and argument when the objective is a plain
//     function;
//   - rewrite elem to float32/float64, vec to [N]T, dim to N and receiver
//     to the user's receiver type;
//   - rename every package-level template name to its generated name;
//   - delete the calls of the observe hook, or, for tracing, point them at
//     the recorder and wrap the line search's objective calls (its trials)
//     in the trial recorder.
func (rw *rewriter) rewrite(cp *kernelCopier, d ast.Decl) ast.Decl {
	// The passes run as the copier leaves each node, after its children
	// (post-order), so a node's type information is read while the node
	// itself is still a copy of the one the type checker saw; replaced
	// children are new nodes without it.
	rw.trials = rw.c.trace && declName(d) == rw.c.pick["lineSearch"]
	cp.post, rw.cp = rw.post, cp
	defer func() { cp.post, rw.cp = nil, nil }()
	return cp.decl(d)
}

// post rewrites the copy n, whose children are rewritten, and returns it,
// its replacement, or nil to delete the statement.
func (rw *rewriter) post(n ast.Node) ast.Node {
	s := rw.c.shape
	switch n := n.(type) {
	case *ast.ExprStmt:
		if call, ok := n.X.(*ast.CallExpr); ok && rw.isRecvCall(call, "gradient") {
			return rw.gradientCall(call)
		}
		if call, ok := n.X.(*ast.CallExpr); ok && (rw.isRecvCall(call, "residual") || rw.isRecvCall(call, "jacobian") || rw.isRecvCall(call, "jacobianColumns")) {
			return rw.residualCall(call)
		}
		if call, ok := n.X.(*ast.CallExpr); ok && rw.isObserve(call) {
			if !rw.c.trace {
				return nil // rewrite observe(…) to nothing
			}
			call.Fun = &ast.Ident{Name: rw.c.traceHook, NamePos: call.Fun.Pos()}
		}
	case *ast.CallExpr:
		if rw.isRecvCall(n, "objective") || rw.isRecvCall(n, "evaluate") {
			return rw.objectiveCall(n)
		}
		if s.Elem == "float64" && len(n.Args) == 1 {
			// elem has already been rewritten to float64 here.
			if id, ok := n.Fun.(*ast.Ident); ok && id.Name == "float64" {
				if tv, ok := rw.ks.info.Types[n.Args[0]]; ok && tv.Value == nil && !isUntyped(tv.Type) && types.Identical(tv.Type, types.Typ[types.Float64]) {
					return n.Args[0]
				}
			}
		}
		if s.Receiver == "" {
			n.Args = rw.withoutRecv(n.Args)
		}
		if rw.trials && rw.isTemplateCall(n, "value") {
			// traceTrial(xt, value(…, xt, …)): a trial of the line
			// search, whose point follows the receiver.
			point := n.Args[0]
			if s.Receiver != "" {
				point = n.Args[1]
			}
			return &ast.CallExpr{Fun: &ast.Ident{Name: rw.c.traceTrial, NamePos: n.Pos()}, Args: []ast.Expr{point, n}, Lparen: n.Lparen, Rparen: n.Rparen}
		}
	case *ast.RangeStmt:
		return rw.unroll(rw.cp, n)
	case *ast.FieldList:
		if s.Receiver == "" {
			n.List = rw.withoutRecvFields(n.List)
		}
	case *ast.SelectorExpr:
		if id, ok := n.X.(*ast.Ident); ok && id.Name == "math" {
			rw.usesMath = true
		}
	case *ast.Ident:
		// (Never a selector's Sel, a field or method name: the copier
		// leaves those alone.)
		return rw.replaceIdent(n)
	}
	return n
}

// replaceIdent returns what a template name becomes: the shape's types
// and length for the stand-ins, else id renamed in place.
func (rw *rewriter) replaceIdent(id *ast.Ident) ast.Node {
	s := rw.c.shape
	o := rw.obj(id)
	if o == nil || o.Parent() != rw.ks.pkg.Scope() {
		return id
	}
	switch o.Name() {
	case "elem":
		return &ast.Ident{Name: s.Elem, NamePos: id.Pos()}
	case "vec":
		return &ast.ArrayType{Lbrack: id.Pos(), Len: intLit(s.Dim, id.Pos()), Elt: &ast.Ident{Name: s.Elem, NamePos: id.Pos()}}
	case "dim":
		return intLit(s.Dim, id.Pos())
	case "rvec":
		return &ast.ArrayType{Lbrack: id.Pos(), Len: intLit(s.Residuals, id.Pos()), Elt: &ast.Ident{Name: s.Elem, NamePos: id.Pos()}}
	case "residuals":
		return intLit(s.Residuals, id.Pos())
	case "receiver":
		return &ast.Ident{Name: s.Receiver, NamePos: id.Pos()}
	}
	if n, ok := rw.newName[o]; ok {
		id.Name = n
	}
	return id
}

func intLit(n int, pos token.Pos) *ast.BasicLit {
	return &ast.BasicLit{Kind: token.INT, Value: strconv.Itoa(n), ValuePos: pos}
}

func isUntyped(t types.Type) bool {
	b, ok := t.(*types.Basic)
	return ok && b.Info()&types.IsUntyped != 0
}

// isObserve reports whether call calls the observe hook.
func (rw *rewriter) isObserve(call *ast.CallExpr) bool {
	id, ok := call.Fun.(*ast.Ident)
	if !ok {
		return false
	}
	o := rw.obj(id)
	return o != nil && o.Parent() == rw.ks.pkg.Scope() && o.Name() == "observe"
}

// isTemplateCall reports whether call calls the templates' package-level
// function name.
func (rw *rewriter) isTemplateCall(call *ast.CallExpr, name string) bool {
	id, ok := call.Fun.(*ast.Ident)
	if !ok {
		return false
	}
	o := rw.obj(id)
	return o != nil && o.Parent() == rw.ks.pkg.Scope() && o.Name() == name
}

// isRecvCall reports whether call is recv.<method>(…) on the stand-in.
func (rw *rewriter) isRecvCall(call *ast.CallExpr, method string) bool {
	sel, ok := call.Fun.(*ast.SelectorExpr)
	if !ok || sel.Sel.Name != method {
		return false
	}
	id, ok := sel.X.(*ast.Ident)
	return ok && rw.isRecvVar(id)
}

// isRecvVar reports whether id is a variable of the stand-in *receiver.
func (rw *rewriter) isRecvVar(id *ast.Ident) bool {
	v, ok := rw.obj(id).(*types.Var)
	if !ok {
		return false
	}
	p, ok := v.Type().(*types.Pointer)
	return ok && p.Elem() == rw.ks.pkg.Scope().Lookup("receiver").Type()
}

func (rw *rewriter) withoutRecv(args []ast.Expr) []ast.Expr {
	var kept []ast.Expr
	for _, a := range args {
		if id, ok := a.(*ast.Ident); ok && rw.isRecvVar(id) {
			continue
		}
		kept = append(kept, a)
	}
	return kept
}

func (rw *rewriter) withoutRecvFields(fields []*ast.Field) []*ast.Field {
	var kept []*ast.Field
	for _, f := range fields {
		if len(f.Names) == 1 && rw.isRecvVar(f.Names[0]) {
			continue
		}
		kept = append(kept, f)
	}
	return kept
}

// callee is the user's function, as recv.Name for methods.
func (rw *rewriter) callee(name string) ast.Expr {
	if rw.c.shape.Receiver == "" {
		return ast.NewIdent(name)
	}
	return &ast.SelectorExpr{X: ast.NewIdent("recv"), Sel: ast.NewIdent(name)}
}

// objectiveCall rewrites recv.objective(p) and recv.evaluate(p, g), p
// and g *vec, to the user's form: f(p[0]), f(*p), f(p) or f(p[:]) for an
// objective of the value alone, which leaves g out; f(p[0], &g[0]),
// f(*p, g), f(p, g) or f(p[:], g[:]) for a combined objective, which
// writes its gradient into g. A combined objective has no call for its
// value alone: recv.objective on it is a thalweg bug, reported.
func (rw *rewriter) objectiveCall(call *ast.CallExpr) ast.Expr {
	s := rw.c.shape
	p := call.Args[0]
	if rw.c.valueAt != "" && (!s.Combined || len(call.Args) == 2) {
		// scale: the glue's adapter converts z to x (and, for a combined
		// objective, the gradient back); only a combined one takes g.
		adapterArgs := call.Args[:1]
		if s.Combined {
			adapterArgs = call.Args
		}
		return &ast.CallExpr{Fun: ast.NewIdent(rw.c.valueAt), Args: rw.adapterArgs(adapterArgs...), Lparen: call.Lparen, Rparen: call.Rparen}
	}
	var args []ast.Expr
	switch s.Arg {
	case ArgScalar:
		args = []ast.Expr{index0(p)}
	case ArgArray:
		args = []ast.Expr{deref(p)}
	case ArgPointer:
		args = []ast.Expr{p}
	case ArgSlice:
		args = []ast.Expr{fullSlice(p)}
	}
	if s.Combined {
		if len(call.Args) < 2 {
			rw.err = fmt.Errorf("a kernel asks the combined objective %s for its value alone, which it cannot give (a thalweg bug)", s.Objective)
			return call
		}
		g := call.Args[1]
		switch s.Arg {
		case ArgScalar:
			args = append(args, &ast.UnaryExpr{Op: token.AND, X: index0(g)})
		case ArgSlice:
			args = append(args, fullSlice(g))
		default:
			args = append(args, g)
		}
	}
	return &ast.CallExpr{Fun: rw.callee(s.Objective), Args: args, Lparen: call.Lparen, Rparen: call.Rparen}
}

// gradientCall rewrites the statement recv.gradient(p, g) to the user's
// form: g[0] = grad(p[0]); grad(p, g); *g = grad(*p); grad(p[:], g[:]).
func (rw *rewriter) gradientCall(call *ast.CallExpr) ast.Stmt {
	p, g := call.Args[0], call.Args[1]
	if rw.c.shape.Combined {
		rw.err = fmt.Errorf("a kernel calls a separate gradient of the combined objective %s, which has none (a thalweg bug)", rw.c.shape.Objective)
		return &ast.ExprStmt{X: call}
	}
	if rw.c.gradientAt != "" {
		return &ast.ExprStmt{X: &ast.CallExpr{Fun: ast.NewIdent(rw.c.gradientAt), Args: rw.adapterArgs(p, g), Lparen: call.Lparen, Rparen: call.Rparen}}
	}
	fun := rw.callee(rw.c.shape.Gradient)
	mk := func(args ...ast.Expr) *ast.CallExpr {
		return &ast.CallExpr{Fun: fun, Args: args, Lparen: call.Lparen, Rparen: call.Rparen}
	}
	switch rw.c.shape.Grad {
	case GradScalar:
		return &ast.AssignStmt{Lhs: []ast.Expr{index0(g)}, Tok: token.ASSIGN, Rhs: []ast.Expr{mk(index0(p))}}
	case GradArray:
		return &ast.AssignStmt{Lhs: []ast.Expr{deref(g)}, Tok: token.ASSIGN, Rhs: []ast.Expr{mk(deref(p))}}
	case GradSlice:
		return &ast.ExprStmt{X: mk(fullSlice(p), fullSlice(g))}
	default:
		return &ast.ExprStmt{X: mk(p, g)}
	}
}

// residualCall rewrites the statements recv.residual(p, r),
// recv.jacobian(p, j) and recv.jacobianColumns(p, j) to the user's form:
// f(p, r) for x *[N]T, f(*p, r) for x [N]T, f(p[:], r[:]) for slices.
func (rw *rewriter) residualCall(call *ast.CallExpr) ast.Stmt {
	s := rw.c.shape
	name := s.Objective
	if sel := call.Fun.(*ast.SelectorExpr); sel.Sel.Name != "residual" {
		name = s.Jacobian
	}
	p, out := call.Args[0], call.Args[1]
	switch {
	case s.Arg == ArgArray:
		p = deref(p)
	case s.Arg == ArgSlice && (name == s.Objective || !s.jacobianOnArrays()):
		p, out = fullSlice(p), fullSlice(out)
	}
	return &ast.ExprStmt{X: &ast.CallExpr{Fun: rw.callee(name), Args: []ast.Expr{p, out}, Lparen: call.Lparen, Rparen: call.Rparen}}
}

// adapterArgs are the arguments of a call of the glue's adapters: the
// receiver first when the objective is a method.
func (rw *rewriter) adapterArgs(args ...ast.Expr) []ast.Expr {
	if rw.c.shape.Receiver == "" {
		return args
	}
	return append([]ast.Expr{ast.NewIdent("recv")}, args...)
}

// deref returns *p, or x when p is &x.
func deref(p ast.Expr) ast.Expr {
	if u, ok := p.(*ast.UnaryExpr); ok && u.Op == token.AND {
		return u.X
	}
	return &ast.StarExpr{X: p}
}

// index0 returns p[0] (Go indexes through a pointer to an array), or x[0]
// for &x.
func index0(p ast.Expr) ast.Expr {
	if u, ok := p.(*ast.UnaryExpr); ok && u.Op == token.AND {
		p = u.X
	}
	return &ast.IndexExpr{X: p, Index: intLit(0, token.NoPos)}
}

// fullSlice returns p[:], or x[:] for &x.
func fullSlice(p ast.Expr) ast.Expr {
	base := p
	if u, ok := p.(*ast.UnaryExpr); ok && u.Op == token.AND {
		base = u.X
	}
	return &ast.SliceExpr{X: base}
}

var wordPattern = regexp.MustCompile(`[A-Za-z_][A-Za-z0-9_]*`)

// renameComments rewrites template names inside the copies of a
// declaration's comments to their generated names (names, by template
// name), so comments keep naming the right thing. Plain words
// ("direction", "finite") are left alone unless they open the
// declaration's doc comment as its own name; camelCase words are always
// names. words indexes them in the originals (see declComments).
func renameComments(comments []*ast.CommentGroup, words [][][]commentWord, names map[string]string) {
	var b strings.Builder
	for g, cg := range comments {
		for c, cm := range cg.List {
			b.Reset()
			last := 0
			for _, w := range words[g][c] {
				if n, ok := names[w.word]; ok {
					b.WriteString(cm.Text[last:w.start])
					b.WriteString(n)
					last = w.end
				}
			}
			if last > 0 {
				b.WriteString(cm.Text[last:])
				cm.Text = b.String()
			}
		}
	}
}

// declName is the template name a declaration introduces.
func declName(d ast.Decl) string {
	switch d := d.(type) {
	case *ast.FuncDecl:
		return d.Name.Name
	case *ast.GenDecl:
		if len(d.Specs) > 0 {
			return specNames(d.Specs[0])[0]
		}
	}
	return ""
}

func upperFirst(s string) string {
	if s == "" {
		return s
	}
	return strings.ToUpper(s[:1]) + s[1:]
}

// MinimizerPrefix is the prefix of every unexported name generated for the
// minimizer named name (its kernels, and its derived gradient
// <prefix>AutoGradient): name with a leading initialism lowered. Outside
// checks that call a derived gradient by name use it.
func MinimizerPrefix(name string) string { return lowerFirst(name) }

// lowerFirst lowers a leading initialism: FitCurve → fitCurve, URLFit → urlFit.
func lowerFirst(s string) string {
	r := []rune(s)
	for i := range r {
		if r[i] < 'A' || r[i] > 'Z' {
			break
		}
		if i > 0 && i+1 < len(r) && r[i+1] >= 'a' && r[i+1] <= 'z' {
			break
		}
		r[i] += 'a' - 'A'
	}
	return string(r)
}
