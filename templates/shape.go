package templates

// Stand-ins for the spec's shape. gen replaces each of them.

// elem stands in for the objective's float type (float32 or float64).
type elem = float64

// dim stands in for the number of unknowns.
const dim = 2

// vec stands in for the objective's argument: an array of dim elements.
// Scalar objectives are minimized as vectors of length one.
type vec [dim]elem

// residuals stands in for the number of residuals of a residual objective,
// whose value is f = ½‖r‖².
const residuals = 3

// rvec stands in for a residual objective's residuals: an array of
// residuals elements.
type rvec = [residuals]elem

// receiver stands in for the value the objective is called on. Plain
// functions have none: gen then drops every recv parameter and argument.
type receiver struct {
	valueFunc    func(x *vec) elem
	gradientFunc func(x, g *vec)
	// combinedFunc, when set, is a combined objective: it returns f(x)
	// and writes ∇f(x) into g in the same call. The kernels then call
	// only evaluate on it.
	combinedFunc func(x, g *vec) elem
	// residualFunc, when set, is a residual objective: it writes r(x),
	// and f(x) = ½‖r(x)‖². jacobianFunc writes J(x) by rows,
	// J[i][j] = ∂rᵢ/∂xⱼ, and columnsFunc by columns, J[j][i].
	residualFunc func(x *vec, r *rvec)
	jacobianFunc func(x *vec, j *[residuals]vec)
	columnsFunc  func(x *vec, j *[dim]rvec)
	calls        int // objective calls, counted independently of the kernels
	valueOnly    int // calls of objective, which a combined objective must never see
	gradients    int // calls of gradient, likewise
}

// objective stands in for the user's objective, called for its value
// alone (finite differences and their calibration).
func (r *receiver) objective(x *vec) elem {
	r.calls++
	r.valueOnly++
	return r.valueFunc(x)
}

// gradient stands in for the user's analytic gradient.
func (r *receiver) gradient(x, g *vec) {
	r.gradients++
	r.gradientFunc(x, g)
}

// residual stands in for the user's residual objective: r = r(x).
func (r *receiver) residual(x *vec, out *rvec) {
	r.calls++
	r.residualFunc(x, out)
}

// jacobian stands in for the user's analytic Jacobian, by rows.
func (r *receiver) jacobian(x *vec, j *[residuals]vec) {
	r.gradients++
	r.jacobianFunc(x, j)
}

// jacobianColumns stands in for the user's analytic Jacobian written by
// columns (transposed).
func (r *receiver) jacobianColumns(x *vec, j *[dim]rvec) {
	r.gradients++
	r.columnsFunc(x, j)
}

// evaluate stands in for the objective called where the kernel may want
// the gradient too: the start, every line-search trial, the probes of a
// stall. It returns f(x); a combined objective also writes ∇f(x) into g
// in the same, single call, while any other objective leaves g alone,
// its gradient coming from the derivative source instead. gen rewrites
// it to the user's call in its form: f(x) for an objective of the value
// alone, f(x, g) for a combined one.
func (r *receiver) evaluate(x, g *vec) elem {
	if r.combinedFunc == nil {
		return r.objective(x)
	}
	r.calls++
	return r.combinedFunc(x, g)
}

// observe stands in for the hook of `thalweg trace`, called with the state
// after the first gradient (iteration 0) and after every accepted step:
// the objective calls so far, x, f(x) and ∇f(x), the accepted step t and
// the slope ∇fᵀd where the search that found it began (both 0 at
// iteration 0), so that the recorder can set the decrease achieved
// against the decrease −t·∇fᵀd the line model predicted. gen deletes its
// calls from every minimizer it writes and keeps them, pointed at a
// recorder, only in the copy it compiles for tracing. Each call is
// followed by a blank line, so that deleting it leaves the layout intact,
// and passes only local values, so that deleting it leaves no
// declaration behind.
func observe(iteration, evaluations int, x *vec, fx elem, g *vec, step, slope elem) {}

// status stands in for the spec's status type.
type status uint8

// Stand-ins for the status values; gen emits the real ones.
const (
	statusGradientSmall status = iota + 1
	statusStalled
	statusOutOfIterations
	statusOutOfEvaluations
	statusNoAcceptableStep
	statusNonFiniteStart
	statusNonFiniteGradient
	statusNoDecrease
	statusDiverged
	statusRunning
)

// limits stands in for the spec's run-time stop limits.
type limits struct {
	Gradient    elem
	Step        elem
	Iterations  int
	Evaluations int
}
