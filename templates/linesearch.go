package templates

// searchEnd tells how a line search ended.
type searchEnd uint8

const (
	searchAccepted    searchEnd = iota // a step met the rule
	searchExhausted                    // stepTrials trials met none
	searchOutOfBudget                  // the evaluation cap came first
	searchTiny                         // every step longer than tiny failed to decrease f
	searchDiverged                     // a fixed step's value overflowed
)

// lineResult is what a line search reports to the kernel.
type lineResult struct {
	step     elem      // the accepted step t
	value    elem      // f(x + t·d)
	calls    int       // objective calls spent, finite differences included
	gradient bool      // whether gt holds ∇f(x + t·d) already
	rising   bool      // whether the failed trials rose in proportion to t (see riseTrend)
	end      searchEnd // how the search ended
}

// riseTrend watches the failed trials of one line search, shortest last,
// for the mark of a wrong gradient: f rising in proportion to the step,
// f(x + t·d) − f(x) ≈ c·t with c > 0, so that the gradient's predicted
// fall is contradicted at every scale. At a minimizer f instead rises
// like t² (curvature) or changes by rounding noise that does not follow
// t, and a search that finds no decrease there has converged. This is the
// linear model's test at the heart of gradient checking (Nocedal & Wright
// 2006, §8.1: with a correct gradient the error of f(x) + t·∇fᵀd shrinks
// like t²). The rules, tuned on wrong and exact gradients (common
// practice, no published source):
//
//   - a pair of trials agrees with proportionality when both rises are
//     positive and (Δf₁/Δf₂)/(t₁/t₂) lies within a factor √2 of 1;
//   - three agreeing pairs at the end of the search, or five anywhere in
//     a row, make the trend; a disagreeing pair starts over;
//   - a trial is left out when the step actually taken is not t·d (a
//     component too large to move by t·dᵢ in floating point), or when its
//     change is within 64 rounding units of f(x), where only noise shows.
type riseTrend struct {
	step, rise elem // the previous counted trial
	linear     int  // consecutive proportional rises so far
	latched    bool // five in a row were seen
}

// add records a failed trial t, at xt, that changed f(x) = fx by rise
// (NaN or ±Inf when the value was not finite).
func (r *riseTrend) add(x, xt, d *vec, t, rise, fx elem) {
	if derivativeCost > 0 {
		// With differences a proportional rise means their error, not a
		// wrong gradient: x is stationary to their accuracy, so nothing is
		// recorded (a constant condition, compiled away).
		return
	}
	if abs(rise) <= 64*unitRoundoff*abs(fx) || !faithfulStep(x, xt, d, t) {
		return
	}
	ratio := (r.rise / rise) / (r.step / t) // 1 when rise ∝ t
	if rise > 0 && r.rise > 0 && ratio >= 0.7071 && ratio <= 1.4143 {
		r.linear++
	} else {
		r.linear = 0
	}
	r.latched = r.latched || r.linear >= 5
	r.step, r.rise = t, rise
}

// contradicts reports whether the trials showed a proportional rise.
func (r *riseTrend) contradicts() bool {
	return r.latched || r.linear >= 3
}

// faithfulStep reports whether xt − x is t·d to within 1% in every
// component, that is, whether rounding let x move as the search meant.
func faithfulStep(x, xt, d *vec, t elem) bool {
	for i := range x {
		if want := t * d[i]; !(abs(xt[i]-x[i]-want) <= 0.01*abs(want)) {
			return false
		}
	}
	return true
}

// lineSearch looks along d from x, where f(x) = fx, ∇f(x) = g and the
// slope ∇f(x)ᵀd < 0, starting with the trial step first and spending at most
// budget objective calls. Steps t ≤ floor are below the step limit: after
// at least one failed trial, a search that would have to try such a step
// ends with searchTiny instead, since every step longer than the step
// limit failed to decrease f. The kernel calls that convergence unless
// the failed trials rose in proportion to the step (see riseTrend) with an
// analytic gradient, which is then likely wrong. On acceptance xt holds
// x + t·d, projected onto the box when the spec has bounds (see
// trialPoint), and gt its gradient when the result says so. It stands in for
// the rule the spec chose; gen keeps only that one under this name.
func lineSearch(recv *receiver, x *vec, fx elem, g, d *vec, slope, first elem, floor *stepFloor, budget int, xt, gt *vec, diffs *differences) lineResult {
	switch stepRule {
	case ruleFixed:
		return fixedStep(recv, x, fx, g, d, slope, first, floor, budget, xt, gt, diffs)
	case ruleDecrease, ruleArmijo:
		return backtrackSearch(recv, x, fx, g, d, slope, first, floor, budget, xt, gt, diffs)
	case ruleDamping:
		return dampedSearch(recv, x, fx, g, d, slope, first, floor, budget, xt, gt, diffs)
	default:
		return wolfeSearch(recv, x, fx, g, d, slope, first, floor, budget, xt, gt, diffs)
	}
}
