package rules

// Residuals is an objective that writes residuals r(x) ∈ ℝᴹ instead of
// returning a value: func(x *[N]T, r *[M]T), func(x [N]T, r *[M]T) or
// func(x, r []T) (with the spec's residuals = M), each also as a method.
// The function minimized is f = ½‖r‖², its gradient Jᵀr; the Jacobian J
// comes from the user (derivative = "analytic", spec key jacobian) or
// from differences of the residuals. Its signature turns the feature on;
// its On picks override the derivative entry's, and the entry's
// ResidualPicks choose the Jacobian.
var Residuals = &Feature{
	Summary: "the objective writes residuals r(x) ∈ ℝᴹ and f = ½‖r‖² is minimized; the gradient is Jᵀr from the Jacobian J, which the least-squares directions also use (JᵀJ, the Gauss–Newton model of the Hessian)",
	Math: "f = ½Σrᵢ², g = Jᵀr, one residual call per value; J analytic (by rows, J *[M][N]T, or by columns, J *[N][M]T, told apart by its type; rows when M = N), or forward (dim calls, hⱼ = √u·|xⱼ|) or central (2·dim calls, hⱼ = ∛u·|xⱼ|) differences of the residuals (relative intervals as in MINPACK's fdjac2; the unit interval at xⱼ = 0); " +
		"error bound of g from the differences' order (√u or u^(2/3) times |r|·(|J| + |r|/|x|)), confirmed by a Jacobian with twice the intervals before convergence is declared; at a stall the rounding floor 4u|xᵢ|(JᵀJ)ᵢᵢ",
	References: []string{NocedalWright + ", §10.1–10.3 (eqs. 10.3–10.4) and §8.1 (difference intervals)",
		"G. A. F. Seber and C. J. Wild, Nonlinear Regression, Wiley, 1989, §2.1 and §5.1 (the covariance s²(JᵀJ)⁻¹)"},
	Off: Picks{"value": "plainValue", "residualModel": "noStructure", "stepScale": "offsetScale"},
	On: Picks{"value": "squaresValue", "stepScale": "typicalScale", "derivative": "residualGradient", "calibrate": "calibrateResiduals",
		"gradientError": "residualError", "settle": "settleResiduals"},
}

// JacobianColumns picks the transposed analytic Jacobian, written by
// columns (J *[N][M]T, told apart by its type), over the Analytic
// entry's rows.
var JacobianColumns = Picks{"jacobian": "columnsJacobian"}

// ResidualStepDoc is the step limit's doc for a residual objective, whose
// step test is relative to each unknown (templates' typicalScale).
const ResidualStepDoc = "stop when every |Δxᵢ| is at most this·max(|xᵢ|, |x0ᵢ|) (|x0ᵢ| read as 1 where the start's x0ᵢ is 0): relative, as fitted parameters are often far below 1"
