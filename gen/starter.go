package gen

import (
	"fmt"
	"go/types"
	"io"
	"math"
	"path/filepath"
	"strings"

	"github.com/thalweg-go/thalweg/rules"
)

// WriteStarter writes a starter spec for the objective ref ("Func" or
// "Type.Method") of the Go package in dir: every key present, with its
// default and a one-line comment, ready for `thalweg gen`. A gradient named
// like the objective plus "Grad" or "Gradient" that fits is proposed as
// the analytic one (a combined objective, which writes its own, gets
// derivative = "analytic" without one; a residual objective gets
// levenberg-marquardt, and a Jacobian named like it plus "Jacobian" or
// "Jac"), and a New<Type> function as the instance. A start, when given, is written as the spec's start, and scale
// is proposed from it: |startᵢ| where that is nonzero, else 1.
func WriteStarter(w io.Writer, dir, ref string, start []float64) error {
	var probs Problems
	at := Pos{File: displayPath(dir), Line: 1, Col: 1}
	if !validReference(ref) {
		return Problems{{at, fmt.Sprintf("objective %q is not \"Func\" or \"Type.Method\"", ref)}}
	}
	if msg := packageDirProblem(dir); msg != "" {
		return Problems{{at, msg}}
	}
	lp := loadPackage(dir, &probs)
	if err := probs.Err(); err != nil {
		return err
	}
	if lp == nil {
		return Problems{{at, "no loadable Go package in " + displayPath(dir)}}
	}
	fn, recvType := lp.lookupFunc(ref, nil, at, "objective", &probs)
	if fn == nil {
		return probs.Err()
	}
	var shape Shape
	sig := fn.Type().(*types.Signature)
	if !lp.objectiveShape(sig, &shape) {
		return Problems{{lp.position(fn.Pos()), fmt.Sprintf("objective %s has signature %s; %s", ref, signatureText(sig), acceptedObjectives)}}
	}
	dim := shape.Dim
	if shape.Arg == ArgSlice {
		dim = 2
		if start != nil {
			dim = len(start)
		}
	}
	if start != nil {
		switch {
		case len(start) != dim:
			return Problems{{at, fmt.Sprintf("--start has %d values, objective %s has %d unknowns", len(start), ref, dim)}}
		case !finiteAll(start):
			return Problems{{at, "--start must be finite: a typical starting point"}}
		}
	}
	residual := shape.Residuals > 0 || shape.ResidualSlice
	if shape.ResidualSlice {
		shape.Residuals = 1 // a stand-in for the stack check; the spec must say
	}
	// The default direction, or the first that fits on the stack; for a
	// residual objective levenberg-marquardt, its default.
	var direction *rules.Entry
	first := rules.Direction.DefaultEntry()
	if residual {
		first = rules.LevenbergMarquardt
	}
	for d := first; d != nil; d = d.Fallback {
		if d.FallbackFrom > 0 && dim >= d.FallbackFrom {
			continue // a later direction is the better default at this size
		}
		var scratch Problems
		sized := shape
		sized.Dim = dim
		checkStackSize(&Minimizer{Direction: d, Derivative: rules.Derivative.DefaultEntry(), Rule: d.DefaultRule, Test: rules.GradientTest.DefaultEntry()},
			sized, &positions{keys: map[string]Pos{}, values: map[string]Pos{}}, &scratch)
		if len(scratch) == 0 {
			direction = d
			break
		}
	}
	if direction == nil {
		return Problems{{lp.position(fn.Pos()), fmt.Sprintf("objective %s has %d unknowns: no direction's state fits in the %d bytes Go keeps on the stack, so no minimizer could avoid allocating", ref, dim, maxStackVariable)}}
	}

	// An analytic gradient named after the objective, when one fits; a
	// combined objective brings its own.
	m := &Minimizer{Derivative: rules.Analytic}
	gradient := ""
	for _, suffix := range []string{"Grad", "Gradient"} {
		if shape.Combined || residual {
			break
		}
		m.Gradient = fn.Name() + suffix
		if recvType != nil {
			m.Gradient = recvType.Obj().Name() + "." + m.Gradient
		}
		var scratch Problems
		trial := shape
		trial.Dim = dim
		lp.resolveGradient(m, &trial, recvType, at, &scratch)
		if len(scratch) == 0 && trial.Gradient != "" {
			gradient = m.Gradient
			break
		}
	}
	// A residual objective's Jacobian named like it plus "Jacobian" or
	// "Jac", when one fits.
	jacobian := ""
	for _, suffix := range []string{"Jacobian", "Jac"} {
		if !residual || shape.ResidualSlice {
			break
		}
		m.Jacobian = fn.Name() + suffix
		if recvType != nil {
			m.Jacobian = recvType.Obj().Name() + "." + m.Jacobian
		}
		var scratch Problems
		trial := shape
		lp.resolveJacobian(m, &trial, recvType, at, &scratch)
		if len(scratch) == 0 && trial.Jacobian != "" {
			jacobian = m.Jacobian
			break
		}
	}
	// Without a gradient, the one thalweg can derive from the source, when
	// the objective keeps to what automatic differentiation takes; why not
	// otherwise, for the comment.
	automatic, whyNot := false, ""
	if gradient == "" && jacobian == "" && !shape.Combined && !shape.ResidualSlice {
		var scratch Problems
		trial := shape
		trial.Dim = dim
		if lp.differentiate(&Minimizer{Name: "Starter"}, &trial, fn, &scratch) != nil && len(scratch) == 0 {
			automatic = true
		} else if len(scratch) > 0 {
			msg := strings.TrimPrefix(scratch[0].Msg, "derivative = \"automatic\" cannot differentiate ")
			if i := strings.Index(msg, "; use derivative"); i > 0 {
				msg = msg[:i]
			}
			whyNot = fmt.Sprintf("%s:%d has %s", filepath.Base(scratch[0].Pos.File), scratch[0].Pos.Line, msg)
		}
	}
	instance := ""
	if recvType != nil {
		name := "New" + recvType.Obj().Name()
		m := &Minimizer{Instance: name}
		var scratch Problems
		trial := shape
		lp.resolveInstance(m, &trial, recvType, func(string) Pos { return at }, &positions{keys: map[string]Pos{}}, &scratch)
		if len(scratch) == 0 && trial.Instance.Name != "" {
			instance = name
		}
	}

	base := fn.Name()
	if recvType != nil {
		base = recvType.Obj().Name() + fn.Name()
	}
	name := "Minimize" + upperFirst(base)
	var b strings.Builder
	// kv writes "key = value" with its comment aligned; commented-out keys
	// start with "# ".
	kv := func(key, value, comment string) {
		entry := key + " = " + value
		fmt.Fprintf(&b, "%-30s # %s\n", entry, comment)
	}
	fmt.Fprintf(&b, "# Starter spec for %s, written by `thalweg init`: every key with its\n", ref)
	b.WriteString("# default and what it means (`thalweg rules` explains each choice).\n")
	b.WriteString("# Edit the lines marked REQUIRED (gen refuses them as written), then run\n# `thalweg gen` on this file.\n\n")
	b.WriteString("[[minimizer]]\n")
	kv("name", fmt.Sprintf("%q", name), "exported name of the generated minimizer")
	kv("objective", fmt.Sprintf("%q", ref), signatureText(sig))
	chosen := &Minimizer{Derivative: rules.Derivative.DefaultEntry(), Direction: direction, Rule: direction.DefaultRule, Test: rules.GradientTest.DefaultEntry()}
	if gradient != "" || jacobian != "" || shape.Combined {
		chosen.Derivative = rules.Analytic
	}
	if automatic {
		chosen.Derivative = rules.Automatic
	}
	ctx := resolveContext(chosen, shape.Elem, dim)
	choiceLine := func(c *rules.Choice, e *rules.Entry, note string) {
		comment := quoteJoin(c.Names(), " | ")
		if note != "" {
			comment += "; " + note
		}
		kv(c.Key, fmt.Sprintf("%q", e.Name), comment)
	}
	// params writes a table's parameters: active when a chosen entry reads
	// them, commented out with the entries that do otherwise.
	params := func(table string) {
		for _, p := range rules.Params() {
			if p.Table != table {
				continue
			}
			if ctx.Reads(p) {
				kv(p.Key, rules.FormatValue(p, ctx.Value(p)), p.Range()+": "+p.Doc)
				continue
			}
			kv("# "+p.Key, rules.FormatValue(p, ctx.DefaultValue(p)), readersOf(p)+" only, "+p.Range()+": "+p.Doc)
		}
	}
	switch {
	case shape.Combined:
		choiceLine(rules.Derivative, rules.Analytic, "the objective writes its gradient through g: no gradient key")
	case gradient != "":
		choiceLine(rules.Derivative, rules.Analytic, "")
		kv("gradient", fmt.Sprintf("%q", gradient), "found beside the objective; the generated test checks it")
	case jacobian != "":
		choiceLine(rules.Derivative, rules.Analytic, "")
		kv("jacobian", fmt.Sprintf("%q", jacobian), "found beside the objective; the generated test checks it entry by entry")
	case automatic && residual:
		choiceLine(rules.Derivative, chosen.Derivative, "thalweg derives the Jacobian from the residuals' source; \"analytic\" needs a jacobian key")
	case automatic:
		choiceLine(rules.Derivative, chosen.Derivative, "thalweg derives the gradient from the objective's source; \"analytic\" needs a gradient key")
	case residual:
		choiceLine(rules.Derivative, chosen.Derivative, `"analytic" needs a jacobian key`+automaticNote(whyNot))
	default:
		choiceLine(rules.Derivative, chosen.Derivative, `"analytic" needs a gradient key`+automaticNote(whyNot))
	}
	note := ""
	switch {
	case residual && direction == rules.LevenbergMarquardt:
		note = "a residual objective's default; gauss-newton, or any other, also works on ½‖r‖²"
	case residual:
		note = "levenberg-marquardt would not fit on the stack"
	case direction != rules.Direction.DefaultEntry():
		note = rules.Direction.Default + " would not fit on the stack"
	}
	choiceLine(rules.Direction, direction, note)
	params("")
	// Without --start, nan, which gen refuses: a start of zeros is often a
	// stationary point (a calibration's zero gain), which would converge at
	// once.
	list := func(vals []float64) string {
		if shape.Scalar() {
			return tomlNumber(vals[0])
		}
		items := make([]string, len(vals))
		for i, v := range vals {
			items[i] = tomlNumber(v)
		}
		return "[" + strings.Join(items, ", ") + "]"
	}
	ones := make([]float64, dim)
	for i := range ones {
		ones[i] = 1
	}
	if start == nil {
		nans := make([]float64, dim)
		for i := range nans {
			nans[i] = math.NaN()
		}
		kv("start", list(nans), "REQUIRED: replace nan with a typical starting point")
		if !residual {
			kv("# scale", list(ones), "typical magnitude of each unknown, when they differ by orders (init --start proposes |start|)")
		}
	} else if residual {
		kv("start", list(start), "a typical starting point, from init --start (no scale: the least-squares directions do not need one)")
	} else {
		kv("start", list(start), "a typical starting point, from init --start")
		scale, unit := make([]float64, dim), true
		for i, v := range start {
			scale[i] = 1
			if v != 0 {
				scale[i] = math.Abs(v)
			}
			unit = unit && scale[i] == 1
		}
		if unit {
			kv("# scale", list(ones), "typical magnitude of each unknown, when they differ by orders")
		} else {
			kv("scale", list(scale), "typical magnitude of each unknown, from |start| where nonzero; the minimizer works in x/scale")
		}
	}
	if shape.Arg == ArgSlice {
		kv("dim", fmt.Sprint(dim), "the objective takes a slice: the number of unknowns")
	}
	if shape.ResidualSlice {
		kv("residuals", "0", "REQUIRED: the number of residuals the objective writes")
	}
	switch {
	case instance != "":
		kv("instance", fmt.Sprintf("%q", instance), "the receiver the generated tests use")
	case recvType != nil && holdsData(recvType) != "":
		kv("instance", `""`, "REQUIRED: a package-level variable or func() giving a "+recvType.Obj().Name()+" with its data")
	case recvType != nil:
		kv("# instance", `""`, "package-level variable or func() giving the receiver (default: zero value)")
	}
	kv("# output", fmt.Sprintf("%q", snakeCase(name)+"_min.go"), "the default file name, beside the objective")
	b.WriteString("\n[minimizer.step]\n")
	choiceLine(rules.StepRule, chosen.Rule, "")
	params("step")
	b.WriteString("\n[minimizer.stop]\n")
	choiceLine(rules.GradientTest, chosen.Test, "")
	params("stop")
	b.WriteString("\n# [minimizer.expect]            # optional: the generated test asserts this minimizer\n")
	b.WriteString("# x = ...\n# tolerance = 1e-6\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// quoteJoin quotes each name and joins them with sep.
func quoteJoin(names []string, sep string) string {
	q := make([]string, len(names))
	for i, n := range names {
		q[i] = fmt.Sprintf("%q", n)
	}
	return strings.Join(q, sep)
}

// readersOf names the entries that read a parameter: `rule "wolfe" or
// "strong-wolfe"`.
func readersOf(p *rules.Param) string {
	for _, c := range rules.Choices() {
		var names []string
		for _, e := range c.Entries {
			if e.Reads(p) {
				names = append(names, e.Name)
			}
		}
		if len(names) > 0 {
			return c.Key + " " + quoteJoin(names, " or ")
		}
	}
	return "unused"
}

// StarterPath is the default file name of `thalweg init` for an objective.
func StarterPath(ref string) string {
	return filepath.Join(".", snakeCase(strings.ReplaceAll(ref, ".", ""))+".toml")
}

func finiteAll(vals []float64) bool {
	for _, v := range vals {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	return true
}

// automaticNote says why init does not propose derivative = "automatic".
func automaticNote(whyNot string) string {
	if whyNot == "" {
		return ""
	}
	return "; not \"automatic\": " + whyNot
}
