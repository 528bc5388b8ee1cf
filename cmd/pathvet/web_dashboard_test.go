package main

import (
	"context"
	"encoding/json"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// deadlineReason is what a worker records when a screening runs past its
// deadline on its last attempt (store/jobs.go; TestWorker_JobAtItsDeadlineReturns
// sees a real one, "attempt 1 of …: … deadline exceeded").
const deadlineReason = "attempt 4 of 4: context deadline exceeded"

// TestWeb_DashboardSmallThings over HTTP against the real server and
// PostgreSQL, with no workers so that nothing is screened behind the
// test's back (issue 22.4): the dashboard names the key by its label, a
// submission whose screening ran out of time says so in words with what
// to do (and its page shows what the server recorded beneath), and the
// counts tell a failed submission from one not screened yet.
func TestWeb_DashboardSmallThings(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMainWith(t, dburl, func(c *Config) { c.Workers = 0 })
	defer m.Close()
	ctx := context.Background()
	if _, err := db.CreateOffice(ctx, "Office L"); err != nil {
		t.Fatal(err)
	}
	token, _, err := db.CreateKey(ctx, service.NewKey{Office: "Office L", Role: service.RoleEditor, Label: "Demo editor"})
	if err != nil {
		t.Fatal(err)
	}
	base := m.URL()
	editor := apiClient{t, &base, token}
	var ids []string
	for range 2 {
		code, _, b := editor.call(http.MethodPost, "/v1/submissions", "application/json",
			readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
		if code != http.StatusAccepted {
			t.Fatalf("submit: %d %.200s", code, b)
		}
		ids = append(ids, idOf(t, b))
	}
	if err := db.MarkFailed(ctx, ids[0], deadlineReason); err != nil {
		t.Fatal(err)
	}
	w := signedIn(t, base, token)
	_, page := w.get("/")
	for _, want := range []string{`<td data-label="Sent with the key">Demo editor</td>`,
		`<span class="n">1</span> <span class="what">not screened yet</span>`,
		`<span class="n">1</span> <span class="what">could not be screened</span>`,
		"could not be screened</span><span class=\"small\">: it ran out of time; screen it again",
		"waiting in the queue"} {
		if !strings.Contains(page, want) {
			t.Errorf("the dashboard lacks %q", want)
		}
	}
	for _, raw := range []string{"deadline exceeded", ">key 1<", "key 1 "} {
		if strings.Contains(page, raw) {
			t.Errorf("the dashboard shows %q", raw)
		}
	}
	_, page = w.get("/submissions/" + ids[0])
	for _, want := range []string{"The screening ran out of time", "ask the service&#39;s administrator for a longer",
		"What the server recorded: <code>" + deadlineReason + "</code>", `action="/submissions/` + ids[0] + `/rerun"`} {
		if !strings.Contains(page, want) {
			t.Errorf("the failed submission's page lacks %q", want)
		}
	}
}

// signedIn is a web client with a session of the key.
func signedIn(t *testing.T, base, token string) *webClient {
	t.Helper()
	w := newWebClient(t, base)
	_, page := w.get("/")
	csrf := csrfRE.FindStringSubmatch(page)
	if csrf == nil {
		t.Fatal("the sign-in page has no form token")
	}
	if code, _, _ := w.post("/session", url.Values{"key": {token}, "_csrf": {csrf[1]}}); code != http.StatusSeeOther {
		t.Fatalf("sign-in: %d", code)
	}
	return w
}

// idOf reads a submission's id from its JSON view.
func idOf(t *testing.T, view []byte) string {
	t.Helper()
	var v api.SubmissionView
	if err := json.Unmarshal(view, &v); err != nil || v.ID == "" {
		t.Fatalf("no submission in %.200s (%v)", view, err)
	}
	return v.ID
}
