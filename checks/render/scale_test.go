package render

import (
	"math"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// The expected domains and ticks are worked by hand from Heckbert's rule
// (Graphics Gems, 1990): the step is the nice number nearest the span
// over ticks−1 (1, 2 or 5 times a power of ten), the ends the multiples
// of the step just outside the data.
var scaleCases = []struct {
	name     string
	values   []float64
	ref      float64
	lo, hi   float64
	firstTwo [2]float64
}{
	{
		"negative claim",
		[]float64{-0.298, -0.373, -0.223},
		0,
		-0.4,
		0,
		[2]float64{-0.4, -0.3},
	}, // span .373/4 = .093 → .1
	{
		"either side",
		[]float64{-1.3, 2.6},
		0,
		-2,
		3,
		[2]float64{-2, -1},
	}, // 3.9/4 = .975 → 1
	{
		"odds ratios",
		[]float64{1.8, 2.4, 3.1},
		1,
		1,
		3.5,
		[2]float64{1, 1.5},
	}, // 2.1/4 = .525 → .5
	{
		"all zero",
		[]float64{0, 0},
		0,
		-1,
		1,
		[2]float64{-1, -0.5},
	}, // no spread: ±1, 2/4 = .5
	{
		"ignores NaN and Inf",
		[]float64{math.NaN(), 0.12, math.Inf(1)},
		0,
		0,
		0.15,
		[2]float64{0, 0.05},
	}, // .12/4 = .03 → .05 (3 is not below 3)
}

func TestNiceScale(t *testing.T) {
	const tol = 1e-12
	for _, tc := range scaleCases {
		sc, ticks := NiceScale(tc.values, tc.ref, 10, 410, 5)
		if !scalar.EqualWithinAbs(sc.D0, tc.lo, tol) || !scalar.EqualWithinAbs(sc.D1, tc.hi, tol) {
			t.Errorf("%s: domain [%g, %g], want [%g, %g]", tc.name, sc.D0, sc.D1, tc.lo, tc.hi)
		}
		if len(ticks) < 2 || !scalar.EqualWithinAbs(ticks[0], tc.firstTwo[0], tol) ||
			!scalar.EqualWithinAbs(ticks[1], tc.firstTwo[1], tol) {
			t.Errorf("%s: ticks %v, want them to start %v", tc.name, ticks, tc.firstTwo)
		}
		if !scalar.EqualWithinAbs(ticks[len(ticks)-1], tc.hi, tol) {
			t.Errorf("%s: last tick %g, want %g", tc.name, ticks[len(ticks)-1], tc.hi)
		}
		if sc.At(sc.D0) != 10 || sc.At(sc.D1) != 410 || !scalar.EqualWithinAbs(sc.At((sc.D0+sc.D1)/2), 210, 1e-9) {
			t.Errorf("%s: the scale does not map the domain onto [10, 410]", tc.name)
		}
		for _, v := range append(tc.values, tc.ref) {
			if !math.IsNaN(v) && !math.IsInf(v, 0) && (v < sc.D0 || v > sc.D1) {
				t.Errorf("%s: %g lies outside the domain", tc.name, v)
			}
		}
	}
}

var (
	nullRe = regexp.MustCompile(`<line class="null" x1="([0-9.]+)"`)
	dotRe  = regexp.MustCompile(`<circle class="dot (sig|nonsig)" cx="([0-9.]+)"`)
)

// TestStabilityChart draws claim C1 of the tutoring demo: the no-effect
// line at zero on the chart's scale, the declared dot at its estimate,
// and the alternative that the graph makes zero as a cross, not a dot.
func TestStabilityChart(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	c := r.Claims[0]
	svg := string(StabilityChart(c, r.SignificanceLevel, r.Graph))
	sc, _ := NiceScale(chartValues(stabilityRows(c, r.SignificanceLevel)), 0, chartPad, chartW-chartPad, chartTick)
	m := nullRe.FindStringSubmatch(svg)
	if m == nil {
		t.Fatal("no zero line")
	}
	if x, _ := strconv.ParseFloat(m[1], 64); !scalar.EqualWithinAbs(x, sc.At(0), 0.06) {
		t.Errorf("zero line at %g, want %g", x, sc.At(0))
	}
	dots := dotRe.FindAllStringSubmatch(svg, -1)
	if len(dots) != 2 { // declared and the non-equivalent alternative; the equivalent one is zero by graph
		t.Fatalf("%d dots, want 2", len(dots))
	}
	if x, _ := strconv.ParseFloat(dots[0][2], 64); dots[0][1] != "sig" ||
		!scalar.EqualWithinAbs(x, sc.At(*c.Declared.Estimate), 0.06) {
		t.Errorf("declared dot %v, want a filled dot at %g", dots[0], sc.At(*c.Declared.Estimate))
	}
	if strings.Count(svg, `class="zero"`) != 1 || !strings.Contains(svg, "zero here") {
		t.Error("the alternative with no path is not drawn as a cross with its words")
	}
}
