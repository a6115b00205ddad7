package templates

import (
	"fmt"
	"math"
	"testing"
)

// tickMinimum is the smallest budget with which every advance progresses:
// the largest worst case of one stage (see descent.advance).
func tickMinimum() int {
	return max(1+calibrationCost+derivativeCost, calibrationCost+2*derivativeCost, iterationCalls)
}

// ticked runs from start to the end with budget calls per advance,
// checking after each advance that it called the objective at most budget
// times, that it reported exactly the calls it made and that it progressed;
// it returns the end and the number of advances.
func ticked(t *testing.T, recv *receiver, start vec, lim limits, b box, budget int) (outcome, int) {
	t.Helper()
	var r descent
	r.prepare(start, lim, b)
	r.forget()
	for ticks := 1; ; ticks++ {
		before := recv.calls
		out := r.advance(recv, budget)
		spent := recv.calls - before
		if spent > budget {
			t.Fatalf("tick %d: %d calls, over the budget %d", ticks, spent, budget)
		}
		if out.evaluations != recv.calls {
			t.Fatalf("tick %d: %d evaluations reported, the objective saw %d", ticks, out.evaluations, recv.calls)
		}
		if out.status != statusRunning {
			return out, ticks
		}
		if spent == 0 {
			t.Fatalf("tick %d: no progress with budget %d ≥ %d", ticks, budget, tickMinimum())
		}
		if ticks > 1<<20 {
			t.Fatal("endless run")
		}
	}
}

// Advancing a run a tick at a time ends exactly where minimize does, with
// the same calls, for every policy, with and without bounds and for
// several budgets from the smallest useful one up; no tick exceeds its
// budget, and every tick progresses.
func TestTicksEndWhereMinimizeDoes(t *testing.T) {
	bounded := box{lower: vec{-2, -2}, upper: vec{0.5, 2}}
	for _, p := range everyPolicy() {
		for _, withBox := range []bool{false, true} {
			t.Run(fmt.Sprintf("%v/box=%v", p, withBox), func(t *testing.T) {
				p.use(t)
				b := box{}
				if withBox {
					saved := boxed
					boxed, b = true, bounded
					t.Cleanup(func() { boxed = saved })
				}
				for _, cap := range []int{200000, 150} {
					lim := defaultLimits()
					lim.Evaluations = cap
					whole := rosenbrock()
					want := minimize(whole, vec{-1.2, 1}, lim, b)
					least := tickMinimum()
					for _, budget := range []int{least, least + 3, 2*least + 1, 5 * least} {
						recv := rosenbrock()
						got, ticks := ticked(t, recv, vec{-1.2, 1}, lim, b, budget)
						if fmt.Sprintf("%+v", got) != fmt.Sprintf("%+v", want) || recv.calls != whole.calls {
							t.Fatalf("cap %d, budget %d, %d ticks:\n got %+v (%d calls)\nwant %+v (%d calls)", cap, budget, ticks, got, recv.calls, want, whole.calls)
						}
						if budget == least && want.evaluations > 2*least && ticks < 2 {
							t.Errorf("budget %d: %d calls in one tick", budget, want.evaluations)
						}
					}
				}
			})
		}
	}
}

// A budget below the worst case of the next stage makes no call and
// reports the run as still running, at the start and in the middle.
func TestSmallBudgetMakesNoCall(t *testing.T) {
	policy{sourceCentral, kindBFGS, ruleWolfe, backtrackShrink}.use(t)
	recv := rosenbrock()
	var r descent
	r.prepare(vec{-1.2, 1}, defaultLimits(), box{})
	r.forget()
	start := 1 + calibrationCost + derivativeCost
	if out := r.advance(recv, start-1); out.status != statusRunning || recv.calls != 0 || out.x != (vec{-1.2, 1}) || !math.IsNaN(out.f) {
		t.Fatalf("budget %d before the start: %+v after %d calls", start-1, out, recv.calls)
	}
	out := r.advance(recv, tickMinimum())
	if out.status != statusRunning || out.evaluations == 0 {
		t.Fatalf("budget %d: %+v", tickMinimum(), out)
	}
	calls := recv.calls
	for budget := range iterationCalls {
		if again := r.advance(recv, budget); recv.calls != calls || again.status != statusRunning || again.evaluations != out.evaluations {
			t.Fatalf("budget %d < %d: %d calls, %+v", budget, iterationCalls, recv.calls-calls, again)
		}
	}
}

// The direction's memory outlives a tick: with the state kept, BFGS,
// L-BFGS and CG reach Rosenbrock's minimum in fewer calls than when the
// memory is forgotten at every tick, which turns them into steepest
// descent (Nocedal & Wright 2006, §3.3: steepest descent is linear, and
// slow in Rosenbrock's valley).
func TestMemoryOutlivesTicks(t *testing.T) {
	for _, p := range []policy{
		{sourceAnalytic, kindBFGS, ruleWolfe, backtrackShrink},
		{sourceAnalytic, kindLBFGS, ruleWolfe, backtrackShrink},
		{sourceForward, kindBFGS, ruleArmijo, backtrackShrink},
		{sourceCentral, kindCG, ruleStrongWolfe, backtrackShrink},
	} {
		t.Run(p.String(), func(t *testing.T) {
			p.use(t)
			run := func(forgetful bool) outcome {
				var r descent
				r.prepare(vec{-1.2, 1}, defaultLimits(), box{})
				r.forget()
				recv := rosenbrock()
				for {
					if forgetful {
						r.forget()
					}
					out := r.advance(recv, tickMinimum())
					if out.status != statusRunning {
						return out
					}
				}
			}
			kept, forgot := run(false), run(true)
			if kept.status != statusGradientSmall {
				t.Fatalf("with memory: status %d after %d calls", kept.status, kept.evaluations)
			}
			if !(kept.evaluations < forgot.evaluations) {
				t.Errorf("with memory %d calls (status %d), forgetting at each tick %d (status %d)", kept.evaluations, kept.status, forgot.evaluations, forgot.status)
			}
		})
	}
}

// A warm start keeps what the direction learned: after the ellipse's
// centre moves, a new run from the previous end with BFGS's matrix kept
// converges in fewer calls than one that forgets it, since the Hessian
// diag(2, 20) did not change (BFGS recovers it from steps: Nocedal &
// Wright 2006, §6.1). The moved target is found either way.
func TestWarmStartKeepsMemory(t *testing.T) {
	policy{sourceAnalytic, kindBFGS, ruleWolfe, backtrackShrink}.use(t)
	centre := vec{3, -1}
	recv := &receiver{
		valueFunc: func(x *vec) elem {
			a, b := x[0]-centre[0], x[1]-centre[1]
			return a*a + 10*b*b
		},
		gradientFunc: func(x, g *vec) {
			g[0], g[1] = 2*(x[0]-centre[0]), 20*(x[1]-centre[1])
		},
	}
	var r descent
	r.prepare(vec{-4, 2}, defaultLimits(), box{})
	r.forget()
	first := r.advance(recv, unlimited)
	if first.status != statusGradientSmall {
		t.Fatalf("first run: status %d", first.status)
	}
	centre = vec{2.5, -0.7}
	warm, cold := r, r
	warm.prepare(first.x, defaultLimits(), box{})
	cold.prepare(first.x, defaultLimits(), box{})
	cold.forget()
	w, c := warm.advance(recv, unlimited), cold.advance(recv, unlimited)
	for _, out := range []outcome{w, c} {
		if out.status != statusGradientSmall || math.Abs(out.x[0]-2.5) > 1e-6 || math.Abs(out.x[1]+0.7) > 1e-6 {
			t.Fatalf("moved target: status %d at %v, want (2.5, −0.7)", out.status, out.x)
		}
	}
	if !(w.evaluations < c.evaluations) {
		t.Errorf("warm start %d calls, cold %d", w.evaluations, c.evaluations)
	}
	// An ended run returns its result again without calling the objective.
	calls := recv.calls
	if again := warm.advance(recv, 100); again != w || recv.calls != calls {
		t.Errorf("advancing an ended run: %+v after %d calls", again, recv.calls-calls)
	}
}

// shrinkDirection makes ∇fᵀd finite where it overflowed, keeping d's
// direction: first to a largest component of 1, then, with gradients
// near the largest float, down by the largest |gᵢ| as well.
func TestShrinkDirection(t *testing.T) {
	for _, size := range []elem{2e200, 1.2e308} {
		var g, d vec
		for i := range g {
			g[i] = size * (1 - 0.1*elem(i)) // 1.2e308: still overflows with |dᵢ| ≤ 1
			d[i] = -g[i]
		}
		if finite(dot(&g, &d)) {
			t.Fatalf("gradient %g: the test needs ∇fᵀd to overflow", size)
		}
		shrinkDirection(&d, &g)
		slope := dot(&g, &d)
		if !finite(slope) || !(slope < 0) {
			t.Errorf("gradient %g: ∇fᵀd = %g after shrinking", size, slope)
		}
		for i := range d {
			if ratio, want := d[i]/d[0], 1-0.1*elem(i); abs(ratio-want) > 1e-12 {
				t.Errorf("gradient %g: d turned: d[%d]/d[0] = %g, want %g", size, i, ratio, want)
			}
		}
	}
}
