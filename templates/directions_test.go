package templates

import (
	"math"
	"math/rand/v2"
	"testing"
)

// square is a dim×dim matrix stored by rows, used only to build reference
// inverse Hessians the long way.
type square = [dim]vec

// unitMatrix returns γ·I.
func unitMatrix(gamma float64) square {
	var m square
	for i := range m {
		m[i][i] = gamma
	}
	return m
}

// product returns a·b.
func product(a, b square) square {
	var m square
	for i := range m {
		for j := range m[i] {
			for k := range b {
				m[i][j] += a[i][k] * b[k][j]
			}
		}
	}
	return m
}

// apply returns m·v.
func apply(m square, v vec) vec {
	var out vec
	for i := range m {
		for j := range v {
			out[i] += m[i][j] * v[j]
		}
	}
	return out
}

// referenceBFGS applies the BFGS inverse update literally as written in
// Nocedal & Wright 2006, eq. 6.17:
//
//	H₊ = (I − ρ s yᵀ) H (I − ρ y sᵀ) + ρ s sᵀ,  ρ = 1/(yᵀs),
//
// forming both factors and multiplying them out, so that it shares no
// algebra with the expanded form in bfgs.go.
func referenceBFGS(h square, s, y vec) square {
	rho := 1 / dot(&s, &y)
	var left, right, outer square
	for i := range left {
		for j := range left[i] {
			left[i][j] = -rho * s[i] * y[j]
			right[i][j] = -rho * y[i] * s[j]
			outer[i][j] = rho * s[i] * s[j]
		}
		left[i][i]++
		right[i][i]++
	}
	m := product(product(left, h), right)
	for i := range m {
		for j := range m[i] {
			m[i][j] += outer[i][j]
		}
	}
	return m
}

// matrixGap returns max |a_ij − b_ij| / max(1, max |b_ij|).
func matrixGap(a, b square) float64 {
	var gap, size float64
	for i := range a {
		for j := range a[i] {
			gap = max(gap, math.Abs(a[i][j]-b[i][j]))
			size = max(size, math.Abs(b[i][j]))
		}
	}
	return gap / max(1, size)
}

// vectorGap returns max |a_i − b_i| / max(1, max |b_i|).
func vectorGap(a, b vec) float64 {
	var gap, size float64
	for i := range a {
		gap = max(gap, math.Abs(a[i]-b[i]))
		size = max(size, math.Abs(b[i]))
	}
	return gap / max(1, size)
}

// randomPairs returns n correction pairs (s, y) with y = A s for a random
// symmetric, strictly diagonally dominant (hence positive definite) A drawn
// afresh for each pair, so sᵀy = sᵀAs > 0 (Nocedal & Wright 2006, §6.1:
// the curvature condition holds for pairs from a strongly convex
// quadratic). A fresh A per pair keeps the pairs mutually inconsistent,
// so the result of a quasi-Newton update depends on which pairs it used.
func randomPairs(rng *rand.Rand, n int) (steps, changes []vec) {
	for len(steps) < n {
		var a square
		for i := range a {
			a[i][i] = 1 + 3*rng.Float64()
			for j := 0; j < i; j++ {
				v := rng.Float64() - 0.5
				a[i][j], a[j][i] = v, v
			}
		}
		for i := range a { // make the diagonal dominate the row
			var off float64
			for j := range a[i] {
				if j != i {
					off += math.Abs(a[i][j])
				}
			}
			a[i][i] += off
		}
		var s vec
		for i := range s {
			s[i] = 2*rng.Float64() - 1
		}
		y := apply(a, s)
		if !curvatureSafeFrom(pairProducts(&s, &y)) {
			continue // practically never for these pairs; keep the data valid regardless
		}
		steps = append(steps, s)
		changes = append(changes, y)
	}
	return steps, changes
}

func randomVec(rng *rand.Rand) vec {
	var v vec
	for i := range v {
		v[i] = 4*rng.Float64() - 2
	}
	return v
}

// After an update with a safe pair the BFGS inverse Hessian satisfies the
// secant equation H₊y = s (Nocedal & Wright 2006, §6.1: the secant
// equation B₊s = y, eq. 6.6, written for H = B⁻¹; both equation numbers
// recalled from memory) and stays symmetric (eq. 6.17 maps symmetric H to
// symmetric H₊). compute returns d = −H·g (eq. 6.18, recalled from memory).
func TestBFGSSecantAndSymmetry(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 6))
	steps, changes := randomPairs(rng, 12)
	var dir bfgsDirection
	dir.reset()
	for k := range steps {
		dir.update(&steps[k], &changes[k])
		hy := apply(dir.h, changes[k])
		if gap := vectorGap(hy, steps[k]); gap > 1e-13 {
			t.Errorf("update %d: H·y = %v, want s = %v (gap %g)", k, hy, steps[k], gap)
		}
		for i := range dir.h {
			for j := 0; j < i; j++ {
				if gap := math.Abs(dir.h[i][j] - dir.h[j][i]); gap > 1e-15*max(1, math.Abs(dir.h[i][j])) {
					t.Errorf("update %d: H[%d][%d] = %g but H[%d][%d] = %g", k, i, j, dir.h[i][j], j, i, dir.h[j][i])
				}
			}
		}
		g := randomVec(rng)
		var d vec
		dir.compute(&g, &d)
		want := apply(dir.h, g)
		negate(&want, &want)
		if gap := vectorGap(d, want); gap > 1e-15 {
			t.Errorf("update %d: d = %v, want −H·g = %v", k, d, want)
		}
	}
}

// The first safe update starts from H₀ = γI, γ = yᵀs/yᵀy (Nocedal & Wright
// 2006, eq. 6.20), and applies eq. 6.17 to it; later updates apply eq.
// 6.17 to the current H without rescaling. After reset the scaling is
// applied again, and an unsafe pair before the first safe one does not
// use it up.
func TestBFGSUpdateMatchesEquation617(t *testing.T) {
	rng := rand.New(rand.NewPCG(2, 17))
	steps, changes := randomPairs(rng, 6)
	var dir bfgsDirection
	for round := 0; round < 2; round++ {
		dir.reset()
		if round == 1 {
			// A pair with sᵀy < 0 must neither change H nor consume the
			// eq. 6.20 scaling.
			s, y := vec{1, 0}, vec{-1, 0.5}
			dir.update(&s, &y)
		}
		s0, y0 := steps[0], changes[0]
		want := referenceBFGS(unitMatrix(dot(&y0, &s0)/dot(&y0, &y0)), s0, y0) // eqs. 6.20 and 6.17
		dir.update(&s0, &y0)
		if gap := matrixGap(dir.h, want); gap > 1e-14 {
			t.Fatalf("round %d, first update: H = %v, want %v (gap %g)", round, dir.h, want, gap)
		}
		for k := 1; k < len(steps); k++ {
			want = referenceBFGS(want, steps[k], changes[k]) // eq. 6.17, no rescaling
			dir.update(&steps[k], &changes[k])
			if gap := matrixGap(dir.h, want); gap > 1e-12 {
				t.Fatalf("round %d, update %d: H = %v, want %v (gap %g)", round, k, dir.h, want, gap)
			}
		}
	}
}

// A pair whose curvature sᵀy is not safely positive leaves H exactly as it
// was: skipping keeps H positive definite (Nocedal & Wright 2006, §6.1,
// the curvature condition 6.7).
func TestBFGSSkipsUnsafePairs(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 7))
	steps, changes := randomPairs(rng, 3)
	var dir bfgsDirection
	dir.reset()
	for k := range steps {
		dir.update(&steps[k], &changes[k])
	}
	unsafe := []struct {
		name string
		s, y vec
	}{
		{"negative curvature", vec{1, 2}, vec{-1, 0.25}},
		{"zero curvature", vec{1, 0}, vec{0, 3}},
		{"zero step", vec{0, 0}, vec{1, 1}},
		{"zero change", vec{1, 1}, vec{0, 0}},
		{"negligible curvature", vec{1, 0}, vec{1e-9, 1}},
		{"NaN change", vec{1, 1}, vec{math.NaN(), 1}},
	}
	for _, c := range unsafe {
		before := dir
		dir.update(&c.s, &c.y)
		if dir != before {
			t.Errorf("%s: H changed from %v to %v", c.name, before.h, dir.h)
		}
	}
}

// reset restores H = I exactly, so the next direction is −g, and re-arms
// the eq. 6.20 scaling.
func TestBFGSResetRestoresIdentity(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 9))
	steps, changes := randomPairs(rng, 4)
	var dir bfgsDirection
	dir.reset()
	for k := range steps {
		dir.update(&steps[k], &changes[k])
	}
	dir.reset()
	if dir.h != unitMatrix(1) || dir.scaled {
		t.Fatalf("after reset H = %v, scaled = %v; want I, false", dir.h, dir.scaled)
	}
	g := vec{3, -0.5}
	var d vec
	dir.compute(&g, &d)
	if d != (vec{-3, 0.5}) {
		t.Errorf("after reset d = %v, want −g", d)
	}
}

// referenceLBFGS builds the L-BFGS inverse Hessian explicitly: H₀ = γI
// with γ = sᵀy/yᵀy of the newest pair (Nocedal & Wright 2006, eq. 7.20,
// recalled from memory), then eq. 6.17 for each pair from oldest to newest
// (the matrix the two-loop recursion, Algorithm 7.4, applies implicitly).
func referenceLBFGS(steps, changes []vec) square {
	newest := len(steps) - 1
	h := unitMatrix(dot(&steps[newest], &changes[newest]) / dot(&changes[newest], &changes[newest]))
	for k := range steps {
		h = referenceBFGS(h, steps[k], changes[k])
	}
	return h
}

// The two-loop recursion returns −H·g for the explicit H of referenceLBFGS
// built from the newest min(count, lbfgsMemory) pairs, for every count up
// to well past lbfgsMemory, where the ring buffer wraps and the oldest
// pairs must drop out.
func TestLBFGSMatchesExplicitMatrix(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 74))
	total := 3*lbfgsMemory + 2
	steps, changes := randomPairs(rng, total)
	var dir lbfgsDirection
	dir.reset()
	for n := 1; n <= total; n++ {
		dir.update(&steps[n-1], &changes[n-1])
		oldest := max(0, n-lbfgsMemory)
		h := referenceLBFGS(steps[oldest:n], changes[oldest:n])
		if dir.count != n-oldest {
			t.Fatalf("after %d updates count = %d, want %d", n, dir.count, n-oldest)
		}
		for trial := 0; trial < 3; trial++ {
			g := randomVec(rng)
			var d vec
			dir.compute(&g, &d)
			want := apply(h, g)
			negate(&want, &want)
			if gap := vectorGap(d, want); gap > 1e-12 {
				t.Errorf("after %d updates: d = %v, want −H·g = %v (gap %g)", n, d, want, gap)
			}
			if n > lbfgsMemory {
				// The check above must be able to tell a buffer that kept a
				// stale pair from one that did not.
				stale := referenceLBFGS(steps[oldest-1:n], changes[oldest-1:n])
				wrong := apply(stale, g)
				negate(&wrong, &wrong)
				if vectorGap(wrong, want) < 1e-8 {
					t.Fatalf("after %d updates the test data cannot tell %d pairs from %d", n, lbfgsMemory, lbfgsMemory+1)
				}
			}
		}
	}
}

// With one pair, L-BFGS and BFGS build the same matrix: both start from
// γI of that pair (Nocedal & Wright 2006, eqs. 6.20 and 7.20) and apply
// eq. 6.17 once.
func TestLBFGSWithOnePairMatchesBFGS(t *testing.T) {
	rng := rand.New(rand.NewPCG(6, 1))
	steps, changes := randomPairs(rng, 1)
	var full bfgsDirection
	var limited lbfgsDirection
	full.reset()
	limited.reset()
	full.update(&steps[0], &changes[0])
	limited.update(&steps[0], &changes[0])
	g := randomVec(rng)
	var dFull, dLimited vec
	full.compute(&g, &dFull)
	limited.compute(&g, &dLimited)
	if gap := vectorGap(dLimited, dFull); gap > 1e-14 {
		t.Errorf("L-BFGS d = %v, BFGS d = %v", dLimited, dFull)
	}
}

// L-BFGS skips unsafe pairs (Nocedal & Wright 2006, §7.2 with condition
// 6.7), and reset empties the memory so that d = −g.
func TestLBFGSSkipAndReset(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 3))
	steps, changes := randomPairs(rng, 3)
	var dir lbfgsDirection
	dir.reset()
	for k := range steps {
		dir.update(&steps[k], &changes[k])
	}
	before := dir
	for _, pair := range [][2]vec{{{1, 0}, {-2, 1}}, {{0, 0}, {1, 1}}, {{1, 0}, {1e-9, 1}}, {{1, math.Inf(1)}, {1, 1}}} {
		dir.update(&pair[0], &pair[1])
		if dir != before {
			t.Errorf("pair %v changed the memory", pair)
		}
	}
	dir.reset()
	g := vec{-1.5, 2}
	var d vec
	dir.compute(&g, &d)
	if d != (vec{1.5, -2}) {
		t.Errorf("after reset d = %v, want −g", d)
	}
}

// polakRibiere is β = gᵀ(g − g₋₁)/‖g₋₁‖² (Nocedal & Wright 2006, eq. 5.44,
// recalled from memory), unclipped.
func polakRibiere(g, previous vec) float64 {
	var num, den float64
	for i := range g {
		num += g[i] * (g[i] - previous[i])
		den += previous[i] * previous[i]
	}
	return num / den
}

// Conjugate gradients takes d = −g + β d₋₁ while successive gradients
// stay nearly orthogonal, |gᵀg₋₁| < 0.1‖g‖², for any number of steps (no
// periodic restart), and restarts with d = −g exactly once they are not
// (Powell's restart test, Nocedal & Wright 2006, eq. 5.52, ν = 0.1).
func TestCGRestartsWhenGradientsLoseOrthogonality(t *testing.T) {
	var dir cgDirection
	dir.reset()
	var previousG, previousD vec
	for k := 0; k < 4*dim+2; k++ {
		// Gradients turning by about a right angle each step, shrinking;
		// the last one turns back by 45 degrees, |gᵀg₋₁| = 0.7‖g‖²·….
		angle := float64(k) * (math.Pi/2 - 0.05)
		if k == 4*dim+1 {
			angle = float64(k-1)*(math.Pi/2-0.05) + math.Pi/4
		}
		size := math.Pow(0.8, float64(k))
		g := vec{size * math.Cos(angle), size * math.Sin(angle)}
		want := g
		negate(&want, &want)
		restart := k == 0
		if k > 0 {
			var y vec
			difference(&y, &g, &previousG)
			dir.update(&previousD, &y)
			restart = math.Abs(dot(&g, &previousG)) >= 0.1*dot(&g, &g)
			if restart != (k == 4*dim+1) {
				t.Fatalf("test data: restart %v at k = %d", restart, k)
			}
			if !restart {
				beta := polakRibiere(g, previousG)
				for i := range want {
					want[i] += beta * previousD[i] // N&W eq. 5.44 (d = −g + βd₋₁)
				}
			}
		}
		var d vec
		dir.compute(&g, &d)
		if gap := vectorGap(d, want); gap > 1e-15 {
			t.Errorf("compute %d: d = %v, want %v", k, d, want)
		}
		if restart && d != want {
			t.Errorf("compute %d is a restart: d = %v, want exactly −g = %v", k, d, want)
		}
		previousG, previousD = g, d
	}
}

// A negative Polak–Ribière β gives d = −g exactly: clipped at zero (PR+,
// Nocedal & Wright 2006, eq. 5.45), and in any case restarted, since
// β_PR < 0 means gᵀg₋₁ > ‖g‖², which fails Powell's test. The next step,
// with a nearly orthogonal gradient, goes on from the restart.
func TestCGClipsNegativeBeta(t *testing.T) {
	var dir cgDirection
	dir.reset()
	g0, g1, g2 := vec{2, 0}, vec{1, 0.5}, vec{-0.5, 1.2} // g2ᵀg1 = 0.1 < 0.1‖g2‖² = 0.169
	var d0, d1, d2, y vec
	dir.compute(&g0, &d0)
	difference(&y, &g1, &g0)
	dir.update(&d0, &y)
	if beta := polakRibiere(g1, g0); !(beta < 0) {
		t.Fatalf("test data: β = %g, want negative", beta)
	}
	dir.compute(&g1, &d1)
	if d1 != (vec{-1, -0.5}) {
		t.Fatalf("clipped β: d = %v, want −g = (-1, -0.5)", d1)
	}
	difference(&y, &g2, &g1)
	dir.update(&d1, &y)
	beta := polakRibiere(g2, g1)
	if !(beta > 0) {
		t.Fatalf("test data: β = %g, want positive", beta)
	}
	dir.compute(&g2, &d2)
	want := vec{-g2[0] + beta*d1[0], -g2[1] + beta*d1[1]}
	if gap := vectorGap(d2, want); gap > 1e-15 {
		t.Errorf("after the clip-restart d = %v, want −g + βd₋₁ = %v", d2, want)
	}
}

// A zero previous gradient gives no β (0/0); the direction is −g.
func TestCGZeroPreviousGradient(t *testing.T) {
	var dir cgDirection
	dir.reset()
	g0, g1 := vec{0, 0}, vec{1, -1}
	var d0, d1, y vec
	dir.compute(&g0, &d0)
	difference(&y, &g1, &g0)
	dir.update(&d0, &y)
	dir.compute(&g1, &d1)
	if d1 != (vec{-1, 1}) {
		t.Errorf("d = %v, want −g", d1)
	}
}

// reset makes the next direction −g even where β would be positive.
func TestCGResetGivesSteepestDescent(t *testing.T) {
	var dir cgDirection
	dir.reset()
	g0, g1 := vec{1, 0}, vec{2, 1}
	var d0, d1, y vec
	dir.compute(&g0, &d0)
	difference(&y, &g1, &g0)
	dir.update(&d0, &y)
	if beta := polakRibiere(g1, g0); !(beta > 0) {
		t.Fatalf("test data: β = %g, want positive", beta)
	}
	dir.reset()
	dir.compute(&g1, &d1)
	if d1 != (vec{-2, -1}) {
		t.Errorf("after reset d = %v, want −g", d1)
	}
}

// cg learns the diagonal b from every pair by the diagonal of the BFGS
// update (Gilbert & Lemaréchal 1989): on a diagonal quadratic, a step
// along one axis gives that axis's curvature exactly (bₖ = yₖ²/sᵀy =
// hₖ with y = Hs) and leaves the others as they were, after the first pair
// scaled every bᵢ to yᵀy/sᵀy. Until a stall, b does not change d.
func TestCGLearnsTheDiagonalCurvature(t *testing.T) {
	// ∇²f of f = ½Σhᵢxᵢ², scales far apart; h and the steps are powers
	// of two, so every operation of the update is exact and b must equal
	// h to the bit.
	h := vec{0x1p20, 0x1p-2}
	var dir cgDirection
	dir.reset()
	for k := 0; k < dim; k++ {
		var s, y vec
		s[k] = 0x1p-1 / float64(k+1)
		y[k] = h[k] * s[k]
		dir.update(&s, &y)
		if got := dir.curvature[k]; got != h[k] {
			t.Errorf("after a step along axis %d, b = %v, want b[%d] = %g", k, dir.curvature, k, h[k])
		}
	}
	// A later step along another axis leaves an entry as it was.
	if dir.curvature != h {
		t.Errorf("after a step along each axis b = %v, want ∇²f's diagonal %v", dir.curvature, h)
	}
	g := vec{3, -4}
	var d vec
	dir.fresh = true
	dir.compute(&g, &d)
	if d != (vec{-3, 4}) {
		t.Errorf("before a stall d = %v, want −g: the preconditioner stays off", d)
	}
}

// At a stall cg switches the preconditioner on once, and only after a pair
// taught b: the next direction is then −g/b, for a diagonal quadratic
// with b its curvature the Newton step; it goes on conjugate in b's
// metric, β = zᵀy/z₋₁ᵀg₋₁ (Nocedal & Wright 2006, §5.2). Asked again, it
// has nothing left and reports false; reset switches it off.
func TestCGSwitchesThePreconditionerOnAtAStall(t *testing.T) {
	var dir cgDirection
	dir.reset()
	if dir.stalled() {
		t.Fatal("stalled reported a reserve before any pair taught b")
	}
	h := vec{1e6, 0.25}
	for k := 0; k < dim; k++ {
		var s, y vec
		s[k] = 1
		y[k] = h[k]
		dir.update(&s, &y)
	}
	if !dir.stalled() {
		t.Fatal("stalled reported no reserve after b was learnt")
	}
	g0 := vec{2e6, -0.5} // at x = (2, −2) on f = ½Σhᵢxᵢ²
	var d0 vec
	dir.compute(&g0, &d0)
	if want := (vec{-2, 2}); vectorGap(d0, want) > 1e-15 {
		t.Errorf("first preconditioned d = %v, want −g/b = %v (the Newton step)", d0, want)
	}
	g1 := vec{1e3, 1e3}
	var y, d1 vec
	difference(&y, &g1, &g0)
	dir.update(&d0, &y)
	dir.compute(&g1, &d1)
	z := vec{g1[0] / dir.curvature[0], g1[1] / dir.curvature[1]}
	z0 := vec{g0[0] / h[0], g0[1] / h[1]}
	if math.Abs(dot(&z, &g0)) >= 0.1*dot(&z, &g1) {
		t.Fatalf("test data: Powell's test restarts here")
	}
	beta := dot(&z, &y) / dot(&z0, &g0)
	want := vec{-z[0] + beta*d0[0], -z[1] + beta*d0[1]}
	if vectorGap(d1, want) > 1e-15 {
		t.Errorf("second preconditioned d = %v, want −z + βd₋₁ = %v", d1, want)
	}
	if dir.stalled() {
		t.Error("stalled reported a reserve a second time")
	}
	dir.reset()
	dir.compute(&g0, &d0)
	if d0 != (vec{-2e6, 0.5}) {
		t.Errorf("after reset d = %v, want −g: the preconditioner is off again", d0)
	}
}

// The diagonal update keeps b positive and finite for any pair whose
// curvature passes curvatureSafeFrom, whatever its shape.
func TestCGDiagonalStaysPositive(t *testing.T) {
	var dir cgDirection
	dir.reset()
	state := uint64(7)
	random := func() float64 {
		state = state*6364136223846793005 + 1442695040888963407 // Knuth's MMIX LCG (common practice)
		return float64(int64(state>>11))/float64(1<<52) - 1
	}
	for k := 0; k < 2000; k++ {
		var s, y vec
		for i := range s {
			s[i] = random() * math.Pow(10, 8*random())
			y[i] = random() * math.Pow(10, 8*random())
		}
		before := dir.curvature
		dir.update(&s, &y)
		for _, b := range dir.curvature {
			if !(b > 0) || math.IsInf(b, 0) {
				t.Fatalf("pair %d (s = %v, y = %v): b = %v from %v", k, s, y, dir.curvature, before)
			}
		}
		if !curvatureSafeFrom(pairProducts(&s, &y)) && dir.curvature != before {
			t.Fatalf("pair %d (s = %v, y = %v) fails curvatureSafeFrom but changed b from %v to %v", k, s, y, before, dir.curvature)
		}
	}
	if !dir.scaled {
		t.Fatal("test data: no pair passed curvatureSafeFrom")
	}
}

// curvatureSafeFrom accepts a pair only when sᵀy > 0 and (sᵀy)² > u·(sᵀs)(yᵀy)
// (Nocedal & Wright 2006, condition 6.7; the relative threshold is Dennis
// & Schnabel 1983, Algorithm A9.4.1, recalled from memory in direction.go).
func TestCurvatureSafeEdgeCases(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name string
		s, y vec
		want bool
	}{
		{"positive", vec{1, 2}, vec{0.5, 1}, true},
		{"small but above √u·‖s‖‖y‖", vec{1, 0}, vec{1e-7, 1}, true},
		{"below √u·‖s‖‖y‖", vec{1, 0}, vec{1e-9, 1}, false},
		{"orthogonal", vec{1, 0}, vec{0, 1}, false},
		{"negative", vec{1, 1}, vec{-1, -0.5}, false},
		{"zero step", vec{0, 0}, vec{1, 2}, false},
		{"zero change", vec{1, 2}, vec{0, 0}, false},
		{"NaN step", vec{nan, 1}, vec{1, 1}, false},
		{"NaN change", vec{1, 1}, vec{1, nan}, false},
		{"infinite step", vec{inf, 0}, vec{1, 0}, false},
		{"infinite both", vec{inf, 0}, vec{inf, 0}, false},
	}
	for _, c := range cases {
		if got := curvatureSafeFrom(pairProducts(&c.s, &c.y)); got != c.want {
			t.Errorf("%s: curvatureSafeFrom(pairProducts(%v, %v)) = %v, want %v", c.name, c.s, c.y, got, c.want)
		}
	}
}

// scaledTrial is α₋₁·(g₋₁ᵀd₋₁)/(gᵀd) (Nocedal & Wright 2006, eq. 3.60);
// a ratio that is not a positive finite number falls back to stepInitial.
// The expected values below are not 1 = stepInitial, so a fallback cannot
// pass for a computed value.
func TestScaledTrialEdgeCases(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	cases := []struct {
		name              string
		step, slope, now  float64
		want              float64
		expectingFallback bool
	}{
		{"ratio 2", 0.5, -4, -1, 2, false},
		{"ratio 1/8", 1, -0.25, -2, 0.125, false},
		{"zero previous slope", 1, 0, -1, stepInitial, true},
		{"zero current slope", 1, -1, 0, stepInitial, true},
		{"both slopes zero (NaN ratio)", 1, 0, 0, stepInitial, true},
		{"negative ratio", 1, 2, -1, stepInitial, true},
		{"negative previous step", -1, -1, -1, stepInitial, true},
		{"zero previous step", 0, -1, -1, stepInitial, true},
		{"NaN slope", 1, nan, -1, stepInitial, true},
		{"NaN step", nan, -1, -1, stepInitial, true},
		{"infinite ratio", 1, -1e300, -1e-300, stepInitial, true},
		{"infinite slope", 1, -inf, -1, stepInitial, true},
		{"infinite over infinite", 1, -inf, -inf, stepInitial, true},
	}
	for _, c := range cases {
		got := scaledTrial(c.step, c.slope, c.now)
		if got != c.want {
			t.Errorf("%s: scaledTrial(%g, %g, %g) = %g, want %g", c.name, c.step, c.slope, c.now, got, c.want)
		}
		if !c.expectingFallback && c.want == stepInitial {
			t.Fatalf("%s: test data cannot tell the ratio from the fallback", c.name)
		}
	}
	// The directions without a quasi-Newton step delegate to scaledTrial;
	// BFGS and L-BFGS try the unit step (N&W 2006, §3.5).
	var steepest steepestDirection
	var cg cgDirection
	var bfgs bfgsDirection
	var lbfgs lbfgsDirection
	if got := steepest.firstTrial(0.5, -4, -1); got != 2 {
		t.Errorf("steepest first trial %g, want 2", got)
	}
	if got := cg.firstTrial(0.5, -4, -1); got != 2 {
		t.Errorf("cg first trial %g, want 2", got)
	}
	if bfgs.firstTrial(0.5, -4, -1) != 1 || lbfgs.firstTrial(0.5, -4, -1) != 1 {
		t.Errorf("quasi-Newton first trial is not 1")
	}
}
