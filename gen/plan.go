package gen

import (
	"fmt"
	"math"
	"path/filepath"

	"github.com/thalweg-go/thalweg/rules"
)

// Plan is everything needed to write one minimizer, resolved once: the
// validated spec entry, the objective's shape, the chosen entries and the
// final value of every parameter. Emitters read the plan; they never look
// a name up in the registry again.
type Plan struct {
	Spec     *Spec
	M        *Minimizer
	Shape    Shape
	SpecName string // the spec's path relative to the output's directory, slash-separated
	Output   string // path of the generated file
	TestFile string // path of the generated test file
	Prefix   string // lowerCamel name that prefixes every unexported identifier

	// Context holds the float type, the dimension, the chosen entries and
	// the parameters' values (given, or their defaults for this plan).
	*rules.Context

	pkg *loadedPackage
}

// newPlan resolves a valid entry against its objective's shape.
func newPlan(spec *Spec, m *Minimizer, shape Shape) *Plan {
	p := &Plan{Spec: spec, M: m, Shape: shape, Prefix: lowerFirst(m.Name)}
	p.Output = filepath.Join(spec.PackageDir, m.Output)
	p.TestFile = filepath.Join(spec.PackageDir, m.Output[:len(m.Output)-len(".go")]+"_test.go")
	specAbs, _ := filepath.Abs(spec.Path)
	dirAbs, _ := filepath.Abs(spec.PackageDir)
	rel, err := filepath.Rel(dirAbs, specAbs)
	if err != nil {
		rel = filepath.Base(spec.Path)
	}
	p.SpecName = filepath.ToSlash(rel)
	p.Context = resolveContext(m, shape.Elem, shape.Dim)
	p.Context.Combined = shape.Combined
	p.Context.Residuals = shape.Residuals
	// Fix every value now: a plan is read from several goroutines (tune,
	// concurrent generation), and a first read would write the memo.
	for _, q := range rules.Params() {
		p.Value(q)
	}
	return p
}

// resolveContext fixes every parameter's value: the spec's, else the
// default for the chosen entries, float type and dimension.
func resolveContext(m *Minimizer, elem string, dim int) *rules.Context {
	c := &rules.Context{Elem: elem, Dim: dim, Derivative: m.Derivative, Direction: m.Direction, Rule: m.Rule, Test: m.Test, Bounded: m.Lower != nil}
	values := map[*rules.Param]float64{}
	c.Value = func(p *rules.Param) float64 {
		if v, ok := m.Given[p]; ok {
			return v
		}
		if v, ok := values[p]; ok {
			return v
		}
		v := c.DefaultValue(p)
		values[p] = v
		return v
	}
	return c
}

// GradientCalls is the objective calls one gradient costs.
func (p *Plan) GradientCalls() int { return p.Derivative.GradientCalls(p.Dim) }

// Switch reads a true/false parameter.
func (p *Plan) Switch(q *rules.Param) bool { return p.Value(q) != 0 }

// WorstCase is the most objective calls one run can make: the evaluation
// cap, or the iteration bound when that is smaller.
// With differences, the start adds a calibration and every iteration may
// add one confirmation of the gradient test (a calibration and two
// gradients; for a residual objective a Jacobian with twice the
// intervals). A combined objective's gradient costs nothing beyond the
// call that gives its value, but its run may settle once at a stall, with
// one call per unknown for the curvature probes (settleCombined).
func (p *Plan) WorstCase() (calls int, byIterations int) {
	perIteration := p.Rule.IterationCalls(int(p.Value(rules.Trials)), p.GradientCalls())
	calibration := p.CalibrationCalls()
	if !p.Shape.Combined {
		perIteration += p.SettleCalls() // a confirmation of differences at every iteration at most
	}
	bound := float64(1+calibration+p.GradientCalls()) + (p.Value(rules.StopIterations)+1)*float64(perIteration)
	if p.Shape.Combined {
		bound += float64(p.Dim)
	}
	byIterations = math.MaxInt
	if bound < math.MaxInt32 {
		byIterations = int(bound)
	}
	return min(int(p.Value(rules.StopEvaluations)), byIterations), byIterations
}

// kernelChoice maps the plan onto the templates' dispatchers and stand-ins:
// the alternatives the chosen entries and switches pick, and the names the
// glue emits for the stand-ins it provides.
func (p *Plan) kernelChoice() kernelChoice {
	pick := map[string]string{}
	feature := rules.Bounds.Off
	if p.Bounded {
		feature = rules.Bounds.On
	}
	for dispatcher, alternative := range feature {
		pick[dispatcher] = alternative
	}
	for _, e := range p.Entries() {
		for dispatcher, alternative := range e.Picks {
			pick[dispatcher] = alternative
		}
		if p.Bounded {
			for dispatcher, alternative := range e.BoundedPicks {
				pick[dispatcher] = alternative
			}
		}
	}
	for _, q := range rules.Params() {
		picks := q.Off
		if p.Value(q) != 0 {
			picks = q.On
		}
		if p.Reads(q) {
			for dispatcher, alternative := range picks {
				pick[dispatcher] = alternative
			}
		}
	}
	// A combined objective's gradient comes with its value: its picks
	// override the analytic entry's.
	combined := rules.Combined.Off
	if p.Shape.Combined {
		combined = rules.Combined.On
	}
	for dispatcher, alternative := range combined {
		pick[dispatcher] = alternative
	}
	// A residual objective's gradient is Jᵀr: its picks override the
	// derivative entry's, and the entry's residual picks choose J.
	residual := rules.Residuals.Off
	if p.Shape.Residuals > 0 {
		residual = rules.Residuals.On
		for dispatcher, alternative := range p.Derivative.ResidualPicks {
			pick[dispatcher] = alternative
		}
		if p.Shape.JacobianColumns && p.Derivative == rules.Analytic {
			for dispatcher, alternative := range rules.JacobianColumns {
				pick[dispatcher] = alternative
			}
		}
	}
	for dispatcher, alternative := range residual {
		pick[dispatcher] = alternative
	}
	provided := map[string]string{
		"status": p.M.Name + "Status",
		"limits": p.M.Name + "Limits",
		"box":    p.Prefix + "Box",
	}
	for _, s := range rules.Statuses {
		provided[s.StandIn] = p.M.Name + s.Suffix
	}
	for _, q := range rules.Params() {
		if q.Const != "" {
			provided[q.Const] = p.Prefix + upperFirst(q.Const)
		}
	}
	for _, c := range rules.Constants {
		provided[c.Name] = p.Prefix + upperFirst(c.Name)
	}
	choice := kernelChoice{shape: p.Shape, pick: pick, provided: provided, prefix: p.Prefix}
	if p.Scaled() {
		choice.valueAt, choice.gradientAt = p.Prefix+"ValueAt", p.Prefix+"GradientAt"
	}
	return choice
}

// Scaled reports whether the spec sets scale: the kernels then work in
// zᵢ = xᵢ/sᵢ and reach the user's functions through the glue's adapters.
func (p *Plan) Scaled() bool { return p.M.Scale != nil }

// formatFloat renders v as a Go float literal that reads back exactly.
func formatFloat(v float64) string { return rules.FormatFloat(v) }

func (p *Plan) describe() string {
	return fmt.Sprintf("%s (%s)", p.M.Name, p.Spec.Path)
}
