// Package rules describes every search direction, step rule and derivative
// source thalweg offers: its spec name, the math it implements, the
// parameters it reads with their defaults and valid ranges, and its
// references. The gen package plans from these tables and `thalweg rules`
// prints them; the kernels themselves live in the templates package.
package rules

import (
	"fmt"
	"math"
	"sort"
)

// Param is one tunable spec key.
type Param struct {
	Key     string  // key under [minimizer.step] or [minimizer], e.g. "shrink"
	Default float64 // value when the spec leaves the key out
	Low     float64 // lower end of the valid range
	High    float64 // upper end of the valid range (+Inf for none)
	// LowOpen and HighOpen exclude the ends.
	LowOpen, HighOpen bool
	Integer           bool   // whether the value must be a whole number
	Doc               string // one line: what it controls and where the default comes from
}

// Range renders the valid range, e.g. "(0, 1)" or "[1, ∞)".
func (p Param) Range() string {
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

// Contains reports whether v lies in the valid range.
func (p Param) Contains(v float64) bool {
	if math.IsNaN(v) || math.IsInf(v, 0) || (p.Integer && v != math.Trunc(v)) {
		return false
	}
	if v < p.Low || (p.LowOpen && v == p.Low) {
		return false
	}
	return v < p.High || (!p.HighOpen && v == p.High)
}

// Entry is one direction, step rule or derivative source.
type Entry struct {
	Name       string   // spec value, e.g. "armijo"
	Summary    string   // one line
	Math       string   // the formula, in plain text
	Params     []Param  // parameters it reads, beyond those every entry of its kind reads
	References []string // sources, in citation form
	Kernel     string   // the templates declaration that implements it
}

// Param returns the parameter with the given key.
func (e Entry) Param(key string) (Param, bool) {
	for _, p := range e.Params {
		if p.Key == key {
			return p, true
		}
	}
	return Param{}, false
}

var (
	directions  []Entry
	stepRules   []Entry
	derivatives []Entry
)

func register(list *[]Entry, e Entry) Entry {
	*list = append(*list, e)
	sort.Slice(*list, func(i, j int) bool { return (*list)[i].Name < (*list)[j].Name })
	return e
}

// Directions lists the search directions, sorted by name.
func Directions() []Entry { return directions }

// StepRules lists the step rules, sorted by name.
func StepRules() []Entry { return stepRules }

// Derivatives lists the derivative sources, sorted by name.
func Derivatives() []Entry { return derivatives }

// Lookup finds an entry by name in a list.
func Lookup(list []Entry, name string) (Entry, bool) {
	for _, e := range list {
		if e.Name == name {
			return e, true
		}
	}
	return Entry{}, false
}

// Names lists the entries' names, for messages.
func Names(list []Entry) []string {
	names := make([]string, len(list))
	for i, e := range list {
		names[i] = e.Name
	}
	return names
}

// Defaults for the spec keys every minimizer has.
const (
	DefaultDerivative = "central"
	DefaultDirection  = "bfgs"
	DefaultStepRule   = "armijo"
)

// Citations used by several entries.
const (
	NocedalWright  = "J. Nocedal and S. J. Wright, Numerical Optimization, 2nd ed., Springer, 2006"
	Armijo1966     = "L. Armijo, Minimization of functions having Lipschitz continuous first partial derivatives, Pacific J. Math. 16(1):1–3, 1966"
	MoreThuente    = "J. J. Moré and D. J. Thuente, Line search algorithms with guaranteed sufficient decrease, ACM TOMS 20(3):286–307, 1994"
	Wolfe1969      = "P. Wolfe, Convergence conditions for ascent methods, SIAM Review 11(2):226–235, 1969"
	DennisSchnabel = "J. E. Dennis and R. B. Schnabel, Numerical Methods for Unconstrained Optimization and Nonlinear Equations, Prentice-Hall, 1983"
	LiuNocedal     = "D. C. Liu and J. Nocedal, On the limited memory BFGS method for large scale optimization, Math. Programming 45:503–528, 1989"
	PolakRibiere   = "E. Polak and G. Ribière, Note sur la convergence de méthodes de directions conjuguées, Rev. Française Informat. Recherche Opérationnelle 3(16):35–43, 1969"
)
