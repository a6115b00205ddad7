package gen

import (
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
)

// The chart's palette, thalweg's own: a riverbed's slate green for the
// gradient and the contours' floor, rust for f and the path, a pale sage
// for the contours' heights, on warm paper.
const (
	inkPaper     = "#fbfaf6"
	inkText      = "#33302b"
	inkRule      = "#e3dfd4" // grid lines
	inkGradient  = "#24505a" // slate green: the gradient test's measure and its limit
	inkGap       = "#b0502a" // rust: f − final f, the path
	inkTrials    = "#b0502a" // trials per move
	inkDiffCalls = "#e2b99f" // calls for differences per move
	inkFloor     = "#24505a" // the lowest contour
	inkHeights   = "#c3d0bd" // the highest contour
)

// frame is a plot area in SVG pixels.
type frame struct{ left, top, width, height float64 }

func (f frame) right() float64  { return f.left + f.width }
func (f frame) bottom() float64 { return f.top + f.height }

// WriteTraceSVG draws the run as a hand-written SVG chart. The left
// panel: the gradient test's measure and f − final f per move on a log axis with
// the gradient limit as a line, and under it the objective calls each
// move spent, trials and differences. For objectives of two unknowns the
// right panel draws contours of f over the box the harness sampled, with
// the path of accepted points and the rejected line-search trials.
func WriteTraceSVG(w io.Writer, p *Plan, res *TraceResult) error {
	plane := res.Grid != nil && len(res.Rows) > 0
	width, height := 640.0, 560.0
	if plane {
		width = 1120
	}
	var b strings.Builder
	fmt.Fprintf(&b, `<svg xmlns="http://www.w3.org/2000/svg" width="%g" height="%g" viewBox="0 0 %g %g" font-family="DejaVu Sans, Verdana, sans-serif" font-size="12" fill="%s">`+"\n", width, height, width, height, inkText)
	fmt.Fprintf(&b, `<rect width="100%%" height="100%%" fill="%s"/>`+"\n", inkPaper)
	fmt.Fprintf(&b, `<text x="24" y="28" font-size="15" font-weight="bold">%s</text>`+"\n", xmlEscape(fmt.Sprintf("%s: %s direction, %s step rule, %s gradient", p.M.Name, p.Direction.Name, p.Rule.Name, p.Derivative.Name)))
	fmt.Fprintf(&b, `<text x="24" y="47">%s</text>`+"\n", xmlEscape(fmt.Sprintf("%s (%s) after %s and %s; f = %s", res.Status, verdict(res.Converged), plural(res.Iterations, "move"), plural(res.Evaluations, "objective call"), compactFloat(res.F, 6))))
	drawConvergence(&b, res, frame{left: 76, top: 96, width: 540, height: 300}, frame{left: 76, top: 420, width: 540, height: 80})
	if plane {
		drawContours(&b, res, frame{left: 700, top: 96, width: 380, height: 380})
	}
	b.WriteString("</svg>\n")
	_, err := io.WriteString(w, b.String())
	return err
}

// drawConvergence draws the log chart in main and the calls per move in
// strip, sharing the move axis. A line search that ended the run without
// a step gets a hollow bar after the last move.
func drawConvergence(b *strings.Builder, res *TraceResult, main, strip frame) {
	type series struct {
		name, color, marker string
		points              [][2]float64 // move, log₁₀ value
	}
	grad := series{name: "largest |∂f/∂xᵢ|", color: inkGradient, marker: "circle"}
	if res.Relative {
		grad.name = "relative gradient"
	}
	gap := series{name: "f − final f", color: inkGap, marker: "square"}
	positive := func(v float64) bool { return v > 0 && !math.IsInf(v, 0) }
	low, high := math.Inf(1), math.Inf(-1)
	add := func(s *series, move int, v float64) {
		if positive(v) {
			s.points = append(s.points, [2]float64{float64(move), math.Log10(v)})
			low, high = math.Min(low, math.Log10(v)), math.Max(high, math.Log10(v))
		}
	}
	lastMove, mostCalls := 0, res.LastTrials
	for _, r := range res.Rows {
		add(&grad, r.Iteration, r.Gradient)
		add(&gap, r.Iteration, r.F-res.F)
		lastMove = max(lastMove, r.Iteration)
		mostCalls = max(mostCalls, r.Trials+r.GradientCalls)
	}
	slots := lastMove + 1 // moves 0…lastMove, and the unfinished search
	if res.LastTrials > 0 {
		slots++
	}
	limit := res.Limits.Gradient
	if positive(limit) {
		low, high = math.Min(low, math.Log10(limit)), math.Max(high, math.Log10(limit))
	}
	if math.IsInf(low, 0) {
		low, high = -1, 1
	}
	lo, hi, decades := decadeTicks(low, high, 10)
	// Each move sits in the middle of its slot, so that markers and bars
	// keep clear of the axes.
	x := func(move float64) float64 { return main.left + main.width*(move+0.5)/float64(slots) }
	y := func(v float64) float64 { return main.top + main.height*(float64(hi)-v)/float64(hi-lo) }

	// Legend above the plot.
	lx := main.left
	for _, s := range []series{grad, gap} {
		fmt.Fprintf(b, `<line x1="%.1f" y1="76" x2="%.1f" y2="76" stroke="%s" stroke-width="2"/>`, lx, lx+26, s.color)
		marker(b, "key", s.marker, lx+13, 76, 3.5, s.color)
		fmt.Fprintf(b, `<text x="%.1f" y="80">%s</text>`+"\n", lx+32, xmlEscape(s.name))
		lx += 44 + 7.5*float64(len([]rune(s.name)))
	}
	if positive(limit) {
		fmt.Fprintf(b, `<line x1="%.1f" y1="76" x2="%.1f" y2="76" stroke="%s" stroke-width="1.5" stroke-dasharray="6 4"/><text x="%.1f" y="80">gradient limit</text>`+"\n", lx, lx+26, inkGradient, lx+32)
	}

	// Grid, ticks and labels: whole decades up the side, round moves along
	// the bottom.
	_, moves := roundTicks(0, float64(lastMove), 10)
	for k := lo; k <= hi; k++ { // a short tick at every decade
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/>`, main.left-3, y(float64(k)), main.left, y(float64(k)), inkText)
	}
	b.WriteString("\n")
	for _, k := range decades {
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><text class="decade" x="%.1f" y="%.1f" text-anchor="end">%s</text>`+"\n",
			main.left, y(float64(k)), main.right(), y(float64(k)), inkRule, main.left-6, y(float64(k)), main.left, y(float64(k)), inkText, main.left-9, y(float64(k))+4, decadeLabel(k))
	}
	for _, m := range moves {
		if m != math.Trunc(m) {
			continue // fractional steps: a run of a single move
		}
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/>`, x(m), main.top, x(m), main.bottom(), inkRule)
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/>`, x(m), strip.top, x(m), strip.bottom(), inkRule)
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><text class="move" x="%.1f" y="%.1f" text-anchor="middle">%s</text>`+"\n",
			x(m), strip.bottom(), x(m), strip.bottom()+5, inkText, x(m), strip.bottom()+19, strconv.Itoa(int(m)))
	}
	axes(b, main)
	if len(res.Rows) == 0 {
		fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="middle">the run ended before its first gradient: nothing to draw</text>`+"\n", main.left+main.width/2, main.top+main.height/2)
	}
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="middle">move (accepted steps; 0 is the start)</text>`+"\n", strip.left+strip.width/2, strip.bottom()+38)

	// The gradient limit, the series, then the limit's label where no
	// series passes.
	if positive(limit) {
		fmt.Fprintf(b, `<line class="limit" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="1.5" stroke-dasharray="6 4"/>`+"\n", main.left, y(math.Log10(limit)), main.right(), y(math.Log10(limit)), inkGradient)
	}
	radius := math.Max(1.5, math.Min(3.5, main.width/float64(slots)/3))
	var drawn [][2]float64 // every point drawn, in pixels, lines sampled
	for _, s := range []series{grad, gap} {
		if len(s.points) == 0 {
			continue
		}
		var pts []string
		for i, pt := range s.points {
			pts = append(pts, fmt.Sprintf("%.1f,%.1f", x(pt[0]), y(pt[1])))
			if i > 0 {
				a := s.points[i-1]
				for k := 0; k <= 16; k++ {
					u := float64(k) / 16
					drawn = append(drawn, [2]float64{x(a[0] + u*(pt[0]-a[0])), y(a[1] + u*(pt[1]-a[1]))})
				}
			}
			drawn = append(drawn, [2]float64{x(pt[0]), y(pt[1])})
		}
		fmt.Fprintf(b, `<polyline fill="none" stroke="%s" stroke-width="1.6" stroke-linejoin="round" points="%s"/>`+"\n", s.color, strings.Join(pts, " "))
		for _, pt := range s.points {
			marker(b, "marker", s.marker, x(pt[0]), y(pt[1]), radius, s.color)
		}
		b.WriteString("\n")
	}
	if positive(limit) {
		text := "gradient limit " + compactFloat(limit, 3)
		ly := y(math.Log10(limit))
		lx, baseline, anchor := labelPlace(main, ly, 7*float64(len([]rune(text))), drawn)
		fmt.Fprintf(b, `<text class="limit" x="%.1f" y="%.1f" text-anchor="%s" fill="%s" stroke="%s" stroke-width="4" stroke-linejoin="round" paint-order="stroke">%s</text>`+"\n", lx, baseline, anchor, inkGradient, inkPaper, xmlEscape(text))
	}

	// Calls per move: trials, with the calls for differences on top.
	callStep := math.Max(1, roundStep(float64(mostCalls), 3))
	top := math.Max(1, math.Ceil(float64(mostCalls)/callStep)) * callStep
	cy := func(v float64) float64 { return strip.bottom() - strip.height*v/top }
	for c := 0.0; c <= top; c += callStep {
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><text x="%.1f" y="%.1f" text-anchor="end">%s</text>`+"\n",
			strip.left, cy(c), strip.right(), cy(c), inkRule, strip.left-6, cy(c), strip.left, cy(c), inkText, strip.left-9, cy(c)+4, strconv.Itoa(int(c)))
	}
	barWidth := math.Max(1, math.Min(14, 0.7*strip.width/float64(slots)))
	bar := func(move float64, from, to int, style string) {
		fmt.Fprintf(b, `<rect class="calls" x="%.1f" y="%.1f" width="%.1f" height="%.1f" %s/>`, x(move)-barWidth/2, cy(float64(to)), barWidth, cy(float64(from))-cy(float64(to)), style)
	}
	for _, r := range res.Rows {
		if r.Trials > 0 {
			bar(float64(r.Iteration), 0, r.Trials, `fill="`+inkTrials+`"`)
		}
		if r.GradientCalls > 0 {
			bar(float64(r.Iteration), r.Trials, r.Trials+r.GradientCalls, `fill="`+inkDiffCalls+`"`)
		}
	}
	if res.LastTrials > 0 {
		bar(float64(lastMove+1), 0, res.LastTrials, `fill="none" stroke="`+inkTrials+`" stroke-width="1.2" stroke-dasharray="3 2"`)
	}
	b.WriteString("\n")
	axes(b, strip)
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f">objective calls per move:</text>`, strip.left, strip.top-8)
	lx = strip.left + 170
	fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="10" height="10" fill="%s"/><text x="%.1f" y="%.1f">line-search trials</text>`, lx, strip.top-17, inkTrials, lx+14, strip.top-8)
	lx += 136
	differences := false
	for _, r := range res.Rows {
		differences = differences || r.GradientCalls > 0
	}
	if differences {
		fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="10" height="10" fill="%s"/><text x="%.1f" y="%.1f">finite differences</text>`+"\n", lx, strip.top-17, inkDiffCalls, lx+14, strip.top-8)
		lx += 136
	}
	if res.LastTrials > 0 {
		fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="10" height="10" fill="none" stroke="%s" stroke-dasharray="3 2"/><text x="%.1f" y="%.1f">last search</text>`+"\n", lx, strip.top-17, inkTrials, lx+14, strip.top-8)
	}
}

// labelPlace finds room for a label of the given width on the line at
// height ly across area: above or below it, at the right end or the left,
// the first place where none of the drawn points falls; the right end
// above the line when every place is taken. It returns the label's
// anchor point and text-anchor.
func labelPlace(area frame, ly, width float64, drawn [][2]float64) (x, baseline float64, anchor string) {
	type place struct {
		x, baseline float64
		anchor      string
		left        float64 // the label's box
	}
	places := []place{
		{area.right() - 4, ly - 6, "end", area.right() - 4 - width},
		{area.right() - 4, ly + 16, "end", area.right() - 4 - width},
		{area.left + 6, ly - 6, "start", area.left + 6},
		{area.left + 6, ly + 16, "start", area.left + 6},
	}
	for _, p := range places {
		free := p.baseline-14 >= area.top && p.baseline+4 <= area.bottom()
		for _, d := range drawn {
			if d[0] >= p.left-4 && d[0] <= p.left+width+4 && d[1] >= p.baseline-16 && d[1] <= p.baseline+6 {
				free = false
				break
			}
		}
		if free {
			return p.x, p.baseline, p.anchor
		}
	}
	return places[0].x, places[0].baseline, places[0].anchor
}

// drawContours draws contours of f over the harness's grid, the rejected
// trials of each line search (dotted from the point the search left), and
// the path of accepted points, start and end marked.
func drawContours(b *strings.Builder, res *TraceResult, area frame) {
	g := res.Grid
	xLow, xHigh := g.X[0], g.X[len(g.X)-1]
	yLow, yHigh := g.Y[0], g.Y[len(g.Y)-1]
	px := func(v float64) float64 { return area.left + area.width*(v-xLow)/(xHigh-xLow) }
	py := func(v float64) float64 { return area.bottom() - area.height*(v-yLow)/(yHigh-yLow) }

	fmt.Fprintf(b, `<text x="%.1f" y="80">contours of f, the path of accepted points and the rejected trials</text>`+"\n", area.left)
	fmt.Fprintf(b, `<clipPath id="thalweg-box"><rect x="%.1f" y="%.1f" width="%.1f" height="%.1f"/></clipPath>`+"\n", area.left, area.top, area.width, area.height)
	// Ticks at round values of x₁ and x₂.
	_, xTicks := roundTicks(xLow, xHigh, 6)
	_, yTicks := roundTicks(yLow, yHigh, 6)
	for _, v := range xTicks {
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><text x="%.1f" y="%.1f" text-anchor="middle">%s</text>`+"\n",
			px(v), area.bottom(), px(v), area.bottom()+5, inkText, px(v), area.bottom()+19, tickLabel(v, xTicks))
	}
	for _, v := range yTicks {
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s"/><text x="%.1f" y="%.1f" text-anchor="end">%s</text>`+"\n",
			area.left-5, py(v), area.left, py(v), inkText, area.left-8, py(v)+4, tickLabel(v, yTicks))
	}
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="middle">x₁</text>`, area.left+area.width/2, area.bottom()+38)
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" text-anchor="middle">x₂</text>`+"\n", area.left-50, area.top+area.height/2+4)

	// Contours, lowest (darkest) last so that the valley floor stays on top.
	fMin := math.Inf(1)
	var values []float64
	for _, row := range g.F {
		for _, v := range row {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				fMin = math.Min(fMin, v)
				values = append(values, v)
			}
		}
	}
	for _, r := range res.Rows {
		fMin = math.Min(fMin, r.F)
	}
	exponents, step := contourLevels(values, fMin, 12)
	fmt.Fprintf(b, `<g clip-path="url(#thalweg-box)" fill="none">`+"\n")
	for k := len(exponents) - 1; k >= 0; k-- {
		shade := 1.0
		if len(exponents) > 1 {
			shade = float64(k) / float64(len(exponents)-1)
		}
		var d strings.Builder
		for _, line := range contourLines(g.X, g.Y, g.F, fMin+math.Pow(10, exponents[k])) {
			for i, pt := range line {
				cmd := "L"
				if i == 0 {
					cmd = "M"
				}
				fmt.Fprintf(&d, "%s%.1f %.1f", cmd, px(pt[0]), py(pt[1]))
			}
		}
		if d.Len() > 0 {
			fmt.Fprintf(b, `<path class="contour" stroke="%s" stroke-width="1.1" d="%s"/>`+"\n", mix(inkFloor, inkHeights, shade), d.String())
		}
	}
	// Rejected trials: a dotted line from the point the search left.
	for _, t := range res.Trials {
		if t.Iteration < 1 || t.Iteration > len(res.Rows) || len(t.X) < 2 {
			continue
		}
		from := res.Rows[t.Iteration-1].X
		if t.Iteration < len(res.Rows) && sameFloats(t.X, res.Rows[t.Iteration].X) {
			continue // the accepted trial: the path draws it
		}
		fmt.Fprintf(b, `<line class="reach" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="0.8" stroke-dasharray="1.5 2.5"/>`, px(from[0]), py(from[1]), px(t.X[0]), py(t.X[1]), inkGap)
		fmt.Fprintf(b, `<circle class="trial" cx="%.1f" cy="%.1f" r="2.6" fill="%s" stroke="%s" stroke-width="1"/>`+"\n", px(t.X[0]), py(t.X[1]), inkPaper, inkGap)
	}
	// The path of accepted points.
	var pts []string
	for _, r := range res.Rows {
		pts = append(pts, fmt.Sprintf("%.1f,%.1f", px(r.X[0]), py(r.X[1])))
	}
	fmt.Fprintf(b, `<polyline fill="none" stroke="%s" stroke-width="1.8" stroke-linejoin="round" points="%s"/>`+"\n", inkGap, strings.Join(pts, " "))
	radius := 3.0
	if len(res.Rows) > 60 {
		radius = 2
	}
	for _, r := range res.Rows {
		fmt.Fprintf(b, `<circle class="iterate" cx="%.1f" cy="%.1f" r="%.1f" fill="%s" stroke="%s" stroke-width="0.8"/>`, px(r.X[0]), py(r.X[1]), radius, inkGap, inkPaper)
	}
	b.WriteString("\n</g>\n")
	start, end := res.Rows[0].X, res.Rows[len(res.Rows)-1].X
	fmt.Fprintf(b, `<rect class="start" x="%.1f" y="%.1f" width="10" height="10" fill="%s" stroke="%s" stroke-width="1.2"/>`, px(start[0])-5, py(start[1])-5, inkPaper, inkText)
	endLabel := "end"
	if math.Hypot(px(start[0])-px(end[0]), py(start[1])-py(end[1])) < 16 {
		endLabel = "start, end" // one label where the two would overlap
	} else {
		pointLabel(b, area, "start", px(start[0]), py(start[1]), 9)
	}
	fmt.Fprintf(b, `<circle class="end" cx="%.1f" cy="%.1f" r="6.5" fill="none" stroke="%s" stroke-width="2"/>`, px(end[0]), py(end[1]), inkText)
	pointLabel(b, area, endLabel, px(end[0]), py(end[1]), 10)
	fmt.Fprintf(b, `<rect x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="none" stroke="%s"/>`+"\n", area.left, area.top, area.width, area.height, inkText)

	// What the lines are.
	ly := area.bottom() + 58
	if len(exponents) > 0 {
		levels := fmt.Sprintf("f = f_min + 10ᵏ, k = %s … %s", exponentText(exponents[0]), exponentText(exponents[len(exponents)-1]))
		if step > 0 {
			levels += ", every " + decadesText(step)
		}
		fmt.Fprintf(b, `<line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="2"/><line x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f" stroke="%s" stroke-width="2"/><text x="%.1f" y="%.1f">%s</text>`+"\n",
			area.left, ly-4, area.left+13, ly-4, inkFloor, area.left+13, ly-4, area.left+26, ly-4, inkHeights, area.left+32, ly, xmlEscape(levels))
	} else {
		fmt.Fprintf(b, `<text x="%.1f" y="%.1f">f is constant over the box: no contours</text>`+"\n", area.left, ly)
	}
	fmt.Fprintf(b, `<circle cx="%.1f" cy="%.1f" r="2.6" fill="%s" stroke="%s"/><text x="%.1f" y="%.1f">rejected trial, dotted from where its search began</text>`+"\n",
		area.left+13, ly+16, inkPaper, inkGap, area.left+32, ly+20)
}

// pointLabel writes a bold label below a marker at (x, y) that reaches
// gap pixels around it, or above it near the bottom of the area, and
// centred but kept inside the area.
func pointLabel(b *strings.Builder, area frame, text string, x, y, gap float64) {
	width := 8 * float64(len(text))
	baseline := y + gap + 12
	if baseline > area.bottom()-4 {
		baseline = y - gap - 3
	}
	left := math.Max(area.left+3, math.Min(x-width/2, area.right()-3-width))
	fmt.Fprintf(b, `<text x="%.1f" y="%.1f" font-weight="bold" stroke="%s" stroke-width="3" paint-order="stroke">%s</text>`+"\n", left, baseline, inkPaper, text)
}

// axes draws the left and bottom axis lines of a frame.
func axes(b *strings.Builder, f frame) {
	fmt.Fprintf(b, `<path d="M%.1f %.1fV%.1fH%.1f" fill="none" stroke="%s"/>`+"\n", f.left, f.top, f.bottom(), f.right(), inkText)
}

// marker draws a point marker, a circle or a square of the given radius,
// of the given class ("marker" on a series, "key" in a legend).
func marker(b *strings.Builder, class, shape string, cx, cy, r float64, color string) {
	if shape == "square" {
		fmt.Fprintf(b, `<rect class="%s" x="%.1f" y="%.1f" width="%.1f" height="%.1f" fill="%s"/>`, class, cx-r, cy-r, 2*r, 2*r, color)
		return
	}
	fmt.Fprintf(b, `<circle class="%s" cx="%.1f" cy="%.1f" r="%.1f" fill="%s"/>`, class, cx, cy, r, color)
}

// decadeTicks spans [low, high], two log₁₀ values, with whole decades:
// the axis runs from 10^lo to 10^hi, and ticks marks every step-th decade,
// step the first of 1, 2, 5, 10, 20, … decades that gives at most
// maxTicks ticks.
func decadeTicks(low, high float64, maxTicks int) (lo, hi int, ticks []int) {
	lo, hi = int(math.Floor(low)), int(math.Ceil(high))
	if hi == lo {
		hi = lo + 1
	}
	step := int(roundStep(float64(hi-lo), maxTicks))
	if step < 1 {
		step = 1
	}
	for k := floorDiv(lo, step) * step; k <= hi; k += step {
		if k >= lo {
			ticks = append(ticks, k)
		}
	}
	return lo, hi, ticks
}

func floorDiv(a, b int) int {
	q := a / b
	if a%b != 0 && a < 0 {
		q--
	}
	return q
}

// roundStep is the smallest of 1, 2 and 5 times a power of ten that
// divides span into at most maxTicks steps (span > 0).
func roundStep(span float64, maxTicks int) float64 {
	if !(span > 0) || maxTicks < 1 {
		return 1
	}
	raw := span / float64(maxTicks)
	power := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 5, 10} {
		if m*power >= raw*(1-1e-12) {
			return m * power
		}
	}
	return 10 * power
}

// roundTicks returns the step of roundStep over [lo, hi] and its
// multiples within [lo, hi], computed as integers times the step so that
// no rounding error creeps in from repeated addition.
func roundTicks(lo, hi float64, maxTicks int) (float64, []float64) {
	step := roundStep(hi-lo, maxTicks)
	var ticks []float64
	for k := math.Ceil(lo/step - 1e-9); k*step <= hi+step*1e-9; k++ {
		v := k * step
		if v == 0 {
			v = 0 // no −0
		}
		ticks = append(ticks, v)
	}
	return step, ticks
}

// tickLabel renders v with as many decimals as the ticks' step needs.
func tickLabel(v float64, ticks []float64) string {
	decimals := 0
	if len(ticks) > 1 {
		step := ticks[1] - ticks[0]
		decimals = max(0, -int(math.Floor(math.Log10(step)+1e-9)))
	}
	s := strconv.FormatFloat(v, 'f', decimals, 64)
	if strings.Trim(s, "-0.") == "" {
		s = "0"
	}
	return strings.Replace(s, "-", "−", 1)
}

// decadeLabel renders 10^k with a superscript exponent: 10⁻⁴, 10⁰, 10³.
func decadeLabel(k int) string { return "10" + superscript(strconv.Itoa(k)) }

func superscript(s string) string {
	return strings.NewReplacer("-", "⁻", "0", "⁰", "1", "¹", "2", "²", "3", "³", "4", "⁴", "5", "⁵", "6", "⁶", "7", "⁷", "8", "⁸", "9", "⁹", ".", "·").Replace(s)
}

// exponentText renders a contour exponent: −2, −1.5, 0.25.
func exponentText(e float64) string {
	return strings.Replace(strconv.FormatFloat(e, 'f', -1, 64), "-", "−", 1)
}

func decadesText(step float64) string {
	switch step {
	case 0.25:
		return "quarter decade"
	case 0.5:
		return "half decade"
	case 1:
		return "decade"
	}
	return exponentText(step) + " decades"
}

// mix blends two #rrggbb colours: share 0 gives a, 1 gives b.
func mix(a, b string, share float64) string {
	var ca, cb [3]int64
	for i := range 3 {
		ca[i], _ = strconv.ParseInt(a[1+2*i:3+2*i], 16, 0)
		cb[i], _ = strconv.ParseInt(b[1+2*i:3+2*i], 16, 0)
	}
	out := "#"
	for i := range 3 {
		v := math.Round(float64(ca[i]) + share*float64(cb[i]-ca[i]))
		out += fmt.Sprintf("%02x", int(v))
	}
	return out
}

func sameFloats(a, b []float64) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i] != b[i] {
			return false
		}
	}
	return true
}
