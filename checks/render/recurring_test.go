package render

import (
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// TestTally over the three demos; the expected counts are read off the
// golden reports' statuses by hand (tutoring: equivalence and
// alternatives fail; coding club: six warnings; sleep: missing data and
// effect reporting fail).
func TestTally(t *testing.T) {
	var reps []*checks.Report
	for _, d := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		reps = append(reps, loadGolden(t, d))
	}
	got := Tally(reps)
	if got.Reports != 3 || len(got.Checks) != len(checks.Pipeline()) {
		t.Fatalf("%d reports, %d checks", got.Reports, len(got.Checks))
	}
	first := got.Checks[0]
	if first.ID != "alternatives" || first.Fail != 1 || first.Warn != 2 || first.Of != 3 {
		t.Errorf("most frequent check %+v, want alternatives with 1 fail and 2 warnings of 3", first)
	}
	kinds := map[string]KindTally{}
	for _, k := range got.Kinds {
		kinds[k.Kind] = k
	}
	// Direct effects: C1, C2 unstable across graphs; H1, H2, S1, S2 not.
	if d := kinds["direct effect"]; d.Claims != 6 || d.AcrossGraphs != 2 {
		t.Errorf("direct effects %+v, want 6 claims, 2 unstable across graphs", d)
	}
	if a := kinds["association"]; a.Claims != 2 || a.AcrossGraphs != 0 {
		t.Errorf("associations %+v", a)
	}
}

// TestChanges: a version that moves claim C1 shows that move and no
// other (what became of the findings is review.Compare's).
func TestChanges(t *testing.T) {
	prev, cur := loadGolden(t, "tutoring-anxiety"), loadGolden(t, "tutoring-anxiety")
	moved := *cur.Claims[0].Declared
	v := -0.1
	moved.Estimate = &v
	cur.Claims[0].Declared = &moved
	ch := Changes(prev, cur)
	if len(ch.Moved) != 1 || ch.Moved[0].ID != "C1" || ch.Moved[0].To != Minus+"0.10" {
		t.Errorf("moved %+v, want C1 to −0.10", ch.Moved)
	}
	if same := Changes(prev, prev); len(same.Moved) != 0 {
		t.Errorf("a report against itself: %+v", same)
	}
}

// TestTally_FailsRankFirst: a check that failed in one report ranks above
// one that warned in all three, which ranks above one that warned in two
// (issue 22.4: a warn-only check used to rank above failed ones by the
// sum). The reports are made here, three of them, so the counts are
// plain.
func TestTally_FailsRankFirst(t *testing.T) {
	report := func(statuses map[string]string) *checks.Report {
		r := &checks.Report{}
		for _, id := range []string{"alternatives", "causal-language", "equivalence"} {
			r.Checks = append(r.Checks, checks.CheckResult{ID: id, Title: id, Status: statuses[id]})
		}
		return r
	}
	reps := []*checks.Report{
		report(map[string]string{"alternatives": "warn", "causal-language": "warn", "equivalence": "fail"}),
		report(map[string]string{"alternatives": "warn", "causal-language": "warn", "equivalence": "pass"}),
		report(map[string]string{"alternatives": "pass", "causal-language": "warn", "equivalence": "pass"}),
	}
	var order []string
	for _, c := range Tally(reps).Checks {
		order = append(order, c.ID)
	}
	if strings.Join(order, " ") != "equivalence causal-language alternatives" {
		t.Errorf("ranked %v, want the failed check first, then by warnings", order)
	}
	var b strings.Builder
	if err := WriteDashboard(&b, Dashboard{Nav: Nav{Office: "O", Role: "editor"}, Recurring: Tally(reps)}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), rankingHint) {
		t.Error("the dashboard does not say how the checks are ranked")
	}
}
