package render

import (
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// tierRows keeps the tiers' numbers as their labels (a tier without a
// variable of the graph left out), and puts the variables in no tier in a
// row of their own: first when no arrow comes into them from a tier, else
// last.
func TestTierRows(t *testing.T) {
	tiers := [][]string{{"a"}, {}, {"b", "c"}, {"d"}}
	nodes := []string{"a", "b", "c", "d", "z"}
	rows, labels := tierRows(tiers, nodes, []LayoutArc{{From: "z", To: "a"}, {From: "a", To: "b"}})
	if !slices.EqualFunc(rows, [][]string{{"z"}, {"a"}, {"b", "c"}, {"d"}}, slices.Equal) ||
		!slices.Equal(labels, []string{"in no tier", "tier 1, earliest", "tier 3", "tier 4, latest"}) {
		t.Errorf("rows %v, labels %v", rows, labels)
	}
	rows, labels = tierRows(tiers, nodes, []LayoutArc{{From: "d", To: "z"}})
	if !slices.Equal(rows[len(rows)-1], []string{"z"}) || labels[len(labels)-1] != "in no tier" {
		t.Errorf("an arrow into z from a tier: rows %v, labels %v", rows, labels)
	}
	if rows, labels := tierRows(nil, nodes, nil); rows != nil || labels != nil {
		t.Errorf("without tiers: %v %v", rows, labels)
	}
}

// The mentoring demo's graph is drawn with each wave in its own labelled
// row, earliest first, and says so in words.
func TestMentoringDrawnInTiers(t *testing.T) {
	r := loadGolden(t, "mentoring-waves")
	arcs := declaredArcs(r.Graph, r.Claims)
	in := layoutInput(r.Graph, [][]drawnArc{arcs, cpdagArcs(r.Graph.PlausibleCPDAG, &r.Graph.CPDAG)})
	if len(in.Tiers) != 3 || in.TierLabels[0] != "tier 1, earliest" || in.TierLabels[2] != "tier 3, latest" {
		t.Fatalf("tiers %v, labels %v", in.Tiers, in.TierLabels)
	}
	l, err := LayOut(in)
	if err != nil {
		t.Fatal(err)
	}
	checkTiers(t, "mentoring-waves", l, in)
	v, err := graphView(r)
	if err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(string(v.Declared), "tier 1, earliest: belonging_w1, overtime_w1") {
		t.Error("the declared drawing does not name its tiers in words")
	}
}

// An indirect claim's row shows its path, the interval that judges it and
// the others, and the mediator–outcome error correlation where the E-value
// would stand; a shift is judged by the intervals, not by a p-value.
func TestClaimRows_Indirect(t *testing.T) {
	r := loadGolden(t, "mentoring-waves")
	rows := claimRows(r)
	w1 := rows[slices.IndexFunc(rows, func(c ClaimRow) bool { return c.ID == "W1" })]
	if w1.Arrow != "mentoring_hours → belonging_w3 → intent_leave_w3" {
		t.Errorf("arrow %q", w1.Arrow)
	}
	text := func(c Cell) string {
		var b strings.Builder
		for _, l := range c.Lines {
			b.WriteString(l.Text + " [" + l.Mark + "]\n")
		}
		return b.String()
	}
	for cell, want := range map[string]string{
		text(w1.Declared): "judged by its percentile bootstrap interval, which excludes zero",
		text(w1.EValue):   "mediator–outcome error correlation that would explain it away: −0.29",
		text(w1.Alternatives): "intention-first: 0, because no directed path from mentoring_hours to intent_leave_w3 " +
			"through belonging_w3 in this graph [zero here]",
	} {
		if !strings.Contains(cell, want) {
			t.Errorf("cell lacks %q:\n%s", want, cell)
		}
	}
	yes, no := true, false
	if got := shift(point{Est: ptr(-0.1), Sig: &yes}, point{Est: ptr(-0.05), Sig: &no}, 0.05); got !=
		"significance lost" {
		t.Errorf("an interval that comes to include zero: %q", got)
	}
	if got := shift(point{Est: ptr(-0.1), Sig: &yes}, point{Est: ptr(-0.05), Sig: &yes}, 0.05); got != "" {
		t.Errorf("both intervals exclude zero: %q", got)
	}
	_ = checks.KindIndirect
}

func ptr(x float64) *float64 { return &x }
