package main

import (
	"encoding/json"
	"net/http"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// A screening that runs past a second shows its progress over HTTP, in a
// plain GET and in a long poll, and none once it is done. The real server,
// worker and PostgreSQL run it; the first check is held until the test has
// seen the progress, so nothing depends on how fast the machine is.
func TestServer_ProgressWhileRunning(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	release := make(chan struct{})
	cs := heldPipeline(release)
	first := cs[0].Title
	m := startHeld(t, url, cs)
	base := m.URL()
	c := apiClient{t, &base, mustKeyToken(t, db, "Office P", service.RoleEditor)}
	code, _, b := c.call(http.MethodPost, "/v1/submissions", "application/json",
		readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	var sub api.SubmissionView
	if err := json.Unmarshal(b, &sub); err != nil || code != http.StatusAccepted {
		t.Fatalf("submit: %d %s", code, b)
	}
	want := api.ProgressView{Stage: "checks (now: " + first + ")", Done: 0, Total: len(cs)}
	v := pollProgress(t, c, sub.Links.Self)
	if p := v.Progress; v.Status != service.StatusRunning || p.Stage != want.Stage || p.Done != 0 ||
		p.Total != want.Total || p.UpdatedAt.IsZero() {
		t.Fatalf("while running: %+v, progress %+v, want %+v", v, p, want)
	}
	if _, lp := c.submission(sub.Links.Self + "?wait=1s"); lp.Progress == nil || lp.Progress.Stage != want.Stage {
		t.Fatalf("a long poll while running: %+v", lp)
	}
	close(release)
	_, done := c.submission(sub.Links.Self + "?wait=30s")
	_, _, raw := c.call(http.MethodGet, sub.Links.Self, "", nil)
	if done.Status != service.StatusDone || done.Progress != nil || strings.Contains(string(raw), `"progress"`) {
		t.Fatalf("after the screening: %+v, %s", done, raw)
	}
}

// pollProgress polls the submission until it shows progress (the worker
// writes it after the screening's first second).
func pollProgress(t *testing.T, c apiClient, path string) api.SubmissionView {
	t.Helper()
	for deadline := time.Now().Add(30 * time.Second); time.Now().Before(deadline); time.Sleep(100 * time.Millisecond) {
		if _, v := c.submission(path); v.Progress != nil {
			return v
		}
	}
	t.Fatal("no progress shown within 30 s")
	return api.SubmissionView{}
}
