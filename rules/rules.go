// Package rules is thalweg's single registry: every spec parameter, every
// choice (derivative source, direction, step rule) with its entries, every
// constant the kernels read and every status a minimizer can end with is
// declared here once, with its key, default, valid range, doc, the
// template alternatives it picks and what it costs. Validation, planning,
// the generated doc comments, `thalweg rules`, `thalweg init`, `thalweg
// tune` and the end-to-end tests loop over these tables; the kernels
// themselves live in the templates package.
//
// Adding a step rule, a direction or a derivative source takes its entry
// here (in step.go, direction.go or derivative.go) and its kernel in
// templates, with a case in the template dispatcher it plugs into. Adding a
// parameter takes its Param here and the constant it sets in
// templates/params.go.
package rules

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
)

// Kind is what a parameter's value is.
type Kind int

const (
	Real   Kind = iota // any number in the range
	Whole              // a whole number (a float with an integral value is accepted)
	Switch             // true or false, held as 1 or 0
)

// Picks maps a template dispatcher to the alternative it becomes, e.g.
// "lineSearch" → "wolfeSearch".
type Picks map[string]string

// Param is one numeric or true/false spec key.
type Param struct {
	Table string // "" for the [[minimizer]] table itself, else "step" or "stop"
	Key   string // key within the table, e.g. "shrink"
	Const string // the templates constant (params.go) gen emits from it; "" for none
	Limit string // the field of the generated limits type it is the default of; "" for none
	// LimitDoc comments that field.
	LimitDoc string
	Label    string // how the entry point's doc comment names the value, e.g. "c1"
	Kind     Kind
	// Default is the value when the spec leaves the key out, unless an
	// entry chosen in the spec sets its own (Entry.Defaults) or DefaultFor
	// derives it.
	Default    float64
	DefaultFor func(c *Context) float64
	// Low and High bound the valid range; LowOpen and HighOpen exclude
	// the ends. A value must also be finite.
	Low, High         float64
	LowOpen, HighOpen bool
	// Exceeds names a parameter this one must be larger than, when both
	// are read (c2 > c1).
	Exceeds *Param
	Doc     string // one line: what it controls and where the default comes from
	// On and Off are the template alternatives a switch picks.
	On, Off Picks
	// ShownAs renders the value in the entry point's doc comment; nil
	// for "Label value".
	ShownAs func(v float64) string
}

// Path is the key as written under [[minimizer]], e.g. "step.shrink".
func (p *Param) Path() string {
	if p.Table == "" {
		return p.Key
	}
	return p.Table + "." + p.Key
}

// Range renders the valid range, e.g. "(0, 1)" or "[1, ∞)", or
// "true|false" for a switch.
func (p *Param) Range() string {
	if p.Kind == Switch {
		return "true|false"
	}
	lo, hi := "[", "]"
	if p.LowOpen {
		lo = "("
	}
	if p.HighOpen || math.IsInf(p.High, 1) {
		hi = ")"
	}
	high := "∞"
	if !math.IsInf(p.High, 1) {
		high = fmt.Sprint(p.High)
	}
	return fmt.Sprintf("%s%v, %s%s", lo, p.Low, high, hi)
}

// Contains reports whether v is a valid value.
func (p *Param) Contains(v float64) bool {
	if p.Kind == Switch {
		return v == 0 || v == 1
	}
	if math.IsNaN(v) || math.IsInf(v, 0) || (p.Kind == Whole && v != math.Trunc(v)) {
		return false
	}
	if v < p.Low || (p.LowOpen && v == p.Low) {
		return false
	}
	return v < p.High || (!p.HighOpen && v == p.High)
}

// Show renders a value for the entry point's doc comment.
func (p *Param) Show(v float64) string {
	if p.ShownAs != nil {
		return p.ShownAs(v)
	}
	return p.Label + " " + FormatValue(p, v)
}

// FormatValue renders v as the spec would write it: true/false for a
// switch, a whole number, or a float that reads back exactly.
func FormatValue(p *Param, v float64) string {
	switch p.Kind {
	case Switch:
		return fmt.Sprint(v != 0)
	case Whole:
		return fmt.Sprint(int64(v))
	}
	return FormatFloat(v)
}

// FormatFloat renders v as a Go or TOML float literal that reads back
// exactly.
func FormatFloat(v float64) string {
	s := strconv.FormatFloat(v, 'g', -1, 64)
	if math.IsInf(v, 0) || math.IsNaN(v) || strings.ContainsAny(s, ".e") {
		return s
	}
	return s + ".0"
}

// Entry is one value of a Choice: a derivative source, a direction or a
// step rule.
type Entry struct {
	Name       string   // spec value, e.g. "armijo"
	Summary    string   // one line
	Math       string   // the formula, in plain text
	References []string // sources, in citation form
	Params     []*Param // parameters it reads, beyond the stop limits every minimizer reads
	Picks      Picks    // the template alternatives it selects
	// Defaults are its own defaults for parameters it or another chosen
	// entry reads (cg's curvature constant).
	Defaults map[*Param]float64

	// GradientCalls is a derivative source's objective calls per
	// gradient for dim unknowns, and CalibrationCalls the calls of
	// choosing its intervals (once at the start, and again, with two
	// gradients, to confirm each convergence).
	GradientCalls    func(dim int) int
	CalibrationCalls func(dim int) int
	// Exact says a derivative source's gradient has no truncation error
	// (the user's own, or thalweg's automatic one), and Derived that
	// thalweg writes it from the objective's source.
	Exact, Derived bool

	// IterationCalls is a step rule's most objective calls in one
	// iteration: its line search and the gradient at the accepted point.
	IterationCalls func(trials, gradientCalls int) int
	// Curvature says a step rule enforces a curvature condition.
	Curvature bool
	// Tune says `thalweg tune` tries the rule with every direction it
	// suits.
	Tune bool

	// State is a direction's (or differences') state in bytes for dim unknowns of
	// elemBytes each, and a phrase saying what it holds, which reads
	// before the float type's name ("a 3×3 matrix of", "2 vectors of
	// 3"); nil for none.
	State func(dim, elemBytes int, value func(*Param) float64) (int, string)
	// SmallerState says what to do when the state does not fit on the
	// stack, and Fallback is the direction `thalweg init` proposes then.
	SmallerState string
	Fallback     *Entry
	// FallbackFrom is the number of unknowns from which `thalweg init`
	// proposes Fallback even where the entry fits: the size at which the
	// fallback solves faster (0 for never).
	FallbackFrom int
	// NeedsCurvature says a direction needs a step rule that enforces a
	// curvature condition to produce descent directions, and DefaultRule
	// is the step rule it gets when the spec names none.
	NeedsCurvature bool
	DefaultRule    *Entry

	// BoundedPicks override the entry's Picks and Bounds.On when the spec
	// has bounds (Armijo's test along the projection arc), and NoBounds
	// says why the entry cannot take bounds; "" when it can.
	BoundedPicks Picks
	NoBounds     string

	// Residual says a direction needs a residual objective (f = ½‖r‖²).
	// Pairs are the only step rules a direction goes with (nil for
	// any), and Exclusive says a step rule goes only with the
	// directions that list it there. PairsWhy says why.
	Residual  bool
	Pairs     []*Entry
	Exclusive bool
	PairsWhy  string
	// ResidualPicks override a derivative source's Picks for a residual
	// objective: its Jacobian instead of the gradient of f;
	// ResidualSummary says what it does there.
	ResidualPicks   Picks
	ResidualSummary string
}

// Suits reports whether the direction d goes with the step rule r.
func Suits(d, r *Entry) bool {
	if d.Pairs == nil {
		return !r.Exclusive
	}
	for _, p := range d.Pairs {
		if p == r {
			return true
		}
	}
	return false
}

// Reads reports whether the entry reads the parameter.
func (e *Entry) Reads(p *Param) bool {
	for _, q := range e.Params {
		if q == p {
			return true
		}
	}
	return false
}

// Choice is an enumerated spec key whose values are entries.
type Choice struct {
	Table   string // as Param.Table
	Key     string
	Default string // the entry used when the spec leaves the key out
	Doc     string
	Entries []*Entry // sorted by name
}

// Path is the key as written under [[minimizer]], e.g. "step.rule".
func (c *Choice) Path() string {
	if c.Table == "" {
		return c.Key
	}
	return c.Table + "." + c.Key
}

// Lookup finds an entry by name.
func (c *Choice) Lookup(name string) (*Entry, bool) {
	for _, e := range c.Entries {
		if e.Name == name {
			return e, true
		}
	}
	return nil, false
}

// Names lists the entries' names, sorted.
func (c *Choice) Names() []string {
	names := make([]string, len(c.Entries))
	for i, e := range c.Entries {
		names[i] = e.Name
	}
	return names
}

// DefaultEntry is the entry used when the spec leaves the key out.
func (c *Choice) DefaultEntry() *Entry {
	e, _ := c.Lookup(c.Default)
	return e
}

func (c *Choice) register(e *Entry) *Entry {
	c.Entries = append(c.Entries, e)
	sort.Slice(c.Entries, func(i, j int) bool { return c.Entries[i].Name < c.Entries[j].Name })
	return e
}

// Choices lists every choice, in spec order.
func Choices() []*Choice { return []*Choice{Derivative, Direction, StepRule, GradientTest} }

// Context is what a derived default or constant may depend on: the float
// type, the dimension, the chosen entries and the other parameters'
// values.
type Context struct {
	Elem                              string // "float32" or "float64"
	Dim                               int
	Derivative, Direction, Rule, Test *Entry
	Value                             func(*Param) float64
	Bounded                           bool // whether the spec has [minimizer.bounds]
	Combined                          bool // whether the objective gives its gradient with its value
	Residuals                         int  // M for a residual objective (f = ½‖r‖²), else 0
}

// Entries lists the chosen entries, in the order of Choices.
func (c *Context) Entries() []*Entry { return []*Entry{c.Derivative, c.Direction, c.Rule, c.Test} }

// Reads reports whether a chosen entry reads the parameter, or every
// minimizer does.
func (c *Context) Reads(p *Param) bool {
	if p.Table == "stop" {
		return true
	}
	for _, e := range c.Entries() {
		if e != nil && e.Reads(p) {
			return true
		}
	}
	return false
}

// DefaultValue is a parameter's value when the spec leaves it out: a
// chosen entry's own default, else the derived or plain default.
func (c *Context) DefaultValue(p *Param) float64 {
	for _, e := range c.Entries() {
		if e == nil {
			continue
		}
		if v, ok := e.Defaults[p]; ok {
			return v
		}
	}
	if p.DefaultFor != nil {
		return p.DefaultFor(c)
	}
	return p.Default
}

// ElemBytes is the size of the float type.
func (c *Context) ElemBytes() int {
	if c.Elem == "float32" {
		return 4
	}
	return 8
}

var params []*Param

// param registers a parameter.
func param(p *Param) *Param {
	params = append(params, p)
	return p
}

// Params lists every parameter, in declaration order.
func Params() []*Param { return params }

// Citations used by several entries.
const (
	NocedalWright            = "J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed., Springer, 2006"
	Armijo1966               = "L. Armijo, Minimization of functions having Lipschitz continuous first partial derivatives, Pacific J. Math. 16(1):1–3, 1966"
	MoreThuente              = "J. J. Moré and D. J. Thuente, Line search algorithms with guaranteed sufficient decrease, ACM TOMS 20(3):286–307, 1994"
	Wolfe1969                = "P. Wolfe, Convergence conditions for ascent methods, SIAM Review 11(2):226–235, 1969"
	DennisSchnabel           = "J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear Equations, Prentice-Hall, 1983"
	LiuNocedal               = "D. C. Liu and J. Nocedal, On the limited memory BFGS method for large scale optimization, Math. Programming 45:503–528, 1989"
	GillMurraySaundersWright = "P. E. Gill, W. Murray, M. A. Saunders and M. H. Wright, Computing forward-difference intervals for numerical optimization, SIAM J. Sci. Stat. Comput. 4(2):310–321, 1983"
	GriewankWalther          = "A. Griewank and A. Walther, Evaluating Derivatives: Principles and Techniques of Algorithmic Differentiation, 2nd ed., SIAM, 2008"
	BischofADIFOR            = "C. Bischof, A. Carle, G. Corliss, A. Griewank and P. Hovland, ADIFOR: generating derivative codes from Fortran programs, Scientific Programming 1(1):11–29, 1992"
	MoreLM                   = "J. J. Moré, The Levenberg–Marquardt algorithm: implementation and theory, in Numerical Analysis, Lecture Notes in Mathematics 630, Springer, 1978, 105–116"
	GilbertLemarechal        = "J. C. Gilbert and C. Lemaréchal, Some numerical experiments with variable-storage quasi-Newton algorithms, Math. Programming 45:407–435, 1989"
	PolakRibiere             = "E. Polak and G. Ribière, Note sur la convergence de méthodes de directions conjuguées, Rev. Française Informat. Recherche Opérationnelle 3(16):35–43, 1969"
)
