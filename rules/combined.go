package rules

// Combined is an objective that computes its gradient with its value in
// one call, returning f(x) and writing ∇f(x) through its second
// parameter: func(x T, g *T) T, func(x [N]T, g *[N]T) T,
// func(x *[N]T, g *[N]T) T or func(x, g []T) T. Its signature turns the
// feature on, with derivative = "analytic" and no gradient key; its On
// picks override the analytic entry's.
var Combined = &Feature{
	Summary: "the objective returns its value and writes its gradient through g in the same call, so a computation the two share is paid once per point; each such call is one objective call",
	Math: "f = objective(x, g) with g = ∇f(x): one call at the start and at every line-search trial, whose gradient is kept, so that the accepted point and the Wolfe curvature test need no second call; " +
		"at a stall the rounding floor's curvature probes are dim more calls",
	References: []string{NocedalWright + ", §8.1 (gradient checking: the generated test compares g with central differences of f)",
		"A. Griewank and A. Walther, Evaluating Derivatives: Principles and Techniques of Algorithmic Differentiation, 2nd ed., SIAM, 2008, ch. 4 (the cheap gradient principle: the reverse mode gives the gradient at a small multiple of the value's cost, reusing the value's intermediate results, which is why value and gradient are best computed together; recalled from memory)"},
	Off: Picks{"settle": "settleAt"},
	On:  Picks{"derivative": "givenGradient", "settle": "settleCombined"},
}
