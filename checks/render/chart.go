package render

import (
	"fmt"
	"html/template"
	"math"
	"slices"
	"strings"
	"unicode/utf8"

	"github.com/pathvet/pathvet/checks"
)

// Sizes of the stability chart, in SVG user units. The chart is set
// between chartMinWidth and chartMaxWidth pixels wide, so that its
// smallest text (tickSize) is never below minTextPx, and on a 390-pixel
// page (358 pixels inside the page's margins) it fits without scrolling.
const (
	chartW     = 360.0
	chartPad   = 30.0 // left and right of the axis, room for its end labels
	labelX     = 10.0 // where the row labels start
	lineH      = 16.0 // one line of a row label
	markRoom   = 24.0 // below a row's label: its dot, interval or bar
	axisH      = 36.0
	dotR       = 5.0
	chartTick  = 5
	minRangeW  = 4.0
	chartGrow  = 1.15 // the most the chart is enlarged
	tickMargin = 6.0  // least room between two tick labels
)

// chartRow is one line of a claim's chart.
type chartRow struct {
	Label  string
	P      point
	Lo, Hi *float64 // a range (the equivalents) instead of a point
	Shift  string
}

// stabilityRows are a claim's estimates: under the declared graph, across
// the plausible equivalents, under each alternative and by each
// missing-data method.
func stabilityRows(c checks.ClaimReport, alpha float64) []chartRow {
	ref := fromEstimate(c.Declared)
	rows := []chartRow{{Label: "declared graph", P: ref}}
	if a := c.AcrossEquivalents; a != nil {
		r := chartRow{Label: "equivalents, lowest to highest (" + acrossWhat(a) + ")", Lo: a.Min, Hi: a.Max}
		if a.Unstable {
			r.Shift = fmt.Sprintf("differs in %d", a.Differing)
		}
		rows = append(rows, r)
	}
	for _, a := range c.UnderAlternatives {
		p := altPoint(a, ref)
		rows = append(rows, chartRow{Label: "alternative " + a.Name, P: p, Shift: altShift(ref, p, a, alpha)})
	}
	for _, m := range methodOrder(c.MissingData) {
		p := fromEstimate(c.MissingData[m])
		rows = append(rows, chartRow{Label: Words(m), P: p, Shift: shift(ref, p, alpha)})
	}
	return rows
}

// altShift is the shift under an alternative; the report's own verdict
// stands when the numbers alone do not say how it changed.
func altShift(ref, p point, a checks.AlternativeEstimate, alpha float64) string {
	if s := shift(ref, p, alpha); s != "" || !a.Changed {
		return s
	}
	return "changes"
}

// chartValues are every number the chart must show.
func chartValues(rows []chartRow) []float64 {
	var vs []float64
	add := func(p *float64) {
		if p != nil {
			vs = append(vs, *p)
		}
	}
	for _, r := range rows {
		add(r.P.Est)
		add(r.Lo)
		add(r.Hi)
		vs = append(vs, r.P.CI...)
	}
	return vs
}

// nullValue is the value of no effect on a claim's scale.
func nullValue(c checks.ClaimReport) float64 {
	if c.Declared != nil && c.Declared.Scale == "odds_ratio" {
		return 1
	}
	return 0
}

// StabilityChart draws one claim's estimates as dots and intervals on a
// common axis with the no-effect line: a filled dot is significant at
// alpha, a hollow one is not; a range bar spans the equivalent graphs;
// the no-effect line runs through each row's marks, not its label.
// Each class of g.nearby_graphs within |ΔBIC| < 2, and g.search_best,
// adds a range row named by its edit (drawnClasses). Row labels wrap onto
// as many lines as they need; none is shrunk or cut.
func StabilityChart(c checks.ClaimReport, alpha float64, g *checks.GraphReport) template.HTML {
	cs, search := drawnClasses(g)
	rows := append(stabilityRows(c, alpha), nearbyChartRows(c.ID, cs, search)...)
	null := nullValue(c)
	sc, ticks := NiceScale(chartValues(rows), null, chartPad, chartW-chartPad, chartTick)
	lines := make([][]string, len(rows))
	h := axisH
	for i, r := range rows {
		lines[i] = wrapText(rowLabel(r), chartSize, r.Shift != "", chartW-2*labelX)
		h += rowHeight(lines[i])
	}
	var b strings.Builder
	id := "chart-" + c.ID
	fmt.Fprintf(&b, `<svg class="chart" viewBox="0 0 %.0f %.0f" style="max-width:%.0fpx;min-width:%.0fpx" `+
		`role="img" aria-labelledby="%[5]s-t %[5]s-d">`,
		chartW, h, chartW*chartGrow, minWidth(chartW, tickSize), esc(id))
	fmt.Fprintf(&b, `<title id="%[1]s-t">Claim %[2]s across graphs and missing-data methods</title>`+
		`<desc id="%[1]s-d">%[3]s</desc>`,
		esc(id), esc(c.ID), esc(chartWords(rows)))
	x0 := sc.At(null)
	y := 0.0
	for i, r := range rows {
		top := y + float64(len(lines[i]))*lineH + 2         // the no-effect line stops short of the labels
		if r.P.Est != nil || (r.Lo != nil && r.Hi != nil) { // and of the words "not computed"
			fmt.Fprintf(&b, `<line class="null" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`,
				x0, top, x0, y+rowHeight(lines[i]))
		}
		drawRow(&b, sc, r, lines[i], y, alpha)
		y += rowHeight(lines[i])
	}
	drawAxis(&b, sc, ticks, h-axisH)
	b.WriteString(`</svg>`)
	return template.HTML(b.String())
}

func rowHeight(lines []string) float64 { return float64(len(lines))*lineH + markRoom }

// rowLabel is a row's label with its shift, if any.
func rowLabel(r chartRow) string {
	if r.Shift != "" {
		return r.Label + " — " + r.Shift
	}
	return r.Label
}

func drawRow(b *strings.Builder, sc Scale, r chartRow, lines []string, y, alpha float64) {
	class := "row"
	if r.Shift != "" {
		class += " shifted"
	}
	fmt.Fprintf(b, `<g class="%s"><text class="rowlabel" x="%.0f" y="%.1f" font-size="%.0f">`, class, labelX,
		y+lineH-3, chartSize)
	for i, line := range lines {
		dy := "0"
		if i > 0 {
			dy = fmt.Sprintf("%.0f", lineH)
		}
		fmt.Fprintf(b, `<tspan x="%.0f" dy="%s">%s</tspan>`, labelX, dy, esc(line))
	}
	b.WriteString(`</text>`)
	ym := y + float64(len(lines))*lineH + markRoom/2
	switch {
	case r.Lo != nil && r.Hi != nil:
		x1, w := sc.At(*r.Lo), sc.At(*r.Hi)-sc.At(*r.Lo)
		if w < minRangeW { // one value: a short bar centred on it
			x1, w = x1+w/2-minRangeW/2, minRangeW
		}
		fmt.Fprintf(b, `<rect class="range" x="%.1f" y="%.1f" width="%.1f" height="8"/>`, x1, ym-4, w)
	case r.P.Est != nil:
		drawPoint(b, sc, r.P, ym, alpha)
	default:
		fmt.Fprintf(b, `<text class="na" x="%.0f" y="%.1f" font-size="%.0f">not computed</text>`, labelX,
			ym+4, chartSize)
	}
	b.WriteString(`</g>`)
}

// wrapText breaks s into lines no wider than w at a font size, between
// words where it can, within a word too long for a line.
func wrapText(s string, size float64, bold bool, w float64) []string {
	var lines []string
	line := ""
	for _, word := range strings.Fields(s) {
		next := strings.TrimSpace(line + " " + word)
		if textWidth(next, size, bold) <= w {
			line = next
			continue
		}
		if line != "" {
			lines = append(lines, line)
		}
		line = word
		for textWidth(line, size, bold) > w {
			cut := fitPrefix(line, size, bold, w)
			lines, line = append(lines, line[:cut]), line[cut:]
		}
	}
	if line != "" || len(lines) == 0 {
		lines = append(lines, line)
	}
	return lines
}

// fitPrefix is the length in bytes of the longest prefix of s (at least
// one rune) no wider than w.
func fitPrefix(s string, size float64, bold bool, w float64) int {
	cut := 0
	for i, r := range s {
		end := i + utf8.RuneLen(r)
		if cut > 0 && textWidth(s[:end], size, bold) > w {
			break
		}
		cut = end
	}
	return cut
}

func drawPoint(b *strings.Builder, sc Scale, p point, y, alpha float64) {
	if len(p.CI) == 2 {
		x1, x2 := sc.At(p.CI[0]), sc.At(p.CI[1])
		fmt.Fprintf(b, `<path class="ci" d="M%.1f,%.1f V%.1f M%.1f,%.1f H%.1f M%.1f,%.1f V%.1f"/>`,
			x1, y-5, y+5, x1, y, x2, x2, y-5, y+5)
	}
	if p.Zero {
		x := sc.At(*p.Est)
		fmt.Fprintf(b, `<path class="zero" d="M%.1f,%.1f l10,10 m0,-10 l-10,10"/>`, x-5, y-5)
		return
	}
	class := "dot sig"
	if sig, ok := p.significant(alpha); !ok || !sig {
		class = "dot nonsig"
	}
	fmt.Fprintf(b, `<circle class="%s" cx="%.1f" cy="%.1f" r="%.0f"/>`, class, sc.At(*p.Est), y, dotR)
}

func drawAxis(b *strings.Builder, sc Scale, ticks []float64, y float64) {
	fmt.Fprintf(b, `<line class="axis" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`, sc.R0, y+8, sc.R1, y+8)
	step := tickStep(sc, ticks)
	for i, t := range ticks {
		x := sc.At(t)
		fmt.Fprintf(b, `<line class="tick" x1="%.1f" y1="%.1f" x2="%.1f" y2="%.1f"/>`, x, y+8, x, y+13)
		if i%step == 0 {
			fmt.Fprintf(b, `<text class="ticklabel" x="%.1f" y="%.1f" font-size="%.0f">%s</text>`, x, y+28,
				tickSize, tickText(t))
		}
	}
}

// tickStep labels every tick, or every second (third …) one when the
// labels would otherwise run into each other.
func tickStep(sc Scale, ticks []float64) int {
	for step := 1; ; step++ {
		ok := true
		for i := step; i < len(ticks); i += step {
			a, b := ticks[i-step], ticks[i]
			room := (textWidth(tickText(a), tickSize, false)+textWidth(tickText(b), tickSize, false))/2 + tickMargin
			ok = ok && sc.At(b)-sc.At(a) >= room
		}
		if ok || step >= len(ticks) {
			return step
		}
	}
}

// tickText prints a tick with as few decimals as its step needs.
func tickText(t float64) string {
	for d := 0; d < 6; d++ {
		if math.Abs(t*math.Pow(10, float64(d))-math.Round(t*math.Pow(10, float64(d)))) < 1e-9 {
			return Num(t, d)
		}
	}
	return Num(t, 6)
}

// chartWords says the chart's rows in words.
func chartWords(rows []chartRow) string {
	out := make([]string, len(rows))
	for i, r := range rows {
		switch {
		case r.Lo != nil && r.Hi != nil:
			out[i] = fmt.Sprintf("%s: %s to %s", r.Label, Num(*r.Lo, 2), Num(*r.Hi, 2))
		default:
			out[i] = r.Label + ": " + numPtr(r.P.Est, 2)
		}
		if r.Shift != "" {
			out[i] += " (" + r.Shift + ")"
		}
	}
	return strings.Join(out, "; ")
}

func sortStrings(s []string) { slices.Sort(s) }
