package main

import (
	"context"
	"net/http"
	"os"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// gardenTable is testdata/tables/garden-daggers-tabs.txt: an invented
// Table 1 with tabs between the cells, daggers and letters as marks, and
// N = 1204 in its note.
func gardenTable(t *testing.T) string {
	b, err := os.ReadFile("../../testdata/tables/garden-daggers-tabs.txt")
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestBrowser_NewScreening drives headless Chromium through the
// new-screening page against the real server and PostgreSQL: a pasted
// table, a claim added by the page's script, preview, a bad cell shown
// beside the table with the text kept, Screen and the report; a claim
// added without JavaScript; the form refused without its CSRF token; and
// the page at 390 px.
func TestBrowser_NewScreening(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	t.Cleanup(func() { _ = m.Close() })
	ctx := newBrowser(t)
	do(t, ctx, chromedp.EmulateViewport(1280, 1000))
	watchCSP(t, ctx)
	signIn(t, ctx, m.URL(), mustKeyToken(t, db, "Office of Invented Gardens", service.RoleSubmitter))
	submitLink(t, ctx, `nav a[href="/submissions/new"]`)
	mustContain(t, ctx, "h1", "New screening")
	checkCSP(t, ctx, "new-screening page")
	checkLabelled(t, ctx, "the empty form")
	fillGardenForm(t, ctx)
	t.Run("AddClaimWithScript", func(t *testing.T) { checkAddClaimInPlace(t, ctx) })
	t.Run("Preview", func(t *testing.T) { checkPreview(t, ctx) })
	t.Run("BadCell", func(t *testing.T) { checkBadCell(t, ctx) })
	t.Run("EnterPreviews", func(t *testing.T) { checkEnterPreviews(t, ctx) })
	t.Run("Narrow", func(t *testing.T) { checkFormNarrow(t, ctx) })
	t.Run("Screen", func(t *testing.T) { checkScreen(t, ctx, m) })
	t.Run("NoCSRF", func(t *testing.T) { checkFormCSRF(t, ctx, m) })
	t.Run("AddClaimWithoutScript", func(t *testing.T) { checkAddClaimWithoutScript(t, ctx, m) })
}

// fillGardenForm fills the form as an editor would: the table pasted,
// the arrows by label (in any case) and by name, the first claim.
func fillGardenForm(t *testing.T, ctx context.Context) {
	t.Helper()
	do(t, ctx, chromedp.SendKeys(chromedp.ID("f-title"), "Gardening and wellbeing (invented)"),
		chromedp.SendKeys(chromedp.ID("f-manuscript_id"), "GARDEN-7"),
		chromedp.SetValue(chromedp.ID("f-design"), "observational"),
		chromedp.SetValue(chromedp.ID("f-missing_method"), "complete_cases"),
		chromedp.SetValue(chromedp.ID("f-table"), gardenTable(t)),
		chromedp.SetValue(chromedp.ID("f-arrows"), "Garden hours per week -> loneliness\n"+
			"neighbourhood TRUST → Loneliness\nloneliness -> Wellbeing\nAge (years) -> wellbeing\n"+
			"garden_hours_per_week -> wellbeing"),
		chromedp.SendKeys(chromedp.ID("c1-text"), "Gardening eases loneliness"),
		chromedp.SendKeys(chromedp.ID("c1-from"), "Garden hours per week"),
		chromedp.SendKeys(chromedp.ID("c1-to"), "loneliness"),
		chromedp.SendKeys(chromedp.ID("c1-estimate"), "−.15"),
		chromedp.SendKeys(chromedp.ID("c1-p"), "< .001"),
		chromedp.Click(chromedp.ID("c1-headline")))
}

// checkLabelled: every visible control has a label the browser ties to it.
func checkLabelled(t *testing.T, ctx context.Context, what string) {
	t.Helper()
	bare := value(t, ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll(
		'#screen-form input:not([type=hidden]), #screen-form select, #screen-form textarea')]
		.filter(e => e.labels.length === 0).map(e => e.name)`))
	if len(bare) > 0 {
		t.Errorf("%s: controls without a label: %v", what, bare)
	}
}

// checkAddClaimInPlace: with the script, "Add a claim" adds a row without
// a round trip and puts the cursor in it.
func checkAddClaimInPlace(t *testing.T, ctx context.Context) {
	before := value(t, ctx, chromedp.Location())
	do(t, ctx, chromedp.Click(chromedp.ID("add-claim")), chromedp.WaitVisible(chromedp.ID("c2-id")))
	if after := value(t, ctx, chromedp.Location()); after != before {
		t.Errorf("adding a claim with the script loaded %s", after)
	}
	if f := value(t, ctx, chromedp.Evaluate[string](`document.activeElement.id`)); f != "c2-id" {
		t.Errorf("the cursor is in %q, want the new row's ID", f)
	}
	do(t, ctx, chromedp.SendKeys(chromedp.ID("c2-text"), "Loneliness lowers wellbeing"),
		chromedp.SendKeys(chromedp.ID("c2-from"), "Loneliness"), chromedp.SendKeys(chromedp.ID("c2-to"), "wellbeing"),
		chromedp.SendKeys(chromedp.ID("c2-estimate"), "-0.45"))
	checkLabelled(t, ctx, "the form with a row added")
	checkCSP(t, ctx, "the form with a row added")
}

func checkPreview(t *testing.T, ctx context.Context) {
	resp := submitLink(t, ctx, `.ns-go button[value=preview]`)
	if resp.Status != http.StatusOK {
		t.Fatalf("preview: %d", resp.Status)
	}
	mustContain(t, ctx, "#preview", "Ready to screen")
	names := value(t, ctx, chromedp.Evaluate[[]string](`[...document.querySelectorAll('.ns-vars tbody th')]
		.map(e => e.textContent)`))
	if strings.Join(names, " ") != "garden_hours_per_week neighbourhood_trust loneliness wellbeing age_years" {
		t.Errorf("variables read: %v", names)
	}
	mustContain(t, ctx, ".ns-vars", "Age (years)")
	mustContain(t, ctx, ".ns-guesses", "significance marks stripped")
	mustContain(t, ctx, "#package-json", `"n": 1204`)
	if v := value(t, ctx, chromedp.Value(chromedp.ID("c2-text"))); v != "Loneliness lowers wellbeing" {
		t.Errorf("the added claim after the preview: %q", v)
	}
	checkCSP(t, ctx, "the preview")
	screenshot(t, ctx, "new-screening-1280.png")
	viewShot(t, ctx, "#preview", "new-screening-preview-1280.png")
	viewShot(t, ctx, "#claims", "new-screening-claims-1280.png")
}

// checkBadCell: a cell that is no number is named by line and cell beside
// the table, the table kept as it was typed; then it is put right.
func checkBadCell(t *testing.T, ctx context.Context) {
	bad := strings.Replace(gardenTable(t), "−.35***", "−.3S", 1)
	do(t, ctx, chromedp.SetValue(chromedp.ID("f-table"), bad))
	resp := submitLink(t, ctx, `.ns-go button[value=screen]`)
	if resp.Status != http.StatusUnprocessableEntity {
		t.Errorf("screen with a bad cell: %d", resp.Status)
	}
	mustContain(t, ctx, "#f-table-err", `line 4, cell 5 ("−.3S")`)
	mustContain(t, ctx, ".ns-problems", "Table 1")
	if v := value(t, ctx, chromedp.Value(chromedp.ID("f-table"))); v != bad {
		t.Errorf("the table after the error:\n%q\nwant what was typed:\n%q", v, bad)
	}
	described := `document.getElementById('f-table').getAttribute('aria-describedby')`
	if v := value(t, ctx, chromedp.Evaluate[string](described)); !strings.Contains(v, "f-table-err") {
		t.Errorf("the table is not described by its error: %q", v)
	}
	checkCSP(t, ctx, "the form with a bad cell")
	viewShot(t, ctx, "main", "new-screening-problems-1280.png")
	viewShot(t, ctx, "#f-table", "new-screening-error-1280.png")
	do(t, ctx, chromedp.SetValue(chromedp.ID("f-table"), gardenTable(t)))
}

// checkEnterPreviews: Enter in a text field previews (the form's first,
// hidden, button), never adds a claim or screens.
func checkEnterPreviews(t *testing.T, ctx context.Context) {
	resp, err := chromedp.RunResponse(ctx, chromedp.SendKeys(chromedp.ID("f-manuscript_id"), kb.Enter))
	if err != nil || resp.Status != http.StatusOK {
		t.Fatalf("Enter: %v %v", resp, err)
	}
	mustContain(t, ctx, "#preview", "Ready to screen")
	if n := value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('#claim-rows fieldset').length`)); n != 2 {
		t.Errorf("%d claim rows after Enter, want 2", n)
	}
}

// sideways is how far a page scrolls sideways, in CSS pixels.
const sideways = `document.documentElement.scrollWidth - document.documentElement.clientWidth`

func checkFormNarrow(t *testing.T, ctx context.Context) {
	do(t, ctx, chromedp.EmulateViewport(390, 844))
	defer do(t, ctx, chromedp.EmulateViewport(1280, 1000))
	over := value(t, ctx, chromedp.Evaluate[int](sideways))
	if over > 0 {
		t.Errorf("the preview at 390 px scrolls sideways by %d px", over)
	}
	screenshot(t, ctx, "new-screening-390.png")
	viewShot(t, ctx, "#preview", "new-screening-preview-390.png")
	viewShot(t, ctx, "#claims", "new-screening-claims-390.png")
	do(t, ctx, chromedp.SetValue(chromedp.ID("f-table"), strings.Replace(gardenTable(t), "−.35***", "−.3S", 1)))
	submitLink(t, ctx, `.ns-go button[value=preview]`)
	over = value(t, ctx, chromedp.Evaluate[int](sideways))
	if over > 0 {
		t.Errorf("the form with a problem at 390 px scrolls sideways by %d px", over)
	}
	viewShot(t, ctx, "#f-table", "new-screening-error-390.png")
	do(t, ctx, chromedp.SetValue(chromedp.ID("f-table"), gardenTable(t)))
}

// checkScreen: Screen lands on the submission's page, which shows the
// status in words until the report is there.
func checkScreen(t *testing.T, ctx context.Context, m *Main) {
	submitLink(t, ctx, `.ns-go button[value=screen]`)
	loc := value(t, ctx, chromedp.Location())
	if !strings.HasPrefix(loc, m.URL()+"/submissions/") || strings.HasSuffix(loc, "/new") {
		t.Fatalf("Screen landed on %s", loc)
	}
	if txt := value(t, ctx, chromedp.Text(chromedp.CSS(".status .word"))); strings.TrimSpace(txt) == "" {
		t.Errorf("the submission's page shows no status in words")
	}
	deadline := time.Now().Add(90 * time.Second)
	for value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('table.claims tbody tr').length`)) != 2 {
		if time.Now().After(deadline) {
			t.Fatalf("no report with 2 claims on %s", loc)
		}
		time.Sleep(300 * time.Millisecond)
		do(t, ctx, chromedp.Navigate(loc))
	}
	mustContain(t, ctx, ".caution", "not a verdict")
	checkCSP(t, ctx, "the report of the screened form")
	_, doc := fetchAsBrowser(t, ctx, loc+"/package.json")
	if !strings.Contains(string(doc), `"manuscript_id": "GARDEN-7"`) {
		t.Errorf("the downloaded package: %.300s", doc)
	}
	viewShot(t, ctx, "main", "new-screening-report-1280.png")
}

// checkFormCSRF posts the form with its token taken out: refused.
func checkFormCSRF(t *testing.T, ctx context.Context, m *Main) {
	do(t, ctx, chromedp.Navigate(m.URL()+"/submissions/new"),
		chromedp.Evaluate[chromedp.Void](`document.querySelector('#screen-form input[name=_csrf]').remove()`))
	resp := submitLink(t, ctx, `.ns-go button[value=preview]`)
	if resp.Status != http.StatusBadRequest {
		t.Errorf("the form without its CSRF token: %d", resp.Status)
	}
	mustContain(t, ctx, "h1", "Form refused")
}

// checkAddClaimWithoutScript: with script off, "Add a claim" posts the
// form, which comes back with one more row, what was typed kept, and the
// cursor in the new row.
func checkAddClaimWithoutScript(t *testing.T, ctx context.Context, m *Main) {
	set := func(off bool) {
		if _, err := chromedp.Call(ctx, emulation.SetScriptExecutionDisabled,
			emulation.SetScriptExecutionDisabledParams{Value: off}); err != nil {
			t.Fatal(err)
		}
	}
	set(true)
	defer set(false)
	do(t, ctx, chromedp.Navigate(m.URL()+"/submissions/new"),
		chromedp.SendKeys(chromedp.ID("f-title"), "Typed before adding"),
		chromedp.SendKeys(chromedp.ID("c1-text"), "The first claim"))
	resp := submitLink(t, ctx, "#add-claim")
	if resp.Status != http.StatusOK {
		t.Fatalf("add a claim without script: %d", resp.Status)
	}
	n := value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('#claim-rows fieldset').length`))
	title := value(t, ctx, chromedp.Value(chromedp.ID("f-title")))
	first := value(t, ctx, chromedp.Value(chromedp.ID("c1-text")))
	focus := value(t, ctx, chromedp.Evaluate[string](`document.activeElement.id`))
	if n != 2 || title != "Typed before adding" || first != "The first claim" || focus != "c2-id" {
		t.Errorf("after adding without script: %d rows, title %q, claim 1 %q, cursor in %q", n, title, first, focus)
	}
	if loc := value(t, ctx, chromedp.Location()); !strings.HasSuffix(loc, "/submissions/new#c2-id") {
		t.Errorf("the page came back at %s, want the new row", loc)
	}
}
