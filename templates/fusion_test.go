package templates

import (
	"go/ast"
	"go/constant"
	"go/parser"
	"go/token"
	"math"
	"testing"
)

// TestFiniteSurvivesFusedMultiplyAdd evaluates the source of finite the way
// a compiler that fuses multiply-adds may execute it once an objective
// ending in a product x·y is inlined: v is then the unrounded product, and
// v ± w becomes math.FMA(x, y, ±w), one rounding (the Go spec allows this
// contraction; arm64, ppc64le, s390x and riscv64 do it). Under that model
// finite must still say exactly whether round(x·y) is finite. The
// test v-v == 0 that finite once used fails it: FMA(x, y, −round(x·y)) is
// the product's rounding error, not 0. The model evaluates the template's
// own syntax tree, so the check runs on any host, amd64 included.
func TestFiniteSurvivesFusedMultiplyAdd(t *testing.T) {
	body := finiteBody(t)
	cases := [][2]float64{
		{0.3, 7.5}, {0.1, 0.7}, {3, 0.75}, {1.0 / 3, 3}, {-2.5, 1e-300},
		{0, 0}, {1e200, 1e200}, {-1e300, 1e10}, {math.Inf(1), 0}, {math.NaN(), 1},
		{math.MaxFloat64, 0.9999999999999999}, {math.MaxFloat64, 1.0000000000000002},
	}
	fused := 0
	for _, c := range cases {
		x, y := c[0], c[1]
		product := x * y
		if math.FMA(x, y, -product) != 0 {
			fused++ // a case where the old v-v == 0 would have failed
		}
		want := !math.IsNaN(product) && !math.IsInf(product, 0)
		if got := evalFused(t, body, fusedProduct{x, y}); got != want {
			t.Errorf("finite(%g·%g) under fused multiply-add is %v, want %v", x, y, got, want)
		}
	}
	if fused == 0 {
		t.Fatal("no case has a product with a rounding error; the check would be vacuous")
	}
}

// fusedProduct is v = x·y not yet rounded.
type fusedProduct struct{ x, y float64 }

// finiteBody returns the expression finite returns, parsed from vector.go.
func finiteBody(t *testing.T) ast.Expr {
	t.Helper()
	f, err := parser.ParseFile(token.NewFileSet(), "vector.go", nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	for _, d := range f.Decls {
		if fn, ok := d.(*ast.FuncDecl); ok && fn.Name.Name == "finite" {
			if len(fn.Body.List) != 1 {
				t.Fatalf("finite has %d statements; the fusion model evaluates a single return", len(fn.Body.List))
			}
			return fn.Body.List[0].(*ast.ReturnStmt).Results[0]
		}
	}
	t.Fatal("vector.go declares no finite")
	return nil
}

// evalFused evaluates e with v bound to the unrounded product p. It knows
// the forms finite may use: v, float constants and the largestFinite
// tunable, unary minus, + − × ÷, comparisons, && and ||, parentheses.
func evalFused(t *testing.T, e ast.Expr, p fusedProduct) bool {
	t.Helper()
	var value func(e ast.Expr) (float64, *fusedProduct)
	value = func(e ast.Expr) (float64, *fusedProduct) {
		switch e := e.(type) {
		case *ast.ParenExpr:
			return value(e.X)
		case *ast.Ident:
			switch e.Name {
			case "v":
				return 0, &p
			case "largestFinite":
				return largestFinite, nil
			}
		case *ast.BasicLit:
			if v, ok := constant.Float64Val(constant.MakeFromLiteral(e.Value, e.Kind, 0)); ok {
				return v, nil
			}
		case *ast.UnaryExpr:
			if e.Op == token.SUB {
				v, prod := value(e.X)
				if prod != nil {
					return 0, &fusedProduct{-prod.x, prod.y}
				}
				return -v, nil
			}
		case *ast.BinaryExpr:
			a, pa := value(e.X)
			b, pb := value(e.Y)
			switch {
			case e.Op == token.ADD && pa != nil:
				return math.FMA(pa.x, pa.y, rounded(b, pb)), nil // fused: x·y + w
			case e.Op == token.SUB && pa != nil:
				return math.FMA(pa.x, pa.y, -rounded(b, pb)), nil // fused: x·y − w
			case e.Op == token.ADD && pb != nil:
				return math.FMA(pb.x, pb.y, a), nil
			case e.Op == token.SUB && pb != nil:
				return math.FMA(-pb.x, pb.y, a), nil
			}
			a, b = rounded(a, pa), rounded(b, pb)
			switch e.Op {
			case token.ADD:
				return a + b, nil
			case token.SUB:
				return a - b, nil
			case token.MUL:
				return a * b, nil
			case token.QUO:
				return a / b, nil
			}
		}
		t.Fatalf("the fusion model cannot evaluate %T in finite", e)
		return 0, nil
	}
	var truth func(e ast.Expr) bool
	truth = func(e ast.Expr) bool {
		switch e := e.(type) {
		case *ast.ParenExpr:
			return truth(e.X)
		case *ast.UnaryExpr:
			if e.Op == token.NOT {
				return !truth(e.X)
			}
		case *ast.BinaryExpr:
			switch e.Op {
			case token.LAND:
				return truth(e.X) && truth(e.Y)
			case token.LOR:
				return truth(e.X) || truth(e.Y)
			}
			a, pa := value(e.X)
			b, pb := value(e.Y)
			a, b = rounded(a, pa), rounded(b, pb) // a compared value is rounded: comparisons never fuse
			switch e.Op {
			case token.EQL:
				return a == b
			case token.NEQ:
				return a != b
			case token.LSS:
				return a < b
			case token.LEQ:
				return a <= b
			case token.GTR:
				return a > b
			case token.GEQ:
				return a >= b
			}
		}
		t.Fatalf("the fusion model cannot evaluate %T as a condition in finite", e)
		return false
	}
	return truth(e)
}

// rounded is the value of an operand: the product rounded once when it is
// one, else v.
func rounded(v float64, p *fusedProduct) float64 {
	if p != nil {
		return p.x * p.y
	}
	return v
}
