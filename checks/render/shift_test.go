package render

import (
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// How an estimate moves from the declared one, on its own scale: an odds
// ratio's direction is above or below 1, and one that the graph makes no
// effect is an odds ratio of 1 (closed forms: log 1 = 0).
func TestShift_OddsRatioAroundOne(t *testing.T) {
	f := func(x float64) *float64 { return &x }
	p := func(x float64) *float64 { return &x }
	or := func(x, pv float64, zero bool) point {
		e := &checks.Estimate{Estimate: f(x), PValue: p(pv), Scale: "odds_ratio"}
		if zero {
			e.Method = checks.MethodZero
		}
		return fromEstimate(e)
	}
	ref := or(2.0, 0.001, false)
	for _, c := range []struct {
		name string
		p    point
		want string
	}{
		{"no effect by the graph", or(1, 0.5, true), "no effect here"},
		{"below 1", or(0.5, 0.001, false), "sign flips"},
		{"above 1, not significant", or(1.2, 0.3, false), "significance lost"},
		{"above 1, significant", or(1.5, 0.01, false), ""},
		{"under an alternative, below 1", altPoint(checks.AlternativeEstimate{Estimate: f(0.7), PValue: p(0.01)},
			ref), "sign flips"},
	} {
		if got := shift(ref, c.p, 0.05); got != c.want {
			t.Errorf("%s: %q, want %q", c.name, got, c.want)
		}
	}
	std := fromEstimate(&checks.Estimate{Estimate: f(0.3), PValue: p(0.001), Scale: "standardized"})
	zero := fromEstimate(&checks.Estimate{Estimate: f(0), Method: checks.MethodZero, Scale: "standardized"})
	if got := shift(std, zero, 0.05); got != "zero here" {
		t.Errorf("standardized, zero by the graph: %q", got)
	}
}
