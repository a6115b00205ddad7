package objectives

// The float32 instances: three of the problems above in single precision,
// each with the gradient derived by hand (MGH 1981 states the residuals
// fᵢ; f = Σfᵢ² and ∂f/∂xⱼ = Σ 2fᵢ·∂fᵢ/∂xⱼ), so that the check can set
// derivative = "automatic" against "analytic" in float32.

// Rosenbrock32 is Rosenbrock in float32: f₁ = 10(x₂ − x₁²), f₂ = 1 − x₁;
// minimum 0 at (1, 1).
func Rosenbrock32(x *[2]float32) float32 {
	a := 1 - x[0]
	b := x[1] - x[0]*x[0]
	return a*a + 100*b*b
}

// Rosenbrock32Grad is Rosenbrock32's gradient.
func Rosenbrock32Grad(x, g *[2]float32) {
	b := x[1] - x[0]*x[0]
	g[0] = -2*(1-x[0]) - 400*x[0]*b
	g[1] = 200 * b
}

// Beale32 is Beale in float32: fᵢ = yᵢ − x₁(1 − x₂ⁱ), y = (1.5, 2.25,
// 2.625); minimum 0 at (3, 0.5).
func Beale32(x *[2]float32) float32 {
	f1 := 1.5 - x[0]*(1-x[1])
	f2 := 2.25 - x[0]*(1-x[1]*x[1])
	f3 := 2.625 - x[0]*(1-x[1]*x[1]*x[1])
	return f1*f1 + f2*f2 + f3*f3
}

// Beale32Grad is Beale32's gradient.
func Beale32Grad(x, g *[2]float32) {
	y2 := x[1] * x[1]
	y3 := y2 * x[1]
	f1 := 1.5 - x[0]*(1-x[1])
	f2 := 2.25 - x[0]*(1-y2)
	f3 := 2.625 - x[0]*(1-y3)
	g[0] = -2 * (f1*(1-x[1]) + f2*(1-y2) + f3*(1-y3))
	g[1] = 2 * x[0] * (f1 + 2*f2*x[1] + 3*f3*y2)
}

// Wood32 is Wood's function in float32; minimum 0 at (1, 1, 1, 1).
func Wood32(x *[4]float32) float32 {
	f1 := x[1] - x[0]*x[0]
	f2 := 1 - x[0]
	f3 := x[3] - x[2]*x[2]
	f4 := 1 - x[2]
	f5 := x[1] + x[3] - 2
	f6 := x[1] - x[3]
	return 100*f1*f1 + f2*f2 + 90*f3*f3 + f4*f4 + 10*f5*f5 + 0.1*f6*f6
}

// Wood32Grad is Wood32's gradient.
func Wood32Grad(x, g *[4]float32) {
	f1 := x[1] - x[0]*x[0]
	f3 := x[3] - x[2]*x[2]
	f5 := x[1] + x[3] - 2
	f6 := x[1] - x[3]
	g[0] = -400*x[0]*f1 - 2*(1-x[0])
	g[1] = 200*f1 + 20*f5 + 0.2*f6
	g[2] = -360*x[2]*f3 - 2*(1-x[2])
	g[3] = 180*f3 + 20*f5 - 0.2*f6
}
