package main

import (
	"context"
	"net/http"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"
)

func checkDashboard(t *testing.T, ctx context.Context, f *browserFixture) {
	mustContain(t, ctx, "h1", "Office of Invented Studies")
	rows := value(t, ctx, chromedp.Evaluate[[]string](
		`[...document.querySelectorAll('table.submissions tbody tr:not(.grouphead) td:first-child > div > a')].map(a => a.getAttribute('href'))`,
	))
	want := []string{"/submissions/" + f.sleep.ID, "/submissions/" + f.v2.ID, "/submissions/" + f.tutoring.ID,
		"/submissions/" + f.club.ID}
	if strings.Join(rows, " ") != strings.Join(want, " ") {
		t.Errorf("dashboard rows %v, want %v (the versions grouped under the newest)", rows, want)
	}
	mustContain(t, ctx, "table.submissions", "version 2 of 2")
	mustContain(t, ctx, "table.submissions", "2 versions listed")
	labels := value(t, ctx, chromedp.Evaluate[[]string](
		`[...document.querySelectorAll('td[data-label="Sent with the key"]')].map(td => td.textContent)`))
	if len(labels) != 4 || strings.Join(labels, "") != strings.Repeat(editorLabel, 4) {
		t.Errorf("the key column says %q, want the key's label %q in each row", labels, editorLabel)
	}
	if value(t, ctx, chromedp.Evaluate[bool](`document.body.innerText.includes('Another office')`)) {
		t.Error("the dashboard shows another office")
	}
	mustContain(t, ctx, "#recur-h + form + p", "4 screened submissions")
	checkCSP(t, ctx, "dashboard")
	screenshot(t, ctx, "dashboard-1280.png")
}

func checkReport(t *testing.T, ctx context.Context, f *browserFixture) {
	resp := submitLink(t, ctx, `a[href="/submissions/`+f.v2.ID+`"]`)
	if resp.Status != http.StatusOK {
		t.Fatalf("submission page: %d", resp.Status)
	}
	nodes := value(t, ctx, chromedp.Evaluate[[]string](
		`[...document.querySelectorAll('svg#declared-graph g.node')].map(g => g.dataset.name)`))
	if len(nodes) != len(f.tutoringReport.Graph.Nodes) {
		t.Errorf("graph nodes %v, want one per variable of %v", nodes, f.tutoringReport.Graph.Nodes)
	}
	seen := map[string]bool{}
	for _, n := range nodes {
		seen[n] = true
	}
	for _, v := range f.tutoringReport.Graph.Nodes {
		if !seen[v] {
			t.Errorf("variable %s is not drawn", v)
		}
	}
	claims := value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('table.claims tbody tr').length`))
	if claims != len(f.tutoringReport.Claims) {
		t.Errorf("claims table has %d rows, want %d", claims, len(f.tutoringReport.Claims))
	}
	mustContain(t, ctx, "#since", "What the authors changed")
	mustContain(t, ctx, ".caution", "not a verdict")
	checkDrawingText(t, ctx, "submission at 1280 px", false)
	checkCSP(t, ctx, "submission page")
	screenshot(t, ctx, "submission-1280.png")
	viewShot(t, ctx, ".masthead", "concern-1280.png")
	viewShot(t, ctx, "#claims", "claims-and-graph-1280.png")
}

// submitLink follows a link and waits for its page.
func submitLink(t *testing.T, ctx context.Context, sel string) *network.Response {
	t.Helper()
	resp, err := chromedp.RunResponse(ctx, chromedp.Click(chromedp.CSS(sel)))
	if err != nil {
		t.Fatalf("follow %s: %v", sel, err)
	}
	return resp
}

func checkLetter(t *testing.T, ctx context.Context, f *browserFixture) {
	href := value(t, ctx, chromedp.Evaluate[string](`document.querySelector('a[href$="/letter.md"]').href`))
	ctype, body := fetchAsBrowser(t, ctx, href)
	if !strings.HasPrefix(ctype, "text/markdown") {
		t.Fatalf("letter: %s", ctype)
	}
	for _, want := range []string{"Dear authors,", "1. ", f.tutoringReport.PackageSHA256, "not a verdict"} {
		if !strings.Contains(string(body), want) {
			t.Errorf("the letter lacks %q", want)
		}
	}
}

// checkNarrow: at 390 px neither the submission page nor the dashboard
// scrolls sideways.
func checkNarrow(t *testing.T, ctx context.Context, f *browserFixture) {
	do(t, ctx, chromedp.EmulateViewport(390, 844))
	defer do(t, ctx, chromedp.EmulateViewport(1280, 1000))
	for _, path := range []string{"/submissions/" + f.v2.ID, "/submissions/" + f.club.ID, "/"} {
		do(t, ctx, chromedp.Navigate(f.m.URL()+path))
		over := value(
			t,
			ctx,
			chromedp.Evaluate[int](`document.documentElement.scrollWidth - document.documentElement.clientWidth`),
		)
		if over > 0 {
			t.Errorf("%s at 390 px scrolls sideways by %d px", path, over)
		}
		if path != "/" {
			checkDrawingText(t, ctx, path+" at 390 px", true)
		}
		checkStackedLabels(t, ctx, path+" at 390 px")
		checkCSP(t, ctx, path+" at 390 px")
		switch path {
		case "/submissions/" + f.club.ID:
			screenshot(t, ctx, "submission-390.png")
			viewShot(t, ctx, "#graph", "graph-390.png")
		case "/":
			screenshot(t, ctx, "dashboard-390.png")
		}
	}
}

// checkCSRF posts the rerun form with its token taken out: refused.
func checkCSRF(t *testing.T, ctx context.Context, f *browserFixture) {
	do(t, ctx, chromedp.Navigate(f.m.URL()+"/submissions/"+f.club.ID),
		chromedp.Evaluate[chromedp.Void](`document.querySelector('form[action$="/rerun"] input[name=_csrf]').remove()`))
	resp := submitForm(t, ctx, `form[action$="/rerun"]`)
	if resp.Status != http.StatusBadRequest && resp.Status != http.StatusForbidden {
		t.Errorf("a form without its CSRF token: %d", resp.Status)
	}
	mustContain(t, ctx, "h1", "Form refused")
}

// checkSignOut signs out, then tries the old session cookie: refused.
func checkSignOut(t *testing.T, ctx context.Context, f *browserFixture) {
	do(t, ctx, chromedp.Navigate(f.m.URL()+"/submissions/"+f.club.ID))
	cookies, err := chromedp.Call(ctx, network.GetCookies, network.GetCookiesParams{})
	if err != nil {
		t.Fatal(err)
	}
	var old *network.Cookie
	for _, c := range cookies.Cookies {
		if c.Name == "pathvet_session" {
			old = c
		}
	}
	if old == nil || !old.HTTPOnly || old.SameSite != network.CookieSameSiteLax {
		t.Fatalf("session cookie %+v: want HttpOnly and SameSite=Lax", old)
	}
	submitForm(t, ctx, `form[action="/session/end"]`)
	mustSignInPage(t, ctx)
	if _, err := chromedp.Call(ctx, network.SetCookie, network.SetCookieParams{Name: old.Name, Value: old.Value,
		URL: f.m.URL() + "/"}); err != nil {
		t.Fatal(err)
	}
	do(t, ctx, chromedp.Navigate(f.m.URL()+"/submissions/"+f.club.ID))
	mustSignInPage(t, ctx)
}

// stackedLabels measures, at a narrow width, each stacked table cell: the
// right edge of its label (the ::before column) and the left edge of the
// leftmost box of its value, with what the cell says.
const stackedLabels = `[...document.querySelectorAll('table.stack td[data-label]')].map(td => {
  const cell = td.getBoundingClientRect(), lab = getComputedStyle(td, '::before');
  const r = document.createRange(); r.selectNodeContents(td);
  const boxes = [...r.getClientRects()].filter(b => b.width > 0);
  return {label: td.dataset.label, text: td.textContent.trim().slice(0, 40),
    labelRight: cell.left + parseFloat(getComputedStyle(td).paddingLeft) + parseFloat(lab.width),
    valueLeft: boxes.length ? Math.min(...boxes.map(b => b.left)) : 1e9, grid: getComputedStyle(td).display};
})`

type stackedCell struct {
	Label, Text, Grid     string
	LabelRight, ValueLeft float64
}

// checkStackedLabels: at 390 px every stacked cell sets its label in a
// column of its own, left of its value, so that no label runs into its
// value (issue 22.4); a value may wrap, but only inside its column.
func checkStackedLabels(t *testing.T, ctx context.Context, where string) {
	t.Helper()
	cells := value(t, ctx, chromedp.Evaluate[[]stackedCell](stackedLabels))
	for _, c := range cells {
		if c.Grid != "grid" || c.ValueLeft < c.LabelRight {
			t.Errorf("%s: the label %q (right edge %.1f) runs into its value %q (left edge %.1f)", where, c.Label,
				c.LabelRight, c.Text, c.ValueLeft)
		}
	}
	if strings.HasSuffix(where, "/ at 390 px") && len(cells) == 0 {
		t.Errorf("%s: no stacked cells measured", where)
	}
}
