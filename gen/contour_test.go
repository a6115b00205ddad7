package gen

import (
	"math"
	"reflect"
	"sort"
	"testing"
)

// sortedPoints returns a line's points in a canonical order, for
// comparing lines whose direction marching squares does not fix.
func sortedPoints(line [][2]float64) [][2]float64 {
	out := append([][2]float64(nil), line...)
	sort.Slice(out, func(i, j int) bool {
		if out[i][0] != out[j][0] {
			return out[i][0] < out[j][0]
		}
		return out[i][1] < out[j][1]
	})
	return out
}

func closeTo(a, b [2]float64) bool {
	return math.Abs(a[0]-b[0]) < 1e-12 && math.Abs(a[1]-b[1]) < 1e-12
}

func samePoints(t *testing.T, what string, got, want [][2]float64) {
	t.Helper()
	g, w := sortedPoints(got), sortedPoints(want)
	if len(g) != len(w) {
		t.Errorf("%s: got %v, want %v", what, got, want)
		return
	}
	for i := range g {
		if !closeTo(g[i], w[i]) {
			t.Errorf("%s: got %v, want %v", what, got, want)
			return
		}
	}
}

// One corner above the level cuts it off with one segment between the
// crossings, placed by linear interpolation.
func TestContourLinesOneCorner(t *testing.T) {
	xs, ys := []float64{0, 1}, []float64{0, 2}
	z := [][]float64{{0, 0}, {0, 1}} // z[j][i]: only (1, 2) is high
	lines := contourLines(xs, ys, z, 0.25)
	if len(lines) != 1 {
		t.Fatalf("got %d lines, want 1: %v", len(lines), lines)
	}
	samePoints(t, "corner", lines[0], [][2]float64{{1, 0.5}, {0.25, 2}})
}

// The level set |x| + |y| = ½ over a 3×3 grid is a diamond: one closed
// line through the four edge midpoints that returns to its first point.
func TestContourLinesClosedDiamond(t *testing.T) {
	xs := []float64{-1, 0, 1}
	z := make([][]float64, 3)
	for j, y := range xs {
		for _, x := range xs {
			z[j] = append(z[j], math.Abs(x)+math.Abs(y))
		}
	}
	lines := contourLines(xs, xs, z, 0.5)
	if len(lines) != 1 || len(lines[0]) != 5 || lines[0][0] != lines[0][4] {
		t.Fatalf("got %v, want one closed line of 4 points", lines)
	}
	samePoints(t, "diamond", lines[0][:4], [][2]float64{{-0.5, 0}, {0.5, 0}, {0, -0.5}, {0, 0.5}})
}

// Segments through shared edges are chained into one line, in order.
func TestContourLinesChain(t *testing.T) {
	xs := []float64{0, 1, 2}
	z := [][]float64{{0, 1, 2}, {0, 1, 2}, {0, 1, 2}}
	lines := contourLines(xs, xs, z, 1.5)
	if len(lines) != 1 || len(lines[0]) != 3 {
		t.Fatalf("got %v, want one line of 3 points", lines)
	}
	if lines[0][0][1] > lines[0][2][1] { // either direction is right
		lines[0][0], lines[0][2] = lines[0][2], lines[0][0]
	}
	for k, want := range [][2]float64{{1.5, 0}, {1.5, 1}, {1.5, 2}} {
		if !closeTo(lines[0][k], want) {
			t.Errorf("point %d is %v, want %v", k, lines[0][k], want)
		}
	}
}

// A saddle cell (opposite corners high) is resolved by the mean of its
// corners: the high corners stay connected when the mean is at or above
// the level, the low ones otherwise.
func TestContourLinesSaddle(t *testing.T) {
	xs := []float64{0, 1}
	z := [][]float64{{1, 0}, {0, 1}} // high at (0, 0) and (1, 1); mean ½
	check := func(level float64, want [][][2]float64) {
		t.Helper()
		lines := contourLines(xs, xs, z, level)
		if len(lines) != len(want) {
			t.Fatalf("level %g: got %v, want %v", level, lines, want)
		}
		var got [][][2]float64
		for _, l := range lines {
			got = append(got, sortedPoints(l))
		}
		sort.Slice(got, func(i, j int) bool { return got[i][0][0] < got[j][0][0] })
		for i := range want {
			samePoints(t, "saddle", got[i], want[i])
		}
	}
	// Mean ½ ≥ 0.5: the low corners (1, 0) and (0, 1) are cut off.
	check(0.5, [][][2]float64{{{0, 0.5}, {0.5, 1}}, {{0.5, 0}, {1, 0.5}}})
	// Mean ½ < 0.6: the high corners (0, 0) and (1, 1) are cut off.
	check(0.6, [][][2]float64{{{0, 0.4}, {0.4, 0}}, {{0.6, 1}, {1, 0.6}}})
}

// A cell with a NaN or infinite corner draws nothing; its neighbours do.
func TestContourLinesSkipNonFinite(t *testing.T) {
	xs, ys := []float64{0, 1, 2}, []float64{0, 1}
	z := [][]float64{{0, 1, math.NaN()}, {0, 1, math.Inf(1)}}
	lines := contourLines(xs, ys, z, 0.5)
	if len(lines) != 1 {
		t.Fatalf("got %v, want the one line of the finite cell", lines)
	}
	samePoints(t, "finite cell", lines[0], [][2]float64{{0.5, 0}, {0.5, 1}})
	if lines := contourLines(xs, ys, z, 1.5); len(lines) != 0 {
		t.Errorf("the non-finite cell drew %v", lines)
	}
}

// Levels are whole multiples of the step in log₁₀(f − f_min), the
// smallest step giving at most maxLevels, between the 1% and 95%
// quantiles.
func TestContourLevels(t *testing.T) {
	var values []float64
	for k := 0; k <= 8; k++ {
		values = append(values, math.Pow(10, float64(k)))
	}
	values = append(values, 0) // f_min itself is no level
	exps, step := contourLevels(values, 0, 12)
	if want := []float64{0, 1, 2, 3, 4, 5, 6, 7}; step != 1 || !reflect.DeepEqual(exps, want) {
		t.Errorf("got %v every %g decades, want %v every decade", exps, step, want)
	}
	exps, step = contourLevels(values, 0, 20)
	if step != 0.5 || len(exps) != 15 || exps[0] != 0 || exps[14] != 7 {
		t.Errorf("with 20 levels allowed: got %v every %g decades, want 0 … 7 every half decade", exps, step)
	}
	if exps, _ := contourLevels([]float64{3, 3, 3, math.NaN()}, 3, 12); exps != nil {
		t.Errorf("a constant f gave levels %v", exps)
	}
}
