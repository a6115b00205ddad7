package templates

// derivative fills g with the gradient at x, where fx = f(x). It stands in
// for the source the spec chose; gen keeps only that one under this name.
// The kernel charges derivativeCost objective calls for each call.
func derivative(recv *receiver, x *vec, fx elem, g *vec) {
	switch derivativeSource {
	case sourceForward:
		forwardDifference(recv, x, fx, g)
	case sourceCentral:
		centralDifference(recv, x, fx, g)
	default:
		analyticGradient(recv, x, fx, g)
	}
}

// analyticGradient calls the user's gradient; it costs no objective calls.
func analyticGradient(recv *receiver, x *vec, fx elem, g *vec) {
	recv.gradient(x, g)
}

// forwardDifference approximates the gradient by forward differences,
//
//	g_i ≈ (f(x + h_i e_i) − f(x)) / h_i,  h_i = √u · max(1, |x_i|),
//
// with error O(h) (Nocedal & Wright 2006, eq. 8.1 and the step choice
// that follows it). It costs dim objective calls.
func forwardDifference(recv *receiver, x *vec, fx elem, g *vec) {
	probe := *x
	for i := range probe {
		xi := probe[i]
		h := forwardScale * larger(1, abs(xi)) // N&W §8.1: h = √u·max(1,|x_i|)
		probe[i] = xi + h
		h = probe[i] - xi // the step actually representable in elem
		g[i] = (recv.objective(&probe) - fx) / h
		probe[i] = xi
	}
}

// centralDifference approximates the gradient by central differences,
//
//	g_i ≈ (f(x + h_i e_i) − f(x − h_i e_i)) / (2 h_i),  h_i = ∛u · max(1, |x_i|),
//
// with error O(h²) (Nocedal & Wright 2006, eq. 8.7 and §8.1). It costs
// 2·dim objective calls; fx is not needed.
func centralDifference(recv *receiver, x *vec, fx elem, g *vec) {
	probe := *x
	for i := range probe {
		xi := probe[i]
		h := centralScale * larger(1, abs(xi)) // N&W §8.1: h = ∛u·max(1,|x_i|)
		up := xi + h
		down := xi - h
		probe[i] = up
		fUp := recv.objective(&probe)
		probe[i] = down
		fDown := recv.objective(&probe)
		g[i] = (fUp - fDown) / (up - down) // N&W eq. 8.7, with the representable 2h
		probe[i] = xi
	}
}
