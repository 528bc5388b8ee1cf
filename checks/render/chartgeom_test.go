package render

import (
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// TestChartGeometry: every claim's chart of every demo and calibration
// package has its row labels whole (their lines joined give the full
// label: nothing cut off), every text inside the viewBox, no two texts
// overlapping, no text on a dot, interval or bar, and no text below 11
// px on a 390-pixel page.
func TestChartGeometry(t *testing.T) {
	for name, r := range reportsToDraw(t) {
		for _, c := range r.Claims {
			svg := string(StabilityChart(c, r.SignificanceLevel, r.Graph))
			d := parseDrawing(t, svg)
			where := name + " claim " + c.ID
			cs, search := drawnClasses(r.Graph)
			rows := append(stabilityRows(c, r.SignificanceLevel), nearbyChartRows(c.ID, cs, search)...)
			got := rowLabels(svg)
			for i, row := range rows {
				if i >= len(got) || got[i] != rowLabel(row) {
					t.Errorf("%s: row %d reads %q, want %q", where, i, got, rowLabel(row))
				}
			}
			checkChart(t, where, d)
		}
	}
}

func checkChart(t *testing.T, where string, d *svgDrawing) {
	t.Helper()
	view := Box{0, 0, d.w, d.h}
	for i, tx := range d.texts {
		if !within(tx.box, view, 0.05) {
			t.Errorf("%s: %q %v runs outside the viewBox %v", where, tx.words, tx.box, view)
		}
		if px := d.effectivePx(tx.size, narrowChartPx); px < minTextPx {
			t.Errorf("%s: %q is %.1f px high on a 390-pixel page", where, tx.words, px)
		}
		for _, o := range d.texts[i+1:] {
			if overlap(tx.box, o.box) {
				t.Errorf("%s: %q and %q overlap", where, tx.words, o.words)
			}
		}
		for _, m := range d.marks {
			if overlap(tx.box, m) {
				t.Errorf("%s: %q %v lies on a mark %v", where, tx.words, tx.box, m)
			}
		}
	}
	if d.minW > narrowChartPx {
		t.Errorf("%s: the chart needs %.0f px, more than a 390-pixel page gives it", where, d.minW)
	}
}

// TestWrapText: lines never wider than asked, words kept whole unless a
// word alone is too wide, and nothing lost.
func TestWrapText(t *testing.T) {
	for _, tc := range []struct {
		s string
		w float64
	}{
		{"search end: without long_commute → maths_anxiety + 1 more, ΔBIC −9.28 — changes", 200},
		{"a_single_variable_name_far_too_long_for_one_line", 120},
		{"", 100},
		{"short", 300},
	} {
		lines := wrapText(tc.s, chartSize, true, tc.w)
		joined := ""
		for i, l := range lines {
			if textWidth(l, chartSize, true) > tc.w && len([]rune(l)) > 1 {
				t.Errorf("%q: line %q is wider than %g", tc.s, l, tc.w)
			}
			if i > 0 && !strings.Contains(tc.s, joined+l) {
				joined += " "
			}
			joined += l
		}
		if joined != tc.s {
			t.Errorf("%q wrapped to %q", tc.s, lines)
		}
	}
}

// TestChartWithoutEstimates: a row whose estimate was not computed says
// so clear of the no-effect line, also when that line stands at the left
// end of the axis (an alternative's estimate of 0.4 puts zero there).
func TestChartWithoutEstimates(t *testing.T) {
	r := loadGolden(t, "coding-club")
	est := 0.4
	for _, c := range r.Claims {
		c.Declared, c.AcrossEquivalents, c.MissingData = nil, nil, nil
		c.UnderAlternatives = []checks.AlternativeEstimate{{Name: "other", Estimate: &est}}
		svg := string(StabilityChart(c, r.SignificanceLevel, nil))
		if !strings.Contains(svg, ">not computed</text>") {
			t.Errorf("claim %s: no row says its estimate was not computed", c.ID)
		}
		checkChart(t, "claim "+c.ID+" without estimates", parseDrawing(t, svg))
	}
}
