package main

import (
	"context"
	"encoding/json"
	"fmt"
	"html"
	"io"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store/storetest"
)

// The dashboard and the submission page of a running screening show its
// progress in words and a text bar, and reload themselves. The first check
// is held until the pages have been read, so nothing depends on how fast
// the machine is.
func TestWeb_ProgressWhileRunning(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	release := make(chan struct{})
	cs := heldPipeline(release)
	m := startHeld(t, dburl, cs)
	base, token := m.URL(), mustKeyToken(t, db, "Office W", service.RoleEditor)
	c := apiClient{t, &base, token}
	code, _, b := c.call(http.MethodPost, "/v1/submissions", "application/json",
		readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	var sub api.SubmissionView
	if err := json.Unmarshal(b, &sub); err != nil || code != http.StatusAccepted {
		t.Fatalf("submit: %d %s", code, b)
	}
	pollProgress(t, c, sub.Links.Self)
	w := newWebClient(t, base)
	_, page := w.get("/")
	csrf := csrfRE.FindStringSubmatch(page)
	if code, _, _ := w.post("/session", url.Values{"key": {token}, "_csrf": {csrf[1]}}); code != http.StatusSeeOther {
		t.Fatalf("sign-in: %d", code)
	}
	words := html.EscapeString(fmt.Sprintf("checks (now: %s), 0 of %d done", cs[0].Title, len(cs)))
	for _, path := range []string{"/", "/submissions/" + sub.ID} {
		code, page := w.get(path)
		for _, want := range []string{">being screened</span>: ", words, "[□□□□□□□□□□]", "(as of ", "attempt 1",
			`<meta http-equiv="refresh" content="15">`} {
			if code != http.StatusOK || !strings.Contains(page, want) {
				t.Errorf("%s while running: %d, lacks %q", path, code, want)
			}
		}
	}
	close(release)
	if _, v := c.submission(sub.Links.Self + "?wait=30s"); v.Status != service.StatusDone {
		t.Fatalf("after the screening: %+v", v)
	}
	if _, page := w.get("/"); strings.Contains(page, " done</span>") || strings.Contains(page, `http-equiv="refresh"`) {
		t.Error("the dashboard still shows progress once the screening is done")
	}
}

// heldPipeline is the pipeline with its first check waiting for release.
// startHeld runs the real server with one in-process worker on the
// pipeline cs, on port 0, closed when the test ends.
func startHeld(t *testing.T, dburl string, cs []checks.Check) *Main {
	t.Helper()
	cfg := defaultConfig(func(string) string { return "" })
	cfg.DatabaseURL, cfg.Addr, cfg.Workers, cfg.checks = dburl, "127.0.0.1:0", 1, cs
	m := &Main{Config: cfg, Logger: newLogger(io.Discard), serve: true}
	if err := m.Run(context.Background()); err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { _ = m.Close() })
	return m
}

// heldPipeline is the pipeline with its first check held until release
// is closed (or the job's context ends).
func heldPipeline(release <-chan struct{}) []checks.Check {
	cs := checks.Pipeline()
	run := cs[0].Run
	cs[0].Run = func(ctx context.Context, a *checks.Analysis) (checks.CheckResult, error) {
		select {
		case <-release:
		case <-ctx.Done():
			return checks.CheckResult{}, ctx.Err()
		}
		return run(ctx, a)
	}
	return cs
}
