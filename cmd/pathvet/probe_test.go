package main

import (
	"bytes"
	"encoding/base64"
	"encoding/json"
	"mime/multipart"
	"net/http"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// probe is one bad request and the status it must get, as problem details.
type probe struct {
	name, method, path, ctype string
	body                      []byte
	headers                   []string
	want                      int
	detail                    string // a part of the detail
}

// The probe's bad bytes against the real server and database: every one
// is a 4xx problem, none a 500.
func TestServer_BadBytesAreProblems(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	t.Cleanup(func() { _ = m.Close() })
	base := m.URL()
	c := apiClient{t, &base, mustKeyToken(t, db, "Office P", service.RoleEditor)}
	pkg := readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")
	for _, p := range badBytes(t, pkg) {
		t.Run(p.name, func(t *testing.T) {
			code, hdr, b := c.call(p.method, p.path, p.ctype, p.body, p.headers...)
			var pr api.Problem
			_ = json.Unmarshal(b, &pr)
			if code != p.want || hdr.Get("Content-Type") != api.ProblemContentType ||
				!strings.Contains(pr.Detail, p.detail) {
				t.Fatalf("%d %s %.300s", code, hdr.Get("Content-Type"), b)
			}
			if code == http.StatusMethodNotAllowed && !strings.Contains(hdr.Get("Allow"), "GET") {
				t.Fatalf("405 without Allow: %v", hdr)
			}
		})
	}
	checkOpenAPI(t, m)
}

func badBytes(t *testing.T, pkg []byte) []probe {
	cursor := func(s string) string { return base64.RawURLEncoding.EncodeToString([]byte(s)) }
	uuid := "3f0e6f43-6c1e-4a8e-9d55-0d2f5b4f2a10"
	twoCT, twoBody := twoParts(t, pkg)
	return []probe{
		{
			name:   "QueryInvalidUTF8",
			method: "GET",
			path:   "/v1/submissions?manuscript_id=%FF%FE",
			want:   400,
			detail: "manuscript_id",
		},
		{name: "QueryNUL", method: "GET", path: "/v1/submissions?manuscript_id=a%00b", want: 400, detail: "NUL"},
		{name: "QueryBadEscape", method: "GET", path: "/v1/submissions?status=%zz", want: 400, detail: "malformed"},
		{
			name:   "CursorFarFuture",
			method: "GET",
			path:   "/v1/submissions?cursor=" + cursor("9223372036854775807/"+uuid),
			want:   400,
			detail: "cursor",
		},
		{
			name:   "CursorFarPast",
			method: "GET",
			path:   "/v1/submissions?cursor=" + cursor("-9223372036854775808/"+uuid),
			want:   400,
			detail: "cursor",
		},
		{
			name:    "IdempotencyKeyInvalidUTF8",
			method:  "POST",
			path:    "/v1/submissions",
			ctype:   "application/json",
			body:    pkg,
			headers: []string{"Idempotency-Key", "k\xff\xfe"},
			want:    400,
			detail:  "Idempotency-Key",
		},
		{name: "TwoPackageParts", method: "POST", path: "/v1/submissions", ctype: twoCT, body: twoBody,
			want: 400, detail: "more than one part named package"},
		{name: "UnknownMethod", method: "PUT", path: "/v1/submissions", want: 405, detail: "PUT"},
		{name: "UnknownMethodOnID", method: "PATCH", path: "/v1/submissions/" + uuid, want: 405, detail: "PATCH"},
		{
			name:    "HeadersTooLarge",
			method:  "GET",
			path:    "/v1/submissions",
			headers: []string{"X-Filler", strings.Repeat("a", 80<<10)},
			want:    431,
			detail:  "limit of 65536 bytes",
		},
		{name: "PackageTooLarge", method: "POST", path: "/v1/submissions", ctype: "application/json",
			body: bytes.Repeat([]byte(" "), 2<<20), want: 413, detail: "limit of 1048576 bytes"},
	}
}

// twoParts returns a multipart body with two package parts.
func twoParts(t *testing.T, pkg []byte) (contentType string, body []byte) {
	var b bytes.Buffer
	w := multipart.NewWriter(&b)
	for range 2 {
		fw, err := w.CreateFormField("package")
		if err != nil {
			t.Fatal(err)
		}
		_, _ = fw.Write(pkg)
	}
	_ = w.Close()
	return w.FormDataContentType(), b.Bytes()
}
