package gen

import (
	"fmt"
	"go/ast"
	"go/token"
	"go/types"
	"math"
	"os"
	"path/filepath"
	"strings"

	"github.com/thalweg-go/thalweg/rules"
	"golang.org/x/tools/go/packages"
)

// ArgForm is how the objective takes its argument.
type ArgForm int

const (
	ArgScalar  ArgForm = iota // func(x T) T
	ArgArray                  // func(x [N]T) T
	ArgPointer                // func(x *[N]T) T
	ArgSlice                  // func(x []T) T, with dim from the spec
)

// GradForm is how the analytic gradient is shaped.
type GradForm int

const (
	GradScalar  GradForm = iota // func(x T) T
	GradPointer                 // func(x *[N]T, g *[N]T)
	GradArray                   // func(x [N]T) [N]T
	GradSlice                   // func(x, g []T)
)

// Shape is what thalweg learned about the objective from the type checker.
type Shape struct {
	Package   string // package name
	Elem      string // "float32" or "float64"
	Dim       int    // 1 for scalar objectives
	Arg       ArgForm
	Receiver  string // receiver's named type, "" for plain functions
	Pointer   bool   // whether the objective's receiver is a pointer
	Objective string // function or method name
	Gradient  string // method or function name of the analytic gradient
	Grad      GradForm
	// Combined says the objective returns its value and writes its
	// gradient through a second parameter of its argument's form:
	// func(x T, g *T) T, func(x [N]T, g *[N]T) T, func(x *[N]T, g *[N]T) T
	// or func(x, g []T) T. It then has no separate gradient.
	Combined bool
	// Residuals is M for a residual objective, which writes r(x) ∈ ℝᴹ
	// through its second parameter (f = ½‖r‖²), and 0 otherwise;
	// ResidualSlice says r is a slice, and Jacobian names the analytic
	// Jacobian, JacobianColumns that it writes J transposed.
	Residuals       int
	ResidualSlice   bool
	Jacobian        string
	JacobianColumns bool
	Instance        instance
	// Derived is the gradient (or Jacobian) thalweg wrote from the
	// objective's source for derivative = "automatic"; Gradient or
	// Jacobian then names it.
	Derived *derivedCode
}

// instance says how the generated tests obtain a receiver.
type instance struct {
	Name   string // package-level variable or function; "" for the zero value
	Call   bool   // a function to call
	Adjust string // "", "&" or "*" to reach the receiver type
}

// Scalar reports whether the objective takes a single number.
func (s Shape) Scalar() bool { return s.Arg == ArgScalar }

// jacobianOnArrays reports whether the Jacobian takes x *[N]T and
// J *[M][N]T although the objective takes slices: the one thalweg
// derives for a slice objective (a user's Jacobian of one is refused).
func (s Shape) jacobianOnArrays() bool { return s.Derived != nil && s.Arg == ArgSlice }

// loadedPackage is one type-checked user package.
type loadedPackage struct {
	dir   string
	pkg   *packages.Package
	files map[string]string // files thalweg generated, by absolute path, to the spec their header names
}

// loadPackage type-checks the package in dir. Type errors in files thalweg
// generated are ignored: they are about to be replaced. So is a use of an
// undefined name that begins with one of the minimizer names in
// generates: the user's code may call a minimizer (and name its result
// and status types) before its first generation.
func loadPackage(dir string, probs *Problems, generates ...string) *loadedPackage {
	abs, err := filepath.Abs(dir)
	if err != nil {
		probs.add(Pos{dir, 1, 1}, "%v", err)
		return nil
	}
	cfg := &packages.Config{
		Mode: packages.NeedName | packages.NeedFiles | packages.NeedTypes | packages.NeedSyntax | packages.NeedTypesInfo,
		Dir:  abs,
	}
	pkgs, err := packages.Load(cfg, ".")
	if err != nil {
		probs.add(Pos{dir, 1, 1}, "loading the Go package: %v", err)
		return nil
	}
	if len(pkgs) != 1 || pkgs[0].Types == nil {
		probs.add(Pos{dir, 1, 1}, "no Go package in %s", dir)
		return nil
	}
	lp := &loadedPackage{dir: abs, pkg: pkgs[0], files: map[string]string{}}
	for _, f := range lp.pkg.GoFiles {
		if spec, ok := fileHeaderSpec(f); ok {
			lp.files[f] = spec
		}
	}
	for _, e := range lp.pkg.Errors {
		for _, problem := range splitPackageError(e, dir) {
			if abs, _ := filepath.Abs(problem.Pos.File); lp.generated(abs) {
				continue // about to be replaced
			}
			if lp.aboutGeneratedFile(problem.Msg) {
				continue // a clash with an old generated file: checkCollisions says it better
			}
			if undefinedGenerated(problem.Msg, generates) {
				continue // about to be generated
			}
			problem.Msg = strings.Join(strings.Fields(problem.Msg), " ")
			*probs = append(*probs, problem)
		}
	}
	return lp
}

// undefinedGenerated reports whether msg is "undefined: NAME" for a NAME
// that begins with one of the minimizer names about to be generated.
func undefinedGenerated(msg string, generates []string) bool {
	name, ok := strings.CutPrefix(msg, "undefined: ")
	if !ok {
		return false
	}
	for _, g := range generates {
		if g != "" && strings.HasPrefix(name, g) {
			return true
		}
	}
	return false
}

// aboutGeneratedFile reports whether a redeclaration error is about a
// name one of thalweg's files declares.
func (lp *loadedPackage) aboutGeneratedFile(msg string) bool {
	name, _, ok := strings.Cut(msg, " redeclared")
	if !ok {
		return false
	}
	_, generated := lp.names(true)[name]
	return generated
}

// names maps each package-level name declared in thalweg's files
// (generated) or in the user's (not generated) to its declaration.
func (lp *loadedPackage) names(generated bool) map[string]token.Pos {
	names := map[string]token.Pos{}
	for _, f := range lp.pkg.Syntax {
		if lp.generated(lp.pkg.Fset.Position(f.Pos()).Filename) != generated {
			continue
		}
		for name, pos := range fileDeclarations(f) {
			names[name] = pos
		}
	}
	return names
}

// fileDeclarations maps each package-level name f declares to its position.
func fileDeclarations(f *ast.File) map[string]token.Pos {
	names := map[string]token.Pos{}
	for _, d := range f.Decls {
		switch d := d.(type) {
		case *ast.FuncDecl:
			if d.Recv == nil {
				names[d.Name.Name] = d.Name.Pos()
			}
		case *ast.GenDecl:
			for _, s := range d.Specs {
				switch s := s.(type) {
				case *ast.TypeSpec:
					names[s.Name.Name] = s.Name.Pos()
				case *ast.ValueSpec:
					for _, n := range s.Names {
						names[n.Name] = n.Pos()
					}
				}
			}
		}
	}
	return names
}

// otherSpecsNames maps each package-level name declared in a file thalweg
// generated from a spec outside specs (absolute spec paths) to its
// declaration and that spec's name: that file stays when this run writes
// its own, so a name it declares is taken, as one of the user's would be.
func (lp *loadedPackage) otherSpecsNames(specs map[string]bool) map[string]otherDeclaration {
	names := map[string]otherDeclaration{}
	for _, f := range lp.pkg.Syntax {
		file := lp.pkg.Fset.Position(f.Pos()).Filename
		spec, generated := lp.files[file]
		if !generated {
			continue
		}
		if abs, _ := filepath.Abs(filepath.Join(filepath.Dir(file), filepath.FromSlash(spec))); specs[abs] {
			continue // this run replaces it, or reports it as an orphan
		}
		for name, pos := range fileDeclarations(f) {
			names[name] = otherDeclaration{pos, spec}
		}
	}
	return names
}

// otherDeclaration is a name another spec's generated file declares.
type otherDeclaration struct {
	pos  token.Pos
	spec string // as the file's header names it
}

// generated reports whether thalweg generated the file at the absolute path.
func (lp *loadedPackage) generated(path string) bool {
	_, ok := lp.files[path]
	return ok
}

// splitPackageError turns one go/packages error into positioned problems.
// A failed compile arrives as one list error, "# pkg" followed by one
// "file:line:col: msg" line per compiler error; each becomes its own
// problem so that errors in thalweg's own files can be told apart.
func splitPackageError(e packages.Error, dir string) []Problem {
	if !strings.HasPrefix(e.Msg, "# ") {
		return []Problem{{Pos: parseErrorPos(e.Pos, dir), Msg: e.Msg}}
	}
	var out []Problem
	for _, line := range strings.Split(e.Msg, "\n")[1:] {
		if strings.HasPrefix(line, "\t") && len(out) > 0 {
			out[len(out)-1].Msg += "; " + strings.TrimSpace(line) // a note on the error above
			continue
		}
		file, rest, ok := strings.Cut(line, ": ")
		if !ok {
			continue
		}
		pos := parseErrorPos(file, dir)
		if !filepath.IsAbs(pos.File) && strings.HasPrefix(file, ".") {
			pos.File = displayPath(filepath.Join(dir, pos.File))
		}
		out = append(out, Problem{Pos: pos, Msg: rest})
	}
	return out
}

// parseErrorPos turns "file:line:col" into a Pos.
func parseErrorPos(s, dir string) Pos {
	var p Pos
	parts := strings.Split(s, ":")
	if len(parts) >= 3 {
		fmt.Sscan(parts[len(parts)-2], &p.Line)
		fmt.Sscan(parts[len(parts)-1], &p.Col)
		p.File = displayPath(strings.Join(parts[:len(parts)-2], ":"))
		return p
	}
	return Pos{File: dir, Line: 1, Col: 1}
}

// displayPath shortens an absolute path to one relative to the working
// directory when it lies below it.
func displayPath(path string) string {
	wd, err := os.Getwd()
	if err != nil {
		return path
	}
	if rel, err := filepath.Rel(wd, path); err == nil && !strings.HasPrefix(rel, "..") {
		return rel
	}
	return path
}

func (lp *loadedPackage) position(p token.Pos) Pos {
	position := lp.pkg.Fset.Position(p)
	return Pos{File: displayPath(position.Filename), Line: position.Line, Col: position.Column}
}

const acceptedObjectives = `accepted forms, T float32 or float64: func(x T) T, func(x [N]T) T, func(x *[N]T) T, func(x []T) T (with dim), each also as a method; ` + combinedObjectives + `; ` + residualObjectives

// combinedObjectives are the forms of an objective that writes its
// gradient through g while computing its value.
const combinedObjectives = `combined with the gradient written through g: func(x T, g *T) T, func(x [N]T, g *[N]T) T, func(x *[N]T, g *[N]T) T, func(x, g []T) T`

const acceptedGradients = `accepted gradient forms: func(x T) T for scalar objectives; func(x *[N]T, g *[N]T), func(x [N]T) [N]T or func(x, g []T) for vectors; a method on the objective's receiver type when the objective is a method`

// resolve finds the minimizer's objective, gradient and instance and
// checks their signatures and the spec keys that depend on them.
func (lp *loadedPackage) resolve(spec *Spec, m *Minimizer, probs *Problems) (Shape, bool) {
	ix := spec.pos
	at := func(k string) Pos { return ix.value(m.keyPrefix + "." + k) }
	shape := Shape{Package: lp.pkg.Name}
	before := len(*probs)

	fn, recvType := lp.lookupFunc(m.Objective, nil, at("objective"), "objective", probs)
	if fn == nil {
		return shape, false
	}
	sig := fn.Type().(*types.Signature)
	shape.Objective = fn.Name()
	if recvType != nil {
		shape.Receiver = recvType.Obj().Name()
		_, shape.Pointer = sig.Recv().Type().(*types.Pointer)
	}
	if !lp.objectiveShape(sig, &shape) {
		probs.add(lp.position(fn.Pos()), "objective %s has signature %s; %s", m.Objective, signatureText(sig), acceptedObjectives)
		return shape, false
	}
	switch {
	case shape.Arg == ArgSlice && m.Dim == 0:
		probs.add(at("objective"), "objective %s takes a slice: set dim to the number of unknowns", m.Objective)
	case shape.Arg == ArgSlice:
		shape.Dim = m.Dim
	case m.Dim != 0:
		probs.add(ix.key(m.keyPrefix+".dim"), "dim is only for objectives that take a slice; %s fixes the dimension at %d", m.Objective, shape.Dim)
	}

	lp.resolveResiduals(m, &shape, sig, recvType, at, ix, probs)
	if shape.Dim > 0 {
		checkStackSize(m, shape, ix, probs)
	}
	if shape.Residuals == 0 && !shape.ResidualSlice {
		lp.resolveDerivative(m, &shape, sig, recvType, at, ix, probs)
	}
	lp.resolveInstance(m, &shape, recvType, at, ix, probs)

	start, scalar, ok := numbers(m.start)
	switch {
	case m.start == nil:
	case !ok:
		probs.add(at("start"), "start must be a number or an array of numbers")
	case shape.Scalar() && !scalar:
		probs.add(at("start"), "start must be a single number: %s takes a scalar", m.Objective)
	case !shape.Scalar() && scalar:
		probs.add(at("start"), "start must be an array of %d numbers", shape.Dim)
	case shape.Dim > 0 && len(start) != shape.Dim:
		probs.add(at("start"), "start has %d values, the objective has %d unknowns", len(start), shape.Dim)
	}
	m.Start = start
	if m.Expect != nil && m.expectX != nil {
		x, scalar, ok := numbers(m.expectX)
		switch {
		case !ok:
			probs.add(at("expect.x"), "expect.x must be a number or an array of numbers")
		case shape.Scalar() != scalar || (!scalar && len(x) != shape.Dim):
			probs.add(at("expect.x"), "expect.x must have the shape of start (%d values)", shape.Dim)
		}
		m.Expect.X = x
	}
	if !finiteAll(start) {
		probs.add(at("start"), "start must be finite: replace it with a typical starting point (thalweg init writes nan there on purpose)")
	}
	if m.bounds != nil && len(*probs) == before {
		resolveBounds(m, shape, at, probs)
	}
	if m.scale != nil && shape.Residuals > 0 {
		probs.add(at("scale"), "scale is not for residual objectives: the least-squares directions are invariant to the unknowns' scale (Gauss–Newton by construction, Levenberg–Marquardt through its scaling D, Moré 1978), and the relative gradient test already weighs each unknown by max(|xᵢ|, 1)")
	}
	if m.scale != nil && len(*probs) == before {
		resolveScale(m, shape, at, probs)
	}
	return shape, len(*probs) == before
}

// tomlNumber writes v as a spec would: 1.5, inf, -inf, nan.
func tomlNumber(v float64) string {
	switch {
	case math.IsNaN(v):
		return "nan"
	case math.IsInf(v, 1):
		return "inf"
	case math.IsInf(v, -1):
		return "-inf"
	}
	return fmt.Sprint(v)
}

// resolveBounds checks [minimizer.bounds] against the objective's shape:
// a number per side for scalar objectives, else a list of dim numbers;
// each side optional, ±inf allowed, lower ≤ upper, no NaN. An expect.x
// outside the box cannot be reached. The start may lie outside: the
// minimizer projects it in.
func resolveBounds(m *Minimizer, shape Shape, at func(string) Pos, probs *Problems) {
	side := func(key string, open float64) []float64 {
		vals := make([]float64, shape.Dim)
		for i := range vals {
			vals[i] = open
		}
		raw, given := m.bounds[key]
		if !given {
			return vals
		}
		path := "bounds." + key
		x, scalar, ok := numbers(raw)
		switch {
		case !ok:
			probs.add(at(path), "bounds.%s must be a number or an array of numbers", key)
			return nil
		case shape.Scalar() && !scalar:
			probs.add(at(path), "bounds.%s must be a single number: %s takes a scalar", key, m.Objective)
			return nil
		case !shape.Scalar() && scalar:
			probs.add(at(path), "bounds.%s must be an array of %d numbers (inf or -inf for no bound)", key, shape.Dim)
			return nil
		case len(x) != shape.Dim:
			probs.add(at(path), "bounds.%s has %d values, the objective has %d unknowns", key, len(x), shape.Dim)
			return nil
		}
		for i, v := range x {
			where := at(path)
			if !scalar {
				where = at(fmt.Sprintf("%s.%d", path, i))
			}
			switch {
			case math.IsNaN(v):
				probs.add(where, "bounds.%s must not be nan; write %s for no bound", key, tomlNumber(open))
				return nil
			case math.IsInf(v, 0) && v != open:
				probs.add(where, "bounds.%s must not be %s: no point lies within it", key, tomlNumber(v))
				return nil
			}
		}
		return x
	}
	lower, upper := side("lower", math.Inf(-1)), side("upper", math.Inf(1))
	if lower == nil || upper == nil {
		return
	}
	for i := range lower {
		if lower[i] > upper[i] {
			where := at("bounds.lower")
			if !shape.Scalar() {
				where = at(fmt.Sprintf("bounds.lower.%d", i))
			}
			probs.add(where, "bounds.lower (%s) is above bounds.upper (%s) for unknown %d: the box is empty", tomlNumber(lower[i]), tomlNumber(upper[i]), i)
			return
		}
	}
	if m.Expect != nil {
		for i, v := range m.Expect.X {
			if i < len(lower) && (v < lower[i] || v > upper[i]) {
				probs.add(at("expect.x"), "expect.x lies outside the bounds (unknown %d: %s is not within [%s, %s]); no run can end there", i, tomlNumber(v), tomlNumber(lower[i]), tomlNumber(upper[i]))
				return
			}
		}
	}
	m.Lower, m.Upper = lower, upper
}

// resolveScale checks scale against the objective's shape: a number for
// scalar objectives, else a list of dim numbers, each positive and finite
// (a typical magnitude, by which the minimizer divides its unknown).
func resolveScale(m *Minimizer, shape Shape, at func(string) Pos, probs *Problems) {
	x, scalar, ok := numbers(m.scale)
	switch {
	case !ok:
		probs.add(at("scale"), "scale must be a number or an array of numbers")
		return
	case shape.Scalar() && !scalar:
		probs.add(at("scale"), "scale must be a single number: %s takes a scalar", m.Objective)
		return
	case !shape.Scalar() && scalar:
		probs.add(at("scale"), "scale must be an array of %d numbers, one typical magnitude per unknown", shape.Dim)
		return
	case len(x) != shape.Dim:
		probs.add(at("scale"), "scale has %d values, the objective has %d unknowns", len(x), shape.Dim)
		return
	}
	for i, v := range x {
		where := at("scale")
		if !scalar {
			where = at(fmt.Sprintf("scale.%d", i))
		}
		// Within float32's normal range either way, so that 1/scale and
		// x/scale stay finite for every float type.
		if !(v >= 1e-30 && v <= 1e30) {
			probs.add(where, "scale must be a positive, finite typical magnitude within [1e-30, 1e30] (unknown %d has %s)", i, tomlNumber(v))
			return
		}
	}
	m.Scale = x
}

// lookupFunc finds "Func" or "Type.Method" in the package. When onType is
// set, a bare name is looked up as a method of that type first.
func (lp *loadedPackage) lookupFunc(ref string, onType *types.Named, pos Pos, what string, probs *Problems) (*types.Func, *types.Named) {
	scope := lp.pkg.Types.Scope()
	typeName, method, isMethod := strings.Cut(ref, ".")
	if !isMethod && onType != nil {
		typeName, method, isMethod = onType.Obj().Name(), ref, true
	}
	if isMethod {
		obj := scope.Lookup(typeName)
		tn, ok := obj.(*types.TypeName)
		if !ok {
			probs.add(pos, "%s %s: no type %s in package %s%s", what, ref, typeName, lp.pkg.Name, didYouMean(typeName, lp.declared(isTypeName)))
			return nil, nil
		}
		named, ok := types.Unalias(tn.Type()).(*types.Named)
		if !ok || named.TypeParams().Len() > 0 {
			probs.add(lp.position(tn.Pos()), "%s %s: %s must be a defined, non-generic type", what, ref, typeName)
			return nil, nil
		}
		if onType != nil && named != onType {
			probs.add(pos, "%s %s must be a method of %s, the objective's receiver type", what, ref, onType.Obj().Name())
			return nil, nil
		}
		sel := types.NewMethodSet(types.NewPointer(named)).Lookup(lp.pkg.Types, method)
		if sel == nil {
			if _, plain := scope.Lookup(ref).(*types.Func); plain && onType != nil {
				probs.add(pos, "%s %s is a plain function; it must be a method of %s, like the objective", what, ref, typeName)
				return nil, nil
			}
			probs.add(pos, "%s %s: type %s has no method %s%s", what, ref, typeName, method, didYouMean(method, methodNames(named)))
			return nil, nil
		}
		return sel.Obj().(*types.Func), named
	}
	obj := scope.Lookup(ref)
	if obj == nil {
		hint := didYouMean(ref, lp.declared(isFunc))
		if hint == "" {
			hint = lp.methodHint(ref)
		}
		probs.add(pos, "%s %s: no such function in package %s%s", what, ref, lp.pkg.Name, hint)
		return nil, nil
	}
	fn, ok := obj.(*types.Func)
	if !ok {
		probs.add(lp.position(obj.Pos()), "%s %s is not a function", what, ref)
		return nil, nil
	}
	return fn, nil
}

func isTypeName(o types.Object) bool { _, ok := o.(*types.TypeName); return ok }
func isFunc(o types.Object) bool     { _, ok := o.(*types.Func); return ok }
func isVarOrFunc(o types.Object) bool {
	_, v := o.(*types.Var)
	return v || isFunc(o)
}

// declared lists the package-level names of the user's files (not
// thalweg's) whose object is of the kind wanted, for "did you mean".
func (lp *loadedPackage) declared(kind func(types.Object) bool) []string {
	scope := lp.pkg.Types.Scope()
	var names []string
	for _, name := range scope.Names() {
		obj := scope.Lookup(name)
		if kind(obj) && !lp.generated(lp.pkg.Fset.Position(obj.Pos()).Filename) {
			names = append(names, name)
		}
	}
	return names
}

// methodNames lists the methods callable on a *T.
func methodNames(named *types.Named) []string {
	set := types.NewMethodSet(types.NewPointer(named))
	names := make([]string, set.Len())
	for i := range names {
		names[i] = set.At(i).Obj().Name()
	}
	return names
}

// methodHint suggests "Type.Method" for a plain name that was not found
// as a function but is close to a method of one of the user's types.
func (lp *loadedPackage) methodHint(ref string) string {
	owner := map[string]string{} // method name → "Type.Method", the first type in order
	var methods []string
	for _, name := range lp.declared(isTypeName) {
		named, ok := types.Unalias(lp.pkg.Types.Scope().Lookup(name).Type()).(*types.Named)
		if !ok || named.TypeParams().Len() > 0 {
			continue
		}
		for _, m := range methodNames(named) {
			if _, seen := owner[m]; !seen {
				owner[m] = name + "." + m
				methods = append(methods, m)
			}
		}
	}
	if m, ok := closest(ref, methods); ok {
		return "; did you mean " + owner[m] + "?"
	}
	return ""
}

// floatKind returns "float32" or "float64" for exactly those types.
func floatKind(t types.Type) string {
	if b, ok := t.(*types.Basic); ok {
		switch b.Kind() {
		case types.Float32:
			return "float32"
		case types.Float64:
			return "float64"
		}
	}
	return ""
}

// arrayOf returns the length of an array of elem, or -1.
func arrayOf(t types.Type, elem string) int {
	if a, ok := types.Unalias(t).(*types.Array); ok && floatKind(types.Unalias(a.Elem())) == elem && elem != "" {
		return int(a.Len())
	}
	return -1
}

func sliceOf(t types.Type, elem string) bool {
	s, ok := types.Unalias(t).(*types.Slice)
	return ok && elem != "" && floatKind(types.Unalias(s.Elem())) == elem
}

func pointerTo(t types.Type) types.Type {
	if p, ok := types.Unalias(t).(*types.Pointer); ok {
		return p.Elem()
	}
	return nil
}

// objectiveShape matches the objective's signature against the accepted
// forms and fills in the element type, form and dimension, and whether it
// is combined: a second parameter g through which it writes its gradient,
// *T for a scalar, *[N]T for an array or a pointer to one, []T for a
// slice.
func (lp *loadedPackage) objectiveShape(sig *types.Signature, shape *Shape) bool {
	n := sig.Params().Len()
	if n == 2 && sig.Results().Len() == 0 && !sig.Variadic() && sig.TypeParams().Len() == 0 {
		return residualShape(sig, shape)
	}
	if n < 1 || n > 2 || sig.Results().Len() != 1 || sig.Variadic() || sig.TypeParams().Len() > 0 {
		return false
	}
	elem := floatKind(types.Unalias(sig.Results().At(0).Type()))
	param := sig.Params().At(0).Type()
	shape.Elem = elem
	switch {
	case elem == "":
		return false
	case floatKind(types.Unalias(param)) == elem:
		shape.Arg, shape.Dim = ArgScalar, 1
	case arrayOf(param, elem) > 0:
		shape.Arg, shape.Dim = ArgArray, arrayOf(param, elem)
	case pointerTo(param) != nil && arrayOf(pointerTo(param), elem) > 0:
		shape.Arg, shape.Dim = ArgPointer, arrayOf(pointerTo(param), elem)
	case sliceOf(param, elem):
		shape.Arg = ArgSlice
	default:
		return false
	}
	if n == 1 {
		return true
	}
	g := sig.Params().At(1).Type()
	shape.Combined = true
	switch shape.Arg {
	case ArgScalar:
		p := pointerTo(g)
		return p != nil && floatKind(types.Unalias(p)) == elem
	case ArgSlice:
		return sliceOf(g, elem)
	default:
		p := pointerTo(g)
		return p != nil && arrayOf(p, elem) == shape.Dim
	}
}

// residualShape matches a residual objective, func(x, r) with no result:
// x *[N]T, [N]T or []T and r *[M]T, or r []T when x is a slice (M from
// the spec's residuals key). T comes from r.
func residualShape(sig *types.Signature, shape *Shape) bool {
	x, r := sig.Params().At(0).Type(), sig.Params().At(1).Type()
	var elem string
	if p := pointerTo(r); p != nil {
		if a, ok := types.Unalias(p).(*types.Array); ok {
			elem = floatKind(types.Unalias(a.Elem()))
			shape.Residuals = int(a.Len())
		}
	} else if s, ok := types.Unalias(r).(*types.Slice); ok {
		elem = floatKind(types.Unalias(s.Elem()))
		shape.ResidualSlice = true
	}
	if elem == "" {
		return false
	}
	shape.Elem = elem
	switch {
	case arrayOf(x, elem) > 0 && !shape.ResidualSlice:
		shape.Arg, shape.Dim = ArgArray, arrayOf(x, elem)
	case pointerTo(x) != nil && arrayOf(pointerTo(x), elem) > 0 && !shape.ResidualSlice:
		shape.Arg, shape.Dim = ArgPointer, arrayOf(pointerTo(x), elem)
	case sliceOf(x, elem) && shape.ResidualSlice:
		shape.Arg = ArgSlice
	default:
		return false
	}
	return shape.Residuals > 0 || shape.ResidualSlice
}

// residualObjectives are the forms of a residual objective.
const residualObjectives = `residual objectives, f = ½‖r‖²: func(x *[N]T, r *[M]T), func(x [N]T, r *[M]T), func(x, r []T) (with dim and residuals)`

// acceptedJacobians are the forms of a residual objective's Jacobian.
const acceptedJacobians = `accepted Jacobian forms: func(x *[N]T, J *[M][N]T) by rows, J[i][j] = ∂rᵢ/∂xⱼ, or func(x *[N]T, J *[N][M]T) by columns (rows when M = N), x as the objective takes it ([N]T or *[N]T); a method on the objective's receiver type when the objective is a method`

// resolveResiduals checks what depends on the objective being residuals
// or not: the residuals and jacobian keys, the least-squares directions,
// and a residual objective's defaults (levenberg-marquardt with its
// damping rule when the spec names no direction).
func (lp *loadedPackage) resolveResiduals(m *Minimizer, shape *Shape, sig *types.Signature, recvType *types.Named, at func(string) Pos, ix *positions, probs *Problems) {
	if shape.Residuals == 0 && !shape.ResidualSlice {
		if m.Residuals != 0 {
			probs.add(ix.key(m.keyPrefix+".residuals"), "residuals is only for residual objectives that take slices; %s returns its value", m.Objective)
		}
		if m.Jacobian != "" {
			probs.add(ix.key(m.keyPrefix+".jacobian"), "jacobian is only for residual objectives (%s); %s returns its value, so name its gradient with the gradient key", residualObjectives, m.Objective)
		}
		if m.Direction != nil && m.Direction.Residual {
			probs.add(at("direction"), "direction %q needs a residual objective (%s); %s returns its value: use a residual form, or direction \"bfgs\"", m.Direction.Name, residualObjectives, m.Objective)
		}
		return
	}
	switch {
	case shape.ResidualSlice && m.Residuals == 0:
		probs.add(at("objective"), "objective %s writes its residuals into a slice: set residuals to their number", m.Objective)
	case shape.ResidualSlice:
		shape.Residuals = m.Residuals
	case m.Residuals != 0 && m.Residuals != shape.Residuals:
		probs.add(at("residuals"), "residuals is %d, but %s writes %d (%s)", m.Residuals, m.Objective, shape.Residuals, signatureText(sig))
	}
	if !m.DirectionGiven && !m.RuleGiven {
		m.Direction, m.Rule = rules.LevenbergMarquardt, rules.LevenbergMarquardt.DefaultRule
		for q := range m.Given {
			if c := resolveContext(m, shape.Elem, max(shape.Dim, 1)); !c.Reads(q) {
				probs.add(ix.key(m.keyPrefix+"."+q.Path()), "%s is not used by the residual objective's default, direction \"levenberg-marquardt\" with step.rule \"damping\"", q.Path())
			}
		}
	}
	if m.Gradient != "" {
		probs.add(ix.key(m.keyPrefix+".gradient"), "objective %s writes residuals, whose gradient Jᵀr comes from their Jacobian: name it with the jacobian key instead of gradient", m.Objective)
	}
	if m.Derivative.Derived {
		lp.derive(m, shape, at("derivative"), probs)
		return
	}
	if m.Derivative == rules.Analytic {
		if m.Jacobian == "" {
			probs.add(at("derivative"), "derivative = \"analytic\" needs a jacobian key naming the residuals' Jacobian (%s)", acceptedJacobians)
			return
		}
		lp.resolveJacobian(m, shape, recvType, at("jacobian"), probs)
	}
}

// resolveJacobian finds the analytic Jacobian and checks its form
// against the objective's shape.
func (lp *loadedPackage) resolveJacobian(m *Minimizer, shape *Shape, recvType *types.Named, pos Pos, probs *Problems) {
	fn := lp.companion(m.Jacobian, recvType, pos, "jacobian", probs)
	if fn == nil {
		return
	}
	sig := fn.Type().(*types.Signature)
	elem, n, mres := shape.Elem, shape.Dim, shape.Residuals
	matrix := func(t types.Type, rows, cols int) bool {
		p := pointerTo(t)
		if p == nil {
			return false
		}
		a, ok := types.Unalias(p).(*types.Array)
		return ok && int(a.Len()) == rows && arrayOf(a.Elem(), elem) == cols
	}
	ok := !sig.Variadic() && sig.TypeParams().Len() == 0 && sig.Params().Len() == 2 && sig.Results().Len() == 0 && !shape.ResidualSlice
	if ok {
		x := sig.Params().At(0).Type()
		switch shape.Arg {
		case ArgPointer:
			ok = pointerTo(x) != nil && arrayOf(pointerTo(x), elem) == n
		default:
			ok = arrayOf(x, elem) == n
		}
	}
	if ok {
		j := sig.Params().At(1).Type()
		switch {
		case matrix(j, mres, n):
		case matrix(j, n, mres):
			shape.JacobianColumns = true
		default:
			ok = false
		}
	}
	if !ok {
		if shape.ResidualSlice {
			probs.add(pos, "jacobian %s: an objective that writes its residuals into a slice takes no analytic Jacobian here; use derivative = \"central\" or \"forward\", or array forms (%s)", m.Jacobian, residualObjectives)
			return
		}
		probs.add(lp.position(fn.Pos()), "jacobian %s has signature %s, which does not fit %d residuals of %d unknowns of %s; %s", m.Jacobian, signatureText(sig), mres, n, elem, acceptedJacobians)
		return
	}
	shape.Jacobian = fn.Name()
}

// resolveDerivative checks the derivative source against the objective:
// a combined objective brings its own gradient, so it takes derivative =
// "analytic" without a gradient key; any other objective needs a gradient
// key for "analytic", whose function resolveGradient then checks.
func (lp *loadedPackage) resolveDerivative(m *Minimizer, shape *Shape, sig *types.Signature, recvType *types.Named, at func(string) Pos, ix *positions, probs *Problems) {
	derivative := at("derivative")
	if _, given := ix.values[m.keyPrefix+".derivative"]; !given {
		derivative = at("objective") // the default, "central": the objective is what rules it out
	}
	switch {
	case shape.Combined && m.Gradient != "":
		probs.add(ix.key(m.keyPrefix+".gradient"), "objective %s writes its gradient through g (%s): remove the gradient key, derivative = \"analytic\" uses that gradient", m.Objective, signatureText(sig))
	case shape.Combined && m.Derivative.Derived:
		probs.add(derivative, "objective %s writes its gradient through g (%s): set derivative = \"analytic\" to use it; automatic differentiation is for objectives that return their value alone", m.Objective, signatureText(sig))
	case shape.Combined && m.Derivative != rules.Analytic:
		probs.add(derivative, "objective %s writes its gradient through g (%s): set derivative = \"analytic\", without a gradient key (derivative is %q, which would ignore it)", m.Objective, signatureText(sig), m.Derivative.Name)
	case shape.Combined:
		// its own gradient, taken through the objective's calls
	case m.Derivative == rules.Analytic && m.Gradient == "":
		probs.add(derivative, "derivative = \"analytic\" needs a gradient key naming the gradient function, or an objective that writes its gradient (%s)", combinedObjectives)
	case m.Derivative == rules.Analytic:
		lp.resolveGradient(m, shape, recvType, at("gradient"), probs)
	case m.Derivative.Derived:
		lp.derive(m, shape, derivative, probs)
	}
}

// derive differentiates the objective for derivative = "automatic": its
// gradient (or Jacobian) becomes a function of the generated file, a
// method of the objective's receiver type when the objective is one.
func (lp *loadedPackage) derive(m *Minimizer, shape *Shape, pos Pos, probs *Problems) {
	fn, _ := lp.lookupFunc(m.Objective, nil, pos, "objective", probs)
	if fn == nil {
		return
	}
	code := lp.differentiate(m, shape, fn, probs)
	if code == nil {
		return
	}
	shape.Derived = code
	if shape.Residuals > 0 {
		shape.Jacobian, shape.JacobianColumns = code.Jacobian, false
		return
	}
	shape.Gradient, shape.Grad = code.Gradient, GradPointer
}

// companion finds a function that goes with the objective (its gradient
// or Jacobian, what names it): a method of the objective's receiver type
// when the objective is one, a plain function otherwise; nil, reported,
// when it is neither.
func (lp *loadedPackage) companion(ref string, recvType *types.Named, pos Pos, what string, probs *Problems) *types.Func {
	fn, owner := lp.lookupFunc(ref, recvType, pos, what, probs)
	if fn == nil {
		return nil
	}
	if (owner == nil) != (recvType == nil) {
		if recvType != nil {
			probs.add(pos, "%s %s must be a method of %s, like the objective", what, ref, recvType.Obj().Name())
		} else {
			probs.add(pos, "%s %s must be a plain function, like the objective", what, ref)
		}
		return nil
	}
	return fn
}

// resolveGradient finds the analytic gradient and checks its form against
// the objective's shape.
func (lp *loadedPackage) resolveGradient(m *Minimizer, shape *Shape, recvType *types.Named, pos Pos, probs *Problems) {
	fn := lp.companion(m.Gradient, recvType, pos, "gradient", probs)
	if fn == nil {
		return
	}
	sig := fn.Type().(*types.Signature)
	params, results := sig.Params(), sig.Results()
	elem, dim := shape.Elem, shape.Dim
	isArray := func(t types.Type) bool { return arrayOf(t, elem) == dim }
	isPointer := func(t types.Type) bool { p := pointerTo(t); return p != nil && isArray(p) }
	ok := !sig.Variadic() && sig.TypeParams().Len() == 0
	switch {
	case !ok:
	case shape.Scalar():
		ok = params.Len() == 1 && results.Len() == 1 &&
			floatKind(types.Unalias(params.At(0).Type())) == elem && floatKind(types.Unalias(results.At(0).Type())) == elem
		shape.Grad = GradScalar
	case params.Len() == 2 && results.Len() == 0 && isPointer(params.At(0).Type()) && isPointer(params.At(1).Type()):
		shape.Grad = GradPointer
	case params.Len() == 1 && results.Len() == 1 && isArray(params.At(0).Type()) && isArray(results.At(0).Type()):
		shape.Grad = GradArray
	case params.Len() == 2 && results.Len() == 0 && sliceOf(params.At(0).Type(), elem) && sliceOf(params.At(1).Type(), elem):
		shape.Grad = GradSlice
	default:
		ok = false
	}
	if !ok {
		want := fmt.Sprintf("[%d]%s", dim, elem)
		if shape.Scalar() {
			want = elem
		}
		probs.add(lp.position(fn.Pos()), "gradient %s has signature %s, which does not fit an objective of %s; %s", m.Gradient, signatureText(sig), want, acceptedGradients)
		return
	}
	shape.Gradient = fn.Name()
}

// resolveInstance checks the receiver source the generated tests use.
func (lp *loadedPackage) resolveInstance(m *Minimizer, shape *Shape, recvType *types.Named, at func(string) Pos, ix *positions, probs *Problems) {
	if recvType == nil {
		if m.Instance != "" {
			probs.add(ix.key(m.keyPrefix+".instance"), "instance is only for objectives that are methods; %s is a function", m.Objective)
		}
		return
	}
	if m.Instance == "" {
		if what := holdsData(recvType); what != "" {
			probs.add(at("objective"), "objective %s is a method of %s, which holds %s: set instance to a package-level variable or a func() giving a receiver with its data, so that the generated tests run on real data (its zero value would minimize an empty model)", m.Objective, recvType.Obj().Name(), what)
		}
		return
	}
	obj := lp.pkg.Types.Scope().Lookup(m.Instance)
	var t types.Type
	inst := instance{Name: m.Instance}
	switch o := obj.(type) {
	case *types.Var:
		t = o.Type()
	case *types.Func:
		sig := o.Type().(*types.Signature)
		if sig.Params().Len() == 0 && sig.Results().Len() == 1 {
			t, inst.Call = sig.Results().At(0).Type(), true
		}
	case nil:
		probs.add(at("instance"), "instance %s: no such variable or function in package %s%s", m.Instance, lp.pkg.Name, didYouMean(m.Instance, lp.declared(isVarOrFunc)))
		return
	}
	want := types.Type(recvType)
	if shape.Pointer {
		want = types.NewPointer(recvType)
	}
	switch {
	case t == nil:
		probs.add(at("instance"), "instance %s must be a package-level variable or a func() returning %s", m.Instance, types.TypeString(want, types.RelativeTo(lp.pkg.Types)))
		return
	case types.Identical(t, want):
	case shape.Pointer && types.Identical(t, recvType):
		inst.Adjust = "&"
	case !shape.Pointer && types.Identical(t, types.NewPointer(recvType)):
		inst.Adjust = "*"
	default:
		probs.add(at("instance"), "instance %s has type %s; want %s or %s", m.Instance,
			types.TypeString(t, types.RelativeTo(lp.pkg.Types)), recvType.Obj().Name(), "*"+recvType.Obj().Name())
		return
	}
	shape.Instance = inst
}

func signatureText(sig *types.Signature) string {
	return "func" + strings.TrimPrefix(types.TypeString(sig, func(*types.Package) string { return "" }), "func")
}

// maxStackVariable is the largest explicitly declared variable the Go
// compiler keeps on the stack; larger ones move to the heap
// (cmd/compile/internal/ir, MaxStackVarSize = 128 KiB, recalled from
// memory and confirmed by the end-to-end escape check).
const maxStackVariable = 128 << 10

// checkStackSize refuses a minimizer whose largest variable would not fit
// on the stack, since the generated code would then allocate: a vector
// (or the outcome that holds one), or the direction's state.
func checkStackSize(m *Minimizer, shape Shape, ix *positions, probs *Problems) {
	ctx := resolveContext(m, shape.Elem, shape.Dim)
	size := ctx.ElemBytes()
	vector := shape.Dim*size + 64
	if vector > maxStackVariable {
		probs.add(ix.value(m.keyPrefix+".objective"), "%d unknowns of %s (%d bytes a vector) exceed the %d bytes Go keeps on the stack: the minimizer would allocate", shape.Dim, shape.Elem, vector, maxStackVariable)
		return
	}
	if jac := shape.Residuals * vector; jac > maxStackVariable {
		probs.add(ix.value(m.keyPrefix+".objective"), "%d residuals of %d unknowns of %s (%d bytes the Jacobian) exceed the %d bytes Go keeps on the stack: the minimizer would allocate", shape.Residuals, shape.Dim, shape.Elem, jac, maxStackVariable)
		return
	}
	for _, e := range ctx.Entries() {
		if e == nil || e.State == nil {
			continue
		}
		c := choiceOf(e)
		state, what := e.State(shape.Dim, size, ctx.Value)
		if state > maxStackVariable {
			hint := e.SmallerState
			if hint == "" {
				hint = "use fewer unknowns or an analytic gradient"
			}
			probs.add(ix.value(m.keyPrefix+"."+c.Path()), "%s %q keeps %s %s (%d bytes) in one variable, above the %d bytes Go keeps on the stack: the minimizer would allocate; %s",
				c.Key, e.Name, what, shape.Elem, state, maxStackVariable, hint)
		}
	}
}

// holdsData says what data a receiver type holds ("2 fields", "an
// array"), or "" when its zero value is all there is to it.
func holdsData(t *types.Named) string {
	switch u := t.Underlying().(type) {
	case *types.Struct:
		switch n := u.NumFields(); n {
		case 0:
			return ""
		case 1:
			return "a field"
		default:
			return fmt.Sprintf("%d fields", n)
		}
	case *types.Array:
		return "an array"
	case *types.Slice:
		return "a slice"
	case *types.Map:
		return "a map"
	}
	return ""
}
