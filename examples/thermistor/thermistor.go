// Package thermistor is thalweg's worked example of a calibration with
// unknowns of very different size: a fermentation-tank controller fits the
// Steinhart–Hart coefficients of each replacement NTC thermistor against a
// reference probe, on the device, at commissioning. The probe, the tank
// and every reading are invented for the demo.
//
// The model is Steinhart and Hart's (J. S. Steinhart and S. R. Hart,
// Calibration curves for thermistors, Deep-Sea Research 15(4):497–503,
// 1968):
//
//	1/T = A + B·ln R + C·(ln R)³,
//
// T in kelvin and R in ohms. For a 10 kΩ part A is near 10⁻³, B near
// 2·10⁻⁴ and C near 10⁻⁷: four orders of magnitude apart, which is what
// the spec's scale is for.
package thermistor

//go:generate go tool thalweg gen thermistor.toml

import "math"

// Calibration holds the readings of one thermistor beside the reference
// probe: its resistance in ohms and the probe's temperature in kelvin at
// each point. Misfit reads them and allocates nothing.
type Calibration struct {
	Ohms, Kelvin []float64
}

// Tank is an invented calibration run of eight points from −21 °C to
// 86 °C, each reading rounded to 1 mK and carrying up to 20 mK of probe
// noise. The generated tests, thalweg tune and thalweg trace use it.
var Tank = &Calibration{
	Ohms:   []float64{95000, 45000, 22000, 10000, 5300, 2900, 1700, 1000},
	Kelvin: []float64{251.830, 265.252, 279.369, 296.453, 311.671, 327.457, 342.669, 359.176},
}

// Misfit is the mean square, over the calibration points, of the relative
// error of the model's 1/T in parts per million:
//
//	rᵢ = 10⁶·(Tᵢ·(A + B·Lᵢ + C·Lᵢ³) − 1),  Lᵢ = ln Rᵢ,
//
// with coef = (A, B, C). Relative error weighs every point alike whatever
// its temperature; in ppm, f is of order one at a good fit and the
// relative gradient test has a value to be relative to. It is a linear
// least-squares problem, which is what the outside checks solve directly.
func (c *Calibration) Misfit(coef [3]float64) float64 {
	var sum float64
	for i, ohms := range c.Ohms {
		l := math.Log(ohms)
		r := 1e6 * (c.Kelvin[i]*(coef[0]+coef[1]*l+coef[2]*l*l*l) - 1)
		sum += r * r
	}
	return sum / float64(len(c.Ohms))
}

// Temperature is the model's temperature in kelvin at resistance ohms.
func Temperature(coef [3]float64, ohms float64) float64 {
	l := math.Log(ohms)
	return 1 / (coef[0] + coef[1]*l + coef[2]*l*l*l)
}

// Commission fits the coefficients from the datasheet's nominal ones and
// accepts them only when the fit converged, every coefficient is positive
// and the model reproduces every calibration point within tolerance
// kelvin; otherwise it keeps the previous coefficients. A controller
// must not steer a heater from an unchecked fit.
func Commission(c *Calibration, nominal, previous [3]float64, tolerance float64) (coef [3]float64, accepted bool) {
	fit := FitSteinhartHart(c, nominal)
	if !fit.Status.Converged() {
		return previous, false
	}
	for _, v := range fit.X {
		if !(v > 0) {
			return previous, false
		}
	}
	for i, ohms := range c.Ohms {
		if !(math.Abs(Temperature(fit.X, ohms)-c.Kelvin[i]) <= tolerance) {
			return previous, false
		}
	}
	return fit.X, true
}
