package main

import (
	"context"
	"testing"

	"github.com/chromedp/chromedp"
)

// drawingProbe measures every text of the page's drawings and charts as
// the browser lays them out: its height in CSS pixels (font size times
// the SVG's scale), whether its box lies inside its SVG's viewBox, and,
// for a tag's words or a variable's name, whether they fit inside the
// tag's box or the variable's shape.
const drawingProbe = `(() => {
  const out = {min: 1e9, texts: 0, problems: []};
  const inside = (b, r, slack) => b.x >= r.x - slack && b.y >= r.y - slack &&
    b.x + b.width <= r.x + r.width + slack && b.y + b.height <= r.y + r.height + slack;
  for (const svg of document.querySelectorAll('svg.graph, svg.chart')) {
    const vb = svg.viewBox.baseVal;
    for (const t of svg.querySelectorAll('text')) {
      const px = parseFloat(getComputedStyle(t).fontSize) * t.getScreenCTM().a;
      out.min = Math.min(out.min, px);
      out.texts++;
      const b = t.getBBox();
      if (!inside(b, vb, 0.5)) out.problems.push(svg.id + ': "' + t.textContent + '" runs outside the viewBox');
      const g = t.parentElement;
      const box = g.matches('g.tag') ? g.querySelector('rect') :
        (g.matches('g.node') && t.classList.contains('name') ? g.querySelector('rect, ellipse') : null);
      if (box && !inside(b, box.getBBox(), 0.5)) out.problems.push(svg.id + ': "' + t.textContent + '" overflows its box');
    }
  }
  return out;
})()`

type drawingText struct {
	Min      float64  `json:"min"`
	Texts    int      `json:"texts"`
	Problems []string `json:"problems"`
}

// checkDrawingText runs the probe on the page shown: at 390 px every
// text of a drawing or chart must be at least 11 px high; at any width
// none may run out of its drawing or its box.
func checkDrawingText(t *testing.T, ctx context.Context, where string, narrow bool) {
	t.Helper()
	got := value(t, ctx, chromedp.Evaluate[drawingText](drawingProbe))
	if got.Texts == 0 {
		t.Errorf("%s: no drawing text measured", where)
	}
	for _, p := range got.Problems {
		t.Errorf("%s: %s", where, p)
	}
	if narrow && got.Min < 11 {
		t.Errorf("%s: the smallest text of a drawing is %.2f px high at 390 px", where, got.Min)
	}
	t.Logf("%s: %d texts, the smallest %.2f px high", where, got.Texts, got.Min)
}
