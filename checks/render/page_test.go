package render

import (
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

var (
	tagRe      = regexp.MustCompile(`(?s)<style>.*?</style>|<[^>]*>`)
	asciiMinus = regexp.MustCompile(`(^|[\s(\[=])-[0-9]`)
	headingRe  = regexp.MustCompile(`<h([1-6])[ >]`)
)

// TestPageForPeople: the page has a viewport, headings that never skip a
// level, no raw tokens in its text, one minus sign, the caution, and no
// script.
func TestPageForPeople(t *testing.T) {
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		r := loadGolden(t, demo)
		var b strings.Builder
		if err := WritePage(&b, r, PageOptions{}); err != nil {
			t.Fatal(err)
		}
		page := b.String()
		if !strings.Contains(page, `<meta name="viewport"`) || strings.Contains(page, "<script") {
			t.Errorf("%s: viewport missing or a script present", demo)
		}
		text := tagRe.ReplaceAllString(page, " ")
		for _, raw := range []string{"not_applicable", "high-concern", "moderate-concern", "direct_effect", "complete_cases"} {
			if strings.Contains(text, raw) {
				t.Errorf("%s: the text shows the raw token %s", demo, raw)
			}
		}
		if m := asciiMinus.FindString(text); m != "" {
			t.Errorf("%s: an ASCII minus in the text: %q", demo, m)
		}
		if !strings.Contains(text, "not a verdict") || !strings.Contains(text, r.PackageSHA256) {
			t.Errorf("%s: caution or hash missing", demo)
		}
		last := 0
		for _, m := range headingRe.FindAllStringSubmatch(page, -1) {
			level := int(m[1][0] - '0')
			if level > last+1 {
				t.Errorf("%s: h%d after h%d", demo, level, last)
			}
			last = level
		}
	}
}

// TestDashboardWords: an empty period says so, a single report is not
// "submissions", and a submitter's dashboard is about its own.
func TestDashboardWords(t *testing.T) {
	for _, tc := range []struct {
		d    Dashboard
		want string
	}{
		{Dashboard{Nav: Nav{Office: "O", Role: "editor"}}, "No submission received in this period has a report yet."},
		{Dashboard{Nav: Nav{Office: "O", Role: "editor"}, Recurring: Recurring{Reports: 1}}, "of 1 screened submission."},
		{Dashboard{Nav: Nav{Office: "O", Role: "submitter"}}, "Your submissions to O"},
	} {
		var b strings.Builder
		if err := WriteDashboard(&b, tc.d); err != nil {
			t.Fatal(err)
		}
		if !strings.Contains(b.String(), tc.want) {
			t.Errorf("dashboard lacks %q", tc.want)
		}
	}
}

// TestNearbyRows: the tutoring demo's classes one edit away, with the
// claims re-estimated only where the report did so.
func TestNearbyRows(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	rows := nearbyRows(r.Graph)
	if len(rows) != len(r.Graph.NearbyGraphs)+1 || !rows[len(rows)-1].Search {
		t.Fatalf("%d rows, want %d and the search's end point last", len(rows), len(r.Graph.NearbyGraphs)+1)
	}
	for i, n := range r.Graph.NearbyGraphs {
		if len(n.Claims) == 0 && rows[i].Changed != "not re-estimated" {
			t.Errorf("row %d says %q of claims that were not re-estimated", i, rows[i].Changed)
		}
		if !strings.HasPrefix(rows[i].DeltaBIC, "+") && !strings.HasPrefix(rows[i].DeltaBIC, Minus) {
			t.Errorf("row %d: ΔBIC %q without its sign", i, rows[i].DeltaBIC)
		}
	}
}

// TestPageOfSparseReports: a report without a graph, estimates or checks
// still makes a page, and says what is missing instead of drawing it.
func TestPageOfSparseReports(t *testing.T) {
	empty := &checks.Report{Title: "Nothing", Caution: checks.Caution}
	noGraph := loadGolden(t, "coding-club")
	noGraph.Graph = nil
	for i := range noGraph.Claims {
		noGraph.Claims[i].Declared, noGraph.Claims[i].AcrossEquivalents, noGraph.Claims[i].MissingData = nil, nil, nil
	}
	for name, r := range map[string]*checks.Report{"empty": empty, "no graph": noGraph} {
		var b strings.Builder
		if err := WritePage(&b, r, PageOptions{}); err != nil {
			t.Fatalf("%s: %v", name, err)
		}
		if !strings.Contains(b.String(), "No causal graph was declared.") {
			t.Errorf("%s: the page does not say the graph is missing", name)
		}
		if name == "no graph" && !strings.Contains(b.String(), "not computed") {
			t.Errorf("%s: missing estimates are not said to be missing", name)
		}
	}
}
