package checks

import (
	"math"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// A range across graphs names an odds ratio of exactly 1 that graphs
// without the effect give as no effect, and nothing else.
func TestBoundText_OddsRatioNoEffect(t *testing.T) {
	one, zero, two := 1.0, 0.0, 2.11
	for _, c := range []struct {
		x     *float64
		scale string
		zeros int
		want  string
	}{
		{&one, "odds_ratio", 1, "no effect (odds ratio 1)"},
		{&one, "odds_ratio", 0, "1.00"},
		{&two, "odds_ratio", 1, "2.11"},
		{&zero, "standardized", 1, "0.00"},
		{nil, "odds_ratio", 1, "n/a"},
	} {
		if got := boundText(c.x, c.scale, c.zeros); got != c.want {
			t.Errorf("boundText(%v, %s, %d) = %q, want %q", c.x, c.scale, c.zeros, got, c.want)
		}
	}
	if noEffect("odds_ratio") != "no effect (odds ratio 1)" || noEffect("standardized") != "zero" ||
		valueText(est{method: MethodZero, scale: "odds_ratio"}) != "no effect (odds ratio 1)" {
		t.Error("no-effect wording")
	}
}

// The E-value summary names the claims it covers and says why a causal
// claim has none, for one claim and for several of each kind.
func TestConfoundingSummary_NamesClaims(t *testing.T) {
	for _, c := range []struct {
		g    eValueGroups
		want []string
		not  []string
	}{
		{eValueGroups{computed: []string{"C1", "C2", "C3"}, absent: []string{"C4"}},
			[]string{"For each causal claim (C1, C2 and C3)", "C4 asserts no effect", "it has no E-value"},
			[]string{"of the 3"}},
		{eValueGroups{computed: []string{"C1"}, absent: []string{"C2", "C3"}},
			[]string{"For the causal claim C1,", "C2 and C3 assert no effect", "they have no E-value"}, nil},
		{eValueGroups{computed: []string{"C1", "C2"}, weak: []string{"C2"}, missing: []string{"C3"},
			contradicted: []string{"C4"}},
			[]string{"For the causal claim C2, an unmeasured", "C3 has no E-value, so how much confounding would " +
				"explain it away", "C4 has no E-value: the declared graph itself gives it no effect"},
			[]string{"asserts no effect"}},
		{eValueGroups{computed: []string{"C1", "C2"}, weak: []string{"C1", "C2"}},
			[]string{"For the causal claims C1 and C2, an unmeasured"}, nil},
	} {
		got := confoundingSummary(c.g)
		for _, w := range c.want {
			if !strings.Contains(got, w) {
				t.Errorf("%+v: %q lacks %q", c.g, got, w)
			}
		}
		for _, w := range c.not {
			if strings.Contains(got, w) {
				t.Errorf("%+v: %q has %q", c.g, got, w)
			}
		}
	}
}

// The power of Fisher's z to detect a partial correlation of 0.5, against
// the closed form Φ(δ − z) + Φ(−δ − z), δ = atanh(0.5) sqrt(n − k − 3),
// z = 1.959963984540054 (the normal's 97.5th percentile), to 1e-9; no
// test where n − k − 3 < 1.
func TestLargeEffectPower(t *testing.T) {
	phi := func(x float64) float64 { return 0.5 * math.Erfc(-x/math.Sqrt2) }
	for _, c := range []struct{ n, k int }{{5, 0}, {5, 1}, {6, 0}, {15, 0}, {16, 0}, {40, 3}} {
		d := math.Atanh(0.5) * math.Sqrt(float64(c.n-c.k-3))
		want := phi(d-1.959963984540054) + phi(-d-1.959963984540054)
		if got := largeEffectPower(c.n, c.k, 0.05); !scalar.EqualWithinAbs(got, want, 1e-9) {
			t.Errorf("n %d, k %d: %v, closed form %v", c.n, c.k, got, want)
		}
	}
	if largeEffectPower(4, 1, 0.05) != 0 || largeEffectPower(3, 0, 0.05) != 0 {
		t.Error("no test below n − k − 3 = 1")
	}
	if p := largeEffectPower(5, 0, 0.05); math.Abs(p-0.12) > 0.005 {
		t.Errorf("n 5: %v, want about 0.12 (README)", p)
	}
	if p := largeEffectPower(5, 1, 0.05); math.Abs(p-0.09) > 0.005 {
		t.Errorf("n 5, k 1: %v, want about 0.09 (README)", p)
	}
}
