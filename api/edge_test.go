package api_test

import (
	"bytes"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/checks/load"
)

// A body past the server's limit is 413 naming the limit in bytes.
func TestEdge_BodyLimitNamed(t *testing.T) {
	l := load.DefaultLimits
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

// The scheme of Authorization is case-insensitive (RFC 7235, section 2.1).
func TestAuth_SchemeAnyCase(t *testing.T) {
	srv := api.New(api.Config{Store: &fakeStore{}})
	for header, want := range map[string]int{"Bearer good": 200, "bearer good": 200, "BEARER  good": 200,
		"Basic good": 401, "Bearer": 401, "bearergood": 401} {
		req := httptest.NewRequest(http.MethodGet, "/v1/submissions", nil)
		req.Header.Set("Authorization", header)
		rr := httptest.NewRecorder()
		srv.Echo().ServeHTTP(rr, req)
		if rr.Code != want {
			t.Errorf("%q: %d, want %d", header, rr.Code, want)
		}
	}
}

// Raw data whose estimated working memory is more than a job has is 422
// at ingest, naming /data and the figures.
func TestIngest_WorkingMemoryRefused(t *testing.T) {
	srv := api.New(api.Config{Store: &fakeStore{}, JobMemory: 64<<20 + 1000})
	csv := "a,b\n" + strings.Repeat("1,2\n", 100)
	req := httptest.NewRequest(http.MethodPost, "/v1/submissions",
		strings.NewReader(`{"data": {"kind": "rows", "csv": "`+strings.ReplaceAll(csv, "\n", `\n`)+`"}}`))
	req.Header.Set("Authorization", "Bearer good")
	req.Header.Set("Content-Type", "application/json")
	rr := httptest.NewRecorder()
	srv.Echo().ServeHTTP(rr, req)
	var p api.Problem
	_ = json.Unmarshal(rr.Body.Bytes(), &p)
	if rr.Code != 422 || len(p.Errors) != 1 || p.Errors[0].Pointer != "/data" ||
		!strings.Contains(p.Errors[0].Detail, "100 rows × 2 columns") {
		t.Fatalf("%d %+v", rr.Code, p)
	}
}

// HEAD is answered wherever GET is.
func TestEdge_HeadLikeGet(t *testing.T) {
	for _, p := range []string{"/healthz", "/v1/submissions"} {
		if rr, _ := serve(t, &fakeStore{}, http.MethodHead, p, "good"); rr.Code != 200 || rr.Body.Len() != 0 {
			t.Errorf("HEAD %s: %d, %d bytes of body", p, rr.Code, rr.Body.Len())
		}
	}
}
