package api_test

import (
	"bytes"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/checks"
)

// A body past the server's limit is 413 naming the limit in bytes.
func TestEdge_BodyLimitNamed(t *testing.T) {
	l := checks.DefaultLimits
	l.PackageBytes, l.CSVBytes = 1000, 1000
	srv := api.New(api.Config{Store: &fakeStore{}, Limits: l})
	req := httptest.NewRequest(http.MethodPost, "/v1/submissions", bytes.NewReader(make([]byte, 2<<20)))
	req.Header.Set("Authorization", "Bearer good")
	req.Header.Set("Content-Type", "application/json")
	rr := httptest.NewRecorder()
	srv.Echo().ServeHTTP(rr, req)
	var p api.Problem
	_ = json.Unmarshal(rr.Body.Bytes(), &p)
	if want := "limit of 1050576 bytes"; rr.Code != 413 || !strings.Contains(p.Detail, want) {
		t.Fatalf("%d %+v, want 413 naming %q", rr.Code, p, want)
	}
}

// A method a known path does not answer is 405 with Allow, as problem
// details.
func TestEdge_MethodNotAllowedHasAllow(t *testing.T) {
	rr, p := serve(t, &fakeStore{}, "BREW", "/v1/submissions/x/report", "good")
	if rr.Code != 405 || rr.Header().Get("Allow") == "" || !strings.Contains(p.Detail, "BREW") || p.Type == "" {
		t.Fatalf("%d %v %+v", rr.Code, rr.Header(), p)
	}
}
