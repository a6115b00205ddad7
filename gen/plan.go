package gen

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"

	"github.com/thalweg-go/thalweg/rules"
)

// Plan is everything needed to write one minimizer: the validated spec
// entry, the objective's shape, the chosen kernels and the derived bounds.
type Plan struct {
	Spec     *Spec
	M        *Minimizer
	Shape    Shape
	SpecName string // the spec's path relative to the output's directory, slash-separated
	Output   string // path of the generated file
	TestFile string // path of the generated test file
	Prefix   string // lowerCamel name that prefixes every unexported identifier
	Cost     int    // objective calls per gradient
	Stop     StopLimits

	pkg *loadedPackage
}

// newPlan fills in what depends on the objective's shape.
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
	p.Cost = rules.Cost(m.Derivative, shape.Dim)
	p.Stop = m.Stop
	if !m.stopSet["gradient"] {
		p.Stop.Gradient = rules.StopDefault(rules.StopGradient, shape.Elem, m.Derivative)
	}
	if !m.stopSet["step"] {
		p.Stop.Step = rules.StopDefault(rules.StopStep, shape.Elem, m.Derivative)
	}
	return p
}

// WorstCase is the most objective calls one run can make: the evaluation
// cap, or the iteration bound when that is smaller.
func (p *Plan) WorstCase() (calls int, byIterations int) {
	perIteration := p.M.Trials + p.Cost // backtracking: trials, then one gradient
	switch p.M.Rule {
	case "fixed":
		perIteration = 1 + p.Cost
	case "wolfe", "strong-wolfe":
		perIteration = p.M.Trials * (1 + p.Cost) // a gradient at every trial at most
	}
	bound := float64(1+p.Cost) + float64(p.Stop.Iterations)*float64(perIteration)
	byIterations = math.MaxInt
	if bound < math.MaxInt32 {
		byIterations = int(bound)
	}
	return min(p.Stop.Evaluations, byIterations), byIterations
}

// kernelChoice maps the plan onto the templates' dispatchers and stand-ins.
func (p *Plan) kernelChoice() kernelChoice {
	direction, _ := rules.Lookup(rules.Directions(), p.M.Direction)
	rule, _ := rules.Lookup(rules.StepRules(), p.M.Rule)
	source, _ := rules.Lookup(rules.Derivatives(), p.M.Derivative)
	pick := map[string]string{
		"derivative":     source.Kernel,
		"direction":      direction.Kernel,
		"lineSearch":     rule.Kernel,
		"curvatureMet":   "weakCurvature",
		"backtrackTrial": "shrunkTrial",
		"acceptable":     "armijoDecrease",
	}
	if p.M.Rule == "decrease" || p.M.Rule == "armijo" {
		// The backtracking rules share backtrackSearch and differ in its
		// acceptance test, which is what their table entries name.
		pick["lineSearch"], pick["acceptable"] = "backtrackSearch", rule.Kernel
	}
	if p.M.Rule == "strong-wolfe" {
		pick["curvatureMet"] = "strongCurvature"
	}
	if p.M.Interpolate {
		pick["backtrackTrial"] = "interpolatedTrial"
	}
	provided := map[string]string{
		"status": p.M.Name + "Status",
		"limits": p.M.Name + "Limits",
	}
	for _, s := range statuses {
		provided[s.template] = p.M.Name + s.suffix
	}
	for _, t := range tunables {
		provided[t.template] = p.Prefix + upperFirst(t.template)
	}
	return kernelChoice{shape: p.Shape, pick: pick, provided: provided, prefix: p.Prefix}
}

// formatFloat renders v as a Go float literal that reads back exactly.
func formatFloat(v float64) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	for _, c := range s {
		if c == '.' || c == 'e' || c == 'n' || c == 'I' {
			return s
		}
	}
	return s + ".0"
}

func (p *Plan) describe() string {
	return fmt.Sprintf("%s (%s)", p.M.Name, p.Spec.Path)
}
