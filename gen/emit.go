package gen

import (
	"bytes"
	"fmt"
	"go/format"
	"go/parser"
	"go/token"
	"io"
	"math"
	"strings"

	"github.com/dave/jennifer/jen"
	"golang.org/x/tools/go/ast/astutil"

	"github.com/thalweg-go/thalweg/rules"
)

// EmitMinimizer writes the generated minimizer for p: header, status,
// result and limits types and entry points (shaped by the spec, built with
// jennifer, which formats them and fails on source that does not parse),
// the tunables, then the specialized kernels, each printed from its
// rewritten syntax tree as go/format prints it.
func EmitMinimizer(w io.Writer, p *Plan) error {
	_, err := emitMinimizer(w, p, p.kernelChoice())
	return err
}

// emitMinimizer is EmitMinimizer for a given kernel choice; it also
// returns the package-level names the file declares.
func emitMinimizer(w io.Writer, p *Plan, choice kernelChoice) ([]string, error) {
	kernels, err := specialize(choice)
	if err != nil {
		return nil, err
	}
	glue, err := renderGlue(p, kernels)
	if err != nil {
		return nil, err
	}
	source, usesMath := kernels.source, kernels.usesMath
	if d := p.Shape.Derived; d != nil {
		source = append(append(append([]byte{}, bytes.TrimRight(source, "\n")...), "\n\n"...), d.Source...)
		usesMath = usesMath || d.UsesMath
	}
	src, ok := assemble(glue, source, usesMath)
	if !ok {
		if src, err = formatWhole(append(glue, source...), usesMath); err != nil {
			return nil, err
		}
	}
	_, err = w.Write(src)
	return declaredNames(src), err
}

// declaredNames lists the package-level names a gofmt'ed Go file
// declares, as topLevelNames does, read from its lines without parsing
// it: "func F", "type T", "const C", "var V" (or a list of names) at the
// start of a line, and the names opening a line indented once in a
// "const (", "var (" or "type (" group. A raw string spanning lines could
// fool it; generated minimizers have none (TestAssembleIsFormatted
// compares it with topLevelNames).
func declaredNames(src []byte) []string {
	var names []string
	group := false
	for len(src) > 0 {
		line := src
		if i := bytes.IndexByte(src, '\n'); i >= 0 {
			line, src = src[:i], src[i+1:]
		} else {
			src = nil
		}
		if group {
			if len(line) == 1 && line[0] == ')' {
				group = false
			} else if len(line) > 1 && line[0] == '\t' && isIdentStart(line[1]) {
				names = identList(names, line[1:])
			}
			continue
		}
		var rest []byte
		switch {
		case bytes.HasPrefix(line, []byte("func ")):
			rest = line[len("func "):]
		case bytes.HasPrefix(line, []byte("type ")):
			rest = line[len("type "):]
		case bytes.HasPrefix(line, []byte("const ")):
			rest = line[len("const "):]
		case bytes.HasPrefix(line, []byte("var ")):
			rest = line[len("var "):]
		default:
			continue
		}
		switch {
		case len(rest) > 0 && rest[0] == '(' && line[0] != 'f':
			group = true
		case len(rest) > 0 && isIdentStart(rest[0]):
			if line[0] == 'f' {
				names = append(names, string(rest[:identLen(rest)]))
			} else {
				names = identList(names, rest)
			}
		}
	}
	return names
}

// identList appends the names of a list "a, b, c …" that opens line.
func identList(names []string, line []byte) []string {
	for {
		n := identLen(line)
		names = append(names, string(line[:n]))
		line = line[n:]
		if !bytes.HasPrefix(line, []byte(", ")) || len(line) < 3 || !isIdentStart(line[2]) {
			return names
		}
		line = line[2:]
	}
}

func identLen(b []byte) int {
	n := 0
	for n < len(b) && (isIdentStart(b[n]) || '0' <= b[n] && b[n] <= '9') {
		n++
	}
	return n
}

// isIdentStart reports whether c can open an identifier; the generated
// code's package-level names are ASCII.
func isIdentStart(c byte) bool {
	return 'a' <= c && c <= 'z' || 'A' <= c && c <= 'Z' || c == '_'
}

// renderGlue renders, formatted, the spec-shaped part of the file.
func renderGlue(p *Plan, kernels *specializedKernels) ([]byte, error) {
	f := jen.NewFile(p.Shape.Package)
	f.HeaderComment(headerLine(p.SpecName))
	emitStatus(f, p)
	emitTypes(f, p)
	emitBox(f, p)
	emitEntry(f, p, kernels.entryName)
	emitScaling(f, p)
	emitSolver(f, p, kernels.stateName)
	if kernels.uncertaintyName != "" {
		emitUncertainty(f, p, kernels.uncertaintyName)
	}
	emitTunables(f, p, kernels.uses)
	var buf bytes.Buffer
	if err := f.Render(&buf); err != nil {
		return nil, err
	}
	return buf.Bytes(), nil
}

// assemble joins the glue, which jennifer has formatted, and the kernels,
// each declaration printed as go/format prints it and followed by a blank
// line, into the file go/format would make of the two: the glue, a blank
// line, the kernels. When the kernels use math and the glue does not
// import it, the import goes after the package clause, where
// astutil.AddImport puts it in a file without imports. It reports false
// when the glue imports other packages (then formatWhole adds the import).
// TestAssembleIsFormatted compares it with formatWhole.
func assemble(glue, kernels []byte, usesMath bool) ([]byte, bool) {
	imports := bytes.Contains(glue, []byte("\nimport "))
	if usesMath && !bytes.Contains(glue, []byte("\nimport \"math\"\n")) {
		if imports {
			return nil, false
		}
		clause := bytes.Index(glue, []byte("\npackage "))
		if clause < 0 {
			return nil, false
		}
		end := clause + 1 + bytes.IndexByte(glue[clause+1:], '\n') + 1
		out := make([]byte, 0, len(glue)+len(kernels)+16)
		out = append(out, glue[:end]...)
		out = append(out, "\nimport \"math\"\n"...)
		out = append(out, glue[end:]...)
		glue = out
	}
	out := make([]byte, 0, len(glue)+len(kernels))
	out = append(out, glue...)
	out = append(out, '\n')
	out = append(out, bytes.TrimSuffix(kernels, []byte("\n"))...)
	return out, true
}

// formatWhole parses the assembled source, adds the math import when the
// kernels need it and formats it.
func formatWhole(src []byte, usesMath bool) ([]byte, error) {
	fset := token.NewFileSet()
	file, err := parser.ParseFile(fset, "", src, parser.ParseComments)
	if err != nil {
		return nil, fmt.Errorf("generated code does not parse (a thalweg bug): %v\n%s", err, numbered(src))
	}
	if usesMath {
		astutil.AddImport(fset, file, "math")
	}
	var out bytes.Buffer
	if err := format.Node(&out, fset, file); err != nil {
		return nil, err
	}
	return out.Bytes(), nil
}

func numbered(src []byte) string {
	var b strings.Builder
	for i, line := range strings.Split(string(src), "\n") {
		fmt.Fprintf(&b, "%5d  %s\n", i+1, line)
	}
	return b.String()
}

// xType is the type of x0 and Result.X: T, or [N]T.
func xType(p *Plan) *jen.Statement {
	if p.Shape.Scalar() {
		return jen.Id(p.Shape.Elem)
	}
	return jen.Index(jen.Lit(p.Shape.Dim)).Id(p.Shape.Elem)
}

// receiverParam is "recv R" for methods; R is the objective's receiver type.
func receiverParam(p *Plan) []jen.Code {
	if p.Shape.Receiver == "" {
		return nil
	}
	t := jen.Id(p.Shape.Receiver)
	if p.Shape.Pointer {
		t = jen.Op("*").Id(p.Shape.Receiver)
	}
	return []jen.Code{jen.Id("recv").Add(t)}
}

// emitStatus writes:
//
//	type NAMEStatus uint8
//	const ( NAMEGradientSmall NAMEStatus = iota + 1; … )
//	func (s NAMEStatus) String() string { switch s { … } }
//	func (s NAMEStatus) Converged() bool { return s == … || s == … }
func emitStatus(f *jen.File, p *Plan) {
	name := p.M.Name + "Status"
	f.Commentf("%s tells why %s stopped. Only the statuses for which Converged is true say that X is a minimizer to the spec's tolerances; check it before acting on a result.", name, p.M.Name)
	f.Type().Id(name).Uint8()
	var consts []jen.Code
	for i, s := range rules.Statuses {
		c := jen.Comment(fmt.Sprintf("%s%s: %s.", p.M.Name, s.Suffix, s.Doc)).Line().Id(p.M.Name + s.Suffix)
		if i == 0 {
			c.Id(name).Op("=").Iota().Op("+").Lit(1)
		}
		consts = append(consts, c)
	}
	f.Const().Defs(consts...)
	var cases []jen.Code
	var converged *jen.Statement
	for _, s := range rules.Statuses {
		cases = append(cases, jen.Case(jen.Id(p.M.Name+s.Suffix)).Block(jen.Return(jen.Lit(s.Text))))
		if s.Converged {
			test := jen.Id("s").Op("==").Id(p.M.Name + s.Suffix)
			if converged == nil {
				converged = test
			} else {
				converged = converged.Op("||").Add(test)
			}
		}
	}
	cases = append(cases, jen.Default().Block(jen.Return(jen.Lit("unknown status"))))
	f.Comment("String describes the status in a few words.")
	f.Func().Params(jen.Id("s").Id(name)).Id("String").Params().String().Block(jen.Switch(jen.Id("s")).Block(cases...))
	f.Comment("Converged reports whether the gradient test holds at X (Gradient ≤ GradientLimit in the result): only then is X a verified stationary point; a stall, the limits, line-search failure and non-finite values are not convergence.")
	f.Func().Params(jen.Id("s").Id(name)).Id("Converged").Params().Bool().Block(jen.Return(converged))
}

// emitTypes writes the result and limits types and the default limits:
//
//	type NAMEResult struct { X …; F T; Iterations, Evaluations int; Status NAMEStatus }
//	type NAMELimits struct { Gradient, Step T; Iterations, Evaluations int }
//	func NAMEDefaultLimits() NAMELimits { return NAMELimits{…} }
func emitTypes(f *jen.File, p *Plan) {
	name, elem := p.M.Name, p.Shape.Elem
	f.Commentf("%sResult is where %s stopped and why.", name, name)
	f.Type().Id(name+"Result").Struct(
		jen.Id("X").Add(xType(p)).Comment("where the gradient test held, when converged; else the lowest point seen"),
		jen.Id("F").Id(elem).Comment("the objective at X"),
		jen.Id("Gradient").Id(elem).Comment("the gradient test's measure at X, the differences' error bound included; NaN when the run ended before the gradient at X was known"),
		jen.Id("GradientLimit").Id(elem).Comment("the limit Gradient was held to: Limits.Gradient, raised with differences to three times the measure of their error bound, and at a stall to ten times the larger of the two; converged runs have Gradient ≤ GradientLimit"),
		jen.Id("Iterations").Int().Comment("accepted steps"),
		jen.Id("Evaluations").Int().Comment("objective calls, finite differences included"),
		jen.Id("Status").Id(name+"Status").Comment("why the run stopped; check Status.Converged()"),
	)
	f.Commentf("%sLimits are the stop limits of one run. Pass them to %sWithLimits to change them at run time; %sDefaultLimits returns the spec's.", name, name, name)
	if p.Scaled() {
		f.Commentf("Gradient and Step apply to the scaled unknowns zᵢ = xᵢ/sᵢ of %s (s the scale of %s): to sᵢ·∂f/∂xᵢ and to |Δzᵢ| ≤ Step·(|zᵢ| + 1).", name, p.SpecName)
	}
	var fields []jen.Code
	defaults := jen.Dict{}
	for _, q := range rules.Params() {
		if q.Limit == "" {
			continue
		}
		t, v := jen.Id(elem), jen.Op(formatFloat(p.Value(q)))
		if q.Kind == rules.Whole {
			t, v = jen.Int(), jen.Lit(int(p.Value(q)))
		}
		doc := q.LimitDoc
		if q == rules.StopStep && p.Shape.Residuals > 0 {
			doc = rules.ResidualStepDoc
		}
		fields = append(fields, jen.Id(q.Limit).Add(t).Comment(doc))
		defaults[jen.Id(q.Limit)] = v
	}
	f.Type().Id(name + "Limits").Struct(fields...)
	f.Commentf("%sDefaultLimits returns the stop limits of %s, [minimizer.stop].", name, p.SpecName)
	f.Func().Id(name + "DefaultLimits").Params().Id(name + "Limits").Block(
		jen.Return(jen.Id(name + "Limits").Values(defaults)),
	)
}

// emitBox writes the type the kernels keep the box of [minimizer.bounds]
// in: the lower and upper bounds, or nothing when the spec has none.
//
//	type prefixBox struct { lower, upper [N]T }
func emitBox(f *jen.File, p *Plan) {
	name := p.Prefix + "Box"
	if !p.Bounded {
		f.Commentf("%s is empty: %s sets no bounds on %s.", name, p.SpecName, p.M.Name)
		f.Type().Id(name).Struct()
		return
	}
	f.Commentf("%s is the box lower ≤ x ≤ upper of %s's [minimizer.bounds], ±Inf where a side is open.", name, p.SpecName)
	f.Type().Id(name).Struct(jen.List(jen.Id("lower"), jen.Id("upper")).Index(jen.Lit(p.Dim)).Id(p.Shape.Elem))
}

// boxValue is the box of [minimizer.bounds] in the user's units.
func boxValue(p *Plan) *jen.Statement { return boxLiteral(p, p.M.Lower, p.M.Upper) }

// kernelBoxValue is the box the entry point hands the kernels: with scale,
// in their unknowns zᵢ = xᵢ/sᵢ (rounded; prefixUnscaled clamps to the
// user's box, so the objective never sees a point outside it).
func kernelBoxValue(p *Plan) *jen.Statement {
	if !p.Bounded || !p.Scaled() {
		return boxValue(p)
	}
	lower, upper := make([]float64, p.Dim), make([]float64, p.Dim)
	for i, s := range p.M.Scale {
		lower[i], upper[i] = p.M.Lower[i]/s, p.M.Upper[i]/s
	}
	return boxLiteral(p, lower, upper)
}

func boxLiteral(p *Plan, lower, upper []float64) *jen.Statement {
	name := p.Prefix + "Box"
	if !p.Bounded {
		return jen.Id(name).Values()
	}
	side := func(vals []float64) *jen.Statement { return vecLiteral(p, vals) }
	return jen.Id(name).Values(jen.Dict{jen.Id("lower"): side(lower), jen.Id("upper"): side(upper)})
}

// vecLiteral is [N]T{v…}, ±Inf written as math.Inf(±1).
func vecLiteral(p *Plan, vals []float64) *jen.Statement {
	return jen.Index(jen.Lit(p.Dim)).Id(p.Shape.Elem).Values(floatItems(vals, p.Shape.Elem)...)
}

// floatItems are the elements of a literal of vals in elem: each exactly
// as formatFloat writes it, ±Inf as math.Inf(±1), converted for float32.
func floatItems(vals []float64, elem string) []jen.Code {
	items := make([]jen.Code, len(vals))
	for i, v := range vals {
		switch {
		case math.IsInf(v, 0) && elem == "float32":
			items[i] = jen.Float32().Call(jen.Qual("math", "Inf").Call(jen.Lit(int(math.Copysign(1, v)))))
		case math.IsInf(v, 0):
			items[i] = jen.Qual("math", "Inf").Call(jen.Lit(int(math.Copysign(1, v))))
		default:
			items[i] = jen.Op(formatFloat(v))
		}
	}
	return items
}

// emitScaling writes, for a spec with scale, the conversions between the
// user's unknowns x and the kernels' zᵢ = xᵢ/sᵢ and the adapters through
// which the kernels call the user's functions:
//
//	func prefixScaled(x [N]T) [N]T                  // zᵢ = xᵢ/sᵢ
//	func prefixUnscaled(z *[N]T) [N]T               // xᵢ = sᵢ·zᵢ, within the box
//	func prefixValueAt([recv *R,] z *[N]T) T        // f(x)
//	func prefixGradientAt([recv *R,] z, g *[N]T)    // gᵢ = sᵢ·∂f/∂xᵢ (chain rule)
func emitScaling(f *jen.File, p *Plan) {
	if !p.Scaled() {
		return
	}
	s := p.Shape
	vec := jen.Index(jen.Lit(p.Dim)).Id(s.Elem)
	ptr := func() *jen.Statement { return jen.Op("*").Add(vec.Clone()) }
	scale := jen.Id("s").Op(":=").Add(vecLiteral(p, p.M.Scale))
	f.Commentf("%sScaled is the kernels' point for the user's x: zᵢ = xᵢ/sᵢ, s the scale of %s.", p.Prefix, p.SpecName)
	f.Func().Id(p.Prefix+"Scaled").Params(jen.Id("x").Add(vec.Clone())).Add(vec.Clone()).Block(
		scale.Clone(),
		jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(jen.Id("x").Index(jen.Id("i")).Op("/=").Id("s").Index(jen.Id("i"))),
		jen.Return(jen.Id("x")),
	)
	unscale := []jen.Code{
		scale.Clone(),
		jen.Var().Id("x").Add(vec.Clone()),
		jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(jen.Id("x").Index(jen.Id("i")).Op("=").Id("s").Index(jen.Id("i")).Op("*").Id("z").Index(jen.Id("i"))),
	}
	doc := fmt.Sprintf("%sUnscaled is the user's point for the kernels' z: xᵢ = sᵢ·zᵢ", p.Prefix)
	if p.Bounded {
		doc += ", kept within the box of [minimizer.bounds], which rounding of zᵢ's bounds could leave by an ulp"
		unscale = append(unscale,
			jen.Id("b").Op(":=").Add(boxValue(p)),
			jen.For(jen.Id("i").Op(":=").Range().Id("x")).Block(
				jen.Id("x").Index(jen.Id("i")).Op("=").Min(jen.Max(jen.Id("x").Index(jen.Id("i")), jen.Id("b").Dot("lower").Index(jen.Id("i"))), jen.Id("b").Dot("upper").Index(jen.Id("i"))),
			))
	}
	f.Comment(doc + ".")
	f.Func().Id(p.Prefix + "Unscaled").Params(jen.Id("z").Add(ptr())).Add(vec.Clone()).Block(append(unscale, jen.Return(jen.Id("x")))...)

	var recv []jen.Code
	callee := func(name string) *jen.Statement { return jen.Id(name) }
	if s.Receiver != "" {
		recv = []jen.Code{jen.Id("recv").Op("*").Id(s.Receiver)}
		callee = func(name string) *jen.Statement { return jen.Id("recv").Dot(name) }
	}
	x := jen.Id("x").Op(":=").Id(p.Prefix + "Unscaled").Call(jen.Id("z"))
	var arg jen.Code
	switch s.Arg {
	case ArgScalar:
		arg = jen.Id("x").Index(jen.Lit(0))
	case ArgArray:
		arg = jen.Id("x")
	case ArgPointer:
		arg = jen.Op("&").Id("x")
	default:
		arg = jen.Id("x").Index(jen.Op(":"))
	}
	if s.Combined {
		// The combined objective writes ∂f/∂x into g; the kernels want
		// ∂f/∂z = s∘∂f/∂x (chain rule).
		var g jen.Code
		switch s.Arg {
		case ArgScalar:
			g = jen.Op("&").Id("g").Index(jen.Lit(0))
		case ArgSlice:
			g = jen.Id("g").Index(jen.Op(":"))
		default:
			g = jen.Id("g")
		}
		f.Commentf("%sValueAt is the objective at the kernels' z, with its gradient with respect to z written into g by the chain rule, gᵢ = sᵢ·∂f/∂xᵢ.", p.Prefix)
		f.Func().Id(p.Prefix+"ValueAt").Params(append(recv, jen.List(jen.Id("z"), jen.Id("g")).Add(ptr()))...).Id(s.Elem).Block(
			x.Clone(),
			jen.Id("v").Op(":=").Add(callee(s.Objective).Call(arg, g)),
			scale.Clone(),
			jen.For(jen.Id("i").Op(":=").Range().Id("g")).Block(jen.Id("g").Index(jen.Id("i")).Op("*=").Id("s").Index(jen.Id("i"))),
			jen.Return(jen.Id("v")),
		)
		return
	}
	f.Commentf("%sValueAt is the objective at the kernels' z.", p.Prefix)
	f.Func().Id(p.Prefix+"ValueAt").Params(append(recv, jen.Id("z").Add(ptr()))...).Id(s.Elem).Block(
		x.Clone(),
		jen.Return(callee(s.Objective).Call(arg)),
	)
	if s.Gradient == "" {
		return
	}
	var call jen.Code
	switch s.Grad {
	case GradScalar:
		call = jen.Id("g").Index(jen.Lit(0)).Op("=").Add(callee(s.Gradient).Call(jen.Id("x").Index(jen.Lit(0))))
	case GradArray:
		call = jen.Op("*").Id("g").Op("=").Add(callee(s.Gradient).Call(jen.Id("x")))
	case GradSlice:
		call = callee(s.Gradient).Call(jen.Id("x").Index(jen.Op(":")), jen.Id("g").Index(jen.Op(":")))
	default:
		call = callee(s.Gradient).Call(jen.Op("&").Id("x"), jen.Id("g"))
	}
	f.Commentf("%sGradientAt is the gradient with respect to the kernels' z, by the chain rule gᵢ = sᵢ·∂f/∂xᵢ.", p.Prefix)
	f.Func().Id(p.Prefix+"GradientAt").Params(append(recv, jen.List(jen.Id("z"), jen.Id("g")).Add(ptr()))...).Block(
		x.Clone(),
		call,
		scale.Clone(),
		jen.For(jen.Id("i").Op(":=").Range().Id("g")).Block(jen.Id("g").Index(jen.Id("i")).Op("*=").Id("s").Index(jen.Id("i"))),
	)
}

// emitEntry writes the two entry points:
//
//	func NAME([recv R,] x0 X) NAMEResult { return NAMEWithLimits([recv,] x0, NAMEDefaultLimits()) }
//	func NAMEWithLimits([recv R,] x0 X, limits NAMELimits) NAMEResult { out := kernel(…); return NAMEResult{…} }
func emitEntry(f *jen.File, p *Plan, kernel string) {
	name := p.M.Name
	params := append(receiverParam(p), jen.Id("x0").Add(xType(p)))
	var args []jen.Code
	if p.Shape.Receiver != "" {
		args = append(args, jen.Id("recv"))
	}
	kernelArgs := append(kernelRecv(p), kernelStart(p, jen.Id("x0")), jen.Id("limits"), kernelBoxValue(p))

	for _, line := range entryDoc(p) {
		f.Comment(line)
	}
	f.Func().Id(name).Params(params...).Id(name + "Result").Block(
		jen.Return(jen.Id(name + "WithLimits").Call(append(args, jen.Id("x0"), jen.Id(name+"DefaultLimits").Call())...)),
	)
	f.Commentf("%sWithLimits is %s with stop limits chosen at run time, without allocating. It makes at most limits.Evaluations objective calls, however the other limits are set.", name, name)
	f.Func().Id(name+"WithLimits").Params(append(params, jen.Id("limits").Id(name+"Limits"))...).Id(name+"Result").Block(
		jen.Id("out").Op(":=").Id(kernel).Call(kernelArgs...),
		jen.Return(resultOf(p)),
	)
}

// kernelRecv is the receiver argument of the kernels, which take a
// pointer: recv, or &recv for a value receiver; none for a function.
func kernelRecv(p *Plan) []jen.Code {
	switch {
	case p.Shape.Receiver == "":
		return nil
	case p.Shape.Pointer:
		return []jen.Code{jen.Id("recv")}
	}
	return []jen.Code{jen.Op("&").Id("recv")}
}

// kernelStart is the kernels' start for the user's x0 (an X): [1]T{x0}
// for a scalar objective, and with scale in zᵢ = xᵢ/sᵢ.
func kernelStart(p *Plan, x0 *jen.Statement) *jen.Statement {
	if p.Shape.Scalar() {
		x0 = jen.Index(jen.Lit(1)).Id(p.Shape.Elem).Values(x0)
	}
	if p.Scaled() {
		x0 = jen.Id(p.Prefix + "Scaled").Call(x0)
	}
	return x0
}

// resultOf is NAMEResult{…} from the kernels' outcome out, with X in the
// user's form and units.
func resultOf(p *Plan) *jen.Statement {
	x := jen.Id("out").Dot("x")
	if p.Scaled() {
		x = jen.Id(p.Prefix + "Unscaled").Call(jen.Op("&").Id("out").Dot("x"))
	}
	if p.Shape.Scalar() {
		x = x.Index(jen.Lit(0))
	}
	return jen.Id(p.M.Name + "Result").Values(jen.Dict{
		jen.Id("X"):             x,
		jen.Id("F"):             jen.Id("out").Dot("f"),
		jen.Id("Gradient"):      jen.Id("out").Dot("gradient"),
		jen.Id("GradientLimit"): jen.Id("out").Dot("gradientLimit"),
		jen.Id("Iterations"):    jen.Id("out").Dot("iterations"),
		jen.Id("Evaluations"):   jen.Id("out").Dot("evaluations"),
		jen.Id("Status"):        jen.Id("out").Dot("status"),
	})
}

// entryDoc is the doc comment of the main entry point: the policy, every
// constant, the worst-case number of objective calls and the caution.
func entryDoc(p *Plan) []string {
	target := p.Shape.Objective
	if p.Shape.Receiver != "" {
		target = p.Shape.Receiver + "." + target
	}
	lines := []string{
		fmt.Sprintf("%s minimizes %s from x0, as %s specifies.", p.M.Name, target, p.SpecName),
		"",
		fmt.Sprintf("Direction %s: %s.", p.Direction.Name, p.Direction.Summary),
		fmt.Sprintf("Step rule %s: %s.", p.Rule.Name, p.Rule.Summary),
		derivativeLine(p),
		fmt.Sprintf("Gradient test %s: %s.", p.Test.Name, p.Test.Math),
	}
	if p.Bounded {
		var box []string
		for i := range p.M.Lower {
			box = append(box, fmt.Sprintf("[%s, %s]", tomlNumber(p.M.Lower[i]), tomlNumber(p.M.Upper[i])))
		}
		lines = append(lines, fmt.Sprintf("Bounds %s: %s; Gradient is the measure of the projected gradient (zero in components pushing against a bound they sit on).", strings.Join(box, " × "), rules.Bounds.Summary))
	}
	if p.Scaled() {
		var scale []string
		for _, v := range p.M.Scale {
			scale = append(scale, tomlNumber(v))
		}
		lines = append(lines, fmt.Sprintf("Scale %s: %s.", strings.Join(scale, ", "), rules.Scaling.Summary))
	}
	var constants, stop []string
	for _, e := range []*rules.Entry{p.Rule, p.Direction, p.Derivative} {
		for _, q := range e.Params {
			if shown := q.Show(p.Value(q)); shown != "" {
				constants = append(constants, shown)
			}
		}
	}
	for _, q := range rules.Params() {
		if q.Limit != "" {
			shown := q.Show(p.Value(q))
			if q == rules.StopStep && p.Shape.Residuals > 0 {
				shown = "every |Δxᵢ| ≤ " + rules.FormatFloat(p.Value(q)) + "·max(|xᵢ|, |x0ᵢ|)"
			}
			stop = append(stop, shown)
		}
	}
	lines = append(lines, "Constants: "+strings.Join(constants, ", ")+".")
	lines = append(lines, "Default stop: "+strings.Join(stop, ", ")+".")
	worst, byIter := p.WorstCase()
	perGradient := ""
	if cost := p.GradientCalls(); cost > 0 {
		perGradient = fmt.Sprintf(", %d of them per gradient and %d per choice of the difference intervals (at the start and before each convergence is confirmed)", cost, p.CalibrationCalls())
		if p.Shape.Residuals > 0 {
			perGradient = fmt.Sprintf(", %d of them per Jacobian", cost)
		}
	}
	if p.Shape.Combined {
		perGradient = fmt.Sprintf(", each giving the value and the gradient, %d of them for the curvature probes of a stall", p.Dim)
	}
	why := fmt.Sprintf("the evaluation cap; the iteration limit alone would allow %d", byIter)
	if byIter < int(p.Value(rules.StopEvaluations)) {
		why = fmt.Sprintf("the bound the iteration limit sets, below the evaluation cap of %d", int(p.Value(rules.StopEvaluations)))
	}
	lines = append(lines, "",
		fmt.Sprintf("Worst case: %d objective calls%s (%s). It allocates nothing, uses no package state and never panics on its own: NaN or ±Inf from x0, the objective or the gradient ends the run with a status.", worst, perGradient, why),
		"Check Status.Converged() before acting on X.")
	return lines
}

// derivativeLine is the entry point's doc line on where the gradient
// comes from: the derivative entry, or a combined objective itself.
func derivativeLine(p *Plan) string {
	if p.Shape.Combined {
		return fmt.Sprintf("Derivative %s, from the objective itself: %s.", p.Derivative.Name, rules.Combined.Summary)
	}
	if p.Shape.Residuals > 0 {
		return fmt.Sprintf("Residual objective: %d residuals, f = ½‖r‖², each objective call one call of %s. Derivative %s: %s.", p.Shape.Residuals, p.Shape.Objective, p.Derivative.Name, p.Derivative.ResidualSummary)
	}
	return fmt.Sprintf("Derivative %s: %s.", p.Derivative.Name, p.Derivative.Summary)
}

// emitTunables writes the constants the kernels read, each echoing the
// spec key it came from:
//
//	const ( prefixStepInitial = 1.0 // step.initial … )
func emitTunables(f *jen.File, p *Plan, uses map[string]bool) {
	var defs []jen.Code
	for _, q := range rules.Params() {
		if q.Const == "" || !uses[q.Const] {
			continue
		}
		source := q.Path()
		if q.Label != "" && q.Label != q.Key {
			source += " (" + q.Label + ")"
		}
		defs = append(defs, jen.Id(p.Prefix+upperFirst(q.Const)).Op("=").Op(rules.FormatValue(q, p.Value(q))).Comment(source))
	}
	for _, c := range rules.Constants {
		if uses[c.Name] {
			defs = append(defs, jen.Id(p.Prefix+upperFirst(c.Name)).Op("=").Op(c.Value(p.Context)).Comment(c.Doc))
		}
	}
	f.Commentf("Tunables of %s from %s; the kernels below read them.", p.M.Name, p.SpecName)
	f.Const().Defs(defs...)
}

// emitUncertainty writes, for a residual objective, the parameter
// covariance of a fit and its entry point:
//
//	type NAMEUncertainty struct { Covariance [N][N]T; StandardErrors [N]T; … }
//	func NAMEUncertaintyAt([recv R,] x [N]T) NAMEUncertainty
func emitUncertainty(f *jen.File, p *Plan, kernel string) {
	name := p.M.Name
	s := p.Shape
	vec := jen.Index(jen.Lit(s.Dim)).Id(s.Elem)
	cost := 1 + p.GradientCalls()
	f.Commentf("%sUncertainty is the uncertainty of a least-squares fit at X: the parameter covariance estimate s²(JᵀJ)⁻¹, s² = ‖r(X)‖²/(M − N), with M = %d residuals and N = %d unknowns, and the standard errors (Seber & Wild, Nonlinear Regression, 1989, §2.1 and §5.1; the estimate NIST's certified standard deviations use). It assumes the residuals' errors are independent with equal variance, and a model close to linear within a few standard errors of X; it means something only at a minimizer (check Status.Converged() first).", name, s.Residuals, s.Dim)
	f.Type().Id(name+"Uncertainty").Struct(
		jen.Id("Covariance").Index(jen.Lit(s.Dim)).Add(vec.Clone()).Comment("s²(JᵀJ)⁻¹"),
		jen.Id("StandardErrors").Add(vec.Clone()).Comment("√Covarianceᵢᵢ, each unknown's standard error"),
		jen.Id("ResidualVariance").Id(s.Elem).Comment("s² = ‖r‖²/(M − N)"),
		jen.Id("DegreesOfFreedom").Int().Comment("M − N"),
		jen.Id("Evaluations").Int().Comment("objective calls spent: one, plus the Jacobian's differences"),
		jen.Id("Valid").Bool().Comment("false when M ≤ N, when JᵀJ is singular to working precision, or when a value is not finite"),
	)
	params := append(receiverParam(p), jen.Id("x").Add(vec.Clone()))
	f.Commentf("%sUncertaintyAt computes %sUncertainty at x, usually Result.X of a converged run, with the spec's Jacobian source: %d objective calls at most. It allocates nothing.", name, name, cost)
	f.Func().Id(name+"UncertaintyAt").Params(params...).Id(name+"Uncertainty").Block(
		jen.List(jen.Id("cov"), jen.Id("stdErr"), jen.Id("variance"), jen.Id("calls"), jen.Id("ok")).Op(":=").Id(kernel).Call(append(kernelRecv(p), jen.Id("x"), kernelBoxValue(p))...),
		jen.Return(jen.Id(name+"Uncertainty").Values(jen.Dict{
			jen.Id("Covariance"):       jen.Id("cov"),
			jen.Id("StandardErrors"):   jen.Id("stdErr"),
			jen.Id("ResidualVariance"): jen.Id("variance"),
			jen.Id("DegreesOfFreedom"): jen.Lit(s.Residuals - s.Dim),
			jen.Id("Evaluations"):      jen.Id("calls"),
			jen.Id("Valid"):            jen.Id("ok"),
		})),
	)
}
