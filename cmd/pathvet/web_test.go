package main

import (
	"context"
	"encoding/json"
	"io"
	"net/http"
	"net/http/cookiejar"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

var csrfRE = regexp.MustCompile(`name="_csrf" value="([^"]+)"`)

type webClient struct {
	t    *testing.T
	base string
	http *http.Client
}

func newWebClient(t *testing.T, base string) *webClient {
	jar, _ := cookiejar.New(nil)
	return &webClient{t, base, &http.Client{Jar: jar, Transport: rec,
		CheckRedirect: func(*http.Request, []*http.Request) error { return http.ErrUseLastResponse }}}
}

func (w *webClient) get(path string) (int, string) {
	resp, err := w.http.Get(w.base + path)
	if err != nil {
		w.t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, string(b)
}

func (w *webClient) post(path string, form url.Values) (int, http.Header, string) {
	resp, err := w.http.PostForm(w.base+path, form)
	if err != nil {
		w.t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, resp.Header, string(b)
}

// TestWeb_SignIn over plain HTTP: a wrong key shows the form again, the
// fourth failure from one address makes the next attempt wait (even with
// the right key), and a form without its token is refused.
func TestWeb_SignIn(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	defer m.Close()
	token := mustKeyToken(t, db, "Office T", service.RoleEditor)
	w := newWebClient(t, m.URL())
	code, page := w.get("/")
	csrf := csrfRE.FindStringSubmatch(page)
	if code != http.StatusOK || csrf == nil || !strings.Contains(page, `name="key"`) {
		t.Fatalf("sign-in page: %d %.300s", code, page)
	}
	if code, _, _ := w.post("/session", url.Values{"key": {token}}); code != http.StatusBadRequest {
		t.Fatalf("sign-in without the CSRF token: %d", code)
	}
	huge := url.Values{"key": {strings.Repeat("k", 100<<10)}, "_csrf": {csrf[1]}}
	if code, _, page := w.post("/session", huge); code != http.StatusRequestEntityTooLarge ||
		!strings.Contains(page, "<h1>") {
		t.Fatalf("a 100 KiB sign-in form: %d", code)
	}
	for i := 1; i <= 4; i++ {
		code, _, page := w.post("/session", url.Values{"key": {"pv_wrong"}, "_csrf": {csrf[1]}})
		if code != http.StatusUnprocessableEntity || !strings.Contains(page, "not accepted") ||
			!strings.Contains(page, `name="key"`) {
			t.Fatalf("wrong key %d: %d %.300s", i, code, page)
		}
	}
	code, hdr, page := w.post("/session", url.Values{"key": {token}, "_csrf": {csrf[1]}})
	if code != http.StatusTooManyRequests || hdr.Get("Retry-After") == "" ||
		!strings.Contains(page, "Too many failed sign-ins") {
		t.Fatalf("after four failures: %d %q %.300s", code, hdr.Get("Retry-After"), page)
	}
	if _, err := db.Pool.Exec(context.Background(), `DELETE FROM web_sign_in_failures`); err != nil {
		t.Fatal(err)
	}
	code, hdr, _ = w.post("/session", url.Values{"key": {token}, "_csrf": {csrf[1]}})
	if code != http.StatusSeeOther || hdr.Get("Location") != "/" ||
		!strings.Contains(hdr.Get("Set-Cookie"), "HttpOnly") {
		t.Fatalf("sign-in: %d %v", code, hdr)
	}
	if code, page := w.get("/"); code != http.StatusOK || !strings.Contains(page, "Submissions of Office T") {
		t.Fatalf("dashboard: %d %.300s", code, page)
	}
	sub := checkSubmitterScope(t, m, db, token)
	checkRerunDelete(t, w, m, token, sub, csrf[1])
}

// sessionToken is the CSRF token of the client's session, from the
// sign-out form of a page it shows.
func sessionToken(t *testing.T, w *webClient, path string) string {
	t.Helper()
	_, page := w.get(path)
	m := csrfRE.FindStringSubmatch(page)
	if m == nil {
		t.Fatalf("%s has no form token", path)
	}
	return m[1]
}

// checkRerunDelete uses the submission page's forms: screen again (the
// history then lists the earlier report), then delete. The token of the
// sign-in page (before the session) is refused: the token is the
// session's.
func checkRerunDelete(t *testing.T, w *webClient, m *Main, token string, sub api.SubmissionView, early string) {
	base := m.URL()
	editor := apiClient{t, &base, token}
	if code, v := editor.submission(sub.Links.Self + "?wait=30s"); code != http.StatusOK ||
		v.Status != service.StatusDone {
		t.Fatalf("screening: %d %+v", code, v)
	}
	if code, _, page := w.post("/submissions/"+sub.ID+"/rerun", url.Values{"_csrf": {early}}); code != 403 ||
		!strings.Contains(page, "Form refused") {
		t.Fatalf("rerun with the token from before sign-in: %d", code)
	}
	csrf := sessionToken(t, w, "/submissions/"+sub.ID)
	checkPage(t, w, "/submissions/"+sub.ID)
	code, hdr, _ := w.post("/submissions/"+sub.ID+"/rerun", url.Values{"_csrf": {csrf}})
	if code != http.StatusSeeOther || hdr.Get("Location") != "/submissions/"+sub.ID {
		t.Fatalf("rerun: %d %v", code, hdr)
	}
	if code, v := editor.submission(sub.Links.Self + "?wait=30s"); code != http.StatusOK || v.Reports != 2 {
		t.Fatalf("after the rerun: %d %+v", code, v)
	}
	code, page := w.get("/submissions/" + sub.ID)
	if code != http.StatusOK || !strings.Contains(page, "2, shown") {
		t.Fatalf("history after a rerun: %d", code)
	}
	earlier := regexp.MustCompile(`href="(/submissions/[^"?]+\?report=[0-9]+)"`).FindStringSubmatch(page)
	if earlier == nil {
		t.Fatal("no link to the earlier report")
	}
	if code, page := w.get(earlier[1]); code != http.StatusOK ||
		!strings.Contains(page, "earlier report, number 1 of 2") {
		t.Fatalf("the earlier report: %d", code)
	}
	checkDeleteAsksFirst(t, w, sub.ID, csrf)
}

// checkSubmitterScope: a submitter's session sees its own submissions
// only, as its key does over the API.
func checkSubmitterScope(t *testing.T, m *Main, db *store.DB, editorToken string) api.SubmissionView {
	base := m.URL()
	editor := apiClient{t, &base, editorToken}
	code, _, b := editor.call(http.MethodPost, "/v1/submissions", "application/json",
		readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	var sub api.SubmissionView
	if code != http.StatusAccepted || json.Unmarshal(b, &sub) != nil {
		t.Fatalf("submit: %d %.200s", code, b)
	}
	w := newWebClient(t, base)
	_, page := w.get("/")
	csrf := csrfRE.FindStringSubmatch(page)
	submitter := mustKeyToken(t, db, "Office T", service.RoleSubmitter)
	if code, _, _ := w.post("/session", url.Values{"key": {submitter}, "_csrf": {csrf[1]}}); code != http.StatusSeeOther {
		t.Fatalf("submitter sign-in: %d", code)
	}
	if code, page := w.get("/submissions/" + sub.ID); code != http.StatusNotFound ||
		!strings.Contains(page, "Not found") {
		t.Errorf("a submitter opens an editor's submission: %d", code)
	}
	if _, page := w.get("/"); strings.Contains(page, sub.ID) {
		t.Error("a submitter's dashboard lists an editor's submission")
	}
	return sub
}

// checkDeleteAsksFirst: the plain form's post deletes nothing and is sent
// to a page of its own that says what goes with the submission; only that
// page's form (confirm=yes) deletes, and the dashboard then says what was
// deleted.
func checkDeleteAsksFirst(t *testing.T, w *webClient, id, csrf string) {
	t.Helper()
	code, hdr, _ := w.post("/submissions/"+id+"/delete", url.Values{"_csrf": {csrf}})
	if code != http.StatusSeeOther || hdr.Get("Location") != "/submissions/"+id+"/delete" {
		t.Fatalf("delete without confirmation: %d %v", code, hdr)
	}
	if code, _ := w.get("/submissions/" + id); code != http.StatusOK {
		t.Fatalf("deleted without confirmation: %d", code)
	}
	code, page := w.get("/submissions/" + id + "/delete")
	if code != http.StatusOK || !strings.Contains(page, "2 reports") || !strings.Contains(page, `name="confirm" value="yes"`) ||
		!strings.Contains(page, "cannot be undone") {
		t.Fatalf("the page that asks: %d %s", code, page)
	}
	if code, _, _ := w.post("/submissions/"+id+"/delete", url.Values{"confirm": {"yes"}}); code != http.StatusBadRequest {
		t.Fatalf("a confirmation without its CSRF token: %d", code)
	}
	code, hdr, _ = w.post("/submissions/"+id+"/delete", url.Values{"_csrf": {csrf}, "confirm": {"yes"}})
	if code != http.StatusSeeOther || hdr.Get("Location") != "/?deleted="+id {
		t.Fatalf("delete: %d %v", code, hdr)
	}
	if code, _ := w.get("/submissions/" + id); code != http.StatusNotFound {
		t.Fatalf("a deleted submission: %d", code)
	}
	if code, page := w.get(hdr.Get("Location")); code != http.StatusOK || !strings.Contains(page, "Deleted: “") ||
		!strings.Contains(page, "with 2 reports") {
		t.Fatalf("the dashboard after the deletion: %d", code)
	}
}
