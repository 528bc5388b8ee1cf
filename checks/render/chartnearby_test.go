package render

import (
	"html"
	"regexp"
	"slices"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

var rangeRe = regexp.MustCompile(`<rect class="range" x="([0-9.-]+)" y="[0-9.]+" width="([0-9.]+)"`)

// TestNearbyChartRows: claim C2 of the tutoring demo gains a row for the
// search's end point (its two removals), a bar from its lowest to its
// highest estimate on the chart's own scale, marked as changing; C1's row
// is not marked. The scale holds every bar.
func TestNearbyChartRows(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	for _, tc := range []struct {
		claim   int
		changes bool
	}{{0, false}, {1, true}} {
		c := r.Claims[tc.claim]
		svg := string(StabilityChart(c, r.SignificanceLevel, r.Graph))
		label := "search end: without long_commute → maths_anxiety + 1 more, ΔBIC " + Minus + "9.28"
		if tc.changes {
			label += " — changes"
		}
		if !slices.Contains(rowLabels(svg), label) {
			t.Errorf("%s: no row labelled %q", c.ID, label)
		}
		cs, search := drawnClasses(r.Graph)
		rows := append(stabilityRows(c, r.SignificanceLevel), nearbyChartRows(c.ID, cs, search)...)
		sc, _ := NiceScale(chartValues(rows), 0, chartPad, chartW-chartPad, chartTick)
		bars := rangeRe.FindAllStringSubmatch(svg, -1)
		if len(bars) != 2 { // the equivalents and the search's end point
			t.Fatalf("%s: %d range bars, want 2", c.ID, len(bars))
		}
		nc := r.Graph.SearchBest.Claims[c.ID]
		x, _ := strconv.ParseFloat(bars[1][1], 64)
		w, _ := strconv.ParseFloat(bars[1][2], 64)
		if !scalar.EqualWithinAbs(x, sc.At(*nc.Min), 0.06) || !scalar.EqualWithinAbs(x+w, sc.At(*nc.Max), 0.11) {
			t.Errorf("%s: bar %g to %g, want %g to %g", c.ID, x, x+w, sc.At(*nc.Min), sc.At(*nc.Max))
		}
		for _, b := range bars {
			x, _ := strconv.ParseFloat(b[1], 64)
			w, _ := strconv.ParseFloat(b[2], 64)
			if x < chartPad-0.1 || x+w > chartW-chartPad+0.1 {
				t.Errorf("%s: a bar from %g to %g runs off the axis", c.ID, x, x+w)
			}
		}
	}
}

// TestNearbyChartHeadline: the headline claim of nearby-headline gains a
// row for the graph without its arrow, where it is zero: a short bar
// centred on the no-effect line, marked as changing.
func TestNearbyChartHeadline(t *testing.T) {
	r := runPackage(t, "calibration/nearby-headline")
	c := r.Claims[0]
	svg := string(StabilityChart(c, r.SignificanceLevel, r.Graph))
	if !slices.Contains(rowLabels(svg), "without offered → wellbeing, ΔBIC +0.72 — changes") {
		t.Fatalf("no row for the graph without the headline arrow in\n%s", svg)
	}
	bars := rangeRe.FindAllStringSubmatch(svg, -1)
	null := nullRe.FindStringSubmatch(svg)
	x, _ := strconv.ParseFloat(bars[len(bars)-1][1], 64)
	w, _ := strconv.ParseFloat(bars[len(bars)-1][2], 64)
	x0, _ := strconv.ParseFloat(null[1], 64)
	if w != minRangeW || !scalar.EqualWithinAbs(x+w/2, x0, 0.11) {
		t.Errorf("bar at %g width %g, want width %g centred on the null line at %g", x, w, minRangeW, x0)
	}
}

var (
	rowLabelRe = regexp.MustCompile(`<text class="rowlabel"[^>]*>(.*?)</text>`)
	tspanRe    = regexp.MustCompile(`<tspan[^>]*>(.*?)</tspan>`)
)

// rowLabels are a chart's row labels, each with its lines joined by a
// space (labels wrap onto lines; the old chart shrank them to fit one).
func rowLabels(svg string) []string {
	var out []string
	for _, m := range rowLabelRe.FindAllStringSubmatch(svg, -1) {
		var lines []string
		for _, l := range tspanRe.FindAllStringSubmatch(m[1], -1) {
			lines = append(lines, html.UnescapeString(l[1]))
		}
		out = append(out, strings.Join(lines, " "))
	}
	return out
}
