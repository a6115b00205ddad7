package gen

import (
	"go/ast"
	"go/token"
	"go/types"
)

// unrollLimit is the most unknowns for which the kernels' loops over a
// vector are unrolled. At two unknowns the loop's own bookkeeping (the
// counter, its test, the branch and the index's bounds check) cost about
// as much as the body: unrolled, the bfgs minimizer of Rosenbrock 2-D runs
// a fifth fewer instructions (bench, callgrind). Past four the copies
// outgrow the saving in code size.
const unrollLimit = 4

// unrollBodyLimit is the largest loop body, in AST nodes, that is unrolled:
// the short loops of the vector and matrix kernels (a dot product, a row of
// the BFGS update), not the per-coordinate probes of the differences.
const unrollBodyLimit = 80

// isDimRange reports whether a range over a value of type t runs over the
// unknowns: t is the templates' vec, a pointer to one, or an array of dim
// vecs (a matrix's rows). vec is a defined type in the templates so that
// an array that only happens to have dim elements is never taken for one.
func isDimRange(t types.Type) bool {
	if p, ok := t.(*types.Pointer); ok {
		t = p.Elem()
	}
	if isVec(t) {
		return true
	}
	a, ok := t.(*types.Array)
	if !ok || !isVec(a.Elem()) {
		return false
	}
	v := a.Elem().Underlying().(*types.Array)
	return a.Len() == v.Len()
}

// isVec reports whether t is the templates' vec.
func isVec(t types.Type) bool {
	n, ok := t.(*types.Named)
	return ok && n.Obj().Name() == "vec" && n.Obj().Pkg() != nil && n.Obj().Pkg().Path() == "templates"
}

// unroll returns the range loop n over the unknowns as one copy of its
// body per index, the index a constant in each, in a block where the loop
// stood (a loop that reads as one still), or n itself when it is not
// one to unroll: more than unrollLimit unknowns, a body past
// unrollBodyLimit, or a loop whose meaning a copy could change (a value
// variable, a break, continue, goto or label, a function literal, or an
// index that is assigned or whose address is taken). Each copy keeps the
// body's statements and their order, so the arithmetic, and what a
// compiler may fuse, is the same as the loop's. A body that declares a
// name gets a block of its own in each copy.
func (rw *rewriter) unroll(cp *kernelCopier, n *ast.RangeStmt) ast.Node {
	dim := rw.c.shape.Dim
	if !cp.dimRanges[n] || dim > unrollLimit || n.Tok != token.DEFINE || n.Value != nil {
		return n
	}
	key, ok := n.Key.(*ast.Ident)
	if !ok || key.Name == "_" {
		return n
	}
	index := rw.obj(key)
	if index == nil || !unrollable(n.Body, func(id *ast.Ident) bool { return rw.obj(id) == index }) {
		return n
	}
	out := &ast.BlockStmt{Lbrace: n.For, Rbrace: n.Body.Rbrace}
	declares := declaresAtTop(n.Body)
	for k := 0; k < dim; k++ {
		clone := &kernelCopier{src: cp.info, info: cp.info, groups: map[*ast.CommentGroup]*ast.CommentGroup{}, dimRanges: cp.dimRanges}
		clone.post = func(m ast.Node) ast.Node {
			if id, ok := m.(*ast.Ident); ok && rw.obj(id) == index {
				return intLit(k, id.Pos())
			}
			return m
		}
		body := clone.block(n.Body)
		if declares {
			out.List = append(out.List, body)
		} else {
			out.List = append(out.List, body.List...)
		}
	}
	return out
}

// unrollable reports whether a body may be copied once per index: it
// stays within unrollBodyLimit nodes and has no statement whose meaning
// depends on being in a loop, and the index (isIndex) is only read.
func unrollable(body *ast.BlockStmt, isIndex func(*ast.Ident) bool) bool {
	nodes, ok := 0, true
	ast.Inspect(body, func(m ast.Node) bool {
		if !ok || m == nil {
			return false
		}
		nodes++
		switch m := m.(type) {
		case *ast.BranchStmt, *ast.LabeledStmt, *ast.FuncLit, *ast.GoStmt, *ast.DeferStmt:
			ok = false
		case *ast.AssignStmt:
			for _, l := range m.Lhs {
				if id, isID := l.(*ast.Ident); isID && isIndex(id) {
					ok = false
				}
			}
		case *ast.IncDecStmt:
			if id, isID := m.X.(*ast.Ident); isID && isIndex(id) {
				ok = false
			}
		case *ast.UnaryExpr:
			if id, isID := m.X.(*ast.Ident); isID && m.Op == token.AND && isIndex(id) {
				ok = false
			}
		}
		return ok
	})
	return ok && nodes <= unrollBodyLimit
}

// declaresAtTop reports whether the body declares a name in its own scope,
// so that its copies need a block each.
func declaresAtTop(body *ast.BlockStmt) bool {
	for _, s := range body.List {
		switch s := s.(type) {
		case *ast.AssignStmt:
			if s.Tok == token.DEFINE {
				return true
			}
		case *ast.DeclStmt:
			return true
		}
	}
	return false
}
