package main

import (
	"html"
	"net/http"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// The review's forms over HTTP: a decision from a finding's form, refused
// without the session's CSRF token (400) or with another session's (403),
// refused for a submitter's session, a dismissal without a reason answered
// with a page that says so; the letter follows the decisions; a comment is
// published and withdrawn from the page and listed on the dashboard; the
// newer version's page says what the authors changed before what became
// of the points asked.
func TestWeb_Review(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	defer m.Close()
	base := m.URL()
	token := mustKeyToken(t, db, "Office W", service.RoleEditor)
	subToken := mustKeyToken(t, db, "Office W", service.RoleSubmitter)
	v1 := submitWait(t, apiClient{t, &base, subToken}, readFile(t,
		"../../testdata/demo/tutoring-anxiety/package.json"))
	w, other, author := signedIn(t, base, token), signedIn(t, base, token), signedIn(t, base, subToken)
	page := "/submissions/" + v1.ID
	csrf, otherCSRF := sessionToken(t, w, page), sessionToken(t, other, page)
	action := page + "/findings/" + c1Across + "/annotation"
	code, body := w.get(page)
	if code != http.StatusOK || !strings.Contains(body, `action="`+action+`"`) ||
		!strings.Contains(body, `id="f-`+c1Across+`"`) || !strings.Contains(body, "What goes to the authors") {
		t.Fatalf("the submission page has no decision form for %s: %d", c1Across, code)
	}
	form := url.Values{"decision": {"ask"}, "question": {"Which came first, the tutoring or the anxiety?"}}
	if code, _, _ := w.post(action, form); code != http.StatusBadRequest {
		t.Errorf("a decision without the CSRF token: %d", code)
	}
	form.Set("_csrf", otherCSRF)
	if code, _, _ := w.post(action, form); code != http.StatusForbidden {
		t.Errorf("a decision with another session's token: %d", code)
	}
	if code, _, body := author.post(action, url.Values{"_csrf": {sessionToken(t, author, "/")},
		"decision": {"note"}}); code != http.StatusForbidden || !strings.Contains(body, "Only an editor") {
		t.Errorf("a submitter's decision: %d", code)
	}
	form.Set("_csrf", csrf)
	code, hdr, _ := w.post(action, form)
	if code != http.StatusSeeOther || hdr.Get("Location") != page+"#f-"+c1Across {
		t.Fatalf("decide: %d %v", code, hdr)
	}
	if code, _, body := w.post(page+"/findings/"+c2Across+"/annotation", url.Values{"_csrf": {csrf},
		"decision": {"dismiss"}}); code != http.StatusUnprocessableEntity || !strings.Contains(body,
		"needs a reason") {
		t.Errorf("a dismissal without a reason: %d %s", code, body)
	}
	_, letter := w.get(page + "/letter.md")
	if !strings.Contains(letter, "Which came first, the tutoring or the anxiety?") {
		t.Errorf("the letter does not ask the reworded question:\n%s", letter)
	}
	if code, _ := author.get(page + "/letter.md"); code != http.StatusForbidden {
		t.Errorf("a submitter's session reads the letter: %d", code)
	}
	_, body = w.get(page)
	if !strings.Contains(html.UnescapeString(body),
		"asked of the authors, in the reviewer's words: “Which came first") {
		t.Error("the page's history does not show the change")
	}
	if _, body := author.get(page); strings.Contains(body, "What goes to the authors") ||
		strings.Contains(body, "/annotation") || strings.Contains(body, "letter.md") {
		t.Error("a submitter's page shows the review")
	}
	checkWebComment(t, w, page, csrf)
	checkSince(t, w, author, subToken, base)
}

// checkWebComment publishes from the page, finds it on the dashboard and
// withdraws it.
func checkWebComment(t *testing.T, w *webClient, page, csrf string) {
	t.Helper()
	if code, hdr, _ := w.post(page+"/comment", url.Values{"_csrf": {csrf}}); code != http.StatusSeeOther ||
		hdr.Get("Location") != page+"#review" {
		t.Fatalf("publish: %d %v", code, hdr)
	}
	_, body := w.get(page)
	link := regexp.MustCompile(`<a href="(http://[^"]+/comments/[^"]+)">`).FindStringSubmatch(body)
	if link == nil || !strings.Contains(body, "Published as a comment on") {
		t.Fatalf("the page does not give the comment's address")
	}
	if _, dash := w.get("/"); !strings.Contains(dash, "Published comments") || !strings.Contains(dash, link[1]) {
		t.Error("the dashboard does not list the published comment")
	}
	if code, _, _ := w.post(page+"/comment/withdraw", url.Values{"_csrf": {csrf}}); code != http.StatusSeeOther {
		t.Fatalf("withdraw: %d", code)
	}
	if resp, err := http.Get(link[1]); err != nil || resp.StatusCode != http.StatusNotFound {
		t.Errorf("the withdrawn comment's address: %v %v", resp, err)
	}
}

// checkSince sends a second version (other figures, C4 withdrawn) and
// reads its page: what the authors changed comes before what became of
// the points asked.
func checkSince(t *testing.T, w, author *webClient, token, base string) {
	t.Helper()
	v2 := submitWait(t, apiClient{t, &base, token}, resubmission(t))
	if _, body := author.get("/submissions/" + v2.ID); !strings.Contains(body, "What the authors changed") ||
		strings.Contains(body, "The points asked last time") {
		t.Error("a submitter's page of the newer version: the package's changes without the points asked, wanted")
	}
	_, body := w.get("/submissions/" + v2.ID)
	body = html.UnescapeString(body)
	changed := strings.Index(body, "What the authors changed")
	asked := strings.Index(body, "The points asked last time")
	questions := strings.Index(body, `id="questions"`)
	if changed < 0 || asked < changed || questions < asked {
		t.Fatalf("the comparison is missing or out of order: %d %d %d", changed, asked, questions)
	}
	for _, want := range []string{"Claim C4 “Students with long commutes attend fewer sessions” is no longer made.",
		"The data changed", "Answered: the screen of this version no longer raises it.",
		"Still open: the screen raises it as before",
		"carried over from"} {
		if !strings.Contains(body, want) {
			t.Errorf("the newer version's page lacks %q", want)
		}
	}
}
