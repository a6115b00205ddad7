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
// would outgrow the saving in code size: longer loops are unrolled in part
// (unrollBy).
const unrollLimit = 4

// unrollBy is how many copies of a loop's body one pass runs past
// unrollLimit unknowns, and partialBodyLimit the largest body, in AST
// nodes, so unrolled: at 100 unknowns the loop's bookkeeping and bounds
// checks were about half the instructions of a dot product.
const (
	unrollBy         = 4
	partialBodyLimit = 64
)

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

// unroll returns the range loop n over the unknowns unrolled, or n itself
// when it is not one to unroll: a loop whose meaning a copy could change
// (a value variable, a break, continue, goto or label, a function literal,
// or an index that is assigned or whose address is taken), or a body past
// the size limit. Up to unrollLimit unknowns each index gets one copy of
// the body, the index a constant, in a block where the loop stood (it
// reads as one loop still). Past it a body of at most partialBodyLimit
// nodes runs unrollBy times per pass of a counted loop, the index i, i+1,
// …, with the last dim mod unrollBy indexes as constants after it; the
// loop's bound, a multiple of unrollBy, lets the compiler drop the bounds
// checks of all the copies. Each copy keeps the body's statements and
// their order, so the arithmetic, and what a compiler may fuse, is the
// same as the loop's. A body that declares a name gets a block of its own
// in each copy.
func (rw *rewriter) unroll(cp *kernelCopier, n *ast.RangeStmt) ast.Node {
	dim := rw.c.shape.Dim
	if !cp.dimRanges[n] || n.Tok != token.DEFINE || n.Value != nil {
		return n
	}
	key, ok := n.Key.(*ast.Ident)
	if !ok || key.Name == "_" {
		return n
	}
	index := rw.obj(key)
	limit := unrollBodyLimit
	if dim > unrollLimit {
		limit = partialBodyLimit
	}
	if index == nil || !unrollable(n.Body, limit, func(id *ast.Ident) bool { return rw.obj(id) == index }) {
		return n
	}
	declares := declaresAtTop(n.Body)
	copies := 0 // copies of a declaring body made so far
	// copyAt appends to list a copy of the body with the index replaced by
	// what at returns.
	copyAt := func(list []ast.Stmt, at func(pos token.Pos) ast.Expr) []ast.Stmt {
		clone := &kernelCopier{src: cp.info, info: cp.info, groups: map[*ast.CommentGroup]*ast.CommentGroup{}, dimRanges: cp.dimRanges}
		clone.post = func(m ast.Node) ast.Node {
			switch m := m.(type) {
			case *ast.Ident:
				if rw.obj(m) == index {
					return at(m.Pos())
				}
			case *ast.IndexExpr:
				m.Index = unparen(m.Index) // x[(i + 1)] reads x[i+1]
			case *ast.CallExpr:
				for j, a := range m.Args {
					m.Args[j] = unparen(a)
				}
			}
			return m
		}
		body := clone.block(n.Body)
		if declares {
			if copies > 0 && len(body.List) > 0 {
				// The comments above the body's first statement print
				// with the first copy only: the later copies' braces
				// open on their first statement's line, so no blank
				// line stands where the comments were.
				body.Lbrace = body.List[0].Pos()
			}
			copies++
			return append(list, body)
		}
		return append(list, body.List...)
	}
	constant := func(k int) func(token.Pos) ast.Expr {
		return func(pos token.Pos) ast.Expr { return intLit(k, pos) }
	}
	out := &ast.BlockStmt{Lbrace: n.For, Rbrace: n.Body.Rbrace}
	if dim <= unrollLimit {
		for k := 0; k < dim; k++ {
			out.List = copyAt(out.List, constant(k))
		}
		return out
	}
	counter := func(pos token.Pos) *ast.Ident { return &ast.Ident{Name: key.Name, NamePos: pos} }
	passes := dim - dim%unrollBy
	loop := &ast.ForStmt{
		For:  n.For,
		Init: &ast.AssignStmt{Lhs: []ast.Expr{counter(key.Pos())}, Tok: token.DEFINE, Rhs: []ast.Expr{intLit(0, key.Pos())}},
		Cond: &ast.BinaryExpr{X: counter(key.Pos()), Op: token.LSS, Y: intLit(passes, key.Pos())},
		Post: &ast.AssignStmt{Lhs: []ast.Expr{counter(key.Pos())}, Tok: token.ADD_ASSIGN, Rhs: []ast.Expr{intLit(unrollBy, key.Pos())}},
		Body: &ast.BlockStmt{Lbrace: n.Body.Lbrace, Rbrace: n.Body.Rbrace},
	}
	for k := 0; k < unrollBy; k++ {
		loop.Body.List = copyAt(loop.Body.List, func(pos token.Pos) ast.Expr {
			if k == 0 {
				return counter(pos)
			}
			return &ast.ParenExpr{Lparen: pos, X: &ast.BinaryExpr{X: counter(pos), OpPos: pos, Op: token.ADD, Y: intLit(k, pos)}, Rparen: pos}
		})
	}
	if passes == dim {
		return loop
	}
	out.List = append(out.List, loop)
	for k := passes; k < dim; k++ {
		out.List = copyAt(out.List, constant(k))
	}
	return out
}

// unparen drops the parentheses around e where the context needs none.
func unparen(e ast.Expr) ast.Expr {
	if p, ok := e.(*ast.ParenExpr); ok {
		return p.X
	}
	return e
}

// unrollable reports whether a body may be copied once per index: it
// stays within limit nodes and has no statement whose meaning depends on
// being in a loop, and the index (isIndex) is only read.
func unrollable(body *ast.BlockStmt, limit int, isIndex func(*ast.Ident) bool) bool {
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
	return ok && nodes <= limit
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
