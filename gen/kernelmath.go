package gen

import (
	"fmt"
	"go/ast"
	"go/parser"
	"go/token"
	"go/types"
)

// mathSource declares the part of package math that the kernels may use,
// with the real package's signatures and constant values;
// TestKernelMathMatchesMath compares every declaration with math itself.
// The kernels are type-checked against it: importing math from source
// would type-check math and its dependencies on every run of gen, and
// export data is only at hand after a go build. A kernel that uses
// anything else of math fails to type-check until it is declared here.
const mathSource = `package math

const (
	MaxFloat32             = 0x1p127 * (1 + (1 - 0x1p-23))
	SmallestNonzeroFloat32 = 0x1p-126 * 0x1p-23
	MaxFloat64             = 0x1p1023 * (1 + (1 - 0x1p-52))
	SmallestNonzeroFloat64 = 0x1p-1022 * 0x1p-52
)

func Abs(x float64) float64
func Cbrt(x float64) float64
func Copysign(f, sign float64) float64
func Exp(x float64) float64
func Float32bits(f float32) uint32
func Float32frombits(b uint32) float32
func Float64bits(f float64) uint64
func Float64frombits(b uint64) float64
func Hypot(p, q float64) float64
func Inf(sign int) float64
func IsInf(f float64, sign int) bool
func IsNaN(f float64) (is bool)
func Ldexp(frac float64, exp int) float64
func Log(x float64) float64
func Max(x, y float64) float64
func Min(x, y float64) float64
func NaN() float64
func Nextafter(x, y float64) (r float64)
func Pow(x, y float64) float64
func Sqrt(x float64) float64
`

// kernelMath type-checks mathSource.
func kernelMath() (*types.Package, error) {
	fset := token.NewFileSet()
	f, err := parser.ParseFile(fset, "kernelmath.go", mathSource, parser.SkipObjectResolution)
	if err != nil {
		return nil, err
	}
	var conf types.Config
	return conf.Check("math", fset, []*ast.File{f}, nil)
}

// kernelImporter gives the kernels their only import.
type kernelImporter struct{ math *types.Package }

func (im kernelImporter) Import(path string) (*types.Package, error) {
	if path == "math" {
		return im.math, nil
	}
	return nil, fmt.Errorf("the templates may import only math")
}
