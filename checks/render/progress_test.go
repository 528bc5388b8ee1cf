package render

import (
	"strings"
	"testing"
)

// TestProgressWords: the words and the text bar of a running screening,
// including totals it cannot divide by and counts past the total.
func TestProgressWords(t *testing.T) {
	for _, tc := range []struct {
		p          Progress
		words, bar string
	}{
		{Progress{Stage: "missing data: imputations", Done: 7, Total: 20}, "missing data: imputations, 7 of 20 done",
			"[■■■□□□□□□□]"},
		{Progress{Stage: "checks", Done: 12, Total: 12}, "checks, 12 of 12 done", "[■■■■■■■■■■]"},
		{Progress{Stage: "checks", Done: 0, Total: 12}, "checks, 0 of 12 done", "[□□□□□□□□□□]"},
		{Progress{Stage: "checks", Done: 15, Total: 12}, "checks, 12 of 12 done", "[■■■■■■■■■■]"},
		{Progress{Stage: "checks", Done: -1, Total: 3}, "checks, 0 of 3 done", "[□□□□□□□□□□]"},
		{Progress{Stage: "loading", Total: 0}, "loading", ""},
		{Progress{Done: 1, Total: 2}, "a stage not named, 1 of 2 done", "[■■■■■□□□□□]"},
	} {
		if got := tc.p.Words(); got != tc.words {
			t.Errorf("%+v: words %q, want %q", tc.p, got, tc.words)
		}
		if got := tc.p.Bar(); got != tc.bar {
			t.Errorf("%+v: bar %q, want %q", tc.p, got, tc.bar)
		}
	}
}

// TestDashboardRunningRow: a running row with progress shows it in words
// beside the bar and keeps the attempt; one without shows the attempt
// only; the page reloads itself while something runs.
func TestDashboardRunningRow(t *testing.T) {
	row := Row{ID: "s1", Title: "T", Status: "running", Progress: "attempt 1, since 05:10 UTC"}
	for _, tc := range []struct {
		running *Progress
		want    []string
		not     []string
	}{
		{&Progress{Stage: "missing data: imputations", Done: 7, Total: 20, AsOf: "05:12:03 UTC"},
			[]string{"being screened</span>: <span class=\"progress\">missing data: imputations, 7 of 20 done</span>",
				`<span class="bar" aria-hidden="true">[■■■□□□□□□□]</span>`, "(as of 05:12:03 UTC)",
				"; attempt 1, since 05:10 UTC"}, nil},
		{nil, []string{"being screened</span><span class=\"small\">: attempt 1, since 05:10 UTC"},
			[]string{"of 20 done", `class="bar"`, "as of"}},
	} {
		r := row
		r.Running = tc.running
		d := Dashboard{Nav: Nav{Office: "O", Role: "editor"}, Groups: []Group{{Rows: []Row{r}}}, Refresh: true}
		var b strings.Builder
		if err := WriteDashboard(&b, d); err != nil {
			t.Fatal(err)
		}
		page := b.String()
		for _, w := range append(tc.want, `<meta http-equiv="refresh" content="15">`) {
			if !strings.Contains(page, w) {
				t.Errorf("progress %v: the row lacks %q", tc.running, w)
			}
		}
		for _, w := range tc.not {
			if strings.Contains(page, w) {
				t.Errorf("progress %v: the row shows %q", tc.running, w)
			}
		}
	}
}

// TestPendingPage: a running submission without a report shows its
// progress and reloads itself; a failed one says why, does not, and offers
// to screen it again.
func TestPendingPage(t *testing.T) {
	for _, tc := range []struct {
		p       Pending
		want    []string
		refresh bool
	}{
		{Pending{Title: "T", Status: "running", Note: "attempt 2, since 05:10 UTC",
			Running: &Progress{Stage: "checks (now: Fit)", Done: 3, Total: 12, AsOf: "05:11:00 UTC"}},
			[]string{"checks (now: Fit), 3 of 12 done", "[■■□□□□□□□□]", "; attempt 2", "reloads itself"}, true},
		{Pending{ID: "s-1", Title: "T", Status: "failed", Note: "The data do not parse.", Detail: "attempt 1 of 1: x"},
			[]string{`<p class="failure">The data do not parse.</p>`, "could not be screened",
				"What the server recorded: <code>attempt 1 of 1: x</code>", "has no report.",
				`action="/submissions/s-1/rerun"`}, false},
	} {
		var b strings.Builder
		if err := WritePending(&b, tc.p); err != nil {
			t.Fatal(err)
		}
		page := b.String()
		for _, w := range append(tc.want, "not a verdict") {
			if !strings.Contains(page, w) {
				t.Errorf("%s: the page lacks %q", tc.p.Status, w)
			}
		}
		if tc.p.Status != "failed" && strings.Contains(page, "/rerun") {
			t.Errorf("%s: the page offers to screen again while the screening may still end", tc.p.Status)
		}
		if got := strings.Contains(page, `http-equiv="refresh"`); got != tc.refresh {
			t.Errorf("%s: reloads itself %v, want %v", tc.p.Status, got, tc.refresh)
		}
	}
}
