package templates

// searchEnd tells how a line search ended.
type searchEnd uint8

const (
	searchAccepted    searchEnd = iota // a step met the rule
	searchExhausted                    // stepTrials trials met none
	searchOutOfBudget                  // the evaluation cap came first
	searchTiny                         // every step longer than tiny failed to decrease f
)

// lineResult is what a line search reports to the kernel.
type lineResult struct {
	step     elem      // the accepted step t
	value    elem      // f(x + t·d)
	calls    int       // objective calls spent, finite differences included
	gradient bool      // whether gt holds ∇f(x + t·d) already
	flat     bool      // whether a failed trial found f flat along d (see flatTrial)
	end      searchEnd // how the search ended
}

// flatTrial reports whether a failed trial t found f flat along d, to
// the accuracy the gradient and f allow, so that no decrease can be
// expected from any step:
//
//   - the change f(x + t·d) − f(x) = ft − fx is at most half the
//     first-order prediction t·∇fᵀd in size: near a minimizer whose
//     gradient is known only roughly (differences), the true slope along
//     d is below that accuracy. A wrong gradient makes f rise about as
//     fast as it predicts a fall, and never passes. This is the ratio of
//     actual to predicted reduction of trust-region methods (Nocedal &
//     Wright 2006, eq. 4.4);
//   - or the prediction itself, |t·∇fᵀd|, is below the rounding unit of
//     f, u·|f(x)|: no change that small can show in floating point, so x
//     is a minimizer to working precision (Dennis & Schnabel 1983, §7.2,
//     relate the gradient test to the precision of f; recalled from
//     memory).
func flatTrial(fx, ft, t, slope elem) bool {
	predicted := abs(t * slope)
	return abs(ft-fx) <= 0.5*predicted || predicted <= unitRoundoff*abs(fx)
}

// lineSearch looks along d from x, where f(x) = fx and the slope
// ∇f(x)ᵀd < 0, starting with the trial step first and spending at most
// budget objective calls. Steps t ≤ tiny are below the step limit: after
// at least one failed trial, a search that would have to try such a step
// ends with searchTiny instead, since every step longer than the step
// limit failed to decrease f. The kernel calls that convergence only when
// some failed trial found f flat (see flatTrial) or the gradient is a
// difference; otherwise the gradient is likely wrong (Dennis & Schnabel
// 1983, §7.2, keep this case apart from the step test, recalled from
// memory). On acceptance xt
// holds x + t·d (and gt its gradient when the result says so). It stands
// in for the rule the spec chose; gen keeps only that one under this name.
func lineSearch(recv *receiver, x *vec, fx elem, d *vec, slope, first, tiny elem, budget int, xt, gt *vec) lineResult {
	switch stepRule {
	case ruleFixed:
		return fixedStep(recv, x, fx, d, slope, first, tiny, budget, xt, gt)
	case ruleDecrease, ruleArmijo:
		return backtrackSearch(recv, x, fx, d, slope, first, tiny, budget, xt, gt)
	default:
		return wolfeSearch(recv, x, fx, d, slope, first, tiny, budget, xt, gt)
	}
}
