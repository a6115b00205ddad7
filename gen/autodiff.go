package gen

import (
	"bytes"
	"fmt"
	"go/ast"
	"go/format"
	"go/token"
	"go/types"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
)

// Automatic differentiation (derivative = "automatic") writes, beside the
// minimizer, the gradient of the user's objective (the Jacobian of a
// residual objective) by transforming the objective's Go syntax tree in
// forward mode: every float that depends on the unknowns gets a tangent,
// an array of N holding its derivative with respect to each unknown.
//
// Each statement is differentiated on its own (statement-level
// preaccumulation): the statement's expression is split into named
// temporaries, its partial derivatives with respect to the floats it reads
// are found by a reverse sweep over the expression (scalars only), and the
// statement's tangent is then one loop over the N components,
// ∂v[k] = Σ cⱼ·∂uⱼ[k]. A read of the unknowns x[i] has the tangent eᵢ, so it
// adds its coefficient to one component instead of a loop.
//
// References:
//   - A. Griewank and A. Walther, Evaluating Derivatives: Principles and
//     Techniques of Algorithmic Differentiation, 2nd ed., SIAM, 2008:
//     §3.1 (forward mode, tangents), §10.2 (statement-level
//     preaccumulation).
//   - C. Bischof, A. Carle, G. Corliss, A. Griewank and P. Hovland,
//     "ADIFOR — generating derivative codes from Fortran programs",
//     Scientific Programming 1(1):11–29, 1992 (the statement-level
//     reverse sweep inside a forward-mode code).
//
// Conventions where the objective is not differentiable, documented in
// the README: a branch contributes the derivative of the branch taken;
// math.Abs has derivative sign(u), 0 at u = 0; math.Max and math.Min (and
// the builtins max and min) take the derivative of the argument they
// return, the first on a tie; math.Sqrt at 0 and math.Pow(0, p) with p < 1
// give an infinite derivative, which the minimizer reports as a gradient
// that is not finite; math.Pow's derivative with respect to its exponent,
// log(u)·uᵖ, is taken as 0 where uᵖ = 0; math.Hypot's at (0, 0) is 0.

// derivedCode is the derivative source one minimizer's file carries.
type derivedCode struct {
	Source   []byte // gofmt'ed declarations
	UsesMath bool
	Gradient string // name of the generated gradient (a method when the objective is one)
	Jacobian string // name of the generated Jacobian, for a residual objective
	Prefix   string // the minimizer prefix every generated name starts with
}

// renamed is the code with the generated names moved to another
// minimizer prefix, for the variants thalweg tune builds beside the
// spec's own file (which declares the original names).
func (c *derivedCode) renamed(prefix string) *derivedCode {
	if prefix == c.Prefix {
		return c
	}
	names := regexp.MustCompile(`\b` + regexp.QuoteMeta(c.Prefix) + `(Auto(Gradient|Jacobian)|Tangent)`)
	out := *c
	out.Source = names.ReplaceAll(c.Source, []byte(prefix+"$1"))
	out.Gradient = names.ReplaceAllString(c.Gradient, prefix+"$1")
	out.Jacobian = names.ReplaceAllString(c.Jacobian, prefix+"$1")
	out.Prefix = prefix
	return &out
}

// adVariant is one function to differentiate: which of its parameters, if
// any, holds the unknowns themselves (seeded with the identity).
type adVariant struct {
	fn       *types.Func
	unknowns int    // parameter index, -1 for none
	passive  string // for each parameter, 'p' where the call passes a float that does not depend on x
}

// differentiator differentiates one objective and the package functions
// it calls.
type differentiator struct {
	lp       *loadedPackage
	info     *types.Info
	shape    *Shape
	elem     string // T, the tangents' element type
	n        int    // unknowns: the tangents' length
	prefix   string
	decls    map[*types.Func]*ast.FuncDecl
	sources  map[string][]byte
	names    map[adVariant]string
	queue    []adVariant
	taken    map[string]bool // generated package-level names
	methods  map[string]bool // the package's own method names
	out      bytes.Buffer
	usesMath bool
	probs    *Problems
	failed   bool
}

// differentiate writes the gradient (or the Jacobian) of the objective fn
// for the minimizer m; problems are positioned at the construct refused.
func (lp *loadedPackage) differentiate(m *Minimizer, shape *Shape, fn *types.Func, probs *Problems) *derivedCode {
	d := &differentiator{
		lp: lp, info: lp.pkg.TypesInfo, shape: shape, elem: shape.Elem, n: max(shape.Dim, 1),
		prefix: lowerFirst(m.Name), decls: map[*types.Func]*ast.FuncDecl{}, sources: map[string][]byte{},
		names: map[adVariant]string{}, taken: map[string]bool{}, probs: probs,
	}
	for _, f := range lp.pkg.Syntax {
		for _, decl := range f.Decls {
			if fd, ok := decl.(*ast.FuncDecl); ok && fd.Body != nil {
				if obj, ok := d.info.Defs[fd.Name].(*types.Func); ok {
					d.decls[obj] = fd
				}
			}
		}
	}
	decl := d.decls[fn]
	if decl == nil {
		probs.add(lp.position(fn.Pos()), "derivative = \"automatic\" needs the source of %s, which thalweg cannot find; use derivative = \"central\"", fn.Name())
		return nil
	}
	code := &derivedCode{Prefix: d.prefix}
	if shape.Residuals > 0 {
		code.Jacobian = d.unique(d.prefix + "AutoJacobian")
	} else {
		code.Gradient = d.unique(d.prefix + "AutoGradient")
	}
	d.top(decl, code)
	for len(d.queue) > 0 && !d.failed {
		v := d.queue[0]
		d.queue = d.queue[1:]
		d.helper(v)
	}
	if d.failed {
		return nil
	}
	src, err := format.Source(d.out.Bytes())
	if err != nil {
		probs.add(lp.position(fn.Pos()), "derivative = \"automatic\": the derivative code thalweg wrote for %s does not parse (a thalweg bug): %v", fn.Name(), err)
		return nil
	}
	code.Source = src
	code.UsesMath = d.usesMath
	return code
}

// unique returns name, or name with a number, not declared in the package
// nor generated before.
func (d *differentiator) unique(name string) string {
	if d.methods == nil {
		// the generated functions of a method objective are methods, so
		// the package's method names are taken too
		d.methods = map[string]bool{}
		scope := d.lp.pkg.Types.Scope()
		for _, n := range scope.Names() {
			if named, ok := scope.Lookup(n).Type().(*types.Named); ok && scope.Lookup(n).Pkg() == d.lp.pkg.Types {
				for m := range named.Methods() {
					if !d.lp.generated(d.lp.pkg.Fset.Position(m.Pos()).Filename) {
						d.methods[m.Name()] = true
					}
				}
			}
		}
	}
	for i := 2; ; i++ {
		obj := d.lp.pkg.Types.Scope().Lookup(name)
		if !d.taken[name] && !d.methods[name] && (obj == nil || d.lp.generated(d.lp.pkg.Fset.Position(obj.Pos()).Filename)) {
			d.taken[name] = true
			return name
		}
		name = strings.TrimRight(name, "0123456789") + strconv.Itoa(i)
	}
}

// refuse reports a construct automatic differentiation does not take.
func (d *differentiator) refuse(n ast.Node, format string, args ...any) {
	if d.failed {
		return // one problem per objective: what follows a refusal may only echo it
	}
	d.failed = true
	d.probs.add(d.lp.position(n.Pos()), "derivative = \"automatic\" cannot differentiate "+format+"; use derivative = \"central\", or \"analytic\" with a gradient of your own", args...)
}

// text is a node's source, as the user wrote it.
func (d *differentiator) text(n ast.Node) string {
	fset := d.lp.pkg.Fset
	file := fset.File(n.Pos())
	if file == nil {
		return ""
	}
	src, ok := d.sources[file.Name()]
	if !ok {
		src, _ = os.ReadFile(file.Name())
		d.sources[file.Name()] = src
	}
	start, end := file.Offset(n.Pos()), file.Offset(n.End())
	if end > len(src) || start > end {
		return ""
	}
	return string(src[start:end])
}

// where is "file.go:12" for a comment: the base name, never a path.
func (d *differentiator) where(n ast.Node) string {
	p := d.lp.pkg.Fset.Position(n.Pos())
	return fmt.Sprintf("%s:%d", filepath.Base(p.Filename), p.Line)
}

// typeText writes t as code in the package.
func (d *differentiator) typeText(t types.Type) string {
	return types.TypeString(t, func(p *types.Package) string {
		if p == d.lp.pkg.Types {
			return ""
		}
		return p.Name()
	})
}

// isFloat reports whether t's underlying type is float32 or float64.
func isFloat(t types.Type) bool {
	if t == nil {
		return false
	}
	b, ok := t.Underlying().(*types.Basic)
	return ok && b.Info()&types.IsFloat != 0 && b.Info()&types.IsUntyped == 0
}

// floatArray reports whether t is an array of floats.
func floatArray(t types.Type) bool {
	a, ok := types.Unalias(t).Underlying().(*types.Array)
	return ok && isFloat(a.Elem())
}

// ex is a piece of generated code: an expression's text, whether it needs
// no parentheses as an operand, and whether it is a constant (untyped
// constants are never held in temporaries: := would make them float64).
type ex struct {
	s      string
	atomic bool
	konst  bool
	free   bool // costs nothing to repeat: a name, a literal, an element
}

var (
	one      = ex{s: "1", atomic: true, konst: true, free: true}
	minusOne = ex{s: "-1", atomic: true, konst: true, free: true}
)

func (e ex) isOne() bool { return e.s == "1" }

func (e ex) paren() string {
	if e.atomic {
		return e.s
	}
	return "(" + e.s + ")"
}

func mul(a, b ex) ex {
	switch {
	case a.isOne():
		return b
	case b.isOne():
		return a
	case b.s == "-1":
		return neg(a)
	case a.s == "-1":
		return neg(b)
	}
	return ex{s: a.paren() + " * " + b.paren(), konst: a.konst && b.konst}
}

func neg(a ex) ex {
	if strings.HasPrefix(a.s, "-") && a.atomic {
		return ex{s: strings.TrimPrefix(a.s, "-"), atomic: true, konst: a.konst}
	}
	return ex{s: "-" + a.paren(), atomic: true, konst: a.konst}
}

func add(a, b ex) ex {
	if strings.HasPrefix(b.s, "-") && b.atomic {
		return ex{s: a.s + " - " + strings.TrimPrefix(b.s, "-"), konst: a.konst && b.konst}
	}
	return ex{s: a.s + " + " + b.s, konst: a.konst && b.konst}
}

// lnode is a node of a statement's expression: its value, its type, and
// the partial derivative of its value with respect to each active child.
// A leaf carries a tangent: an array (row), or a unit vector (seed: a
// read of the unknowns x[seed]).
type lnode struct {
	val    ex
	typ    types.Type
	active bool
	kids   []*lnode
	parts  []ex // ∂val/∂kids[i], in val's type
	row    string
	seed   string
	sparse []term // a sparse variable's unit vectors
}

// term is one leaf's share of a statement's tangent.
type term struct {
	coef ex
	row  string
	seed string
}

// adFunc is the state of one function's derivative code.
type adFunc struct {
	d         *differentiator
	decl      *ast.FuncDecl
	unknowns  types.Object // the parameter holding the unknowns (vector forms)
	output    types.Object // a residual objective's r
	outputRow string       // the Jacobian: r[i]'s tangent is outputRow[i]
	active    map[types.Object]bool
	tangent   map[types.Object]string
	pointer   map[types.Object]bool // tangent held through a pointer parameter
	read      map[string]bool       // tangents some statement reads
	assigned  map[types.Object]int  // assignments to each variable
	// sparse holds the tangents kept as a few unit vectors: a variable
	// assigned once from reads of the unknowns alone, dv = Σ cⱼ·e_{iⱼ}
	// (a − x[i] has one, x[i+1] − x[i]² two), whose reads then add to a
	// few components instead of a loop over all N (compile-time sparsity,
	// Griewank & Walther 2008, ch. 7).
	sparse  map[types.Object][]term
	used    map[string]bool
	once    map[string]bool // the locals the derivative code assigns once (temp, hold): never stale
	body    *bytes.Buffer
	result  string       // where a return's tangent goes ("" when nothing is returned)
	value   bool         // a return keeps its value (helpers) or not (the objective)
	k       string       // the tangent loop's index
	fresh0  string       // a tangent just declared, so already zero
	byValue bool         // the unknowns are an array value, not a pointer
	named   types.Object // a named result, declared as a local
}

func (d *differentiator) newFunc(decl *ast.FuncDecl) *adFunc {
	f := &adFunc{d: d, decl: decl, active: map[types.Object]bool{}, tangent: map[types.Object]string{},
		pointer: map[types.Object]bool{}, read: map[string]bool{}, assigned: map[types.Object]int{}, sparse: map[types.Object][]term{}, used: map[string]bool{}, once: map[string]bool{}, body: &bytes.Buffer{}}
	ast.Inspect(decl, func(n ast.Node) bool {
		if id, ok := n.(*ast.Ident); ok {
			f.used[id.Name] = true
		}
		return true
	})
	f.k = f.fresh("k")
	return f
}

// fresh returns a local name not used in the function.
func (f *adFunc) fresh(base string) string {
	name := base
	for i := 2; f.used[name]; i++ {
		name = base + strconv.Itoa(i)
	}
	f.used[name] = true
	return name
}

// temp returns a fresh temporary name of the given kind.
func (f *adFunc) temp(base string) string {
	for i := 1; ; i++ {
		name := base + strconv.Itoa(i)
		if !f.used[name] {
			f.used[name], f.once[name] = true, true
			return name
		}
	}
}

func (f *adFunc) line(format string, args ...any) {
	fmt.Fprintf(f.body, format+"\n", args...)
}

func (f *adFunc) tangentType() string { return fmt.Sprintf("[%d]%s", f.d.n, f.d.elem) }

// tangentName names the tangent of a variable.
func (f *adFunc) tangentName(obj types.Object) string {
	if t, ok := f.tangent[obj]; ok {
		return t
	}
	name := obj.Name()
	t := f.fresh("d" + strings.ToUpper(name[:1]) + name[1:])
	f.tangent[obj] = t
	return t
}

// objOf is the variable an identifier names.
func (d *differentiator) objOf(id *ast.Ident) types.Object {
	if o := d.info.Defs[id]; o != nil {
		return o
	}
	return d.info.Uses[id]
}

// analyze finds the active variables: the function's floats (and arrays of
// floats) that depend on the unknowns or on an active parameter, to a
// fixed point over the body's assignments.
func (f *adFunc) analyze() {
	d := f.d
	type flow struct {
		to   types.Object
		from ast.Expr
	}
	var flows []flow
	local := func(e ast.Expr) types.Object {
		for {
			switch v := e.(type) {
			case *ast.ParenExpr:
				e = v.X
			case *ast.IndexExpr:
				e = v.X
			case *ast.Ident:
				return d.objOf(v)
			default:
				return nil
			}
		}
	}
	ast.Inspect(f.decl.Body, func(n ast.Node) bool {
		switch s := n.(type) {
		case *ast.AssignStmt:
			for i, l := range s.Lhs {
				if o := local(l); o != nil {
					// a, b := f(x) takes each from the one call
					flows = append(flows, flow{o, s.Rhs[min(i, len(s.Rhs)-1)]})
				}
			}
		case *ast.ValueSpec:
			for i, name := range s.Names {
				if i < len(s.Values) {
					flows = append(flows, flow{d.objOf(name), s.Values[i]})
				}
			}
		case *ast.RangeStmt:
			if s.Value != nil {
				if o := local(s.Value); o != nil {
					flows = append(flows, flow{o, s.X})
				}
			}
		}
		return true
	})
	for _, fl := range flows {
		f.assigned[fl.to]++
	}
	for changed := true; changed; {
		changed = false
		for _, fl := range flows {
			if fl.to == nil || f.active[fl.to] || !(isFloat(fl.to.Type()) || floatArray(fl.to.Type())) {
				continue
			}
			if f.reads(fl.from) {
				f.active[fl.to] = true
				changed = true
			}
		}
	}
}

// reads reports whether e's value depends on the unknowns or an active
// variable through floats: len(x), int(v) and comparisons do not.
func (f *adFunc) reads(e ast.Expr) bool {
	d := f.d
	switch v := e.(type) {
	case *ast.Ident:
		o := d.objOf(v)
		return o != nil && (f.active[o] || o == f.unknowns || o == f.output)
	case *ast.ParenExpr:
		return f.reads(v.X)
	case *ast.IndexExpr:
		return f.reads(v.X)
	case *ast.SliceExpr:
		return f.reads(v.X)
	case *ast.StarExpr:
		return f.reads(v.X)
	case *ast.SelectorExpr:
		if id, ok := v.X.(*ast.Ident); ok {
			if _, pkg := d.objOf(id).(*types.PkgName); pkg {
				return false
			}
		}
		return f.reads(v.X)
	case *ast.UnaryExpr:
		return v.Op != token.NOT && f.reads(v.X)
	case *ast.BinaryExpr:
		if !isFloat(d.info.TypeOf(v)) {
			return false
		}
		return f.reads(v.X) || f.reads(v.Y)
	case *ast.CallExpr:
		if tv, ok := d.info.Types[v.Fun]; ok && tv.IsType() {
			return isFloat(tv.Type) && len(v.Args) == 1 && f.reads(v.Args[0])
		}
		if id, ok := ast.Unparen(v.Fun).(*ast.Ident); ok {
			if b, ok := d.objOf(id).(*types.Builtin); ok && (b.Name() == "len" || b.Name() == "cap") {
				return false
			}
		}
		if sel, ok := ast.Unparen(v.Fun).(*ast.SelectorExpr); ok && f.reads(sel.X) {
			return true
		}
		for _, a := range v.Args {
			if f.reads(a) {
				return true
			}
		}
	case *ast.CompositeLit:
		for _, el := range v.Elts {
			if kv, ok := el.(*ast.KeyValueExpr); ok {
				el = kv.Value
			}
			if f.reads(el) {
				return true
			}
		}
	}
	return false
}

// top writes the objective's gradient (or Jacobian).
func (d *differentiator) top(decl *ast.FuncDecl, code *derivedCode) {
	f := d.newFunc(decl)
	s := d.shape
	params := decl.Type.Params.List
	var xName string
	var xObj types.Object
	if len(params) > 0 && len(params[0].Names) > 0 {
		xObj = d.objOf(params[0].Names[0])
		xName = xObj.Name()
	}
	if xName == "" || xName == "_" {
		xName = f.fresh("x")
	}
	recv := d.receiverText(decl)
	vec := f.tangentType()
	var head strings.Builder
	if s.Residuals > 0 {
		jac := f.fresh("jac")
		var rName string
		if ps := paramObjects(d, decl); len(ps) > 1 && ps[1] != nil {
			f.output = ps[1]
			rName = ps[1].Name()
		}
		if rName == "" || rName == "_" {
			rName = f.fresh("r")
		}
		f.outputRow = jac
		f.unknowns = xObj
		fmt.Fprintf(&head, "// %s writes the Jacobian of %s's residuals by rows, %s[i][j] = ∂rᵢ/∂xⱼ:\n", code.Jacobian, decl.Name.Name, jac)
		fmt.Fprintf(&head, "// %s (%s) differentiated in forward mode by thalweg derivative = \"automatic\".\n", decl.Name.Name, d.where(decl))
		star := "*" // x as the objective takes it: the kernels call the Jacobian so
		if s.Arg == ArgArray {
			star, f.byValue = "", true
		}
		fmt.Fprintf(&head, "func %s%s(%s %s%s, %s *[%d]%s) {\n", recv, code.Jacobian, xName, star, vec, jac, s.Residuals, vec)
		f.line("*%s = [%d]%s{}", jac, s.Residuals, vec)
		f.line("var %s [%d]%s", rName, s.Residuals, d.elem)
	} else {
		g := f.fresh("grad")
		f.result = g
		fmt.Fprintf(&head, "// %s writes ∇%s(x) into %s: %s (%s) differentiated in forward mode by\n", code.Gradient, decl.Name.Name, g, decl.Name.Name, d.where(decl))
		head.WriteString("// thalweg derivative = \"automatic\".\n")
		if s.Scalar() {
			at := f.fresh("at")
			fmt.Fprintf(&head, "func %s%s(%s *%s, %s *%s) {\n", recv, code.Gradient, at, vec, g, vec)
			if xObj != nil {
				f.active[xObj] = true
				t := f.tangentName(xObj)
				f.line("%s := %s[0]", xName, at)
				f.line("%s := %s{1}", t, vec)
				f.line("_, _ = %s, %s", xName, t)
			}
		} else {
			f.unknowns = xObj
			fmt.Fprintf(&head, "func %s%s(%s *%s, %s *%s) {\n", recv, code.Gradient, xName, vec, g, vec)
		}
	}
	f.analyze()
	f.namedResult()
	f.block(decl.Body.List)
	d.out.WriteString(head.String())
	d.out.Write(f.finish())
	d.out.WriteString("}\n\n")
}

// receiverText is "(name Type) " of a method, as the user wrote it, so
// that a generated function of a method is a method of the same receiver;
// "" for a plain function.
func (d *differentiator) receiverText(decl *ast.FuncDecl) string {
	if decl.Recv == nil || len(decl.Recv.List) == 0 {
		return ""
	}
	r := decl.Recv.List[0]
	name := "_"
	if len(r.Names) > 0 {
		name = r.Names[0].Name
	}
	return fmt.Sprintf("(%s %s) ", name, d.text(r.Type))
}

// paramObjects are a function's parameters, nil where unnamed.
func paramObjects(d *differentiator, decl *ast.FuncDecl) []types.Object {
	var out []types.Object
	for _, field := range decl.Type.Params.List {
		if len(field.Names) == 0 {
			out = append(out, nil)
		}
		for _, name := range field.Names {
			out = append(out, d.objOf(name))
		}
	}
	return out
}

// variant returns the name of a helper's derivative, queueing it.
func (d *differentiator) variant(v adVariant) string {
	if name, ok := d.names[v]; ok {
		return name
	}
	base := v.fn.Name()
	if sig := v.fn.Type().(*types.Signature); sig.Recv() != nil {
		t := sig.Recv().Type()
		if p, ok := t.(*types.Pointer); ok {
			t = p.Elem()
		}
		if named, ok := types.Unalias(t).(*types.Named); ok {
			base = named.Obj().Name() + strings.ToUpper(base[:1]) + base[1:]
		}
	}
	name := d.unique(d.prefix + "Tangent" + strings.ToUpper(base[:1]) + base[1:])
	d.names[v] = name
	d.queue = append(d.queue, v)
	return name
}

// helper writes the derivative of a package function the objective calls:
// each float parameter p comes with its tangent dP, and the result's
// tangent goes to dres.
func (d *differentiator) helper(v adVariant) {
	decl := d.decls[v.fn]
	f := d.newFunc(decl)
	vec := f.tangentType()
	params := paramObjects(d, decl)
	var list []string
	var copies []string
	assigned := assignedObjects(d, decl.Body)
	for i, p := range params {
		name := "_"
		if p != nil {
			name = p.Name()
		}
		if name == "_" {
			name = f.fresh("p")
		}
		var typ types.Type
		if p != nil {
			typ = p.Type()
		} else {
			typ = v.fn.Type().(*types.Signature).Params().At(i).Type()
		}
		switch {
		case i == v.unknowns:
			f.unknowns = p
			list = append(list, fmt.Sprintf("%s *%s", name, vec))
		case isFloat(typ) && v.passive[i] == 'p':
			list = append(list, fmt.Sprintf("%s %s", name, d.typeText(typ)))
		case isFloat(typ):
			list = append(list, fmt.Sprintf("%s %s", name, d.typeText(typ)))
			if p == nil {
				list = append(list, fmt.Sprintf("_ *%s", vec))
				continue
			}
			f.active[p] = true
			t := f.tangentName(p)
			if assigned[p] {
				in := f.fresh(t + "In")
				list = append(list, fmt.Sprintf("%s *%s", in, vec))
				copies = append(copies, fmt.Sprintf("%s := *%s", t, in))
			} else {
				f.pointer[p] = true
				list = append(list, fmt.Sprintf("%s *%s", t, vec))
			}
		default:
			list = append(list, fmt.Sprintf("%s %s", name, d.typeText(typ)))
		}
	}
	sig := v.fn.Type().(*types.Signature)
	if sig.Results().Len() != 1 || !isFloat(sig.Results().At(0).Type()) {
		d.refuse(decl.Name, "%s: a function the objective calls with values that depend on x must return one float (it has %s)", decl.Name.Name, signatureText(sig))
		return
	}
	res := f.fresh("dres")
	list = append(list, fmt.Sprintf("%s *%s", res, vec))
	f.result, f.value = res, true
	recv := d.receiverText(decl)
	fmt.Fprintf(&d.out, "// %s is %s (%s) with the derivative of each float with respect to the\n// unknowns carried along (derivative = \"automatic\").\n", d.names[v], decl.Name.Name, d.where(decl))
	fmt.Fprintf(&d.out, "func %s%s(%s) %s {\n", recv, d.names[v], strings.Join(list, ", "), d.typeText(sig.Results().At(0).Type()))
	for _, c := range copies {
		f.line("%s", c)
	}
	f.analyze()
	f.namedResult()
	f.block(decl.Body.List)
	d.out.Write(f.finish())
	d.out.WriteString("}\n\n")
}

// assignedObjects are the variables a body assigns to.
func assignedObjects(d *differentiator, body *ast.BlockStmt) map[types.Object]bool {
	out := map[types.Object]bool{}
	ast.Inspect(body, func(n ast.Node) bool {
		switch s := n.(type) {
		case *ast.AssignStmt:
			for _, l := range s.Lhs {
				if id, ok := ast.Unparen(l).(*ast.Ident); ok {
					out[d.objOf(id)] = true
				}
			}
		case *ast.IncDecStmt:
			if id, ok := ast.Unparen(s.X).(*ast.Ident); ok {
				out[d.objOf(id)] = true
			}
		}
		return true
	})
	return out
}

func (f *adFunc) block(list []ast.Stmt) {
	for _, s := range list {
		if f.d.failed {
			return
		}
		f.stmt(s)
	}
}

// comment points at the source line a block differentiates.
func (f *adFunc) comment(n ast.Node) {
	text := f.d.text(n)
	if i := strings.IndexByte(text, '\n'); i >= 0 {
		text = text[:i] + " …"
	}
	f.line("// %s: %s", f.d.where(n), text)
}

func (f *adFunc) stmt(s ast.Stmt) {
	d := f.d
	switch s := s.(type) {
	case *ast.BlockStmt:
		f.line("{")
		f.block(s.List)
		f.line("}")
	case *ast.ExprStmt:
		if call, ok := s.X.(*ast.CallExpr); ok {
			if id, ok := ast.Unparen(call.Fun).(*ast.Ident); ok && id.Name == "panic" {
				if _, builtin := d.objOf(id).(*types.Builtin); builtin {
					f.check(call)
					f.line("%s", d.text(s))
					return
				}
			}
		}
		d.refuse(s, "a call whose result is not used (a function writing through its arguments or to package state)")
	case *ast.IncDecStmt:
		f.writeTarget(s.X)
		f.check(s.X)
		f.line("%s", d.text(s))
	case *ast.AssignStmt:
		f.assign(s)
	case *ast.DeclStmt:
		f.declStmt(s)
	case *ast.ReturnStmt:
		f.ret(s)
	case *ast.IfStmt:
		f.ifStmt(s)
	case *ast.ForStmt:
		init := ""
		if a, ok := s.Init.(*ast.AssignStmt); ok && !f.anyActive(a) && !f.readsAny(a.Rhs) {
			f.check(a)
			init, s = d.text(a), &ast.ForStmt{For: s.For, Cond: s.Cond, Post: s.Post, Body: s.Body}
		}
		if s.Init != nil {
			f.line("{")
			f.stmt(s.Init)
		}
		cond := "true"
		if s.Cond != nil {
			f.check(s.Cond)
			cond = d.text(s.Cond)
		}
		var post string
		if s.Post != nil {
			if f.anyActive(s.Post) {
				d.refuse(s.Post, "a loop's post statement that changes a value depending on x; move it into the loop body")
				return
			}
			f.check(s.Post)
			post = d.text(s.Post)
		}
		f.line("for %s; %s; %s {", init, cond, post)
		f.block(s.Body.List)
		f.line("}")
		if s.Init != nil {
			f.line("}")
		}
	case *ast.RangeStmt:
		f.rangeStmt(s)
	case *ast.SwitchStmt:
		if s.Init != nil {
			f.line("{")
			f.stmt(s.Init)
		}
		tag := ""
		if s.Tag != nil {
			f.check(s.Tag)
			tag = d.text(s.Tag)
		}
		f.line("switch %s {", tag)
		for _, c := range s.Body.List {
			cc := c.(*ast.CaseClause)
			if cc.List == nil {
				f.line("default:")
			} else {
				var labels []string
				for _, e := range cc.List {
					f.check(e)
					labels = append(labels, d.text(e))
				}
				f.line("case %s:", strings.Join(labels, ", "))
			}
			f.block(cc.Body)
		}
		f.line("}")
		if s.Init != nil {
			f.line("}")
		}
	case *ast.BranchStmt:
		if s.Tok == token.GOTO || s.Tok == token.FALLTHROUGH {
			d.refuse(s, "%s", s.Tok)
			return
		}
		f.line("%s", d.text(s))
	case *ast.LabeledStmt:
		f.line("%s:", s.Label.Name)
		f.stmt(s.Stmt)
	case *ast.EmptyStmt:
	case *ast.GoStmt:
		d.refuse(s, "a go statement (goroutines)")
	case *ast.DeferStmt:
		d.refuse(s, "a defer statement")
	case *ast.SelectStmt, *ast.SendStmt:
		d.refuse(s, "channel operations")
	case *ast.TypeSwitchStmt:
		d.refuse(s, "a type switch (interfaces)")
	default:
		d.refuse(s, "this statement")
	}
}

func (f *adFunc) ifStmt(s *ast.IfStmt) {
	d := f.d
	if s.Init != nil {
		f.line("{")
		f.stmt(s.Init)
	}
	f.check(s.Cond)
	f.line("if %s {", d.text(s.Cond))
	f.block(s.Body.List)
	switch e := s.Else.(type) {
	case nil:
		f.line("}")
	case *ast.BlockStmt:
		f.line("} else {")
		f.block(e.List)
		f.line("}")
	case *ast.IfStmt:
		f.line("} else {")
		f.ifStmt(e)
		f.line("}")
	}
	if s.Init != nil {
		f.line("}")
	}
}

func (f *adFunc) rangeStmt(s *ast.RangeStmt) {
	d := f.d
	over := ast.Unparen(s.X)
	if !f.isUnknowns(over) {
		f.check(s.X)
	}
	overObj := types.Object(nil)
	if id, ok := over.(*ast.Ident); ok {
		overObj = d.objOf(id)
	}
	valueActive := s.Value != nil && overObj != nil && (overObj == f.unknowns || f.active[overObj] || overObj == f.output)
	if !valueActive {
		if f.anyActive(s.Key) || (s.Value != nil && f.anyActive(s.Value)) {
			d.refuse(s, "a range loop assigning to variables that depend on x")
			return
		}
		head := "for "
		if s.Key != nil {
			head += d.text(s.Key)
			if s.Value != nil {
				head += ", " + d.text(s.Value)
			}
			head += " " + s.Tok.String() + " "
		}
		f.line("%srange %s {", head, d.text(s.X))
		f.block(s.Body.List)
		f.line("}")
		return
	}
	if s.Tok != token.DEFINE {
		d.refuse(s, "a range loop assigning to variables declared outside it")
		return
	}
	key := "_"
	if s.Key != nil {
		key = d.text(s.Key)
	}
	if key == "_" {
		key = f.fresh("i")
	}
	f.line("for %s := range %s {", key, d.text(s.X))
	value, ok := s.Value.(*ast.Ident)
	if !ok {
		d.refuse(s.Value, "a range value that is not a variable")
		return
	}
	if value.Name != "_" {
		obj := d.objOf(value)
		f.active[obj] = true
		read := &lnode{val: ex{s: fmt.Sprintf("%s[%s]", overObj.Name(), key), atomic: true, free: true}, typ: obj.Type(), active: true}
		switch {
		case overObj == f.unknowns:
			read.seed = key
		case overObj == f.output:
			read.row = fmt.Sprintf("%s[%s]", f.outputRow, key)
		default:
			read.row = fmt.Sprintf("%s[%s]", f.tangentName(overObj), key)
		}
		f.define(obj, value.Name, read)
	}
	f.block(s.Body.List)
	f.line("}")
}

// anyActive reports whether an expression names an active variable.
func (f *adFunc) anyActive(n ast.Node) bool {
	found := false
	if n == nil {
		return false
	}
	ast.Inspect(n, func(m ast.Node) bool {
		if id, ok := m.(*ast.Ident); ok {
			if o := f.d.objOf(id); o != nil && f.active[o] {
				found = true
			}
		}
		return !found
	})
	return found
}

// check refuses what an expression copied as the user wrote it may not
// hold: closures, other packages, channel, map and interface operations,
// and bare uses of the unknowns that would alias them.
func (f *adFunc) check(e ast.Node) {
	d := f.d
	allowed := map[*ast.Ident]bool{}
	ast.Inspect(e, func(n ast.Node) bool {
		switch v := n.(type) {
		case *ast.IndexExpr:
			if id, ok := ast.Unparen(v.X).(*ast.Ident); ok {
				allowed[id] = true
			}
		case *ast.CallExpr:
			if id, ok := ast.Unparen(v.Fun).(*ast.Ident); ok && (id.Name == "len" || id.Name == "cap") && len(v.Args) == 1 {
				if arg, ok := ast.Unparen(v.Args[0]).(*ast.Ident); ok {
					allowed[arg] = true
				}
			}
		}
		return true
	})
	ast.Inspect(e, func(n ast.Node) bool {
		if d.failed {
			return false
		}
		switch v := n.(type) {
		case *ast.FuncLit:
			d.refuse(v, "a function literal (closures)")
			return false
		case *ast.SelectorExpr:
			if id, ok := v.X.(*ast.Ident); ok {
				if pn, ok := d.objOf(id).(*types.PkgName); ok {
					if pn.Imported().Path() != "math" {
						d.refuse(v, "%s: a call or value outside the package other than math (%s)", d.text(v), pn.Imported().Path())
					} else if id.Name != "math" {
						d.refuse(v, "%s: math imported under another name (%s)", d.text(v), id.Name)
					}
					return false
				}
			}
			if sel := d.info.Selections[v]; sel != nil && sel.Kind() == types.MethodVal {
				if _, ok := sel.Recv().Underlying().(*types.Interface); ok {
					d.refuse(v, "%s: a method call through an interface", d.text(v))
					return false
				}
			}
		case *ast.IndexExpr:
			if _, ok := d.info.TypeOf(v.X).Underlying().(*types.Map); ok {
				d.refuse(v, "%s: a map", d.text(v))
				return false
			}
		case *ast.UnaryExpr:
			if v.Op == token.ARROW {
				d.refuse(v, "channel operations")
				return false
			}
		case *ast.TypeAssertExpr:
			d.refuse(v, "a type assertion (interfaces)")
			return false
		case *ast.CallExpr:
			if fn := calledFunc(d.info, v); fn != nil && fn.Pkg() != nil && fn.Pkg() != d.lp.pkg.Types && fn.Pkg().Path() != "math" {
				d.refuse(v, "%s: a call outside the package other than math", d.text(v.Fun))
				return false
			}
			if tv, ok := d.info.Types[v.Fun]; ok && !tv.IsType() && !tv.IsBuiltin() && calledFunc(d.info, v) == nil {
				d.refuse(v, "%s: a call of a function value", d.text(v.Fun))
				return false
			}
		case *ast.Ident:
			if o := d.objOf(v); o != nil && (o == f.unknowns || o == f.output) && !allowed[v] {
				d.refuse(v, "%s used whole where its derivative is not carried: the unknowns may only be indexed, ranged over, measured with len or passed whole to a function of the package in a float expression", v.Name)
			}
		}
		return true
	})
}

// calledFunc is the function or method a call names statically.
func calledFunc(info *types.Info, call *ast.CallExpr) *types.Func {
	switch fun := ast.Unparen(call.Fun).(type) {
	case *ast.Ident:
		fn, _ := info.Uses[fun].(*types.Func)
		return fn
	case *ast.SelectorExpr:
		if sel := info.Selections[fun]; sel != nil {
			fn, _ := sel.Obj().(*types.Func)
			return fn
		}
		fn, _ := info.Uses[fun.Sel].(*types.Func)
		return fn
	case *ast.IndexExpr: // generic instantiation
		return nil
	}
	return nil
}

// writeTarget refuses writes to what the objective may only read.
func (f *adFunc) writeTarget(lhs ast.Expr) {
	d := f.d
	base := ast.Unparen(lhs)
	for {
		switch v := base.(type) {
		case *ast.IndexExpr:
			base = ast.Unparen(v.X)
			continue
		case *ast.ParenExpr:
			base = v.X
			continue
		}
		break
	}
	switch v := base.(type) {
	case *ast.Ident:
		if v.Name == "_" {
			return
		}
		o := d.objOf(v)
		switch {
		case o == nil:
		case o == f.unknowns:
			d.refuse(lhs, "a write to the unknowns %s", v.Name)
		case o.Parent() == d.lp.pkg.Types.Scope():
			d.refuse(lhs, "a write to package state (%s)", v.Name)
		}
	case *ast.SelectorExpr:
		d.refuse(lhs, "a write to a struct field (%s): package state, the receiver or a struct holding values that depend on x", d.text(lhs))
	case *ast.StarExpr:
		d.refuse(lhs, "a write through a pointer (%s)", d.text(lhs))
	default:
		d.refuse(lhs, "a write to %s", d.text(lhs))
	}
}

func (f *adFunc) declStmt(s *ast.DeclStmt) {
	d := f.d
	g := s.Decl.(*ast.GenDecl)
	if g.Tok != token.VAR {
		f.check(g)
		f.line("%s", d.text(s))
		return
	}
	for _, spec := range g.Specs {
		vs := spec.(*ast.ValueSpec)
		anyActive := false
		for _, name := range vs.Names {
			if f.active[d.objOf(name)] {
				anyActive = true
			}
		}
		if !anyActive {
			f.check(vs)
			f.line("var %s", d.text(vs))
			continue
		}
		if len(vs.Values) != 0 && len(vs.Values) != len(vs.Names) {
			d.refuse(vs, "a declaration from a call with several results")
			return
		}
		for i, name := range vs.Names {
			obj := d.objOf(name)
			if !f.active[obj] {
				typ := d.typeText(obj.Type())
				if len(vs.Values) > 0 {
					f.check(vs.Values[i])
					f.line("var %s %s = %s", name.Name, typ, d.text(vs.Values[i]))
				} else {
					f.line("var %s %s", name.Name, typ)
				}
				continue
			}
			if floatArray(obj.Type()) {
				if len(vs.Values) > 0 {
					d.refuse(vs.Values[i], "an array of values that depend on x given a value at once; declare it and set its elements")
					return
				}
				n := obj.Type().Underlying().(*types.Array).Len()
				f.line("var %s %s", name.Name, d.typeText(obj.Type()))
				f.line("var %s [%d]%s", f.tangentName(obj), n, f.tangentType())
				f.line("%s%s", unreadMarker, f.tangentName(obj))
				continue
			}
			f.line("var %s %s", name.Name, d.typeText(obj.Type()))
			f.line("var %s %s", f.tangentName(obj), f.tangentType())
			f.line("%s%s", unreadMarker, f.tangentName(obj))
			if len(vs.Values) > 0 {
				f.comment(vs)
				f.fresh0 = f.tangentName(obj)
				f.store(name.Name, f.tangentName(obj), false, f.lin(vs.Values[i]))
			}
		}
	}
}

// define declares an active variable from a lowered expression.
func (f *adFunc) define(obj types.Object, name string, n *lnode) {
	if f.assigned[obj] == 1 && isFloat(obj.Type()) && f.defineSparse(obj, name, n) {
		return
	}
	t := f.tangentName(obj)
	f.line("var %s %s", t, f.tangentType())
	f.line("%s%s", unreadMarker, t)
	f.fresh0 = t
	f.tangentInto(t, false, n)
	f.line("%s := %s", name, n.val.s)
}

// maxSparse is the most unit vectors a sparse tangent keeps.
const maxSparse = 4

// defineSparse defines a variable assigned once whose tangent is a few
// unit vectors: each coefficient stays a scalar and each index an int
// held at the definition (the index's variables may change or be
// shadowed before a read). It reports false, writing nothing, when the
// tangent is not of that kind.
func (f *adFunc) defineSparse(obj types.Object, name string, n *lnode) bool {
	mark := f.body.Len()
	terms := f.collect(n)
	ok := len(terms) <= maxSparse
	for _, t := range terms {
		ok = ok && t.row == ""
	}
	if !ok {
		f.body.Truncate(mark) // the coefficients collect wrote go again with the loop
		return false
	}
	// The tangent is read later, after the names in its indices and
	// coefficients may have been assigned again (b := 2; v := b*x[0];
	// b = 3): each is held in a local of its own, as of now.
	kept := make([]term, len(terms))
	for j, t := range terms {
		idx, coef := t.seed, t.coef
		if _, err := strconv.Atoi(idx); err != nil {
			idx = f.hold("i"+strings.ToUpper(name[:1])+name[1:], idx)
		}
		if !coef.konst && !f.once[coef.s] {
			coef = ex{s: f.hold("k"+strings.ToUpper(name[:1])+name[1:], coef.s), atomic: true, free: true}
		}
		kept[j] = term{coef: coef, seed: idx}
	}
	f.sparse[obj] = kept
	f.line("%s := %s", name, n.val.s)
	return true
}

// hold assigns value to a fresh local named after base, read or not,
// and returns its name.
func (f *adFunc) hold(base, value string) string {
	v := f.fresh(base)
	f.once[v] = true
	f.line("%s := %s", v, value)
	f.line("%s%s", unreadMarker, v)
	return v
}

// namedResult declares a named float result as the local it is, with
// its tangent when it depends on x; a bare return returns it.
func (f *adFunc) namedResult() {
	results := f.decl.Type.Results
	if results == nil || len(results.List) != 1 || len(results.List[0].Names) != 1 {
		return
	}
	obj := f.d.objOf(results.List[0].Names[0])
	if obj == nil || obj.Name() == "_" {
		return
	}
	f.named = obj
	f.line("var %s %s", obj.Name(), f.d.typeText(obj.Type()))
	if f.active[obj] {
		t := f.tangentName(obj)
		f.line("var %s %s", t, f.tangentType())
		f.line("%s%s", unreadMarker, t)
	}
}

// unreadMarker marks a tangent's declaration; finish turns it into _ = dV
// where nothing reads dV (a variable read only where its derivative does
// not matter: a condition, an index).
const unreadMarker = "//thalweg:unread "

// finish resolves the unread markers of a function's body.
func (f *adFunc) finish() []byte {
	var out bytes.Buffer
	for _, line := range strings.SplitAfter(f.body.String(), "\n") {
		if rest, ok := strings.CutPrefix(line, unreadMarker); ok {
			name := strings.TrimSpace(rest)
			if !f.read[name] {
				fmt.Fprintf(&out, "_ = %s\n", name)
			}
			continue
		}
		out.WriteString(line)
	}
	return out.Bytes()
}

func (f *adFunc) assign(s *ast.AssignStmt) {
	d := f.d
	for _, l := range s.Lhs {
		if s.Tok != token.DEFINE {
			f.writeTarget(l)
		}
	}
	if d.failed {
		return
	}
	if len(s.Lhs) != len(s.Rhs) {
		for _, l := range s.Lhs {
			if f.anyActive(l) || f.readsAny(s.Rhs) {
				d.refuse(s, "an assignment from a call with several results")
				return
			}
		}
		f.check(s)
		f.line("%s", d.text(s))
		return
	}
	active := false
	for i, l := range s.Lhs {
		if f.isActiveTarget(l) || f.reads(s.Rhs[i]) {
			active = true
		}
	}
	if !active {
		for _, r := range s.Rhs {
			f.check(r)
		}
		f.line("%s", d.text(s))
		return
	}
	f.comment(s)
	if len(s.Lhs) > 1 {
		// a, b = e1, e2: every right side first, then the stores.
		type pending struct {
			lhs ast.Expr
			val string
			tan string
		}
		var ps []pending
		for i, l := range s.Lhs {
			n := f.lin(s.Rhs[i])
			v := f.temp("v")
			f.line("%s := %s", v, n.val.s)
			t := ""
			if n.active {
				t = f.temp("dv")
				f.line("var %s %s", t, f.tangentType())
				f.fresh0 = t
				f.tangentInto(t, false, n)
			}
			ps = append(ps, pending{l, v, t})
		}
		for _, p := range ps {
			f.storeExpr(p.lhs, s.Tok, &lnode{val: ex{s: p.val, atomic: true, free: true}, active: p.tan != "", row: p.tan})
		}
		return
	}
	rhs := s.Rhs[0]
	lhs := s.Lhs[0]
	if s.Tok != token.ASSIGN && s.Tok != token.DEFINE {
		// v op= e is v = v op e
		op := map[token.Token]token.Token{token.ADD_ASSIGN: token.ADD, token.SUB_ASSIGN: token.SUB, token.MUL_ASSIGN: token.MUL, token.QUO_ASSIGN: token.QUO}[s.Tok]
		if op == token.ILLEGAL {
			d.refuse(s, "the operator %s on a value that depends on x", s.Tok)
			return
		}
		// lin parenthesizes by its own operands' shapes, so rhs needs no
		// ParenExpr; the synthetic node only needs its type recorded.
		rhs = &ast.BinaryExpr{X: lhs, Op: op, Y: rhs, OpPos: s.TokPos}
		d.info.Types[rhs] = types.TypeAndValue{Type: d.info.TypeOf(lhs)}
	}
	f.storeExpr(lhs, s.Tok, f.lin(rhs))
}

// isActiveTarget reports whether an assignment's target carries a tangent.
func (f *adFunc) isActiveTarget(l ast.Expr) bool {
	base := ast.Unparen(l)
	if ix, ok := base.(*ast.IndexExpr); ok {
		base = ast.Unparen(ix.X)
	}
	if id, ok := base.(*ast.Ident); ok {
		o := f.d.objOf(id)
		return o != nil && (f.active[o] || o == f.output)
	}
	return false
}

// storeExpr stores a lowered value into an assignment's target.
func (f *adFunc) storeExpr(l ast.Expr, tok token.Token, n *lnode) {
	d := f.d
	l = ast.Unparen(l)
	switch v := l.(type) {
	case *ast.Ident:
		if v.Name == "_" {
			f.line("_ = %s", n.val.s)
			return
		}
		obj := d.objOf(v)
		if !f.active[obj] {
			f.line("%s %s %s", v.Name, tok, n.val.s)
			return
		}
		if floatArray(obj.Type()) {
			d.refuse(l, "an assignment of a whole array that depends on x; set its elements")
			return
		}
		if tok == token.DEFINE {
			f.define(obj, v.Name, n)
			return
		}
		f.store(v.Name, f.tangentName(obj), f.pointer[obj], n)
	case *ast.IndexExpr:
		id, ok := ast.Unparen(v.X).(*ast.Ident)
		if !ok {
			d.refuse(l, "a write to %s", d.text(l))
			return
		}
		obj := d.objOf(id)
		f.check(v.Index)
		idx := d.text(v.Index)
		switch {
		case obj == f.output:
			f.store(fmt.Sprintf("%s[%s]", id.Name, idx), fmt.Sprintf("%s[%s]", f.outputRow, idx), false, n)
		case f.active[obj] && floatArray(obj.Type()):
			f.store(fmt.Sprintf("%s[%s]", id.Name, idx), fmt.Sprintf("%s[%s]", f.tangentName(obj), idx), false, n)
		default:
			d.refuse(l, "a write to %s", d.text(l))
		}
	default:
		d.refuse(l, "a write to %s", d.text(l))
	}
}

// store writes a tangent, then the value (the value last: the
// coefficients may read the old one).
func (f *adFunc) store(target, tangent string, ptr bool, n *lnode) {
	f.tangentInto(tangent, ptr, n)
	f.line("%s = %s", target, n.val.s)
}

// tangentInto writes the tangent of n into dst: one loop over the
// components for the leaves with tangent arrays, then the seeds.
func (f *adFunc) tangentInto(dst string, ptr bool, n *lnode) {
	terms := f.collect(n)
	var rows, seeds []term
	for _, t := range terms {
		if t.row != "" {
			rows = append(rows, t)
		} else {
			seeds = append(seeds, t)
		}
	}
	k := f.k
	zeroed := f.fresh0 == dst
	f.fresh0 = ""
	switch {
	case len(rows) == 0 && zeroed:
	case len(rows) == 0:
		if ptr {
			f.line("*%s = %s{}", dst, f.tangentType())
		} else {
			f.line("%s = %s{}", dst, f.tangentType())
		}
	case len(rows) == 1 && rows[0].coef.isOne() && rows[0].row != dst:
		src := rows[0].row
		if f.isPointerRow(src) {
			src = "*" + src
		}
		if ptr {
			f.line("*%s = %s", dst, src)
		} else {
			f.line("%s = %s", dst, src)
		}
	default:
		var sum []string
		accumulate := false
		for _, t := range rows {
			if t.row == dst && t.coef.isOne() {
				accumulate = true
				continue
			}
			switch t.coef.s {
			case "1":
				sum = append(sum, t.row+"["+k+"]")
			case minusOne.s:
				sum = append(sum, "-"+t.row+"["+k+"]")
			default:
				sum = append(sum, t.coef.paren()+"*"+t.row+"["+k+"]")
			}
		}
		op := "="
		if accumulate {
			op = "+="
		}
		if len(sum) > 0 {
			f.line("for %s := range %s {", k, dst)
			f.line("%s[%s] %s %s", dst, k, op, strings.Join(sum, " + "))
			f.line("}")
		}
	}
	for _, t := range seeds {
		f.line("%s[%s] += %s", dst, t.seed, t.coef.s)
	}
}

func (f *adFunc) isPointerRow(row string) bool {
	for o, t := range f.tangent {
		if t == row {
			return f.pointer[o]
		}
	}
	return false
}

// collect sweeps n's tree from the root: each leaf's coefficient is the
// product of the partials on its path (a reverse sweep over one
// statement), summed over the leaf's occurrences and held in a temporary.
func (f *adFunc) collect(n *lnode) []term {
	var out []term
	index := map[string]int{}
	type sparseRead struct {
		terms []term
		adj   ex
	}
	var sparseAdj []sparseRead // each sparse variable read, with its adjoint summed over its reads
	sparseIndex := map[*term]int{}
	var walk func(n *lnode, adj ex)
	walk = func(n *lnode, adj ex) {
		if !n.active {
			return
		}
		if n.row != "" || n.seed != "" || n.sparse != nil {
			if isFloat(n.typ) && !types.Identical(n.typ, types.Typ[f.d.kind()]) && !adj.isOne() {
				adj = ex{s: f.d.elem + "(" + adj.s + ")", atomic: true, konst: adj.konst}
			}
			if n.sparse != nil {
				// Add up the variable's adjoint over all its reads first,
				// and multiply by its coefficients once, below.
				key := &n.sparse[0]
				if i, ok := sparseIndex[key]; ok {
					sparseAdj[i].adj = add(sparseAdj[i].adj, adj)
					return
				}
				sparseIndex[key] = len(sparseAdj)
				sparseAdj = append(sparseAdj, sparseRead{n.sparse, adj})
				return
			}
			key := "row " + n.row
			if n.seed != "" {
				key = "seed " + n.seed
			}
			if i, ok := index[key]; ok {
				out[i].coef = add(out[i].coef, adj)
				return
			}
			index[key] = len(out)
			out = append(out, term{coef: adj, row: n.row, seed: n.seed})
			if n.row != "" {
				f.read[rowBase(n.row)] = true
			}
			return
		}
		activeKids := 0
		for _, k := range n.kids {
			if k.active {
				activeKids++
			}
		}
		if activeKids > 1 && !adj.free && !adj.konst {
			a := f.temp("a")
			f.line("%s := %s", a, adj.s)
			adj = ex{s: a, atomic: true, free: true}
		}
		for i, k := range n.kids {
			if !k.active {
				continue
			}
			a := mul(adj, n.parts[i])
			if isFloat(k.typ) && isFloat(n.typ) && !types.Identical(k.typ, n.typ) && !a.isOne() {
				a = ex{s: f.d.typeText(k.typ) + "(" + a.s + ")", atomic: true, konst: a.konst}
			}
			walk(k, a)
		}
	}
	walk(n, one)
	for _, r := range sparseAdj {
		adj := r.adj
		if len(r.terms) > 1 && !adj.free && !adj.konst {
			a := f.temp("a")
			f.line("%s := %s", a, adj.s)
			adj = ex{s: a, atomic: true, free: true}
		}
		for _, t := range r.terms {
			f.read[t.seed] = true
			if t.coef.free && !t.coef.konst {
				f.read[t.coef.s] = true
			}
			walk(&lnode{active: true, seed: t.seed}, mul(adj, t.coef))
		}
	}
	for i := range out {
		if c := out[i].coef; !c.free && !c.konst {
			t := f.temp("c")
			f.line("%s := %s", t, c.s)
			out[i].coef = ex{s: t, atomic: true, free: true}
		} else if c.konst && !c.isOne() {
			out[i].coef = ex{s: c.paren(), atomic: true, konst: true}
		}
	}
	return out
}

func (d *differentiator) kind() types.BasicKind {
	if d.elem == "float32" {
		return types.Float32
	}
	return types.Float64
}

// bind holds a node's value in a temporary when it is not already an
// operand that costs nothing to repeat.
func (f *adFunc) bind(n *lnode) ex {
	if n.val.free || n.val.konst {
		return n.val
	}
	t := f.temp("t")
	f.line("%s := %s", t, n.val.s)
	n.val = ex{s: t, atomic: true, free: true}
	return n.val
}

func (f *adFunc) constant(e ast.Expr) *lnode {
	f.check(e)
	tv := f.d.info.Types[e]
	text := f.d.text(e)
	atomic := isAtomicExpr(e)
	free := false
	switch e.(type) {
	case *ast.Ident, *ast.BasicLit, *ast.IndexExpr, *ast.SelectorExpr:
		free = true
	}
	return &lnode{val: ex{s: text, atomic: atomic, konst: tv.Value != nil, free: free}, typ: tv.Type}
}

func isAtomicExpr(e ast.Expr) bool {
	switch v := e.(type) {
	case *ast.Ident, *ast.BasicLit, *ast.CallExpr, *ast.IndexExpr, *ast.SelectorExpr, *ast.ParenExpr, *ast.CompositeLit:
		return true
	case *ast.UnaryExpr:
		return v.Op == token.SUB || v.Op == token.ADD
	}
	return false
}

// lin lowers an expression: its value's temporaries are written, its
// partials recorded in the returned tree.
func (f *adFunc) lin(e ast.Expr) *lnode {
	d := f.d
	if d.failed {
		return &lnode{val: ex{s: "0", atomic: true, konst: true}}
	}
	typ := d.info.TypeOf(e)
	if !f.reads(e) || !isFloat(typ) {
		return f.constant(e)
	}
	switch v := e.(type) {
	case *ast.ParenExpr:
		return f.lin(v.X)
	case *ast.Ident:
		obj := d.objOf(v)
		switch {
		case obj == f.unknowns || obj == f.output:
			d.refuse(v, "%s used whole: the unknowns may only be indexed, ranged over, measured with len or passed on to a function of the package", v.Name)
		case floatArray(obj.Type()):
			d.refuse(v, "%s: an array that depends on x used whole; use its elements", v.Name)
		}
		if sp, ok := f.sparse[obj]; ok {
			return &lnode{val: ex{s: v.Name, atomic: true, free: true}, typ: typ, active: true, sparse: sp}
		}
		row := f.tangentName(obj)
		return &lnode{val: ex{s: v.Name, atomic: true, free: true}, typ: typ, active: true, row: row}
	case *ast.IndexExpr:
		id, ok := ast.Unparen(v.X).(*ast.Ident)
		if !ok {
			d.refuse(v, "%s: an index into an expression that depends on x", d.text(v))
			return &lnode{}
		}
		if f.reads(v.Index) {
			d.refuse(v.Index, "an index that depends on x")
			return &lnode{}
		}
		f.check(v.Index)
		obj := d.objOf(id)
		idx := d.text(v.Index)
		val := ex{s: d.text(v), atomic: true, free: true}
		switch {
		case obj == f.unknowns:
			return &lnode{val: val, typ: typ, active: true, seed: idx}
		case obj == f.output:
			return &lnode{val: val, typ: typ, active: true, row: fmt.Sprintf("%s[%s]", f.outputRow, idx)}
		case f.active[obj]:
			return &lnode{val: val, typ: typ, active: true, row: fmt.Sprintf("%s[%s]", f.tangentName(obj), idx)}
		}
		d.refuse(v, "%s", d.text(v))
		return &lnode{}
	case *ast.UnaryExpr:
		switch v.Op {
		case token.SUB:
			k := f.lin(v.X)
			return &lnode{val: ex{s: "-" + k.val.paren(), atomic: true}, typ: typ, active: true, kids: []*lnode{k}, parts: []ex{minusOne}}
		case token.ADD:
			return f.lin(v.X)
		}
		d.refuse(v, "the operator %s on a value that depends on x", v.Op)
		return &lnode{}
	case *ast.BinaryExpr:
		if !isFloat(typ) {
			// a comparison or integer arithmetic: the primal value only
			return f.constant(v)
		}
		a, b := f.lin(v.X), f.lin(v.Y)
		n := &lnode{typ: typ, active: true, kids: []*lnode{a, b}}
		switch v.Op {
		case token.ADD:
			n.val = ex{s: a.val.s + " + " + b.val.paren()}
			n.parts = []ex{one, one}
		case token.SUB:
			n.val = ex{s: a.val.s + " - " + b.val.paren()}
			n.parts = []ex{one, minusOne}
		case token.MUL:
			av, bv := a.val, b.val
			if b.active {
				av = f.bind(a)
			}
			if a.active {
				bv = f.bind(b)
			}
			n.val = ex{s: av.paren() + " * " + bv.paren()}
			n.parts = []ex{bv, av}
		case token.QUO:
			av := a.val
			bv := f.bind(b)
			if b.active {
				n.val = ex{s: av.paren() + " / " + bv.paren()}
				t := f.bind(n)
				n.parts = []ex{{s: "1.0 / " + bv.paren(), konst: bv.konst}, neg(ex{s: t.s + " / " + bv.paren()})}
			} else {
				n.val = ex{s: av.paren() + " / " + bv.paren()}
				n.parts = []ex{{s: "1.0 / " + bv.paren(), konst: bv.konst}, {}}
			}
		default:
			d.refuse(v, "the operator %s on values that depend on x", v.Op)
			return &lnode{}
		}
		return n
	case *ast.CallExpr:
		return f.call(v, typ)
	case *ast.SelectorExpr:
		d.refuse(v, "%s: a struct field that depends on x", d.text(v))
	case *ast.StarExpr:
		d.refuse(v, "%s: a pointer to values that depend on x", d.text(v))
	case *ast.SliceExpr:
		d.refuse(v, "%s: a slice of values that depend on x other than the unknowns passed whole", d.text(v))
	case *ast.CompositeLit:
		d.refuse(v, "a composite literal of values that depend on x; declare the array and set its elements")
	case *ast.FuncLit:
		d.refuse(v, "a function literal (closures)")
	case *ast.TypeAssertExpr:
		d.refuse(v, "a type assertion (interfaces)")
	default:
		d.refuse(e, "%s", d.text(e))
	}
	return &lnode{}
}

// mathRule is the derivative of a math function of one argument: the
// partial as code, from the argument u and the (bound) value t.
var mathRules = map[string]func(u, t ex) ex{
	"Exp":   func(u, t ex) ex { return t },
	"Expm1": func(u, t ex) ex { return ex{s: t.s + " + 1"} },
	"Log":   func(u, t ex) ex { return ex{s: "1.0 / " + u.paren()} },
	"Log1p": func(u, t ex) ex { return ex{s: "1.0 / (1 + " + u.s + ")"} },
	"Log2":  func(u, t ex) ex { return ex{s: "1.0 / (" + u.paren() + " * math.Ln2)"} },
	"Log10": func(u, t ex) ex { return ex{s: "1.0 / (" + u.paren() + " * math.Ln10)"} },
	"Sqrt":  func(u, t ex) ex { return ex{s: "0.5 / " + t.paren()} },
	"Cbrt":  func(u, t ex) ex { return ex{s: "1.0 / (3 * " + t.paren() + " * " + t.paren() + ")"} },
	"Sin":   func(u, t ex) ex { return ex{s: "math.Cos(" + u.s + ")", atomic: true} },
	"Cos":   func(u, t ex) ex { return ex{s: "-math.Sin(" + u.s + ")", atomic: true} },
	"Tan":   func(u, t ex) ex { return ex{s: "1 + " + t.paren() + "*" + t.paren()} },
	"Atan":  func(u, t ex) ex { return ex{s: "1.0 / (1 + " + u.paren() + "*" + u.paren() + ")"} },
	"Asin":  func(u, t ex) ex { return ex{s: "1.0 / math.Sqrt(1-" + u.paren() + "*" + u.paren() + ")"} },
	"Acos":  func(u, t ex) ex { return ex{s: "-1.0 / math.Sqrt(1-" + u.paren() + "*" + u.paren() + ")"} },
	"Sinh":  func(u, t ex) ex { return ex{s: "math.Cosh(" + u.s + ")", atomic: true} },
	"Cosh":  func(u, t ex) ex { return ex{s: "math.Sinh(" + u.s + ")", atomic: true} },
	"Tanh":  func(u, t ex) ex { return ex{s: "1 - " + t.paren() + "*" + t.paren()} },
	"Erf":   func(u, t ex) ex { return ex{s: "2 / math.SqrtPi * math.Exp(-" + u.paren() + "*" + u.paren() + ")"} },
	"Erfc":  func(u, t ex) ex { return ex{s: "-2 / math.SqrtPi * math.Exp(-" + u.paren() + "*" + u.paren() + ")"} },
}

// call lowers a call that depends on x: a conversion, a math function, a
// builtin min or max, or a function of the package (differentiated in
// turn).
func (f *adFunc) call(c *ast.CallExpr, typ types.Type) *lnode {
	d := f.d
	if tv, ok := d.info.Types[c.Fun]; ok && tv.IsType() {
		if !isFloat(tv.Type) || len(c.Args) != 1 || !isFloat(d.info.TypeOf(c.Args[0])) {
			d.refuse(c, "%s: a conversion of a value that depends on x to a type other than a float", d.text(c))
			return &lnode{}
		}
		k := f.lin(c.Args[0])
		return &lnode{val: ex{s: d.text(c.Fun) + "(" + k.val.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{k}, parts: []ex{one}}
	}
	if id, ok := ast.Unparen(c.Fun).(*ast.Ident); ok {
		if b, ok := d.objOf(id).(*types.Builtin); ok {
			if b.Name() == "min" || b.Name() == "max" {
				return f.pick(c, b.Name(), typ, id.Name)
			}
			d.refuse(c, "the builtin %s on values that depend on x", b.Name())
			return &lnode{}
		}
	}
	if sel, ok := ast.Unparen(c.Fun).(*ast.SelectorExpr); ok {
		if s := d.info.Selections[sel]; s != nil && types.IsInterface(s.Recv()) {
			d.refuse(c, "%s: a method call through an interface", d.text(c.Fun))
			return &lnode{}
		}
	}
	fn := calledFunc(d.info, c)
	if fn == nil {
		d.refuse(c, "%s: a call of a function value", d.text(c.Fun))
		return &lnode{}
	}
	if fn.Pkg() != nil && fn.Pkg().Path() == "math" {
		return f.mathCall(c, fn.Name(), typ)
	}
	if fn.Pkg() != d.lp.pkg.Types {
		d.refuse(c, "%s: a call outside the package other than math", d.text(c.Fun))
		return &lnode{}
	}
	return f.packageCall(c, fn, typ)
}

func (f *adFunc) mathCall(c *ast.CallExpr, name string, typ types.Type) *lnode {
	d := f.d
	if sel, ok := ast.Unparen(c.Fun).(*ast.SelectorExpr); ok {
		if id, ok := sel.X.(*ast.Ident); ok && id.Name != "math" {
			d.refuse(c, "%s: math imported under another name (%s)", d.text(c.Fun), id.Name)
			return &lnode{}
		}
	}
	d.usesMath = true
	if rule, ok := mathRules[name]; ok && len(c.Args) == 1 {
		u := f.lin(c.Args[0])
		uv := f.bind(u)
		n := &lnode{val: ex{s: "math." + name + "(" + uv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{u}}
		t := f.bind(n)
		n.parts = []ex{rule(uv, t)}
		return n
	}
	switch name {
	case "Abs":
		u := f.lin(c.Args[0])
		uv := f.bind(u)
		p := f.temp("p")
		f.line("var %s %s", p, d.typeText(typ))
		f.line("if %s > 0 {", uv.s)
		f.line("%s = 1", p)
		f.line("} else if %s < 0 {", uv.s)
		f.line("%s = -1", p)
		f.line("}")
		return &lnode{val: ex{s: "math.Abs(" + uv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{u}, parts: []ex{{s: p, atomic: true}}}
	case "Max", "Min":
		return f.pick(c, name, typ, "math."+name)
	case "Pow":
		u, v := f.lin(c.Args[0]), f.lin(c.Args[1])
		uv, vv := f.bind(u), f.bind(v)
		n := &lnode{val: ex{s: "math.Pow(" + uv.s + ", " + vv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{u, v}}
		t := f.bind(n)
		pu := ex{s: vv.paren() + " * math.Pow(" + uv.s + ", " + vv.s + "-1)"}
		pv := ex{}
		if v.active {
			p := f.temp("p")
			f.line("var %s %s", p, d.typeText(typ))
			f.line("if %s != 0 {", t.s)
			f.line("%s = math.Log(%s) * %s", p, uv.s, t.s)
			f.line("}")
			pv = ex{s: p, atomic: true, free: true}
		}
		n.parts = []ex{pu, pv}
		return n
	case "Atan2":
		y, x := f.lin(c.Args[0]), f.lin(c.Args[1])
		yv, xv := f.bind(y), f.bind(x)
		r := f.temp("t")
		f.line("%s := %s*%s + %s*%s", r, xv.paren(), xv.paren(), yv.paren(), yv.paren())
		return &lnode{val: ex{s: "math.Atan2(" + yv.s + ", " + xv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{y, x},
			parts: []ex{{s: xv.paren() + " / " + r}, neg(ex{s: yv.paren() + " / " + r})}}
	case "Hypot":
		a, b := f.lin(c.Args[0]), f.lin(c.Args[1])
		av, bv := f.bind(a), f.bind(b)
		n := &lnode{val: ex{s: "math.Hypot(" + av.s + ", " + bv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{a, b}}
		t := f.bind(n)
		n.parts = make([]ex, 2)
		for i, k := range []*lnode{a, b} {
			if !k.active {
				continue
			}
			p := f.temp("p")
			f.line("var %s %s", p, d.typeText(typ))
			f.line("if %s != 0 {", t.s)
			f.line("%s = %s / %s", p, k.val.paren(), t.s)
			f.line("}")
			n.parts[i] = ex{s: p, atomic: true, free: true}
		}
		return n
	}
	d.refuse(c, "math.%s: no derivative rule for it (supported: Exp, Expm1, Log, Log1p, Log2, Log10, Sqrt, Cbrt, Pow, Abs, Sin, Cos, Tan, Asin, Acos, Atan, Atan2, Sinh, Cosh, Tanh, Erf, Erfc, Hypot, Max, Min)", name)
	return &lnode{}
}

// pick lowers max and min: the derivative of the argument returned, the
// first on a tie.
func (f *adFunc) pick(c *ast.CallExpr, name string, typ types.Type, fun string) *lnode {
	d := f.d
	if len(c.Args) != 2 {
		d.refuse(c, "%s with other than two arguments on values that depend on x", name)
		return &lnode{}
	}
	a, b := f.lin(c.Args[0]), f.lin(c.Args[1])
	av, bv := f.bind(a), f.bind(b)
	n := &lnode{val: ex{s: fun + "(" + av.s + ", " + bv.s + ")", atomic: true}, typ: typ, active: true, kids: []*lnode{a, b}}
	t := f.bind(n)
	// ∂/∂a is 1 where a is returned (a tie included), ∂/∂b the rest.
	n.parts = make([]ex, 2)
	if a.active {
		p := f.temp("p")
		f.line("var %s %s", p, d.typeText(typ))
		f.line("if %s == %s {", t.s, av.s)
		f.line("%s = 1", p)
		f.line("}")
		n.parts[0] = ex{s: p, atomic: true, free: true}
	}
	if b.active {
		p := f.temp("p")
		f.line("var %s %s", p, d.typeText(typ))
		f.line("if %s != %s {", t.s, av.s)
		f.line("%s = 1", p)
		f.line("}")
		n.parts[1] = ex{s: p, atomic: true, free: true}
	}
	return n
}

// packageCall calls the derivative of a package function: each float
// argument with its tangent, the unknowns passed on as they are.
func (f *adFunc) packageCall(c *ast.CallExpr, fn *types.Func, typ types.Type) *lnode {
	d := f.d
	if d.decls[fn] == nil {
		d.refuse(c, "%s: a function without a body", fn.Name())
		return &lnode{}
	}
	sig := fn.Type().(*types.Signature)
	if sig.Variadic() || c.Ellipsis.IsValid() {
		d.refuse(c, "%s: a variadic call", fn.Name())
		return &lnode{}
	}
	if sig.TypeParams().Len() > 0 {
		d.refuse(c, "%s: a generic function", fn.Name())
		return &lnode{}
	}
	if sig.Results().Len() != 1 || !isFloat(sig.Results().At(0).Type()) {
		d.refuse(c, "%s: a call whose result is not a single float, with arguments that depend on x", fn.Name())
		return &lnode{}
	}
	unknowns := -1
	var args []string
	passive := []byte(strings.Repeat("a", len(c.Args)))
	for i, a := range c.Args {
		pt := sig.Params().At(i).Type()
		if f.isUnknowns(a) {
			if !holdsUnknowns(pt, d.elem, d.n) {
				d.refuse(a, "the unknowns passed to %s as %s: pass them as [%d]%s, *[%d]%s or []%s", fn.Name(), d.typeText(pt), d.n, d.elem, d.n, d.elem, d.elem)
				return &lnode{}
			}
			if unknowns >= 0 {
				d.refuse(a, "the unknowns passed twice to %s", fn.Name())
				return &lnode{}
			}
			unknowns = i
			if f.byValue {
				args = append(args, "&"+f.unknowns.Name())
			} else {
				args = append(args, f.unknowns.Name())
			}
			continue
		}
		if !isFloat(pt) {
			if f.reads(a) {
				d.refuse(a, "%s: an argument that depends on x and is not a float (pass its elements, or the unknowns whole)", d.text(a))
				return &lnode{}
			}
			f.check(a)
			args = append(args, d.text(a))
			continue
		}
		k := f.lin(a)
		if !k.active {
			passive[i] = 'p'
			args = append(args, k.val.s)
			continue
		}
		val := f.bind(k)
		if k.row != "" && len(k.kids) == 0 {
			ref := "&" + k.row
			if f.isPointerRow(k.row) {
				ref = k.row
			}
			f.read[rowBase(k.row)] = true
			args = append(args, val.s, ref)
			continue
		}
		t := f.temp("dt")
		f.line("var %s %s", t, f.tangentType())
		f.fresh0 = t
		f.tangentInto(t, false, k)
		args = append(args, val.s, "&"+t)
	}
	if d.failed {
		return &lnode{}
	}
	name := d.variant(adVariant{fn, unknowns, string(passive)})
	fun := name
	if sel, ok := ast.Unparen(c.Fun).(*ast.SelectorExpr); ok && sig.Recv() != nil {
		if f.reads(sel.X) {
			d.refuse(sel.X, "a method called on a value that depends on x")
			return &lnode{}
		}
		f.check(sel.X)
		fun = d.text(sel.X) + "." + name
	}
	r := f.temp("dt")
	f.line("var %s %s", r, f.tangentType())
	v := f.temp("t")
	f.line("%s := %s(%s, &%s)", v, fun, strings.Join(args, ", "), r)
	return &lnode{val: ex{s: v, atomic: true, free: true}, typ: typ, active: true, row: r}
}

// isUnknowns reports whether an argument passes the unknowns whole: x,
// x[:], &x or *x.
func (f *adFunc) isUnknowns(a ast.Expr) bool {
	if f.unknowns == nil {
		return false
	}
	a = ast.Unparen(a)
	switch v := a.(type) {
	case *ast.SliceExpr:
		if v.Low != nil || v.High != nil {
			return false
		}
		a = v.X
	case *ast.UnaryExpr:
		if v.Op == token.AND {
			a = v.X
		}
	case *ast.StarExpr:
		a = v.X
	}
	id, ok := ast.Unparen(a).(*ast.Ident)
	return ok && f.d.objOf(id) == f.unknowns
}

// ret writes a return: the result's tangent, then the value (helpers).
func (f *adFunc) ret(s *ast.ReturnStmt) {
	d := f.d
	if f.result == "" {
		if len(s.Results) > 0 {
			d.refuse(s, "a return with values in a residual objective")
			return
		}
		f.line("return")
		return
	}
	if len(s.Results) != 1 && !(len(s.Results) == 0 && f.named != nil) {
		d.refuse(s, "a return of other than one value")
		return
	}
	f.comment(s)
	var n *lnode
	if len(s.Results) == 0 {
		// a bare return of the named result
		n = &lnode{val: ex{s: f.named.Name(), atomic: true, free: true}, typ: f.named.Type(), active: f.active[f.named]}
		if n.active {
			n.row = f.tangentName(f.named)
			f.read[n.row] = true
		}
	} else {
		n = f.lin(s.Results[0])
	}
	if d.failed {
		return
	}
	if !n.active {
		f.line("*%s = %s{}", f.result, f.tangentType())
	} else {
		f.tangentInto(f.result, true, n)
	}
	if f.value {
		f.line("return %s", n.val.s)
	} else {
		f.line("_ = %s // the value itself is not needed", n.val.s)
		f.line("return")
	}
}

// rowBase is the variable a tangent row belongs to: dV for dV and dV[i].
func rowBase(row string) string {
	if i := strings.IndexByte(row, '['); i >= 0 {
		return row[:i]
	}
	return row
}

// readsAny reports whether any of es depends on x.
func (f *adFunc) readsAny(es []ast.Expr) bool {
	for _, e := range es {
		if f.reads(e) {
			return true
		}
	}
	return false
}

// holdsUnknowns reports whether a parameter of type t can take the
// unknowns whole: [n]elem, *[n]elem or []elem.
func holdsUnknowns(t types.Type, elem string, n int) bool {
	if p := pointerTo(t); p != nil {
		t = p
	}
	return arrayOf(t, elem) == n || sliceOf(t, elem)
}
