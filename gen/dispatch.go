package gen

import (
	"go/ast"
	"go/types"
	"maps"
	"slices"
	"sort"
	"strings"
)

// dispatchers finds the templates' dispatchers and their alternatives. A
// selector is a package-level variable of the templates that no registry
// entry provides (derivativeSource, stepRule, …): the kernels' own tests
// set it to pick an alternative. A dispatcher is a declaration unit that
// reads a selector (a function, or a type with its methods), and its
// alternatives are the functions and types it refers to, stand-ins
// aside. gen replaces every dispatcher it reaches by the alternative the
// plan picks, so selectors never reach generated code.
func (ks *kernelSource) dispatchers(provided map[string]string) map[string][]string {
	scope := ks.pkg.Scope()
	selectors := map[types.Object]bool{}
	for _, name := range scope.Names() {
		if v, ok := scope.Lookup(name).(*types.Var); ok && provided[name] == "" && !standIns[name] {
			selectors[v] = true
		}
	}
	out := map[string][]string{}
	for _, name := range ks.order {
		u := ks.units[name]
		reads := false
		alternatives := map[string]bool{}
		for _, d := range u.decls {
			var within ast.Node = d
			if fn, ok := d.(*ast.FuncDecl); ok {
				within = fn.Body // not the signature: its types are no alternatives
			}
			ast.Inspect(within, func(n ast.Node) bool {
				id, ok := n.(*ast.Ident)
				if !ok {
					return true
				}
				obj := ks.info.Uses[id]
				if obj == nil || obj.Parent() != scope {
					return true
				}
				switch obj.(type) {
				case *types.Var:
					reads = reads || selectors[obj]
				case *types.Func, *types.TypeName:
					if obj.Name() != name && !standIns[obj.Name()] {
						alternatives[obj.Name()] = true
					}
				}
				return true
			})
		}
		if !reads {
			continue
		}
		var list []string
		for a := range alternatives {
			list = append(list, a)
		}
		sort.Strings(list)
		out[name] = list
	}
	return out
}

// cachedDispatchers is dispatchers, computed once for each set of
// provided names.
func (ks *kernelSource) cachedDispatchers(provided map[string]string) map[string][]string {
	key := strings.Join(slices.Sorted(maps.Keys(provided)), " ")
	if d, ok := ks.dispatch.Load(key); ok {
		return d.(map[string][]string)
	}
	d, _ := ks.dispatch.LoadOrStore(key, ks.dispatchers(provided))
	return d.(map[string][]string)
}
