package gen

import (
	"math"
	"sort"
)

// contourLines returns where the objective, sampled as z[j][i] at
// (xs[i], ys[j]), crosses level, as polylines in data coordinates, by
// marching squares: each cell's corners are classed as at or above the
// level or below it, the crossing on each edge whose ends differ is placed
// by linear interpolation, and the crossings of a cell are joined in
// pairs. A cell with all four edges crossed (a saddle) is resolved by the
// mean of its corners: the corners on the mean's side stay connected.
// Cells with a NaN or ±Inf corner are skipped. Segments that share an
// edge are chained, so a closed curve comes back to its first point. The
// result depends only on the input, in grid order.
func contourLines(xs, ys []float64, z [][]float64, level float64) [][][2]float64 {
	nx, ny := len(xs), len(ys)
	if nx < 2 || ny < 2 {
		return nil
	}
	// Edge ids: 2·(j·nx + i) for the edge from (i, j) to (i+1, j), and one
	// more for the edge from (i, j) to (i, j+1).
	horizontal := func(i, j int) int { return 2 * (j*nx + i) }
	vertical := func(i, j int) int { return 2*(j*nx+i) + 1 }
	point := func(edge int) [2]float64 {
		k := edge / 2
		i, j := k%nx, k/nx
		i2, j2 := i+1, j
		if edge%2 == 1 {
			i2, j2 = i, j+1
		}
		a, b := z[j][i], z[j2][i2]
		t := (level - a) / (b - a)
		return [2]float64{xs[i] + t*(xs[i2]-xs[i]), ys[j] + t*(ys[j2]-ys[j])}
	}
	var segments [][2]int
	for j := 0; j+1 < ny; j++ {
		for i := 0; i+1 < nx; i++ {
			// Corners counterclockwise from the lower left, and the edge
			// leaving each corner counterclockwise.
			c := [4]float64{z[j][i], z[j][i+1], z[j+1][i+1], z[j+1][i]}
			edges := [4]int{horizontal(i, j), vertical(i+1, j), horizontal(i, j+1), vertical(i, j)}
			finiteCell := true
			for _, v := range c {
				finiteCell = finiteCell && !math.IsNaN(v) && !math.IsInf(v, 0)
			}
			if !finiteCell {
				continue
			}
			var above [4]bool
			var crossed []int // indices into edges
			for k := range c {
				above[k] = c[k] >= level
			}
			for k := range c {
				if above[k] != above[(k+1)%4] {
					crossed = append(crossed, k)
				}
			}
			switch len(crossed) {
			case 2:
				segments = append(segments, [2]int{edges[crossed[0]], edges[crossed[1]]})
			case 4:
				// Cut off the two corners on the other side of the mean:
				// corner k lies between edges k−1 and k.
				mean := (c[0] + c[1] + c[2] + c[3]) / 4
				for k := range c {
					if above[k] != (mean >= level) {
						segments = append(segments, [2]int{edges[(k+3)%4], edges[k]})
					}
				}
			}
		}
	}
	// Chain segments through shared edges; each edge has at most two.
	byEdge := map[int][]int{}
	for s, seg := range segments {
		byEdge[seg[0]] = append(byEdge[seg[0]], s)
		byEdge[seg[1]] = append(byEdge[seg[1]], s)
	}
	used := make([]bool, len(segments))
	next := func(edge int) (int, int, bool) { // an unused segment through edge, and its other end
		for _, s := range byEdge[edge] {
			if !used[s] {
				other := segments[s][0]
				if other == edge {
					other = segments[s][1]
				}
				return s, other, true
			}
		}
		return 0, 0, false
	}
	var lines [][][2]float64
	for s := range segments {
		if used[s] {
			continue
		}
		used[s] = true
		chain := []int{segments[s][0], segments[s][1]}
		for { // forward from the last edge
			n, other, ok := next(chain[len(chain)-1])
			if !ok {
				break
			}
			used[n] = true
			chain = append(chain, other)
		}
		if chain[0] != chain[len(chain)-1] { // open: extend backward from the first edge
			var back []int
			for edge := chain[0]; ; {
				n, other, ok := next(edge)
				if !ok {
					break
				}
				used[n] = true
				back = append(back, other)
				edge = other
			}
			for l, r := 0, len(back)-1; l < r; l, r = l+1, r-1 {
				back[l], back[r] = back[r], back[l]
			}
			chain = append(back, chain...)
		}
		line := make([][2]float64, len(chain))
		for k, edge := range chain {
			line[k] = point(edge)
		}
		lines = append(lines, line)
	}
	return lines
}

// contourLevels chooses levels f_min + 10^e for contours of values: the
// exponents e are the multiples of a step (a quarter, half, one, two, five
// … decades, the smallest that gives at most maxLevels) between the
// log₁₀ of the 1% and 95% quantiles of values − f_min, above f_min. Even
// steps in log(f − f_min) follow a valley down to its floor, where even
// steps in f would crowd at the walls and leave the floor blank. It
// returns nil when f is constant over the values or none is finite.
func contourLevels(values []float64, fMin float64, maxLevels int) (exponents []float64, step float64) {
	var gaps []float64
	for _, v := range values {
		if d := v - fMin; d > 0 && !math.IsInf(d, 0) {
			gaps = append(gaps, d)
		}
	}
	if len(gaps) == 0 {
		return nil, 0
	}
	sort.Float64s(gaps)
	quantile := func(q float64) float64 { return gaps[int(q*float64(len(gaps)-1))] }
	lo, hi := math.Log10(quantile(0.01)), math.Log10(quantile(0.95))
	for _, step = range []float64{0.25, 0.5, 1, 2, 5, 10, 20, 50, 100} {
		first, last := math.Ceil(lo/step), math.Floor(hi/step)
		if last-first+1 <= float64(maxLevels) {
			for k := first; k <= last; k++ {
				exponents = append(exponents, k*step)
			}
			if len(exponents) == 0 { // the quantiles lie within one step
				exponents = []float64{(lo + hi) / 2}
			}
			return exponents, step
		}
	}
	return []float64{(lo + hi) / 2}, 0
}
