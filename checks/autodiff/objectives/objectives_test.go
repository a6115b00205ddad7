package objectives

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/optimize/functions"
)

// instance pairs one transcribed objective with gonum's Func for it.
type instance struct {
	name  string
	start []float64 // MGH's x₀ (as in ../../mgh/table.go)
	f     func(x []float64) float64
	ref   funcer
}

// funcer is what every gonum test function implements.
type funcer interface{ Func(x []float64) float64 }

func wrap2(f func(*[2]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[2]float64)(x)) }
}
func wrap3(f func(*[3]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[3]float64)(x)) }
}
func wrap4(f func(*[4]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[4]float64)(x)) }
}
func wrap6(f func(*[6]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[6]float64)(x)) }
}
func wrap9(f func(*[9]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[9]float64)(x)) }
}
func wrap10(f func(*[10]float64) float64) func([]float64) float64 {
	return func(x []float64) float64 { return f((*[10]float64)(x)) }
}

// instances lists every objective with the standard start of
// ../../mgh/table.go (MGH 1981, §3).
var instances = []instance{
	{"Rosenbrock", []float64{-1.2, 1}, wrap2(Rosenbrock), functions.ExtendedRosenbrock{}},
	{"PowellBadlyScaled", []float64{0, 1}, wrap2(PowellBadlyScaled), functions.PowellBadlyScaled{}},
	{"BrownBadlyScaled", []float64{1, 1}, wrap2(BrownBadlyScaled), functions.BrownBadlyScaled{}},
	{"Beale", []float64{1, 1}, wrap2(Beale), functions.Beale{}},
	{"HelicalValley", []float64{-1, 0, 0}, wrap3(HelicalValley), functions.HelicalValley{}},
	{"Gaussian", []float64{0.4, 1, 0}, wrap3(Gaussian), functions.Gaussian{}},
	{"GulfRD", []float64{5, 2.5, 0.15}, wrap3(GulfRD), functions.GulfResearchAndDevelopment{}},
	{"Box3D", []float64{0, 10, 20}, wrap3(Box3D), functions.Box3D{}},
	{"PowellSingular", []float64{3, -1, 0, 1}, wrap4(PowellSingular), functions.ExtendedPowellSingular{}},
	{"Wood", []float64{-3, -1, -3, -1}, wrap4(Wood), functions.Wood{}},
	{"BrownDennis", []float64{25, 5, -5, -1}, wrap4(BrownDennis), functions.BrownAndDennis{}},
	{"BiggsEXP6", []float64{1, 2, 1, 1, 1, 1}, wrap6(BiggsEXP6), functions.BiggsEXP6{}},
	{"Watson6", []float64{0, 0, 0, 0, 0, 0}, wrap6(Watson6), functions.Watson{}},
	{"Watson9", []float64{0, 0, 0, 0, 0, 0, 0, 0, 0}, wrap9(Watson9), functions.Watson{}},
	{"PenaltyI4", []float64{1, 2, 3, 4}, wrap4(PenaltyI4), functions.PenaltyI{}},
	{"PenaltyI10", []float64{1, 2, 3, 4, 5, 6, 7, 8, 9, 10}, wrap10(PenaltyI10), functions.PenaltyI{}},
	{"PenaltyII4", []float64{0.5, 0.5, 0.5, 0.5}, wrap4(PenaltyII4), functions.PenaltyII{}},
	{"PenaltyII10", []float64{0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5, 0.5}, wrap10(PenaltyII10), functions.PenaltyII{}},
	{"VariablyDimensioned10", []float64{0.9, 0.8, 0.7, 0.6, 0.5, 0.4, 0.3, 0.2, 0.1, 0}, wrap10(VariablyDimensioned10), functions.VariablyDimensioned{}},
	{"Trigonometric10", []float64{0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1, 0.1}, wrap10(Trigonometric10), functions.Trigonometric{}},
}

const (
	relTol  = 1e-13 // the transcription against gonum's Func: equal to rounding (common practice)
	nPoints = 10    // pseudo-random points near each start
)

// TestAgainstGonum checks each objective against gonum's Func at the
// standard start and at nPoints deterministic points start_i +
// u·max(1, |start_i|), u uniform in [−1/2, 1/2).
func TestAgainstGonum(t *testing.T) {
	rng := rand.New(rand.NewPCG(20260101, 1981))
	for _, in := range instances {
		t.Run(in.name, func(t *testing.T) {
			points := [][]float64{append([]float64(nil), in.start...)}
			for range nPoints {
				x := make([]float64, len(in.start))
				for i, s := range in.start {
					x[i] = s + (rng.Float64()-0.5)*math.Max(1, math.Abs(s))
				}
				points = append(points, x)
			}
			exact := 0
			for _, x := range points {
				xr := append([]float64(nil), x...)
				want := in.ref.Func(xr)
				got := in.f(x)
				if math.IsNaN(want) || math.IsInf(want, 0) {
					t.Fatalf("gonum's value at %v is %v", x, want)
				}
				if d := math.Abs(got - want); d > relTol*math.Max(math.Abs(want), 1e-300) {
					t.Errorf("at %v: got %.17g, gonum %.17g (rel diff %.3g)", x, got, want, d/math.Max(math.Abs(want), 1e-300))
				}
				if got == want {
					exact++
				}
			}
			t.Logf("%d/%d points bit-identical to gonum", exact, len(points))
		})
	}
}

// TestHelicalValleyAtZero documents the one deviation from gonum: at x₁ = 0,
// where gonum panics, HelicalValley evaluates its formula instead.
func TestHelicalValleyAtZero(t *testing.T) {
	if v := HelicalValley(&[3]float64{0, 1, 0}); math.IsNaN(v) {
		t.Errorf("HelicalValley(0, 1, 0) = NaN, want the θ = 1/4 value")
	}
	if v := HelicalValley(&[3]float64{0, 0, 0}); !math.IsNaN(v) {
		t.Errorf("HelicalValley(0, 0, 0) = %v, want NaN (0/0)", v)
	}
}
