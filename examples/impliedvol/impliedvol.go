// Package impliedvol is thalweg's worked example of a minimizer on a hot
// path: a market-making quote engine that, on every tick, re-derives the
// volatility implied by each option's last traded price before it
// re-quotes. The instrument, the trade and its numbers are invented for
// the demo.
//
// The model is Black and Scholes's price of a European call on a stock
// that pays no dividend (F. Black and M. Scholes, The pricing of options
// and corporate liabilities, J. Political Economy 81(3):637–654, 1973).
// Implied volatility is the σ at which the model price equals the traded
// price; the engine finds it by minimizing the squared pricing error over
// a plausible box of volatilities with the generated ImpliedVol.
package impliedvol

//go:generate go tool thalweg gen impliedvol.toml

import "math"

// Trade is one traded European call, as the quote engine sees it on a
// tick. Every field must be finite and Spot, Strike and Maturity positive;
// the engine validates them before it solves (see ValidTrade).
type Trade struct {
	Spot     float64 // price of the underlying now
	Strike   float64 // exercise price
	Rate     float64 // continuously compounded risk-free rate, per year
	Maturity float64 // time to expiry, in years
	Price    float64 // the call's traded price
}

// SampleTrade is an invented trade: a three-month call struck 5 % out of
// the money on an underlying at 101.35, traded at 2.87. The generated
// tests, thalweg tune and thalweg trace use it as the receiver.
var SampleTrade = Trade{Spot: 101.35, Strike: 106.5, Rate: 0.035, Maturity: 0.25, Price: 2.87}

// normalCDF is the standard normal distribution function Φ(x) =
// erfc(−x/√2)/2. Through erfc it keeps full relative accuracy in the
// lower tail, where 1 − Φ(−x) computed from erf would cancel to zero.
func normalCDF(x float64) float64 {
	return 0.5 * math.Erfc(-x/math.Sqrt2)
}

// invSqrt2Pi is 1/√(2π), the standard normal density at zero.
const invSqrt2Pi = 0.3989422804014327

// CallPrice is the Black–Scholes price of a European call on a stock that
// pays no dividend, at volatility sigma > 0:
//
//	C = S·Φ(d₁) − K·e^(−rT)·Φ(d₂), d₁ = (ln(S/K) + (r + σ²/2)T)/(σ√T), d₂ = d₁ − σ√T
//
// (Black and Scholes 1973, eq. 13, the number from memory; Hull, Options,
// Futures, and Other Derivatives, the Black–Scholes–Merton chapter).
func CallPrice(spot, strike, rate, maturity, sigma float64) float64 {
	d1, d2 := dPlusMinus(spot, strike, rate, maturity, sigma)
	return spot*normalCDF(d1) - strike*math.Exp(-rate*maturity)*normalCDF(d2)
}

// Vega is ∂C/∂σ = S·φ(d₁)·√T, φ the standard normal density; it is the
// same for a call and a put and positive for every σ > 0.
func Vega(spot, strike, rate, maturity, sigma float64) float64 {
	d1, _ := dPlusMinus(spot, strike, rate, maturity, sigma)
	return spot * invSqrt2Pi * math.Exp(-d1*d1/2) * math.Sqrt(maturity)
}

// dPlusMinus returns Black and Scholes's d₁ and d₂.
func dPlusMinus(spot, strike, rate, maturity, sigma float64) (d1, d2 float64) {
	sd := sigma * math.Sqrt(maturity) // standard deviation of ln S_T
	d1 = (math.Log(spot/strike) + (rate+sigma*sigma/2)*maturity) / sd
	return d1, d1 - sd
}

// priceScale is the vega of an at-the-money-forward call as σ → 0,
// S·√T/√(2π), the factor that turns a small volatility error into a price
// error near the money (it is the slope in Brenner and Subrahmanyam's
// approximation C ≈ 0.4·S·σ·√T). Pricing errors are measured in it.
func (t Trade) priceScale() float64 {
	return t.Spot * math.Sqrt(t.Maturity) * invSqrt2Pi
}

// PricingError is the objective: half the squared difference between the
// model price at volatility sigma and the traded price, in units of
// priceScale,
//
//	f(σ) = ½·((C(σ) − P)/s)², s = S·√T/√(2π).
//
// Why this form. C rises strictly with σ, so the minimum is f = 0 at the
// implied volatility σ* when the model can produce the price, and
// otherwise at the bound nearer to it. The scale s is the largest value
// vega = S·√T·φ(d₁) can take (φ(d₁) ≤ φ(0)), so f′(σ) = (C − P)·vega/s² is
// the Newton step for C(σ) = P, (C − P)/vega, shortened by the factor
// (vega/s)² ≤ 1: a unit step along −f′, the first step the minimizer
// tries, moves towards σ* and near the money lands close to it. Near the
// money f ≈ ½(σ − σ*)² and f′ ≈ σ − σ*, so the stop tests read in
// volatility units whatever the price level, currency or maturity.
//
// Where vega is tiny (deep in or out of the money, or short maturity at a
// low σ) f is flat: the price then says little about σ, and a start there
// sees almost no slope. The engine implies volatilities only where vega
// at its guess and at the answer is a fair share of s (see the round-trip
// test).
func (t Trade) PricingError(sigma float64) float64 {
	e := (CallPrice(t.Spot, t.Strike, t.Rate, t.Maturity, sigma) - t.Price) / t.priceScale()
	return e * e / 2
}

// PricingErrorSlope is PricingError's derivative in σ, by the chain rule
// through vega: f′(σ) = (C(σ) − P)·vega(σ)/s².
func (t Trade) PricingErrorSlope(sigma float64) float64 {
	s := t.priceScale()
	e := CallPrice(t.Spot, t.Strike, t.Rate, t.Maturity, sigma) - t.Price
	return e * Vega(t.Spot, t.Strike, t.Rate, t.Maturity, sigma) / (s * s)
}

// ValidTrade reports whether a trade's data can be handed to ImpliedVol:
// every field finite, spot, strike and maturity positive, and the price
// strictly between the no-arbitrage bounds of a call, max(S − K·e^(−rT), 0)
// < P < S. A price outside them has no implied volatility at all; the
// minimizer would end at a bound.
func ValidTrade(t Trade) bool {
	for _, v := range [...]float64{t.Spot, t.Strike, t.Rate, t.Maturity, t.Price} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return false
		}
	}
	if !(t.Spot > 0 && t.Strike > 0 && t.Maturity > 0) {
		return false
	}
	intrinsic := math.Max(t.Spot-t.Strike*math.Exp(-t.Rate*t.Maturity), 0)
	return t.Price > intrinsic && t.Price < t.Spot
}

// PriceTick is the invented market's price increment; a volatility is
// quoted only when it reprices the trade to within half a tick.
const PriceTick = 0.01

// Volatility box of the spec's [minimizer.bounds]; ImpliedVol never
// evaluates the objective outside it.
const (
	LowestVol  = 1e-3
	HighestVol = 5.0
)

// VolFromTrade is the quote engine's hot-path call: it validates the
// trade, solves from guess (typically the previous tick's volatility for
// this option) and accepts the result only when the run converged, σ lies
// in the box, and the model price at σ is within half a tick of the
// traded price. A converged run that ends on a bound has met the box's
// first-order conditions but found no volatility that reproduces the
// price; the repricing check rejects it. On false the engine must not
// quote from sigma (keep the last good value or pull the quote).
func VolFromTrade(t Trade, guess float64) (sigma float64, ok bool) {
	if !ValidTrade(t) {
		return math.NaN(), false
	}
	r := ImpliedVol(t, guess)
	if !r.Status.Converged() || !(r.X >= LowestVol && r.X <= HighestVol) {
		return r.X, false
	}
	miss := CallPrice(t.Spot, t.Strike, t.Rate, t.Maturity, r.X) - t.Price
	return r.X, math.Abs(miss) <= PriceTick/2
}
