// Package quickstart is thalweg's first example: two objectives of a small
// motor controller, minimized by generated code. The data are invented for
// the demo.
package quickstart

//go:generate go tool thalweg gen quickstart.toml

// GainCost is the cost of running the speed loop at gain k: energy grows
// as k²/2 while settling time, weighted by 8, shrinks as 1/k. Its minimum
// is where k − 8/k² = 0, so k = 2 exactly.
func GainCost(k float64) float64 {
	return k*k/2 + 8/k
}

// Invented calibration run: raw encoder readings and the reference speed
// measured beside them; the sensor's true gain is 2 and its offset −1.
var (
	rawReadings = [4]float64{0.5, 1, 2, 3.5}
	refSpeeds   = [4]float64{0, 1, 3, 6}
)

// CalibrationError is the squared error of reading speed as
// gain·raw + offset, with p = (gain, offset).
func CalibrationError(p *[2]float64) float64 {
	var sum float64
	for i, raw := range rawReadings {
		r := p[0]*raw + p[1] - refSpeeds[i]
		sum += r * r
	}
	return sum
}

// CalibrationGradient is CalibrationError's gradient.
func CalibrationGradient(p, g *[2]float64) {
	g[0], g[1] = 0, 0
	for i, raw := range rawReadings {
		r := p[0]*raw + p[1] - refSpeeds[i]
		g[0] += 2 * r * raw
		g[1] += 2 * r
	}
}
