package templates

import "math"

// finite reports whether v is neither NaN nor ±Inf, by comparing it with
// the largest finite value of elem: a NaN fails both comparisons. The
// shorter test v-v == 0 is not used, since it relies on exact
// cancellation: when v is a product inlined from the objective, compilers
// for arm64, ppc64le, s390x, riscv64 and amd64 v3 may fuse v-v into one
// multiply-subtract, x·y − round(x·y), which yields the product's
// rounding error instead of 0 (the Go spec allows such fusion; comparisons
// are never fused).
func finite(v elem) bool {
	return v >= -largestFinite && v <= largestFinite
}

// finiteVec reports whether every component of x is finite.
func finiteVec(x *vec) bool {
	for i := range x {
		if !finite(x[i]) {
			return false
		}
	}
	return true
}

// larger returns the larger of a and b, or a NaN among them. The builtin
// max is not used: a package-level max or min in the user's package would
// shadow it in the generated file.
func larger(a, b elem) elem {
	if a > b || a != a {
		return a
	}
	return b
}

// abs returns |v|.
func abs(v elem) elem {
	if v < 0 {
		return -v
	}
	return v
}

// maxAbs returns the largest |x_i|, the infinity norm.
func maxAbs(x *vec) elem {
	var m elem
	for i := range x {
		if a := abs(x[i]); a > m || a != a {
			m = a
		}
	}
	return m
}

// dot returns aᵀb.
func dot(a, b *vec) elem {
	var s elem
	for i := range a {
		s += a[i] * b[i]
	}
	return s
}

// moveTo sets out = x + t·d.
func moveTo(out, x *vec, t elem, d *vec) {
	for i := range x {
		out[i] = x[i] + t*d[i]
	}
}

// difference sets out = a − b.
func difference(out, a, b *vec) {
	for i := range a {
		out[i] = a[i] - b[i]
	}
}

// negate sets out = −x.
func negate(out, x *vec) {
	for i := range x {
		out[i] = -x[i]
	}
}

// squareRoot returns √v.
func squareRoot(v elem) elem {
	return elem(math.Sqrt(float64(v)))
}

// stepWithin is the step test: every |s_i| ≤ tol·stepScale(x_i),
// (|x_i| + 1), or max(|x_i|, typical_i) for a residual objective. It judges each
// component on its own scale, so a small component still moving is not
// hidden by a large one.
func stepWithin(s, x *vec, tol elem, diffs *differences) bool {
	for i := range s {
		if !(abs(s[i]) <= tol*stepScale(x[i], i, diffs)) {
			return false
		}
	}
	return true
}

// stepFloor is the step limit along one search direction: the longest
// step t whose move t·d passes the step test (tinyStep), computed on first
// use. A line search needs it only after a trial fails, and the first
// trial is accepted in most iterations (99.5 % of them on extended
// Rosenbrock with steepest descent, bench/), which then skip its N
// divisions.
type stepFloor struct {
	tol   elem // the step test's tolerance, lim.Step
	value elem // tinyStep along d, once known
	known bool
}

// at is the floor along d from x, computed the first time it is asked for.
func (f *stepFloor) at(x, d *vec, diffs *differences) elem {
	if !f.known {
		f.value, f.known = tinyStep(x, d, f.tol, diffs), true
	}
	return f.value
}

// tinyStep returns the longest t for which the step t·d from x passes the
// step test, min over i of tol·stepScale(x_i)/|d_i|, or −1 when d is zero.
func tinyStep(x, d *vec, tol elem, diffs *differences) elem {
	tiny := elem(-1)
	for i := range x {
		if d[i] != 0 {
			if t := tol * stepScale(x[i], i, diffs) / abs(d[i]); tiny < 0 || t < tiny {
				tiny = t
			}
		}
	}
	return tiny
}

// shortenAlong is where the searches that test sufficient decrease begin:
// when ∇fᵀd, the slope, overflowed (gradients near 1e200), every trial
// would fail the test against −Inf, so it shortens d in place
// (shrinkDirection) and returns the finite slope. The searches ask for
// their step limit (stepFloor) only afterwards, so it is computed along
// the shorter d. The fixed step does not call it: its step is t·d by
// definition.
func shortenAlong(g, d *vec, slope elem) elem {
	if finite(slope) || !finiteVec(d) {
		return slope
	}
	shrinkDirection(d, g)
	return dot(g, d)
}

// shrinkDirection scales d so that ∇fᵀd, with ∇f = g, is finite: to a
// largest component of 1, and when ∇fᵀd still overflows, down by the
// largest |gᵢ| too, after which |∇fᵀd| ≤ dim.
func shrinkDirection(d, g *vec) {
	if m := maxAbs(d); m > 0 {
		scaleBy(d, 1/m)
	}
	if !finite(dot(g, d)) {
		if m := maxAbs(g); m > 1 {
			scaleBy(d, 1/m)
		}
	}
}

// scaleBy sets x = c·x.
func scaleBy(x *vec, c elem) {
	for i := range x {
		x[i] *= c
	}
}

// stepScale is the scale the step test measures a change of x_i against.
// It stands in for the objective's kind; gen keeps only that one under
// this name.
func stepScale(xi elem, i int, diffs *differences) elem {
	if residualObjective {
		return typicalScale(xi, i, diffs)
	}
	return offsetScale(xi, i, diffs)
}

// offsetScale is |x_i| + 1: relative for large x_i, absolute near 0.
func offsetScale(xi elem, i int, diffs *differences) elem {
	return abs(xi) + 1
}
