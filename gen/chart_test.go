package gen

import (
	"bytes"
	"encoding/xml"
	"io"
	"math"
	"reflect"
	"strconv"
	"strings"
	"testing"

	"github.com/thalweg-go/thalweg/rules"
)

func TestDecadeTicks(t *testing.T) {
	for _, c := range []struct {
		low, high float64
		lo, hi    int
		ticks     []int
	}{
		{-10.3, 2.1, -11, 3, []int{-10, -8, -6, -4, -2, 0, 2}}, // 14 decades: every second
		{-16, 2, -16, 2, []int{-16, -14, -12, -10, -8, -6, -4, -2, 0, 2}},
		{-40, 1, -40, 1, []int{-40, -35, -30, -25, -20, -15, -10, -5, 0}}, // every fifth
		{-3.5, 1.2, -4, 2, []int{-4, -3, -2, -1, 0, 1, 2}},
		{0.2, 0.3, 0, 1, []int{0, 1}}, // within one decade: its two ends
		{5, 5, 5, 6, []int{5, 6}},
	} {
		lo, hi, ticks := decadeTicks(c.low, c.high, 10)
		if lo != c.lo || hi != c.hi || !reflect.DeepEqual(ticks, c.ticks) {
			t.Errorf("decadeTicks(%g, %g) = %d, %d, %v; want %d, %d, %v", c.low, c.high, lo, hi, ticks, c.lo, c.hi, c.ticks)
		}
	}
}

func TestRoundSteps(t *testing.T) {
	for _, c := range []struct {
		span  float64
		most  int
		step  float64
		ticks []float64 // from 0
	}{
		{35, 10, 5, []float64{0, 5, 10, 15, 20, 25, 30, 35}},
		{19, 10, 2, []float64{0, 2, 4, 6, 8, 10, 12, 14, 16, 18}},
		{100, 10, 10, nil},
		{7, 10, 1, nil},
		{0.9, 6, 0.2, []float64{0, 0.2, 0.4, 0.6, 0.8}},
		{3e-7, 3, 1e-7, []float64{0, 1e-7, 2e-7, 3e-7}},
	} {
		if got := roundStep(c.span, c.most); math.Abs(got-c.step) > 1e-15*c.step {
			t.Errorf("roundStep(%g, %d) = %g, want %g", c.span, c.most, got, c.step)
		}
		if c.ticks == nil {
			continue
		}
		_, ticks := roundTicks(0, c.span, c.most)
		if len(ticks) != len(c.ticks) {
			t.Errorf("roundTicks(0, %g, %d) = %v, want %v", c.span, c.most, ticks, c.ticks)
			continue
		}
		for i := range ticks {
			if math.Abs(ticks[i]-c.ticks[i]) > 1e-12*c.step {
				t.Errorf("roundTicks(0, %g, %d) = %v, want %v", c.span, c.most, ticks, c.ticks)
			}
		}
	}
	// Over an interval that is not aligned with the step, and the labels.
	step, ticks := roundTicks(-1.45, 1.25, 6)
	var labels []string
	for _, v := range ticks {
		labels = append(labels, tickLabel(v, ticks))
	}
	if want := []string{"−1.0", "−0.5", "0", "0.5", "1.0"}; step != 0.5 || !reflect.DeepEqual(labels, want) {
		t.Errorf("roundTicks(−1.45, 1.25, 6): step %g, labels %q; want 0.5, %q", step, labels, want)
	}
}

func TestLabels(t *testing.T) {
	for k, want := range map[int]string{-4: "10⁻⁴", 0: "10⁰", 12: "10¹²"} {
		if got := decadeLabel(k); got != want {
			t.Errorf("decadeLabel(%d) = %q, want %q", k, got, want)
		}
	}
	for _, c := range []struct {
		v      float64
		digits int
		want   string
	}{{1.0583e13, 3, "1.06e13"}, {4.5e-9, 2, "4.5e-9"}, {0.0123, 3, "0.0123"}, {2.16e10, 3, "2.16e10"}, {1e-8, 3, "1e-8"}, {13.25, 3, "13.2"}} {
		if got := compactFloat(c.v, c.digits); got != c.want {
			t.Errorf("compactFloat(%g, %d) = %q, want %q", c.v, c.digits, got, c.want)
		}
	}
	if got := mix("#000000", "#ff8040", 0.5); got != "#804020" {
		t.Errorf("mix = %s, want #804020", got)
	}
}

// element is what the chart tests read back from the SVG.
type element struct {
	name  string
	attr  map[string]string
	text  string
	class string
}

// parseSVG checks that the document is well-formed XML with an svg root
// and returns its elements in order.
func parseSVG(t *testing.T, data []byte) []element {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(data))
	var out []element
	var open []int // indices of the elements not yet closed
	depth := 0
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("the SVG is not well-formed XML: %v", err)
		}
		switch tok := tok.(type) {
		case xml.StartElement:
			if depth == 0 && tok.Name.Local != "svg" {
				t.Fatalf("root element %s, want svg", tok.Name.Local)
			}
			depth++
			e := element{name: tok.Name.Local, attr: map[string]string{}}
			for _, a := range tok.Attr {
				e.attr[a.Name.Local] = a.Value
			}
			e.class = e.attr["class"]
			open = append(open, len(out))
			out = append(out, e)
		case xml.CharData:
			if len(open) > 0 {
				out[open[len(open)-1]].text += string(tok)
			}
		case xml.EndElement:
			depth--
			open = open[:len(open)-1]
		}
	}
	if depth != 0 || len(out) == 0 {
		t.Fatal("the SVG is truncated")
	}
	return out
}

func countClass(elems []element, name, class string) int {
	n := 0
	for _, e := range elems {
		if e.name == name && e.class == class {
			n++
		}
	}
	return n
}

func attrFloat(t *testing.T, e element, name string) float64 {
	t.Helper()
	v, err := strconv.ParseFloat(e.attr[name], 64)
	if err != nil {
		t.Fatalf("<%s %s=%q>: %v", e.name, name, e.attr[name], err)
	}
	return v
}

// syntheticTrace is a run of three moves on f = x² + 4y² with a grid
// when plane, and one rejected trial before the first move.
func syntheticTrace(plane bool) *TraceResult {
	res := &TraceResult{
		Limits: TraceLimits{Gradient: 1e-6, Step: 1e-14, Iterations: 100, Evaluations: 50},
		Status: "gradient small", Converged: true, Iterations: 3, Evaluations: 5, F: 0,
		Rows: []TraceRow{
			{Iteration: 0, Evaluations: 1, F: 5, Gradient: 8, X: []float64{1, 1}},
			{Iteration: 1, Evaluations: 3, Trials: 2, F: 0.5, Gradient: 2, Step: 0.5, Slope: -10, X: []float64{0.5, -0.25}},
			{Iteration: 2, Evaluations: 4, Trials: 1, F: 1e-4, Gradient: 1e-3, Step: 1, Slope: -0.9, X: []float64{0.01, 0}},
			{Iteration: 3, Evaluations: 5, Trials: 1, F: 0, Gradient: 1e-9, Step: 1, Slope: -2e-4, X: []float64{0, 0}},
		},
		LastTrials: 0,
	}
	if plane {
		res.Trials = []TracePoint{
			{Iteration: 1, F: 40, X: []float64{-1, -3}},
			{Iteration: 1, F: 0.5, X: []float64{0.5, -0.25}}, // accepted: drawn as the path
		}
		g := &TraceGrid{}
		for i := 0; i <= 8; i++ {
			v := -1.5 + 3*float64(i)/8
			g.X, g.Y = append(g.X, v), append(g.Y, v)
		}
		for _, y := range g.Y {
			var row []float64
			for _, x := range g.X {
				row = append(row, x*x+4*y*y)
			}
			g.F = append(g.F, row)
		}
		res.Grid = g
	}
	res.derive()
	return res
}

func tracePlan(dim int) *Plan {
	m := &Minimizer{Name: "Fit", Direction: rules.BFGS, Rule: rules.ArmijoRule, Derivative: rules.Analytic, Start: make([]float64, dim)}
	return &Plan{M: m, Shape: Shape{Elem: "float64", Dim: dim}, Context: resolveContext(m, "float64", dim)}
}

// The chart is well-formed SVG with the gradient limit drawn as a line at
// its decade, a marker per plotted value, ticks at whole decades, and, for
// two unknowns only, contours under the path with start and end marked.
func TestTraceSVG(t *testing.T) {
	for _, plane := range []bool{true, false} {
		res := syntheticTrace(plane)
		var buf, again bytes.Buffer
		if err := WriteTraceSVG(&buf, tracePlan(2), res); err != nil {
			t.Fatal(err)
		}
		WriteTraceSVG(&again, tracePlan(2), res)
		if !bytes.Equal(buf.Bytes(), again.Bytes()) {
			t.Errorf("plane %v: two renderings differ", plane)
		}
		elems := parseSVG(t, buf.Bytes())

		// The limit line lies exactly on the 10⁻⁶ decade, across the plot.
		var limit, decade *element
		var decades []string
		for i, e := range elems {
			switch {
			case e.name == "line" && e.class == "limit":
				limit = &elems[i]
			case e.name == "text" && e.class == "decade":
				decades = append(decades, e.text)
				if e.text == "10⁻⁶" {
					decade = &elems[i]
				}
			}
		}
		if limit == nil || decade == nil {
			t.Fatalf("plane %v: no gradient-limit line or no 10⁻⁶ tick (ticks %v)", plane, decades)
		}
		if y1, y2, ty := attrFloat(t, *limit, "y1"), attrFloat(t, *limit, "y2"), attrFloat(t, *decade, "y"); y1 != y2 || math.Abs(y1-(ty-4)) > 0.05 {
			t.Errorf("plane %v: limit line at y %g–%g, the 10⁻⁶ tick at %g", plane, y1, y2, ty-4)
		}
		// f − final f spans 10⁻⁴…10⁰·⁷ and the gradient 10⁻⁹…10⁰·⁹: whole
		// decades from 10⁻⁹ to 10¹, every one.
		if want := []string{"10⁻⁹", "10⁻⁸", "10⁻⁷", "10⁻⁶", "10⁻⁵", "10⁻⁴", "10⁻³", "10⁻²", "10⁻¹", "10⁰", "10¹"}; !reflect.DeepEqual(decades, want) {
			t.Errorf("plane %v: decade labels %v, want %v", plane, decades, want)
		}
		if !strings.Contains(buf.String(), "gradient limit 1e-6</text>") {
			t.Errorf("plane %v: the limit line is not labelled", plane)
		}
		// 4 gradient values and 3 positive gaps (the last is 0).
		if n := countClass(elems, "circle", "marker") + countClass(elems, "rect", "marker"); n != 7 {
			t.Errorf("plane %v: %d series markers, want 7", plane, n)
		}
		if n := countClass(elems, "rect", "calls"); n != 3 {
			t.Errorf("plane %v: %d bars of calls, want 3 (analytic gradient, one per move)", plane, n)
		}
		contours, iterates := countClass(elems, "path", "contour"), countClass(elems, "circle", "iterate")
		trials, start, end := countClass(elems, "circle", "trial"), countClass(elems, "rect", "start"), countClass(elems, "circle", "end")
		if plane {
			// The rejected trial of move 1 is reached from the start.
			var reach, first *element
			for i, e := range elems {
				if e.class == "reach" && reach == nil {
					reach = &elems[i]
				}
				if e.class == "iterate" && first == nil {
					first = &elems[i]
				}
			}
			if reach == nil || first == nil || reach.attr["x1"] != first.attr["cx"] || reach.attr["y1"] != first.attr["cy"] {
				t.Errorf("the rejected trial is not reached from the start: %v from %v", reach, first)
			}
			if contours < 3 || iterates != 4 || trials != 1 || start != 1 || end != 1 {
				t.Errorf("two unknowns: %d contours (want ≥ 3), %d iterates (4), %d rejected trials (1), start %d, end %d", contours, iterates, trials, start, end)
			}
		} else if contours+iterates+trials+start+end != 0 || strings.Contains(buf.String(), "clipPath") {
			t.Errorf("no grid: the chart has a contour panel")
		}
	}
}
