package gen

import (
	"fmt"
	"go/ast"
	"go/types"
)

// kernelCopier deep-copies declarations of the shared kernels for one
// specialization, whose passes rewrite each node as it is copied (post)
// and the copied comments in place.
// The type checker's facts that the passes read about the originals are
// carried over to the copies in info: the objects of identifiers and the
// types of calls' sole arguments, so the passes read them exactly as they
// would on a tree of their own.
//
// Every node and every slice of nodes is new; positions, names and
// literal values are kept. The parser's deprecated *ast.Object and
// *ast.Scope are shared: no pass reads or writes them.
// TestKernelCopyIsDeep checks that a copy equals its original and shares
// no node with it.
type kernelCopier struct {
	src  *types.Info // the kernels', shared and only read
	info *types.Info // the copies'
	// groups maps each comment group copied to its copy, so a node's Doc
	// or Comment and the comment list given to the printer stay the same
	// object, as in a parsed file.
	groups map[*ast.CommentGroup]*ast.CommentGroup
	// post, when set, is applied to every copied node except a
	// selector's Sel, after its children: it returns the node, its
	// replacement, or nil to delete a statement from its list.
	post func(ast.Node) ast.Node
	// dimRanges marks the copies of range loops over the unknowns (see
	// isDimRange), which the passes may unroll.
	dimRanges map[*ast.RangeStmt]bool
}

// newKernelCopier returns a copier whose info has room for about exprs
// expressions.
func newKernelCopier(src *types.Info, exprs int) *kernelCopier {
	return &kernelCopier{
		src: src,
		info: &types.Info{
			Types: make(map[ast.Expr]types.TypeAndValue, exprs/16),
			Defs:  make(map[*ast.Ident]types.Object, exprs/8),
			Uses:  make(map[*ast.Ident]types.Object, exprs/2),
		},
		groups:    map[*ast.CommentGroup]*ast.CommentGroup{},
		dimRanges: map[*ast.RangeStmt]bool{},
	}
}

// decl returns a deep copy of d.
func (c *kernelCopier) decl(d ast.Decl) ast.Decl {
	return c.node(d).(ast.Decl)
}

// comments returns copies of the comment groups.
func (c *kernelCopier) comments(groups []*ast.CommentGroup) []*ast.CommentGroup {
	out := make([]*ast.CommentGroup, len(groups))
	for i, g := range groups {
		out[i] = c.group(g)
	}
	return out
}

func (c *kernelCopier) group(g *ast.CommentGroup) *ast.CommentGroup {
	if g == nil {
		return nil
	}
	if cp, ok := c.groups[g]; ok {
		return cp
	}
	cp := &ast.CommentGroup{List: make([]*ast.Comment, len(g.List))}
	for i, cm := range g.List {
		cp.List[i] = &ast.Comment{Slash: cm.Slash, Text: cm.Text}
	}
	c.groups[g] = cp
	return cp
}

// node returns a deep copy of n, which must not be nil.
func (c *kernelCopier) node(n ast.Node) ast.Node {
	var out ast.Node
	switch n := n.(type) {
	// Expressions and types.
	case *ast.BadExpr:
		cp := *n
		out = &cp
	case *ast.Ident:
		cp := *n
		out = &cp
	case *ast.BasicLit:
		cp := *n
		out = &cp
	case *ast.Ellipsis:
		cp := *n
		cp.Elt = c.expr(n.Elt)
		out = &cp
	case *ast.FuncLit:
		cp := *n
		cp.Type = c.funcType(n.Type)
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.CompositeLit:
		cp := *n
		cp.Type = c.expr(n.Type)
		cp.Elts = c.exprs(n.Elts)
		out = &cp
	case *ast.ParenExpr:
		cp := *n
		cp.X = c.expr(n.X)
		out = &cp
	case *ast.SelectorExpr:
		cp := *n
		cp.X = c.expr(n.X)
		post := c.post
		c.post = nil // a field or method name, never a template name
		cp.Sel = c.ident(n.Sel)
		c.post = post
		out = &cp
	case *ast.IndexExpr:
		cp := *n
		cp.X = c.expr(n.X)
		cp.Index = c.expr(n.Index)
		out = &cp
	case *ast.IndexListExpr:
		cp := *n
		cp.X = c.expr(n.X)
		cp.Indices = c.exprs(n.Indices)
		out = &cp
	case *ast.SliceExpr:
		cp := *n
		cp.X = c.expr(n.X)
		cp.Low = c.expr(n.Low)
		cp.High = c.expr(n.High)
		cp.Max = c.expr(n.Max)
		out = &cp
	case *ast.TypeAssertExpr:
		cp := *n
		cp.X = c.expr(n.X)
		cp.Type = c.expr(n.Type)
		out = &cp
	case *ast.CallExpr:
		cp := *n
		cp.Fun = c.expr(n.Fun)
		cp.Args = c.exprs(n.Args)
		if len(n.Args) == 1 {
			// The sole argument's type: the passes read it to drop
			// conversions that change nothing.
			if tv, ok := c.src.Types[n.Args[0]]; ok {
				c.info.Types[cp.Args[0]] = tv
			}
		}
		out = &cp
	case *ast.StarExpr:
		cp := *n
		cp.X = c.expr(n.X)
		out = &cp
	case *ast.UnaryExpr:
		cp := *n
		cp.X = c.expr(n.X)
		out = &cp
	case *ast.BinaryExpr:
		cp := *n
		cp.X = c.expr(n.X)
		cp.Y = c.expr(n.Y)
		out = &cp
	case *ast.KeyValueExpr:
		cp := *n
		cp.Key = c.expr(n.Key)
		cp.Value = c.expr(n.Value)
		out = &cp
	case *ast.ArrayType:
		cp := *n
		cp.Len = c.expr(n.Len)
		cp.Elt = c.expr(n.Elt)
		out = &cp
	case *ast.StructType:
		cp := *n
		cp.Fields = c.fieldList(n.Fields)
		out = &cp
	case *ast.FuncType:
		cp := *n
		cp.TypeParams = c.fieldList(n.TypeParams)
		cp.Params = c.fieldList(n.Params)
		cp.Results = c.fieldList(n.Results)
		out = &cp
	case *ast.InterfaceType:
		cp := *n
		cp.Methods = c.fieldList(n.Methods)
		out = &cp
	case *ast.MapType:
		cp := *n
		cp.Key = c.expr(n.Key)
		cp.Value = c.expr(n.Value)
		out = &cp
	case *ast.ChanType:
		cp := *n
		cp.Value = c.expr(n.Value)
		out = &cp

	// Statements.
	case *ast.BadStmt:
		cp := *n
		out = &cp
	case *ast.DeclStmt:
		cp := *n
		cp.Decl = c.decl(n.Decl)
		out = &cp
	case *ast.EmptyStmt:
		cp := *n
		out = &cp
	case *ast.LabeledStmt:
		cp := *n
		cp.Label = c.ident(n.Label)
		cp.Stmt = c.stmt(n.Stmt)
		out = &cp
	case *ast.ExprStmt:
		cp := *n
		cp.X = c.expr(n.X)
		out = &cp
	case *ast.SendStmt:
		cp := *n
		cp.Chan = c.expr(n.Chan)
		cp.Value = c.expr(n.Value)
		out = &cp
	case *ast.IncDecStmt:
		cp := *n
		cp.X = c.expr(n.X)
		out = &cp
	case *ast.AssignStmt:
		cp := *n
		cp.Lhs = c.exprs(n.Lhs)
		cp.Rhs = c.exprs(n.Rhs)
		out = &cp
	case *ast.GoStmt:
		cp := *n
		cp.Call = c.call(n.Call)
		out = &cp
	case *ast.DeferStmt:
		cp := *n
		cp.Call = c.call(n.Call)
		out = &cp
	case *ast.ReturnStmt:
		cp := *n
		cp.Results = c.exprs(n.Results)
		out = &cp
	case *ast.BranchStmt:
		cp := *n
		cp.Label = c.ident(n.Label)
		out = &cp
	case *ast.BlockStmt:
		cp := *n
		cp.List = c.stmts(n.List)
		out = &cp
	case *ast.IfStmt:
		cp := *n
		cp.Init = c.stmt(n.Init)
		cp.Cond = c.expr(n.Cond)
		cp.Body = c.block(n.Body)
		cp.Else = c.stmt(n.Else)
		out = &cp
	case *ast.CaseClause:
		cp := *n
		cp.List = c.exprs(n.List)
		cp.Body = c.stmts(n.Body)
		out = &cp
	case *ast.SwitchStmt:
		cp := *n
		cp.Init = c.stmt(n.Init)
		cp.Tag = c.expr(n.Tag)
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.TypeSwitchStmt:
		cp := *n
		cp.Init = c.stmt(n.Init)
		cp.Assign = c.stmt(n.Assign)
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.CommClause:
		cp := *n
		cp.Comm = c.stmt(n.Comm)
		cp.Body = c.stmts(n.Body)
		out = &cp
	case *ast.SelectStmt:
		cp := *n
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.ForStmt:
		cp := *n
		cp.Init = c.stmt(n.Init)
		cp.Cond = c.expr(n.Cond)
		cp.Post = c.stmt(n.Post)
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.RangeStmt:
		cp := *n
		cp.Key = c.expr(n.Key)
		cp.Value = c.expr(n.Value)
		cp.X = c.expr(n.X)
		cp.Body = c.block(n.Body)
		if tv, ok := c.src.Types[n.X]; ok && isDimRange(tv.Type) {
			c.dimRanges[&cp] = true
		}
		out = &cp

	// Declarations and their parts.
	case *ast.BadDecl:
		cp := *n
		out = &cp
	case *ast.GenDecl:
		cp := *n
		cp.Doc = c.group(n.Doc)
		if n.Specs != nil {
			cp.Specs = make([]ast.Spec, len(n.Specs))
			for i, s := range n.Specs {
				cp.Specs[i] = c.node(s).(ast.Spec)
			}
		}
		out = &cp
	case *ast.FuncDecl:
		cp := *n
		cp.Doc = c.group(n.Doc)
		cp.Recv = c.fieldList(n.Recv)
		cp.Name = c.ident(n.Name)
		cp.Type = c.funcType(n.Type)
		cp.Body = c.block(n.Body)
		out = &cp
	case *ast.ImportSpec:
		cp := *n
		cp.Doc = c.group(n.Doc)
		cp.Name = c.ident(n.Name)
		cp.Path = c.basicLit(n.Path)
		cp.Comment = c.group(n.Comment)
		out = &cp
	case *ast.ValueSpec:
		cp := *n
		cp.Doc = c.group(n.Doc)
		cp.Names = c.idents(n.Names)
		cp.Type = c.expr(n.Type)
		cp.Values = c.exprs(n.Values)
		cp.Comment = c.group(n.Comment)
		out = &cp
	case *ast.TypeSpec:
		cp := *n
		cp.Doc = c.group(n.Doc)
		cp.Name = c.ident(n.Name)
		cp.TypeParams = c.fieldList(n.TypeParams)
		cp.Type = c.expr(n.Type)
		cp.Comment = c.group(n.Comment)
		out = &cp
	case *ast.FieldList:
		cp := *n
		if n.List != nil {
			cp.List = make([]*ast.Field, len(n.List))
			for i, f := range n.List {
				cp.List[i] = c.node(f).(*ast.Field)
			}
		}
		out = &cp
	case *ast.Field:
		cp := *n
		cp.Doc = c.group(n.Doc)
		cp.Names = c.idents(n.Names)
		cp.Type = c.expr(n.Type)
		cp.Tag = c.basicLit(n.Tag)
		cp.Comment = c.group(n.Comment)
		out = &cp
	default:
		panic(fmt.Sprintf("kernelCopier: cannot copy %T", n))
	}
	c.carry(n, out)
	if c.post != nil {
		return c.post(out)
	}
	return out
}

// carry records for the copy of an identifier the object the type
// checker recorded for orig. (Of the expressions' types, the passes read
// only those of a call's sole argument, which node carries.)
func (c *kernelCopier) carry(orig, cp ast.Node) {
	if id, ok := orig.(*ast.Ident); ok {
		if o, ok := c.src.Uses[id]; ok {
			c.info.Uses[cp.(*ast.Ident)] = o
		}
		if o, ok := c.src.Defs[id]; ok {
			c.info.Defs[cp.(*ast.Ident)] = o
		}
	}
}

func (c *kernelCopier) expr(e ast.Expr) ast.Expr {
	if e == nil {
		return nil
	}
	return c.node(e).(ast.Expr)
}

func (c *kernelCopier) stmt(s ast.Stmt) ast.Stmt {
	if s == nil {
		return nil
	}
	cp, _ := c.node(s).(ast.Stmt) // nil when post deletes it
	return cp
}

func (c *kernelCopier) ident(id *ast.Ident) *ast.Ident {
	if id == nil {
		return nil
	}
	return c.node(id).(*ast.Ident)
}

func (c *kernelCopier) basicLit(l *ast.BasicLit) *ast.BasicLit {
	if l == nil {
		return nil
	}
	return c.node(l).(*ast.BasicLit)
}

func (c *kernelCopier) call(e *ast.CallExpr) *ast.CallExpr {
	if e == nil {
		return nil
	}
	return c.node(e).(*ast.CallExpr)
}

func (c *kernelCopier) block(b *ast.BlockStmt) *ast.BlockStmt {
	if b == nil {
		return nil
	}
	return c.node(b).(*ast.BlockStmt)
}

func (c *kernelCopier) funcType(t *ast.FuncType) *ast.FuncType {
	if t == nil {
		return nil
	}
	return c.node(t).(*ast.FuncType)
}

func (c *kernelCopier) fieldList(l *ast.FieldList) *ast.FieldList {
	if l == nil {
		return nil
	}
	return c.node(l).(*ast.FieldList)
}

func (c *kernelCopier) exprs(list []ast.Expr) []ast.Expr {
	if list == nil {
		return nil
	}
	out := make([]ast.Expr, len(list))
	for i, e := range list {
		out[i] = c.expr(e)
	}
	return out
}

func (c *kernelCopier) stmts(list []ast.Stmt) []ast.Stmt {
	if list == nil {
		return nil
	}
	out := make([]ast.Stmt, 0, len(list))
	for _, s := range list {
		if cp := c.stmt(s); cp != nil {
			out = append(out, cp)
		}
	}
	return out
}

func (c *kernelCopier) idents(list []*ast.Ident) []*ast.Ident {
	if list == nil {
		return nil
	}
	out := make([]*ast.Ident, len(list))
	for i, id := range list {
		out[i] = c.ident(id)
	}
	return out
}
