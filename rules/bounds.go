package rules

// Feature is a part of a spec that is there or not, such as
// [minimizer.bounds] or a combined objective: the template alternatives
// it picks either way.
type Feature struct {
	Table      string // the spec table that turns it on; "" when the objective's signature does (Combined)
	Summary    string
	Math       string
	References []string
	// Off and On are the alternatives picked without and with it. For
	// bounds an entry's BoundedPicks override On; a combined objective's
	// On overrides the derivative entry's picks.
	Off, On Picks
}

// Bounds is [minimizer.bounds], the box lower ≤ x ≤ upper.
var Bounds = &Feature{
	Table:   "bounds",
	Summary: "box bounds lower ≤ x ≤ upper (either side optional per variable, ±inf allowed); the start is projected into the box and the objective is never evaluated outside it",
	Math: "x(t) = P(x + t·d), P the projection onto the box; Armijo along that arc, f(x(t)) ≤ f(x) + c1·∇fᵀ(x(t) − x); " +
		"d from the direction's rule on the free variables of the ε-active set, −∇f on the others; Wolfe rules capped at the first bound; " +
		"converged when the projected gradient passes the stop test; differences one-sided at a bound",
	References: []string{Bertsekas1976, Bertsekas1982, Kelley1999 + ", §5.5.3 (the reduced quasi-Newton update)"},
	Off: Picks{"enterBox": "openStart", "trialPoint": "straightTrial", "stepCap": "noCap",
		"searchDirection": "freeDirection", "stationarity": "unboundedMeasure", "coordinateRange": "wholeLine",
		"curvaturePair": "fullPair", "pinned": "neverPinned"},
	On: Picks{"enterBox": "projectStart", "trialPoint": "projectedTrial", "stepCap": "firstBound",
		"searchDirection": "boundDirection", "stationarity": "projectedMeasure", "coordinateRange": "boxRange",
		"curvaturePair": "freePair", "pinned": "equalBounds"},
}

// Citations of the bounds.
const (
	Bertsekas1976 = "D. P. Bertsekas, On the Goldstein–Levitin–Polyak gradient projection method, IEEE Trans. Automatic Control 21(2):174–184, 1976"
	Kelley1999    = "C. T. Kelley, Iterative Methods for Optimization, SIAM, 1999"
	Bertsekas1982 = "D. P. Bertsekas, Projected Newton methods for optimization problems with simple constraints, SIAM J. Control Optim. 20(2):221–246, 1982"
)

// Scaling is the scale key: the typical magnitude sᵢ of each unknown. It
// picks no alternatives; the glue converts between the user's x and the
// kernels' z and adapts the objective and gradient calls.
var Scaling = &Feature{
	Table:   "scale",
	Summary: "the kernels work in zᵢ = xᵢ/sᵢ, s the typical magnitude of each unknown, and report X in the user's units; Gradient and the gradient limit apply to the scaled gradient sᵢ·∂f/∂xᵢ, the step limit to the scaled step, and difference steps are taken in z",
	Math: "z = x/s, f_z(z) = f(s∘z), ∇f_z = s∘∇f(x) (chain rule); a diagonal change of variables that makes every unknown of order one, " +
		"so that one step length, one gradient limit and one difference step suit them all",
	References: []string{DennisSchnabel + ", §7.1 (scaling)", NocedalWright + ", §2.2 (scaling)"},
}
