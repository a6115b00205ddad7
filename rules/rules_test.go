package rules

import (
	"math"
	"testing"
)

func TestParamRanges(t *testing.T) {
	cases := []struct {
		p    *Param
		v    float64
		want bool
	}{
		{Shrink, 0.5, true}, {Shrink, 0, false}, {Shrink, 1, false},
		{Initial, 1e300, true}, {Initial, math.Inf(1), false}, {Initial, 0, false},
		{Trials, 1, true}, {Trials, 1.5, false}, {Trials, 1000, true}, {Trials, 1001, false},
		{StopGradient, 0, true}, {StopGradient, math.NaN(), false}, {StopGradient, math.Inf(1), false},
		{Interpolate, 1, true}, {Interpolate, 0, true}, {Interpolate, 0.5, false},
	}
	for _, c := range cases {
		if got := c.p.Contains(c.v); got != c.want {
			t.Errorf("%s.Contains(%v) = %v, want %v", c.p.Key, c.v, got, c.want)
		}
	}
	for p, want := range map[*Param]string{Shrink: "(0, 1)", Initial: "(0, ∞)", Trials: "[1, 1000]", Interpolate: "true|false"} {
		if got := p.Range(); got != want {
			t.Errorf("%s.Range() = %q, want %q", p.Key, got, want)
		}
	}
}

// Every default, of a parameter or of an entry, lies in its range, for
// every float type and choice of entries; every entry has a reference; and
// the registry's lists hold what the package declares.
func TestRegistryIsConsistent(t *testing.T) {
	seen := map[string]bool{}
	for _, p := range Params() {
		if seen[p.Path()] {
			t.Errorf("parameter %s is registered twice", p.Path())
		}
		seen[p.Path()] = true
		if p.Table != "" && p.Table != "step" && p.Table != "stop" {
			t.Errorf("%s: unknown table %q", p.Key, p.Table)
		}
		if p.Kind == Switch && (p.On == nil || p.Off == nil) {
			t.Errorf("switch %s picks no alternatives", p.Path())
		}
	}
	for _, elem := range []string{"float32", "float64"} {
		for _, d := range Derivative.Entries {
			for _, dir := range Direction.Entries {
				for _, r := range StepRule.Entries {
					c := &Context{Elem: elem, Dim: 3, Derivative: d, Direction: dir, Rule: r, Test: Relative}
					c.Value = c.DefaultValue
					for _, p := range Params() {
						if v := c.DefaultValue(p); c.Reads(p) && !p.Contains(v) {
							t.Errorf("%s %s %s %s: default %v of %s is outside %s", elem, d.Name, dir.Name, r.Name, v, p.Path(), p.Range())
						}
					}
					for _, k := range Constants {
						if k.Value(c) == "" {
							t.Errorf("%s: constant %s has no value", elem, k.Name)
						}
					}
				}
			}
		}
	}
	for _, c := range Choices() {
		if c.DefaultEntry() == nil {
			t.Errorf("%s: default %q is not an entry", c.Path(), c.Default)
		}
		for _, e := range c.Entries {
			if len(e.References) == 0 {
				t.Errorf("%s %s has no reference", c.Key, e.Name)
			}
			if len(e.Picks) == 0 {
				t.Errorf("%s %s picks no template alternative", c.Key, e.Name)
			}
		}
	}
	for _, d := range Derivative.Entries {
		if d.GradientCalls == nil {
			t.Errorf("derivative %s has no cost", d.Name)
		}
	}
	for _, r := range StepRule.Entries {
		if r.IterationCalls == nil {
			t.Errorf("rule %s has no cost", r.Name)
		}
	}
}

// The default trials cover the shrinks from the first trial to the step
// limit: 2⁻⁴⁶·⁵ ≈ 1e-14 (float64) and 2⁻¹⁹·⁹ ≈ 1e-6 (float32), one trial more
// for the first.
func TestTrialsDefault(t *testing.T) {
	cases := []struct {
		elem  string
		rule  *Entry
		given map[*Param]float64
		want  float64
	}{
		{"float64", ArmijoRule, nil, 48},
		{"float32", ArmijoRule, nil, 21},
		{"float64", WolfeRule, nil, 48},
		{"float64", ArmijoRule, map[*Param]float64{Shrink: 0.1}, 15},
		{"float64", ArmijoRule, map[*Param]float64{Initial: 0.25}, 46},
		{"float64", ArmijoRule, map[*Param]float64{StopStep: 0}, 1 + 53},
		{"float64", ArmijoRule, map[*Param]float64{Initial: 1e-20}, 1},
	}
	for _, c := range cases {
		ctx := &Context{Elem: c.elem, Dim: 2, Derivative: Central, Direction: BFGS, Rule: c.rule, Test: Relative}
		ctx.Value = func(p *Param) float64 {
			if v, ok := c.given[p]; ok {
				return v
			}
			return ctx.DefaultValue(p)
		}
		if got := ctx.DefaultValue(Trials); got != c.want {
			t.Errorf("%s %s %v: trials default %v, want %v", c.elem, c.rule.Name, c.given, got, c.want)
		}
	}
}
