package api_test

import (
	"crypto/sha256"
	"encoding/base64"
	"net/http"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/render"
)

// Every answer, pages, documents and errors alike, carries the security
// headers.
func TestSecurityHeaders_OnEveryAnswer(t *testing.T) {
	for _, tc := range []struct{ method, path, token string }{
		{http.MethodGet, "/healthz", ""}, {http.MethodGet, "/v1/openapi.yaml", ""},
		{http.MethodGet, "/nowhere", ""}, {http.MethodGet, "/v1/submissions", ""},
		{http.MethodGet, "/v1/submissions/x/report", "good"}, {http.MethodPut, "/healthz", ""},
	} {
		rr, _ := serve(t, &fakeStore{}, tc.method, tc.path, tc.token)
		h := rr.Header()
		csp := h.Get("Content-Security-Policy")
		if !strings.Contains(csp, "default-src 'none'") || !strings.Contains(csp, "frame-ancestors 'none'") ||
			strings.Contains(csp, "script-src") || h.Get("X-Frame-Options") != "DENY" ||
			h.Get("X-Content-Type-Options") != "nosniff" || h.Get("Referrer-Policy") != "no-referrer" {
			t.Errorf("%s %s (%d): headers %v", tc.method, tc.path, rr.Code, h)
		}
	}
}

var styleRE = regexp.MustCompile(`(?s)<style>(.*?)</style>`)

// The policy lets the pages' own stylesheet through: the hash of every
// <style> element a workspace page carries is among the policy's
// sources (a policy that refused the page's styles would be a bug).
func TestSecurityHeaders_PolicyAllowsThePagesStyles(t *testing.T) {
	rr, _ := serve(t, &fakeStore{}, http.MethodGet, "/healthz", "")
	csp := rr.Header().Get("Content-Security-Policy")
	var pages []string
	for _, write := range []func(*strings.Builder) error{
		func(b *strings.Builder) error { return render.WriteSignIn(b, render.SignIn{CSRF: "t"}) },
		func(b *strings.Builder) error { return render.WriteNotice(b, nil, "Not found", "None.") },
		func(b *strings.Builder) error { return render.WriteShell(b, "x", "", "") },
	} {
		var b strings.Builder
		if err := write(&b); err != nil {
			t.Fatal(err)
		}
		pages = append(pages, b.String())
	}
	for i, page := range pages {
		styles := styleRE.FindAllStringSubmatch(page, -1)
		if len(styles) == 0 {
			t.Errorf("page %d has no stylesheet", i)
		}
		for _, st := range styles {
			sum := sha256.Sum256([]byte(st[1]))
			src := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
			if !strings.Contains(csp, "style-src-elem "+src) {
				t.Errorf("page %d: its stylesheet's hash %s is not in the policy %q", i, src, csp)
			}
		}
	}
}
