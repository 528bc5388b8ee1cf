package main

import (
	"context"
	"encoding/json"
	"net/http"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/checks"
)

// checkMediation: the three-wave demo, sent as it runs (after the
// dashboard's checks, which count the fixture's submissions), gets a page
// that draws each wave as a labelled row, shows the headline indirect
// effect's path and the interval that judges it, and a letter that asks
// about the reported p-value of an indirect effect.
func checkMediation(t *testing.T, ctx context.Context, f *browserFixture) {
	base := f.m.URL()
	editor := apiClient{t, &base, f.editorToken}
	v := submitMultipart(t, editor, "../../testdata/demo/mentoring-waves")
	checkMediationJSON(t, editor, v)
	do(t, ctx, chromedp.Navigate(base+"/submissions/"+v.ID))
	labels := value(t, ctx, chromedp.Evaluate[string](
		`[...document.querySelectorAll('svg#declared-graph text')].map(e => e.textContent).join("|")`))
	for _, want := range []string{"tier 1, earliest", "tier 2", "tier 3, latest"} {
		if !strings.Contains(labels, want) {
			t.Errorf("the declared graph lacks the row label %q: %.300s", want, labels)
		}
	}
	mustContain(t, ctx, "table.claims", "mentoring_hours → belonging_w3 → intent_leave_w3")
	mustContain(t, ctx, "table.claims", "judged by its percentile bootstrap interval, which excludes zero")
	mustContain(t, ctx, "table.claims", "mediator–outcome error correlation that would explain it away")
	checkCSP(t, ctx, "mediation page")
	checkDrawingText(t, ctx, "mediation page at 1280 px", false)
	viewShot(t, ctx, "#claims", "mediation-claims-1280.png")
	viewShot(t, ctx, "#graph", "tiers-and-mediation-1280.png")
	href := value(t, ctx, chromedp.Evaluate[string](`document.querySelector('a[href$="/letter.md"]').href`))
	_, body := fetchAsBrowser(t, ctx, href)
	for _, want := range []string{"Preacher & Hayes 2008", "no directed path from mentoring_hours to intent_leave_w3"} {
		if !strings.Contains(string(body), want) {
			t.Errorf("the letter lacks %q", want)
		}
	}
}

// checkMediationJSON: the API's report carries the headline indirect
// effect's intervals, the one that judges it, its mediator–outcome error
// correlation and the tiers.
func checkMediationJSON(t *testing.T, c apiClient, v api.SubmissionView) {
	_, _, b := c.call(http.MethodGet, v.Links.Report, "", nil)
	var r checks.Report
	if err := json.Unmarshal(b, &r); err != nil {
		t.Fatal(err)
	}
	for _, cl := range r.Claims {
		if cl.ID != "W1" {
			continue
		}
		d := cl.Declared
		if d.Significance == nil || d.Significance.Method != checks.IntervalBootstrap || len(d.Intervals) != 3 ||
			cl.MediatorConfounding == nil || cl.MediatorConfounding.RhoAtZero == nil {
			t.Errorf("W1 over the API: %+v, %+v", d, cl.MediatorConfounding)
		}
	}
	if r.Graph == nil || len(r.Graph.Tiers) != 3 {
		t.Errorf("the API's report lacks the tiers: %+v", r.Graph)
	}
}
