package gen

import (
	"go/ast"
	"go/types"
	"path/filepath"
	"sort"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/rules"
)

// TestRegistryMatchesTemplates holds the registry in rules and the kernels
// in templates to each other, both ways, so that nothing added to one can
// be forgotten in the other without a failure:
//
//   - every dispatcher's alternatives are exactly the alternatives some
//     entry or switch picks for it, and every pick names a dispatcher and
//     one of its alternatives;
//   - every templates constant or variable a kernel reads (outside the
//     dispatchers) is a parameter's constant, a derived constant, a status
//     stand-in or a shape stand-in, and each of those the registry names
//     exists in the templates;
//   - every function alternative has its dispatcher's signature;
//   - the fields of the limits stand-in are the parameters' limit fields.
func TestRegistryMatchesTemplates(t *testing.T) {
	ks, err := loadKernels()
	if err != nil {
		t.Fatal(err)
	}
	scope := ks.pkg.Scope()
	provided := map[string]string{}
	for _, q := range rules.Params() {
		if q.Const != "" {
			provided[q.Const] = "parameter " + q.Path()
		}
	}
	for _, c := range rules.Constants {
		provided[c.Name] = "derived constant"
	}
	for _, s := range rules.Statuses {
		provided[s.StandIn] = "status " + s.Text
	}
	for name, what := range provided {
		if scope.Lookup(name) == nil {
			t.Errorf("the registry's %s names %s, which templates does not declare", what, name)
		}
	}

	// Dispatchers and picks.
	dispatchers := ks.dispatchers(provided)
	picked := map[string]map[string]bool{}
	addPicks := func(owner string, picks rules.Picks) {
		for d, alt := range picks {
			alts, ok := dispatchers[d]
			if !ok && emptiedType(scope, d, alt) {
				continue // a type whose state the spec does without (residualModel)
			}
			if !ok {
				t.Errorf("%s picks %s for %s, which is no dispatcher of the templates", owner, alt, d)
				continue
			}
			if !contains(alts, alt) {
				t.Errorf("%s picks %s for %s, which is not one of its alternatives %v", owner, alt, d, alts)
			}
			if picked[d] == nil {
				picked[d] = map[string]bool{}
			}
			picked[d][alt] = true
		}
	}
	for _, c := range rules.Choices() {
		for _, e := range c.Entries {
			addPicks(c.Key+" "+e.Name, e.Picks)
		}
	}
	for _, c := range rules.Choices() {
		for _, e := range c.Entries {
			addPicks(c.Key+" "+e.Name+" with bounds", e.BoundedPicks)
		}
	}
	addPicks("bounds off", rules.Bounds.Off)
	addPicks("bounds on", rules.Bounds.On)
	addPicks("combined objective off", rules.Combined.Off)
	addPicks("combined objective on", rules.Combined.On)
	addPicks("residual objective off", rules.Residuals.Off)
	addPicks("residual objective on", rules.Residuals.On)
	addPicks("residual objective, Jacobian by columns", rules.JacobianColumns)
	for _, e := range rules.Derivative.Entries {
		addPicks("derivative "+e.Name+" of residuals", e.ResidualPicks)
	}
	for _, q := range rules.Params() {
		addPicks("switch "+q.Path()+" on", q.On)
		addPicks("switch "+q.Path()+" off", q.Off)
	}
	if len(dispatchers) == 0 {
		t.Fatal("found no dispatcher in the templates; the check would be vacuous")
	}
	for d, alts := range dispatchers {
		for _, alt := range alts {
			if !picked[d][alt] {
				t.Errorf("no registry entry picks %s for the dispatcher %s", alt, d)
			}
		}
	}
	// gen puts the picked function in the dispatcher's place, under its
	// name, so every call of the dispatcher must fit every alternative.
	for d, alts := range dispatchers {
		fn, ok := scope.Lookup(d).(*types.Func)
		if !ok {
			continue
		}
		for _, alt := range alts {
			if other, ok := scope.Lookup(alt).(*types.Func); ok && !types.Identical(fn.Type(), other.Type()) {
				t.Errorf("the dispatcher %s is %s but its alternative %s is %s", d, fn.Type(), alt, other.Type())
			}
		}
	}

	// The constants, variables and statuses of params.go and shape.go
	// that kernels reachable from minimize read, with every dispatcher
	// standing for all of its alternatives.
	used := map[string]bool{}
	var standInsRead []string
	seen := map[*unit]bool{}
	var visit func(u *unit)
	visit = func(u *unit) {
		if u == nil || seen[u] {
			return
		}
		seen[u] = true
		if alts, ok := dispatchers[u.name]; ok {
			for _, alt := range alts {
				visit(ks.units[alt])
			}
			return
		}
		for _, d := range u.decls {
			for _, id := range identsIn(d) {
				obj := ks.info.Uses[id]
				if obj == nil || obj.Parent() != scope {
					continue
				}
				name := obj.Name()
				file := filepath.Base(ks.fset.Position(obj.Pos()).Filename)
				switch {
				case provided[name] != "":
					used[name] = true
				case standIns[name] || standIns[ks.units[name].name]:
				case file == "params.go" || file == "shape.go":
					if !contains(standInsRead, name) {
						standInsRead = append(standInsRead, name)
					}
				default:
					visit(ks.units[name])
				}
			}
		}
	}
	visit(ks.units["minimize"])
	sort.Strings(standInsRead)
	if len(standInsRead) > 0 {
		t.Errorf("kernels read %s of params.go or shape.go, which no registry parameter, constant or status provides", strings.Join(standInsRead, ", "))
	}
	for name, what := range provided {
		if !used[name] {
			t.Errorf("the registry's %s names %s, which no kernel reads", what, name)
		}
	}

	// Limits.
	var fields, limits []string
	st := scope.Lookup("limits").Type().Underlying().(*types.Struct)
	for i := 0; i < st.NumFields(); i++ {
		fields = append(fields, st.Field(i).Name())
	}
	for _, q := range rules.Params() {
		if q.Limit != "" {
			limits = append(limits, q.Limit)
		}
	}
	sort.Strings(fields)
	sort.Strings(limits)
	if strings.Join(fields, ",") != strings.Join(limits, ",") {
		t.Errorf("the templates' limits have fields %v, the registry's stop limits %v", fields, limits)
	}
}

// identsIn lists the identifiers in a declaration.
func identsIn(n ast.Node) []*ast.Ident {
	var ids []*ast.Ident
	ast.Inspect(n, func(n ast.Node) bool {
		if id, ok := n.(*ast.Ident); ok {
			ids = append(ids, id)
		}
		return true
	})
	return ids
}

// With bounds, tune tries only directions that take them, and still every
// rule it tries without bounds.
func TestTunePoliciesWithBounds(t *testing.T) {
	open, bounded := TunePolicies(false, false), TunePolicies(true, false)
	rulesTried := map[*rules.Entry]bool{}
	for _, pol := range bounded {
		if pol.Direction.NoBounds != "" {
			t.Errorf("tune tries %s with bounds, which it cannot take", pol)
		}
		rulesTried[pol.Rule] = true
	}
	refused := 0
	for _, pol := range open {
		if pol.Direction.NoBounds != "" {
			refused++
		} else if !rulesTried[pol.Rule] {
			t.Errorf("tune with bounds leaves out rule %s", pol.Rule.Name)
		}
	}
	if refused == 0 || len(bounded) != len(open)-refused {
		t.Errorf("%d policies with bounds, %d without, %d of which cannot take bounds", len(bounded), len(open), refused)
	}
}

// A combined objective's worst case is the start's one call, the rule's
// calls in each of iterations + 1 searches, a gradient costing nothing
// more, and one probe per unknown at a stall (settleCombined; the kernel
// test TestCombinedWorstCase holds runs to the same count).
func TestCombinedWorstCase(t *testing.T) {
	plans, err := Plans([]string{filepath.Join("..", "testdata", "golden", "shapes", "shapes.toml")})
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, p := range plans {
		if !p.Shape.Combined {
			continue
		}
		found = true
		trials, iterations := int(p.Value(rules.Trials)), int(p.Value(rules.StopIterations))
		want := 1 + (iterations+1)*p.Rule.IterationCalls(trials, 0) + p.Dim
		if _, byIterations := p.WorstCase(); byIterations != want {
			t.Errorf("%s: worst case %d by the iteration limit, want 1 + (%d + 1)·%d + %d = %d", p.M.Name, byIterations, iterations, p.Rule.IterationCalls(trials, 0), p.Dim, want)
		}
		if p.GradientCalls() != 0 {
			t.Errorf("%s: a combined objective's gradient costs %d calls, want 0", p.M.Name, p.GradientCalls())
		}
	}
	if !found {
		t.Fatal("no golden minimizer has a combined objective")
	}
}

// emptiedType reports whether a pick replaces the templates' type name by
// alt, a struct type without fields: state the spec's shape does without,
// which no reached code then touches.
func emptiedType(scope *types.Scope, name, alt string) bool {
	from, ok := scope.Lookup(name).(*types.TypeName)
	if !ok {
		return false
	}
	to, ok := scope.Lookup(alt).(*types.TypeName)
	if !ok || from == to {
		return false
	}
	st, ok := to.Type().Underlying().(*types.Struct)
	return ok && st.NumFields() == 0
}
