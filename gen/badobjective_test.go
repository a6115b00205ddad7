package gen

import (
	"errors"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// misfitSource is the package the objective errors resolve against. Tests
// pin positions in it by line, so keep the layout (one declaration every
// other line) when adding to it.
const misfitSource = `package bad

func TwoParams(x, y float64) float64 { return x + y }

func ReturnsInt(x float64) int { return 0 }

func Mixed(x [2]float32) float64 { return 0 }

func SliceObj(x []float64) float64 { return 0 }

func ArrayObj(x [2]float64) float64 { return 0 }

func ScalarObj(x float64) float64 { return x * x }

var NotFunc = 3.0

type Model struct{}

func (m Model) Loss(x [2]float64) float64 { return 0 }

func (m *Model) Grad(x, g *[2]float64) {}

func (m Model) BadGrad(x [2]float64) float64 { return 0 }

type Other struct{}

func (o Other) Grad(x, g *[2]float64) {}

func NewOther() Other { return Other{} }

func PtrObj(x *[2]float64) float64 { return 0 }

func WrongDimGrad(x, g *[3]float64) {}

func PlainGrad(x, g *[2]float64) {}

var DefaultModel = Model{}

var WrongInstance = 1.0

func Variadic(x ...float64) float64 { return 0 }

func Generic[T float64](x T) T { return x }

type Vec = [2]float64

func AliasObj(x Vec) float64 { return 0 }

func ScalarGradWrong(x float64) float32 { return 0 }

func Both(x, g *[2]float64) float64 { return 0 }

func BothWrongDim(x *[2]float64, g *[3]float64) float64 { return 0 }

func BothScalarWrongElem(x float64, g *float32) float64 { return 0 }

func BothSliceArray(x []float64, g *[2]float64) float64 { return 0 }

func (m Model) Both(x [2]float64, g *[2]float64) float64 { return 0 }

func Res(x *[2]float64, r *[3]float64) {}

func ResJac(x *[2]float64, j *[3][2]float64) {}

func ResJacWrong(x *[2]float64, j *[2][2]float64) {}

func ResSlice(x, r []float64) {}

func ResBig(x *[64]float64, r *[300]float64) {}
`

// misfitWant is one expected problem: in the spec at a line of the case's body
// (1 = the line after name) or in obj.go at an absolute line, with the
// exact column and substrings of the message. A spec value that is an array
// is positioned at its first element (its own range is empty in go-toml's
// parser), so `start = [1.0]` points at column 10, `start = 1.0` at 9.
type misfitWant struct {
	inGo      bool
	line, col int
	has       []string
}

func misfitInSpec(line, col int, has ...string) misfitWant { return misfitWant{false, line, col, has} }
func misfitInGo(line, col int, has ...string) misfitWant   { return misfitWant{true, line, col, has} }

const (
	acceptedObjectiveForms = "func(x T) T, func(x [N]T) T, func(x *[N]T) T, func(x []T) T (with dim)"
	acceptedGradientForm1  = "func(x T) T for scalar objectives"
	acceptedGradientForm2  = "func(x *[N]T, g *[N]T)"
	acceptedGradientForm3  = "func(x [N]T) [N]T"
	acceptedGradientForm4  = "func(x, g []T)"
	combinedObjectiveForms = "combined with the gradient written through g: func(x T, g *T) T, func(x [N]T, g *[N]T) T, func(x *[N]T, g *[N]T) T, func(x, g []T) T"
)

// misfits are minimizers whose objective, gradient or instance does not fit
// the package. Each becomes one [[minimizer]] named after its index; all go
// into one spec, so they are also reported together in one run.
var misfits = []struct {
	name string
	body string // keys after name
	want []misfitWant
}{
	{"wrong param count", `objective = "TwoParams"
start = 1.0`, []misfitWant{
		misfitInGo(3, 6, "objective TwoParams has signature func(x float64, y float64) float64", acceptedObjectiveForms),
	}},
	{"returns int", `objective = "ReturnsInt"
start = 1.0`, []misfitWant{
		misfitInGo(5, 6, "objective ReturnsInt has signature func(x float64) int", acceptedObjectiveForms),
	}},
	{"mixed float32 and float64", `objective = "Mixed"
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(7, 6, "objective Mixed has signature func(x [2]float32) float64", acceptedObjectiveForms),
	}},
	{"variadic", `objective = "Variadic"
start = 1.0`, []misfitWant{
		misfitInGo(41, 6, "objective Variadic has signature func(x ...float64) float64", acceptedObjectiveForms),
	}},
	{"generic", `objective = "Generic"
start = 1.0`, []misfitWant{
		misfitInGo(43, 6, "objective Generic has signature func[T float64](x T) T", acceptedObjectiveForms),
	}},
	{"slice without dim", `objective = "SliceObj"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, "objective SliceObj takes a slice: set dim to the number of unknowns"),
	}},
	{"slice start shorter than dim", `objective = "SliceObj"
dim = 3
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 10, "start has 2 values, the objective has 3 unknowns"),
	}},
	{"dim for an array objective", `objective = "ArrayObj"
start = [1.0, 2.0]
dim = 2`, []misfitWant{
		misfitInSpec(3, 1, "dim is only for objectives that take a slice; ArrayObj fixes the dimension at 2"),
	}},
	{"start too long", `objective = "ArrayObj"
start = [1.0, 2.0, 3.0]`, []misfitWant{
		misfitInSpec(2, 10, "start has 3 values, the objective has 2 unknowns"),
	}},
	{"scalar start for a vector", `objective = "ArrayObj"
start = 1.0`, []misfitWant{
		misfitInSpec(2, 9, "start must be an array of 2 numbers"),
	}},
	{"vector start for a scalar", `objective = "ScalarObj"
start = [1.0]`, []misfitWant{
		misfitInSpec(2, 10, "start must be a single number: ScalarObj takes a scalar"),
	}},
	{"start not numbers", `objective = "AliasObj"
start = "one"`, []misfitWant{
		misfitInSpec(2, 9, "start must be a number or an array of numbers"),
	}},
	{"start not finite", `objective = "ScalarObj"
start = nan`, []misfitWant{
		misfitInSpec(2, 9, "start must be finite: replace it with a typical starting point (thalweg init writes nan there on purpose)"),
	}},
	{"expect.x of the wrong shape", `objective = "ArrayObj"
start = [1.0, 2.0]
[minimizer.expect]
x = 1.0`, []misfitWant{
		misfitInSpec(4, 5, "expect.x must have the shape of start (2 values)"),
	}},
	{"bounds of the wrong shape", `objective = "ArrayObj"
start = [1.0, 2.0]
[minimizer.bounds]
lower = 0.0
upper = [1.0, 2.0, 3.0]`, []misfitWant{
		misfitInSpec(4, 9, "bounds.lower must be an array of 2 numbers (inf or -inf for no bound)"),
		misfitInSpec(5, 10, "bounds.upper has 3 values, the objective has 2 unknowns"),
	}},
	{"bounds on a scalar as a list", `objective = "ScalarObj"
start = 1.0
[minimizer.bounds]
upper = [2.0]`, []misfitWant{
		misfitInSpec(4, 10, "bounds.upper must be a single number: ScalarObj takes a scalar"),
	}},
	{"bounds crossed", `objective = "ArrayObj"
start = [1.0, 2.0]
[minimizer.bounds]
lower = [0.0, 3.0]
upper = [1.0, 2.5]`, []misfitWant{
		misfitInSpec(4, 15, "bounds.lower (3) is above bounds.upper (2.5) for unknown 1: the box is empty"),
	}},
	{"bounds nan and wrong infinity", `objective = "ArrayObj"
start = [1.0, 2.0]
[minimizer.bounds]
lower = [nan, -inf]
upper = [-inf, inf]`, []misfitWant{
		misfitInSpec(4, 10, "bounds.lower must not be nan; write -inf for no bound"),
		misfitInSpec(5, 10, "bounds.upper must not be -inf: no point lies within it"),
	}},
	{"expect.x outside the bounds", `objective = "ArrayObj"
start = [1.0, 2.0]
[minimizer.bounds]
lower = [0.0, 0.0]
[minimizer.expect]
x = [1.0, -1.0]`, []misfitWant{
		misfitInSpec(6, 6, "expect.x lies outside the bounds (unknown 1: -1 is not within [0, inf]); no run can end there"),
	}},
	{"scale of the wrong shape", `objective = "ArrayObj"
start = [1.0, 2.0]
scale = [1.0, 2.0, 3.0]`, []misfitWant{
		misfitInSpec(3, 10, "scale has 3 values, the objective has 2 unknowns"),
	}},
	{"scale on a scalar as a list", `objective = "ScalarObj"
start = 1.0
scale = [2.0]`, []misfitWant{
		misfitInSpec(3, 10, "scale must be a single number: ScalarObj takes a scalar"),
	}},
	{"scale a number for an array", `objective = "ArrayObj"
start = [1.0, 2.0]
scale = 2.0`, []misfitWant{
		misfitInSpec(3, 9, "scale must be an array of 2 numbers, one typical magnitude per unknown"),
	}},
	{"scale not numbers", `objective = "ArrayObj"
start = [1.0, 2.0]
scale = "big"`, []misfitWant{
		misfitInSpec(3, 9, "scale must be a number or an array of numbers"),
	}},
	{"scale zero", `objective = "ArrayObj"
start = [1.0, 2.0]
scale = [1.0, 0.0]`, []misfitWant{
		misfitInSpec(3, 15, "scale must be a positive, finite typical magnitude within [1e-30, 1e30] (unknown 1 has 0)"),
	}},
	{"scale negative", `objective = "ScalarObj"
start = 1.0
scale = -2.0`, []misfitWant{
		misfitInSpec(3, 9, "scale must be a positive, finite typical magnitude within [1e-30, 1e30] (unknown 0 has -2)"),
	}},
	{"scale not finite", `objective = "ArrayObj"
start = [1.0, 2.0]
scale = [inf, nan]`, []misfitWant{
		misfitInSpec(3, 10, "scale must be a positive, finite typical magnitude within [1e-30, 1e30] (unknown 0 has inf)"),
	}},
	{"objective not found", `objective = "Missing"
start = 1.0`, []misfitWant{
		misfitInSpec(1, 13, "objective Missing: no such function in package bad"),
	}},
	{"objective typo", `objective = "ScalarOjb"
start = 1.0`, []misfitWant{
		misfitInSpec(1, 13, "objective ScalarOjb: no such function in package bad; did you mean ScalarObj?"),
	}},
	{"objective typo in case", `objective = "scalarobj"
start = 1.0`, []misfitWant{
		misfitInSpec(1, 13, "objective scalarobj: no such function in package bad; did you mean ScalarObj?"),
	}},
	{"objective is a method named alone", `objective = "Loss"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, "objective Loss: no such function in package bad; did you mean Model.Loss?"),
	}},
	{"objective type typo", `objective = "Modle.Loss"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, "objective Modle.Loss: no type Modle in package bad; did you mean Model?"),
	}},
	{"objective method typo", `objective = "Model.Los"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, "objective Model.Los: type Model has no method Los; did you mean Loss?"),
	}},
	{"gradient method typo", `objective = "Model.Loss"
derivative = "analytic"
gradient = "Gard"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 12, "gradient Gard: type Model has no method Gard; did you mean Grad?"),
	}},
	{"instance typo", `objective = "Model.Loss"
instance = "DefaultModle"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 12, "instance DefaultModle: no such variable or function in package bad; did you mean DefaultModel?"),
	}},
	{"objective is a var", `objective = "NotFunc"
start = 1.0`, []misfitWant{
		misfitInGo(15, 5, "objective NotFunc is not a function"),
	}},
	{"method on a missing type", `objective = "Nope.Loss"
start = 1.0`, []misfitWant{
		misfitInSpec(1, 13, "objective Nope.Loss: no type Nope in package bad"),
	}},
	{"missing method", `objective = "Model.Nope"
start = 1.0`, []misfitWant{
		misfitInSpec(1, 13, "objective Model.Nope: type Model has no method Nope"),
	}},
	{"gradient of the wrong shape", `objective = "Model.Loss"
derivative = "analytic"
gradient = "BadGrad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(23, 16, "gradient BadGrad has signature func(x [2]float64) float64, which does not fit an objective of [2]float64",
			acceptedGradientForm1, acceptedGradientForm2, acceptedGradientForm3, acceptedGradientForm4),
	}},
	{"gradient of the wrong dimension", `objective = "PtrObj"
derivative = "analytic"
gradient = "WrongDimGrad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(33, 6, "gradient WrongDimGrad has signature func(x *[3]float64, g *[3]float64), which does not fit an objective of [2]float64",
			acceptedGradientForm2, acceptedGradientForm3, acceptedGradientForm4),
	}},
	{"scalar gradient of the wrong element type", `objective = "ScalarObj"
derivative = "analytic"
gradient = "ScalarGradWrong"
start = 1.0`, []misfitWant{
		misfitInGo(49, 6, "gradient ScalarGradWrong has signature func(x float64) float32, which does not fit an objective of float64",
			acceptedGradientForm1),
	}},
	{"gradient of the wrong receiver type", `objective = "Model.Loss"
derivative = "analytic"
gradient = "Other.Grad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 12, "gradient Other.Grad must be a method of Model, the objective's receiver type"),
	}},
	{"method gradient for a function objective", `objective = "PtrObj"
derivative = "analytic"
gradient = "Model.Grad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 12, "gradient Model.Grad must be a plain function, like the objective"),
	}},
	{"function gradient for a method objective", `objective = "Model.Loss"
derivative = "analytic"
gradient = "PlainGrad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 12, "gradient PlainGrad is a plain function; it must be a method of Model, like the objective"),
	}},
	{"gradient not found", `objective = "ScalarObj"
derivative = "analytic"
gradient = "Missing"
start = 1.0`, []misfitWant{
		misfitInSpec(3, 12, "gradient Missing: no such function in package bad"),
	}},
	{"instance var of the wrong type", `objective = "Model.Loss"
instance = "WrongInstance"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 12, "instance WrongInstance has type float64; want Model or *Model"),
	}},
	{"instance func of the wrong type", `objective = "Model.Loss"
instance = "NewOther"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 12, "instance NewOther has type Other; want Model or *Model"),
	}},
	{"instance func with parameters", `objective = "Model.Loss"
instance = "TwoParams"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 12, "instance TwoParams must be a package-level variable or a func() returning Model"),
	}},
	{"instance not found", `objective = "Model.Loss"
instance = "Missing"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 12, "instance Missing: no such variable or function in package bad"),
	}},
	{"analytic without a gradient key", `objective = "ScalarObj"
derivative = "analytic"
start = 1.0`, []misfitWant{
		misfitInSpec(2, 14, `derivative = "analytic" needs a gradient key naming the gradient function, or an objective that writes its gradient (combined with the gradient written through g: func(x T, g *T) T`),
	}},
	{"combined objective with a gradient key", `objective = "Both"
derivative = "analytic"
gradient = "PlainGrad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 1, `objective Both writes its gradient through g (func(x *[2]float64, g *[2]float64) float64): remove the gradient key, derivative = "analytic" uses that gradient`),
	}},
	{"combined objective with differences", `objective = "Model.Both"
derivative = "forward"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 14, `objective Model.Both writes its gradient through g (func(x [2]float64, g *[2]float64) float64): set derivative = "analytic", without a gradient key (derivative is "forward", which would ignore it)`),
	}},
	{"combined objective with the default derivative", `objective = "Both"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, `objective Both writes its gradient through g (func(x *[2]float64, g *[2]float64) float64): set derivative = "analytic", without a gradient key (derivative is "central", which would ignore it)`),
	}},
	{"combined objective whose g has another dimension", `objective = "BothWrongDim"
derivative = "analytic"
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(53, 6, "objective BothWrongDim has signature func(x *[2]float64, g *[3]float64) float64", acceptedObjectiveForms, combinedObjectiveForms),
	}},
	{"combined scalar objective whose g has another type", `objective = "BothScalarWrongElem"
derivative = "analytic"
start = 1.0`, []misfitWant{
		misfitInGo(55, 6, "objective BothScalarWrongElem has signature func(x float64, g *float32) float64", combinedObjectiveForms),
	}},
	{"combined slice objective whose g is an array", `objective = "BothSliceArray"
derivative = "analytic"
dim = 2
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(57, 6, "objective BothSliceArray has signature func(x []float64, g *[2]float64) float64", combinedObjectiveForms),
	}},
	{"residuals for an objective of its value", `objective = "ArrayObj"
residuals = 3
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 1, "residuals is only for residual objectives that take slices; ArrayObj returns its value"),
	}},
	{"jacobian for an objective of its value", `objective = "PtrObj"
derivative = "analytic"
gradient = "PlainGrad"
jacobian = "ResJac"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(4, 1, "jacobian is only for residual objectives", "PtrObj returns its value, so name its gradient with the gradient key"),
	}},
	{"least-squares direction for an objective of its value", `objective = "ArrayObj"
direction = "gauss-newton"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 13, `direction "gauss-newton" needs a residual objective`, "ArrayObj returns its value"),
	}},
	{"slice residuals without residuals", `objective = "ResSlice"
dim = 2
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(1, 13, "objective ResSlice writes its residuals into a slice: set residuals to their number"),
	}},
	{"residuals that disagree with the type", `objective = "Res"
residuals = 4
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 13, "residuals is 4, but Res writes 3"),
	}},
	{"gradient key for residuals", `objective = "Res"
derivative = "analytic"
gradient = "PlainGrad"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(3, 1, "objective Res writes residuals, whose gradient Jᵀr comes from their Jacobian: name it with the jacobian key instead of gradient"),
		misfitInSpec(2, 14, `derivative = "analytic" needs a jacobian key naming the residuals' Jacobian`),
	}},
	{"analytic residuals without a jacobian", `objective = "Res"
derivative = "analytic"
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 14, `derivative = "analytic" needs a jacobian key naming the residuals' Jacobian`, "func(x *[N]T, J *[M][N]T) by rows"),
	}},
	{"jacobian of the wrong shape", `objective = "Res"
derivative = "analytic"
jacobian = "ResJacWrong"
start = [1.0, 2.0]`, []misfitWant{
		misfitInGo(65, 6, "jacobian ResJacWrong has signature func(x *[2]float64, j *[2][2]float64), which does not fit 3 residuals of 2 unknowns of float64"),
	}},
	{"scale for residuals", `objective = "Res"
scale = [1.0, 1.0]
start = [1.0, 2.0]`, []misfitWant{
		misfitInSpec(2, 10, "scale is not for residual objectives"),
	}},
	{"a rule's parameter the residual default does not read", `objective = "Res"
start = [1.0, 2.0]
[minimizer.step]
curvature = 0.5`, []misfitWant{
		misfitInSpec(4, 1, `step.curvature is not used by the residual objective's default, direction "levenberg-marquardt" with step.rule "damping"`),
	}},
	{"a Jacobian too large for the stack", `objective = "ResBig"
start = [` + strings.Repeat("0.5, ", 63) + `0.5]`, []misfitWant{
		misfitInSpec(1, 13, "300 residuals of 64 unknowns of float64", "exceed the 131072 bytes Go keeps on the stack"),
	}},
	{"instance for a plain function", `objective = "ScalarObj"
instance = "DefaultModel"
start = 1.0`, []misfitWant{
		misfitInSpec(2, 1, "instance is only for objectives that are methods; ScalarObj is a function"),
	}},
}

// writeMisfitModule writes module "bad" with misfitSource and returns its
// directory.
func writeMisfitModule(t *testing.T) string {
	t.Helper()
	dir := t.TempDir()
	for name, data := range map[string]string{
		"go.mod": "module bad\n\ngo 1.24\n",
		"obj.go": misfitSource,
	} {
		if err := os.WriteFile(filepath.Join(dir, name), []byte(data), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return dir
}

func TestObjectiveErrors(t *testing.T) {
	dir := writeMisfitModule(t)
	var spec strings.Builder
	starts := make([]int, len(misfits)) // line of each case's body
	line := 1
	for i, c := range misfits {
		block := fmt.Sprintf("[[minimizer]]\nname = \"Misfit%d\"\n", i)
		starts[i] = line + 2
		block += c.body + "\n\n"
		spec.WriteString(block)
		line += strings.Count(block, "\n")
	}
	specPath := filepath.Join(dir, "bad.toml")
	if err := os.WriteFile(specPath, []byte(spec.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	before := dirListing(t, dir)

	plans, err := Plans([]string{specPath})
	if err == nil {
		t.Fatalf("Plans succeeded with %d plans, want errors", len(plans))
	}
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("error is %T, want Problems: %v", err, err)
	}
	goFile, _ := filepath.EvalSymlinks(filepath.Join(dir, "obj.go"))
	used := make([]bool, len(probs))
	for i, c := range misfits {
		t.Run(c.name, func(t *testing.T) {
			for _, w := range c.want {
				pos := Pos{File: specPath, Line: starts[i] + w.line - 1, Col: w.col}
				if w.inGo {
					pos = Pos{File: goFile, Line: w.line, Col: w.col}
				}
				found := false
				for j, p := range probs {
					file, _ := filepath.EvalSymlinks(p.Pos.File)
					if used[j] || file != pos.File || p.Pos.Line != pos.Line || p.Pos.Col != pos.Col || !hasAll(p.Msg, w.has) {
						continue
					}
					used[j], found = true, true
					break
				}
				if !found {
					t.Errorf("no problem at %s containing %q; got:\n%v", pos, w.has, err)
				}
			}
		})
	}
	for j, p := range probs {
		if !used[j] {
			t.Errorf("unexpected problem: %s", p.Error())
		}
	}
	if after := dirListing(t, dir); after != before {
		t.Errorf("resolving wrote into the package:\nbefore %s\nafter  %s", before, after)
	}
}

// TestObjectiveFixtureResolves guards the fixture: well-formed minimizers
// on the same package resolve, so the misfits fail for their own reasons.
func TestObjectiveFixtureResolves(t *testing.T) {
	dir := writeMisfitModule(t)
	spec := `[[minimizer]]
name = "Good1"
objective = "Model.Loss"
derivative = "analytic"
gradient = "Model.Grad"
instance = "DefaultModel"
start = [1.0, 2.0]

[[minimizer]]
name = "Good2"
objective = "SliceObj"
dim = 2
start = [1.0, 2.0]

[[minimizer]]
name = "Good3"
objective = "PtrObj"
derivative = "analytic"
gradient = "PlainGrad"
start = [1.0, 2.0]

[[minimizer]]
name = "Good4"
objective = "AliasObj"
start = [1.0, 2.0]

[[minimizer]]
name = "Good5"
objective = "Model.Both"
derivative = "analytic"
instance = "DefaultModel"
start = [1.0, 2.0]
`
	specPath := filepath.Join(dir, "good.toml")
	if err := os.WriteFile(specPath, []byte(spec), 0o644); err != nil {
		t.Fatal(err)
	}
	plans, err := Plans([]string{specPath})
	if err != nil {
		t.Fatalf("Plans: %v", err)
	}
	if len(plans) != 5 || !plans[4].Shape.Combined {
		t.Fatalf("got %d plans, want 5, the last with a combined objective", len(plans))
	}
}

// TestObjectivePackageTypeError: a type error in the user's own code is
// reported at its Go position, and stops resolution.
func TestObjectivePackageTypeError(t *testing.T) {
	dir := writeMisfitModule(t)
	broken := filepath.Join(dir, "broken.go")
	if err := os.WriteFile(broken, []byte("package bad\n\nvar broken int = \"s\"\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	specPath := filepath.Join(dir, "ok.toml")
	if err := os.WriteFile(specPath, []byte("[[minimizer]]\nname = \"Fit\"\nobjective = \"ScalarObj\"\nstart = 1.0\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	_, err := Plans([]string{specPath})
	var probs Problems
	if !errors.As(err, &probs) {
		t.Fatalf("error is %T, want Problems: %v", err, err)
	}
	want, _ := filepath.EvalSymlinks(broken)
	if len(probs) != 1 {
		t.Errorf("got %d problems, want the type error once: %v", len(probs), probs)
	}
	for _, p := range probs {
		file, _ := filepath.EvalSymlinks(p.Pos.File)
		if file != want || p.Pos.Line != 3 || p.Pos.Col != 18 || !strings.Contains(p.Msg, `cannot use "s"`) {
			t.Errorf("unexpected problem: %s", p.Error())
		}
	}
	if len(probs) == 0 {
		t.Errorf("no problem reported for broken.go")
	}
}

// TestPackageDirectoryProblems: a package directory that does not exist,
// or holds no Go files, is one error at the spec's package value.
func TestPackageDirectoryProblems(t *testing.T) {
	dir := t.TempDir()
	if err := os.Mkdir(filepath.Join(dir, "empty"), 0o755); err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct{ pkg, want string }{
		{"./nowhere", "package directory %s does not exist"},
		{"empty", "package directory %s has no Go files"},
	} {
		spec := filepath.Join(dir, "spec.toml")
		body := "package = \"" + c.pkg + "\"\n\n[[minimizer]]\nname = \"Fit\"\nobjective = \"F\"\nstart = 1.0\n"
		if err := os.WriteFile(spec, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		_, err := Plans([]string{spec})
		var probs Problems
		if !errors.As(err, &probs) || len(probs) != 1 {
			t.Fatalf("package %q: got %v, want one problem", c.pkg, err)
		}
		p := probs[0]
		wantMsg := fmt.Sprintf(c.want, displayPath(filepath.Join(dir, filepath.FromSlash(c.pkg))))
		if p.Pos.File != spec || p.Pos.Line != 1 || p.Pos.Col != 11 || p.Msg != wantMsg {
			t.Errorf("package %q: got %s, want %s:1:11: %s", c.pkg, p.Error(), spec, wantMsg)
		}
	}
}

func hasAll(s string, subs []string) bool {
	for _, sub := range subs {
		if !strings.Contains(s, sub) {
			return false
		}
	}
	return true
}

// dirListing renders a directory's file names and sizes, hidden files included.
func dirListing(t *testing.T, dir string) string {
	t.Helper()
	entries, err := os.ReadDir(dir)
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	for _, e := range entries {
		info, err := e.Info()
		if err != nil {
			t.Fatal(err)
		}
		fmt.Fprintf(&b, "%s:%d ", e.Name(), info.Size())
	}
	return b.String()
}
