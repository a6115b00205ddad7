package linesearch

import (
	"math"
	"strings"
)

// Function is one of MT's test functions: its name in this package (the
// derivative is Name+"Deriv") and the table of MT §5 that uses it.
type Function struct {
	Name  string
	Table int
	Phi   func(float64) float64
	Deriv func(float64) float64
	// Paper's constants for that table: sufficient decrease μ and
	// curvature η (MT §5; the per-table values as used by jlmelville/mize
	// tests/testthat/test_minfunc_wolfe.R, which reproduces Tables 1–6).
	Mu, Eta float64
}

// Functions lists MT's six test instances, in the paper's table order.
var Functions = []Function{
	{"ConcaveRight", 1, ConcaveRight, ConcaveRightDeriv, 0.001, 0.1},
	{"ConcaveLeft", 2, ConcaveLeft, ConcaveLeftDeriv, 0.1, 0.1},
	{"Plassmann", 3, Plassmann, PlassmannDeriv, 0.1, 0.1},
	{"YOK1", 4, YOK1, YOK1Deriv, 0.001, 0.001},
	{"YOK2", 5, YOK2, YOK2Deriv, 0.001, 0.001},
	{"YOK3", 6, YOK3, YOK3Deriv, 0.001, 0.001},
}

// InitialSteps are MT's first trials α₀ (MT §5, every table).
var InitialSteps = []float64{1e-3, 1e-1, 1e1, 1e3}

// Rules are the two step rules checked.
var Rules = []string{"wolfe", "strong-wolfe"}

// Constants is a named pair (c1, c2) of line-search constants.
type Constants struct {
	Label  string
	C1, C2 float64
}

// ConstantSets gives, for a function, the two sets of constants checked:
//
//   - "nw": c1 = 1e-4, c2 = 0.9, thalweg's defaults for a non-CG direction
//     (Nocedal & Wright 2006, §3.1);
//   - "mt": the paper's table constants where thalweg accepts them. thalweg
//     requires c1 < c2 (N&W's 0 < c1 < c2 < 1), while MT Tables 2–6 use
//     μ = η; there the paper's curvature constant η is kept (it is what
//     makes those tables hard) and c1 = η/10 is taken, a weaker sufficient
//     decrease than the paper's. Table 1's (0.001, 0.1) is used as is.
func ConstantSets(f Function) []Constants {
	mt := Constants{"mt", f.Mu, f.Eta}
	if !(mt.C1 < mt.C2) {
		mt.C1 = f.Eta / 10
	}
	return []Constants{{"nw", 1e-4, 0.9}, mt}
}

// Case is one generated minimizer: a function, a first trial α₀, a rule and
// a set of constants.
type Case struct {
	Function
	Alpha0 float64
	Rule   string
	Constants
}

// Cases crosses Functions, InitialSteps, Rules and ConstantSets.
func Cases() []Case {
	var cs []Case
	for _, f := range Functions {
		for _, k := range ConstantSets(f) {
			for _, rule := range Rules {
				for _, a := range InitialSteps {
					cs = append(cs, Case{f, a, rule, k})
				}
			}
		}
	}
	return cs
}

// Initial is the spec's step.initial: the first trial along d = −φ'(0) is
// initial·|φ'(0)| = α₀.
func (c Case) Initial() float64 {
	return c.Alpha0 / math.Abs(c.Deriv(0))
}

// Name is the generated minimizer's name, e.g. ConcaveRightStrongWolfeMTAlphaEm3.
func (c Case) Name() string {
	rule := map[string]string{"wolfe": "Wolfe", "strong-wolfe": "StrongWolfe"}[c.Rule]
	alpha := map[float64]string{1e-3: "Em3", 1e-1: "Em1", 1e1: "E1", 1e3: "E3"}[c.Alpha0]
	return c.Function.Name + rule + strings.ToUpper(c.Label) + "Alpha" + alpha
}
