package main

import (
	"context"
	"net/http"
	"strings"
	"testing"

	"github.com/chromedp/chromedp"
	"github.com/chromedp/chromedp/kb"
)

// checkReview drives the review forms with the keyboard on the first
// version's page: a question reworded in place and saved with Enter, a
// finding dismissed with a reason; the letter on the page and the letter's
// Markdown change with them, and the history says who changed what. A
// decision without its CSRF token is refused. Then the comment is
// published and its page read as anyone would.
func checkReview(t *testing.T, ctx context.Context, f *browserFixture) {
	base, page := f.m.URL(), f.m.URL()+"/submissions/"+f.tutoring.ID
	do(t, ctx, chromedp.Navigate(page))
	reworded := "In which order in time were tutoring and anxiety measured?"
	do(t, ctx, chromedp.Focus(chromedp.CSS(`[id="q-`+c1Across+`"]`)),
		chromedp.Evaluate[chromedp.Void](`document.activeElement.select()`),
		chromedp.KeyEvent(reworded))
	pressEnterOn(t, ctx, `article[id="f-`+c1Across+`"] button[type=submit]`)
	mustContain(t, ctx, "#questions", reworded)
	do(t, ctx, chromedp.Focus(chromedp.CSS(`article[id="f-`+c3Across+`"] input[value=dismiss]`)),
		chromedp.KeyEvent(" "), chromedp.Focus(chromedp.CSS(`[id="r-`+c3Across+`"]`)),
		chromedp.KeyEvent("The authors' cohort design orders tutoring first."))
	pressEnterOn(t, ctx, `input[id="r-`+c3Across+`"]`)
	mustContain(t, ctx, `article[id="f-`+c3Across+`"] .status`, "dismissed")
	mustContain(t, ctx, "#review table.history", "dismissed; reason: The authors' cohort design")
	if got := value(t, ctx, chromedp.Text(chromedp.CSS("#questions"))); strings.Contains(got, "C3 is 0.26") {
		t.Error("the dismissed finding is still among the questions")
	}
	_, letter := fetchAsBrowser(t, ctx, page+"/letter.md")
	if !strings.Contains(string(letter), reworded) || strings.Contains(string(letter), "C3 is 0.26") {
		t.Errorf("the letter does not follow the decisions:\n%s", letter)
	}
	checkCSP(t, ctx, "submission page with the review")
	viewShot(t, ctx, "#review", "review-1280.png")
	do(t, ctx, chromedp.Evaluate[chromedp.Void](
		`document.querySelector('form.decision input[name=_csrf]').remove()`))
	if resp := submitForm(t, ctx, "form.decision"); resp.Status != http.StatusBadRequest {
		t.Errorf("a decision without its CSRF token: %d", resp.Status)
	}
	mustContain(t, ctx, "h1", "Form refused")
	checkPublished(t, ctx, base, page, reworded)
	do(t, ctx, chromedp.Navigate(base+"/submissions/"+f.v2.ID))
	mustContain(t, ctx, "#since", "What the authors changed")
	mustContain(t, ctx, "#since", "now say that they discussed the graphs equivalent to theirs")
	viewShot(t, ctx, "#since", "since-1280.png")
}

// pressEnterOn focuses an element and presses Enter, which submits its
// form, and waits for the page the form leads to.
func pressEnterOn(t *testing.T, ctx context.Context, sel string) {
	t.Helper()
	do(t, ctx, chromedp.Focus(chromedp.CSS(sel)))
	if _, err := chromedp.RunResponse(ctx, chromedp.KeyEvent(kb.Enter)); err != nil {
		t.Fatalf("Enter on %s: %v", sel, err)
	}
}

// checkPublished publishes the asked points from the page and opens the
// comment's address: the reworded question, the caution, no link, no
// form, no score; then withdraws it.
func checkPublished(t *testing.T, ctx context.Context, base, page, reworded string) {
	t.Helper()
	do(t, ctx, chromedp.Navigate(page))
	submitForm(t, ctx, `form[action$="/comment"]`)
	url := value(t, ctx, chromedp.Evaluate[string](`document.querySelector('.published a').href`))
	if !strings.HasPrefix(url, base+"/comments/") {
		t.Fatalf("the comment's address: %q", url)
	}
	do(t, ctx, chromedp.Navigate(url))
	mustContain(t, ctx, "main", reworded)
	mustContain(t, ctx, ".caution", "not a verdict")
	if n := value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('a, form, nav, input').length`)); n != 0 {
		t.Errorf("the published page has %d links, forms or fields", n)
	}
	if txt := value(t, ctx, chromedp.Text(chromedp.CSS("body"))); strings.Contains(txt, "of 100") ||
		strings.Contains(txt, "concern") || strings.Contains(txt, editorLabel) {
		t.Errorf("the published page shows a score, a concern or a key label: %.300s", txt)
	}
	checkCSP(t, ctx, "published comment")
	screenshot(t, ctx, "published-1280.png")
	do(t, ctx, chromedp.Navigate(page))
	submitForm(t, ctx, `form[action$="/comment/withdraw"]`)
	if resp := value(t, ctx, chromedp.NavigateResponse(url)); resp.Status != http.StatusNotFound {
		t.Errorf("the withdrawn comment: %d", resp.Status)
	}
}

// checkDelete follows the submission page's delete link to the page that
// asks, deletes from there, and reads what the dashboard says.
func checkDelete(t *testing.T, ctx context.Context, f *browserFixture) {
	do(t, ctx, chromedp.Navigate(f.m.URL()+"/submissions/"+f.sleep.ID))
	submitLink(t, ctx, `a[href$="/delete"]`)
	mustContain(t, ctx, "h1", "Delete “")
	mustContain(t, ctx, "main", "cannot be undone")
	screenshot(t, ctx, "delete-1280.png")
	submitForm(t, ctx, `form[action$="/delete"]`)
	mustContain(t, ctx, ".notice", "Deleted: “Sleep and classroom attention")
	viewShot(t, ctx, ".notice", "dashboard-deleted-1280.png")
	if resp := value(t, ctx, chromedp.NavigateResponse(f.m.URL()+"/submissions/"+f.sleep.ID)); resp.Status != 404 {
		t.Errorf("the deleted submission: %d", resp.Status)
	}
}
