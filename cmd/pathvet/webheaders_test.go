package main

import (
	"io"
	"net/http"
	"net/url"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// scriptRE finds script of any kind in a page: an element, an event
// handler attribute, or a javascript: URL.
var scriptRE = regexp.MustCompile(`(?i)<script|\son[a-z]+\s*=|javascript:`)

// checkPage: a page of the workspace carries the security headers and no
// script at all, as its policy requires.
func checkPage(t *testing.T, w *webClient, path string) {
	t.Helper()
	resp, err := w.http.Get(w.base + path)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	h := resp.Header
	if csp := h.Get("Content-Security-Policy"); !strings.Contains(csp, "default-src 'none'") ||
		!strings.Contains(csp, "frame-ancestors 'none'") || strings.Contains(csp, "script-src") {
		t.Errorf("%s: policy %q", path, csp)
	}
	if h.Get("X-Frame-Options") != "DENY" || h.Get("X-Content-Type-Options") != "nosniff" ||
		h.Get("Referrer-Policy") != "no-referrer" {
		t.Errorf("%s: headers %v", path, h)
	}
	if m := scriptRE.Find(b); m != nil {
		t.Errorf("%s holds script: %q", path, m)
	}
}

// The CSRF token is read from the form body or the X-CSRF-Token header,
// never the query string (which the request log writes).
func TestWeb_CSRFNotFromTheQuery(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMainWith(t, dburl, func(c *Config) { c.Workers = 0 })
	defer m.Close()
	token := mustKeyToken(t, db, "Office Q", service.RoleEditor)
	w := newWebClient(t, m.URL())
	checkPage(t, w, "/")
	csrf := w.signInForm()
	if code := w.postFrom("/session?_csrf="+url.QueryEscape(csrf), url.Values{"key": {token}}); code != 400 {
		t.Fatalf("sign-in with the token in the query string: %d, want 400", code)
	}
	if code := w.postFrom("/session", url.Values{"key": {token}}, "X-CSRF-Token", csrf); code != 303 {
		t.Fatalf("sign-in with the token in the header: %d, want 303", code)
	}
	checkPage(t, w, "/")
	checkPage(t, w, "/submissions/00000000-0000-0000-0000-000000000000")
	session := sessionToken(t, w, "/")
	if code := w.postFrom("/session/end?_csrf="+url.QueryEscape(session), nil); code != 400 {
		t.Fatalf("sign-out with the token in the query string: %d, want 400", code)
	}
	if code := w.postFrom("/session/end", url.Values{"_csrf": {session}}); code != http.StatusSeeOther {
		t.Fatalf("sign-out with the token in the body: %d", code)
	}
}
