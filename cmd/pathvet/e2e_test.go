package main

import (
	"bytes"
	"context"
	"encoding/json"
	"io"
	"net/http"
	"os"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/labstack/echo/v4"
	"gopkg.in/yaml.v3"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// recorder notes every (method, path, status) the tests see, to hold the
// OpenAPI document to what the server really answers.
type recorder struct {
	mu   sync.Mutex
	seen map[seenCall]bool
	next http.RoundTripper
}

type seenCall struct {
	method, path string
	status       int
}

func (r *recorder) RoundTrip(req *http.Request) (*http.Response, error) {
	resp, err := r.next.RoundTrip(req)
	if err == nil {
		r.mu.Lock()
		r.seen[seenCall{req.Method, req.URL.Path, resp.StatusCode}] = true
		r.mu.Unlock()
	}
	return resp, err
}

var rec = &recorder{seen: map[seenCall]bool{}, next: http.DefaultTransport}

// startMain starts a server with in-process workers on port 0 against the
// database at url.
func startMain(t *testing.T, url string) *Main {
	t.Helper()
	return startMainWith(t, url, func(*Config) {})
}

// startMainWith is startMain with the configuration changed by set.
func startMainWith(t *testing.T, url string, set func(*Config)) *Main {
	t.Helper()
	cfg := defaultConfig(func(string) string { return "" })
	cfg.DatabaseURL, cfg.Addr, cfg.Workers = url, "127.0.0.1:0", 2
	cfg.Limits.PackageBytes = 1 << 20 // small, for the 413 test
	set(&cfg)
	m := &Main{Config: cfg, Logger: newLogger(io.Discard), serve: true}
	if err := m.Run(context.Background()); err != nil {
		t.Fatal(err)
	}
	return m
}

type apiClient struct {
	t     *testing.T
	base  *string // shared, so that a restarted server is found
	token string
}

func (c apiClient) call(method, path, ctype string, body []byte, headers ...string) (int, http.Header, []byte) {
	c.t.Helper()
	req, _ := http.NewRequest(method, *c.base+path, bytes.NewReader(body))
	if c.token != "" {
		req.Header.Set("Authorization", "Bearer "+c.token)
	}
	if ctype != "" {
		req.Header.Set("Content-Type", ctype)
	}
	for i := 0; i+1 < len(headers); i += 2 {
		req.Header.Set(headers[i], headers[i+1])
	}
	resp, err := (&http.Client{Transport: rec, Timeout: time.Minute}).Do(req)
	if err != nil {
		c.t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	return resp.StatusCode, resp.Header, b
}

func (c apiClient) submission(path string) (int, api.SubmissionView) {
	c.t.Helper()
	code, _, b := c.call(http.MethodGet, path, "", nil)
	var v api.SubmissionView
	_ = json.Unmarshal(b, &v)
	return code, v
}

func mustKeyToken(t *testing.T, db *store.DB, office, role string) string {
	t.Helper()
	token, _ := storetest.MustKey(t, db, office, role)
	return token
}

func readFile(t *testing.T, path string) []byte {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// End to end over HTTP against a real PostgreSQL: submit, wait, report,
// list, delete, rerun, idempotency, the auth matrix, bad packages,
// oversize bodies, and a restart.
func TestServer_EndToEnd(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	base := m.URL()
	editor := apiClient{t, &base, mustKeyToken(t, db, "Office A", service.RoleEditor)}
	submitter := apiClient{t, &base, mustKeyToken(t, db, "Office A", service.RoleSubmitter)}
	otherSubmitter := apiClient{t, &base, mustKeyToken(t, db, "Office A", service.RoleSubmitter)}
	otherOffice := apiClient{t, &base, mustKeyToken(t, db, "Office B", service.RoleEditor)}
	anonymous := apiClient{t, &base, ""}
	badKey := apiClient{t, &base, "pv_not-a-key"}

	pkg := readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")
	code, hdr, b := submitter.call(
		http.MethodPost,
		"/v1/submissions",
		"application/json",
		pkg,
		"Idempotency-Key",
		"first",
	)
	var sub api.SubmissionView
	if err := json.Unmarshal(b, &sub); err != nil || code != http.StatusAccepted || sub.ID == "" ||
		hdr.Get("Location") != sub.Links.Self {
		t.Fatalf("submit: %d %s", code, b)
	}
	t.Run("Wait", func(t *testing.T) {
		code, v := submitter.submission(sub.Links.Self + "?wait=20s")
		if code != http.StatusOK || v.Status != service.StatusDone || v.Score == nil || v.Band == nil {
			t.Fatalf("after waiting: %d %+v", code, v)
		}
	})
	t.Run("Report", func(t *testing.T) {
		code, hdr, b := submitter.call(http.MethodGet, sub.Links.Report, "", nil)
		var rep checks.Report
		if code != http.StatusOK || json.Unmarshal(b, &rep) != nil || rep.PackageSHA256 != sub.PackageSHA256 ||
			!strings.HasPrefix(hdr.Get("Content-Type"), "application/json") {
			t.Fatalf("report: %d %.200s", code, b)
		}
		if code, _, b := submitter.call(http.MethodGet, sub.Links.Report+"?format=text", "", nil); code != 200 ||
			!bytes.HasPrefix(b, []byte("pathvet screening report: ")) {
			t.Fatalf("text report: %d %.100s", code, b)
		}
		code, hdr, b = submitter.call(http.MethodGet, sub.Links.Report+"?format=html", "", nil)
		if code != 200 || !strings.HasPrefix(hdr.Get("Content-Type"), "text/html") ||
			!bytes.Contains(b, []byte("not a verdict")) ||
			!bytes.Contains(b, []byte("Points taken off, by check")) {
			t.Fatalf("html report: %d %.200s", code, b)
		}
		if code, _, _ := submitter.call(http.MethodGet, sub.Links.Report+"?format=pdf", "", nil); code != 400 {
			t.Fatalf("unknown format: %d", code)
		}
	})
	t.Run("Idempotency", func(t *testing.T) {
		code, hdr, b := submitter.call(
			http.MethodPost,
			"/v1/submissions",
			"application/json",
			pkg,
			"Idempotency-Key",
			"first",
		)
		var again api.SubmissionView
		_ = json.Unmarshal(b, &again)
		if code != http.StatusAccepted || again.ID != sub.ID || hdr.Get("Idempotent-Replayed") != "true" {
			t.Fatalf("replay: %d %s", code, b)
		}
		other := bytes.Replace(pkg, []byte("Peer tutoring"), []byte("Peer mentoring"), 1)
		if code, _, _ := submitter.call(http.MethodPost, "/v1/submissions", "application/json", other, "Idempotency-Key", "first"); code != http.StatusConflict {
			t.Fatalf("same key, other package: %d", code)
		}
	})
	t.Run("AuthMatrix", func(t *testing.T) {
		for _, tc := range []struct {
			name string
			c    apiClient
			want int
		}{{"editor", editor, 200}, {"own submitter", submitter, 200}, {"other submitter", otherSubmitter, 404},
			{"other office", otherOffice, 404}, {"no key", anonymous, 401}, {"bad key", badKey, 401}} {
			if code, _ := tc.c.submission(sub.Links.Self); code != tc.want {
				t.Errorf("%s: %d, want %d", tc.name, code, tc.want)
			}
			if code, _, _ := tc.c.call(http.MethodGet, sub.Links.Report, "", nil); code != tc.want {
				t.Errorf("%s report: %d, want %d", tc.name, code, tc.want)
			}
		}
		if code, hdr, b := anonymous.call(http.MethodGet, "/v1/submissions", "", nil); code != 401 ||
			hdr.Get("WWW-Authenticate") == "" ||
			hdr.Get("Content-Type") != api.ProblemContentType {
			t.Errorf("no key: %d %s %s", code, hdr, b)
		}
	})
	t.Run("Multipart", func(t *testing.T) {
		ct, body, err := packageBody("../../testdata/demo/coding-club/package.json")
		if err != nil {
			t.Fatal(err)
		}
		code, _, b := editor.call(http.MethodPost, "/v1/submissions", ct, body)
		var v api.SubmissionView
		if json.Unmarshal(b, &v); code != http.StatusAccepted {
			t.Fatalf("multipart: %d %s", code, b)
		}
		if _, done := editor.submission(v.Links.Self + "?wait=20s"); done.Status != service.StatusDone ||
			*done.Band != checks.BandModerate {
			t.Fatalf("multipart screening: %+v", done)
		}
	})
	t.Run("ListAndFilters", func(t *testing.T) {
		var list api.SubmissionList
		_, _, b := editor.call(http.MethodGet, "/v1/submissions?limit=1", "", nil)
		if json.Unmarshal(b, &list); len(list.Submissions) != 1 || list.NextCursor == "" {
			t.Fatalf("page 1: %s", b)
		}
		_, _, b = editor.call(http.MethodGet, "/v1/submissions?limit=1&cursor="+list.NextCursor, "", nil)
		var page2 api.SubmissionList
		if json.Unmarshal(b, &page2); len(page2.Submissions) != 1 || page2.Submissions[0].ID == list.Submissions[0].ID {
			t.Fatalf("page 2: %s", b)
		}
		_, _, b = editor.call(http.MethodGet, "/v1/submissions?manuscript_id=DEMO-2026-0141&status=done", "", nil)
		if json.Unmarshal(b, &list); len(list.Submissions) != 1 || list.Submissions[0].ID != sub.ID {
			t.Fatalf("filters: %s", b)
		}
		_, _, b = submitter.call(http.MethodGet, "/v1/submissions", "", nil)
		if json.Unmarshal(b, &list); len(list.Submissions) != 1 {
			t.Fatalf("a submitter sees %d submissions, want its own 1", len(list.Submissions))
		}
		if code, _, _ := editor.call(http.MethodGet, "/v1/submissions?status=lost", "", nil); code != 400 {
			t.Fatalf("bad status filter: %d", code)
		}
		_, _, b = editor.call(http.MethodGet, "/v1/submissions?band=high-concern", "", nil)
		var high api.SubmissionList
		if json.Unmarshal(b, &high); len(high.Submissions) != 1 || high.Submissions[0].ID != sub.ID {
			t.Fatalf("band filter: %s", b)
		}
	})
	t.Run("BadPackage422", func(t *testing.T) {
		code, hdr, b := editor.call(
			http.MethodPost,
			"/v1/submissions",
			"application/json",
			readFile(t, "../../testdata/bad/edge-unknown-variable.json"),
		)
		var p api.Problem
		if json.Unmarshal(b, &p); code != 422 || hdr.Get("Content-Type") != api.ProblemContentType ||
			len(p.Errors) == 0 ||
			p.Errors[0].Pointer != "/graph/edges/2/to" {
			t.Fatalf("bad package: %d %s", code, b)
		}
		code, _, b = editor.call(
			http.MethodPost,
			"/v1/submissions",
			"application/json",
			readFile(t, "../../testdata/bad/csv-not-a-number.json"),
		)
		if json.Unmarshal(b, &p); code != 422 || p.Errors[0].Line != 3 || p.Errors[0].Column != 2 {
			t.Fatalf("bad CSV: %d %s", code, b)
		}
		if code, _, _ := editor.call(http.MethodPost, "/v1/submissions", "text/plain", pkg); code != 415 {
			t.Fatalf("wrong media type: %d", code)
		}
	})
	t.Run("Oversize413", func(t *testing.T) {
		big := append([]byte(`{"title": "`), bytes.Repeat([]byte("x"), 2<<20)...)
		if code, _, b := editor.call(http.MethodPost, "/v1/submissions", "application/json", big); code != 413 {
			t.Fatalf("oversize package: %d %.200s", code, b)
		}
	})
	t.Run("Rerun", func(t *testing.T) {
		code, _, b := editor.call(http.MethodPost, sub.Links.Self+"/rerun", "", nil)
		if code != http.StatusAccepted {
			t.Fatalf("rerun: %d %s", code, b)
		}
		if _, v := editor.submission(sub.Links.Self + "?wait=20s"); v.Status != service.StatusDone || v.Reports != 2 {
			t.Fatalf("after rerun: %+v", v)
		}
		if code, _, _ := otherOffice.call(http.MethodPost, sub.Links.Self+"/rerun", "", nil); code != 404 {
			t.Fatalf("other office reruns: %d", code)
		}
	})
	t.Run("RestartKeepsReports", func(t *testing.T) {
		_, _, before := editor.call(http.MethodGet, sub.Links.Report, "", nil)
		if err := m.Close(); err != nil {
			t.Fatal(err)
		}
		m = startMain(t, url)
		base = m.URL()
		code, _, after := editor.call(http.MethodGet, sub.Links.Report, "", nil)
		if code != 200 || !bytes.Equal(before, after) {
			t.Fatalf("after restart: %d, same report %v", code, bytes.Equal(before, after))
		}
	})
	t.Run("Delete", func(t *testing.T) {
		if code, _, _ := otherOffice.call(http.MethodDelete, sub.Links.Self, "", nil); code != 404 {
			t.Fatalf("other office deletes: %d", code)
		}
		if code, _, _ := editor.call(http.MethodDelete, sub.Links.Self, "", nil); code != 204 {
			t.Fatalf("delete: %d", code)
		}
		if code, _ := editor.submission(sub.Links.Self); code != 404 {
			t.Fatalf("deleted submission: %d", code)
		}
	})
	t.Run("Probes", func(t *testing.T) {
		for _, p := range []string{"/healthz", "/readyz", "/metrics", "/v1/openapi.yaml"} {
			if code, _, _ := anonymous.call(http.MethodGet, p, "", nil); code != 200 {
				t.Errorf("%s: %d", p, code)
			}
		}
	})
	checkOpenAPI(t, m)
	t.Cleanup(func() { _ = m.Close() })
}

// checkOpenAPI holds the OpenAPI document to the server: every registered
// route is documented with its method, and every status the tests saw for
// a route is among its documented responses.
func checkOpenAPI(t *testing.T, m *Main) {
	var doc struct {
		OpenAPI string                    `yaml:"openapi"`
		Paths   map[string]map[string]any `yaml:"paths"`
	}
	if err := yaml.Unmarshal(api.OpenAPI, &doc); err != nil || !strings.HasPrefix(doc.OpenAPI, "3.1") {
		t.Fatalf("OpenAPI document: %v (version %q)", err, doc.OpenAPI)
	}
	param := regexp.MustCompile(`:(\w+)`)
	templates := map[string]*regexp.Regexp{}
	for _, r := range routesOf(m) {
		path := param.ReplaceAllString(r[1], "{$1}")
		op, ok := doc.Paths[path][strings.ToLower(r[0])].(map[string]any)
		if !ok {
			t.Errorf("route %s %s is not in the OpenAPI document", r[0], path)
			continue
		}
		if _, ok := op["responses"]; !ok {
			t.Errorf("%s %s documents no responses", r[0], path)
		}
		templates[r[0]+" "+path] = regexp.MustCompile("^" + param.ReplaceAllString(r[1], `[^/]+`) + "$")
	}
	for seen := range rec.seen {
		status := strconv.Itoa(seen.status)
		for key, re := range templates {
			method, path, _ := strings.Cut(key, " ")
			if method != seen.method || !re.MatchString(seen.path) {
				continue
			}
			op, _ := doc.Paths[path][strings.ToLower(method)].(map[string]any)
			responses, _ := op["responses"].(map[string]any)
			if _, ok := responses[status]; !ok {
				t.Errorf("%s %s answered %s, which the OpenAPI document does not list", method, path, status)
			}
		}
	}
}

// routesOf lists the server's registered routes as (method, path).
func routesOf(m *Main) [][2]string {
	var out [][2]string
	for _, r := range m.HTTP.Handler.(*echo.Echo).Routes() {
		if strings.HasPrefix(r.Method, "echo_") || strings.HasSuffix(r.Path, "*") {
			continue // Echo's own not-found routes of a group
		}
		out = append(out, [2]string{r.Method, r.Path})
	}
	return out
}
