package main

import (
	"context"
	"encoding/json"
	"net/http"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// During a real database outage every route that needs the database
// answers 503 with Retry-After as problem details, and nothing sent then
// is stored.
func TestServer_OutageIs503(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	t.Cleanup(func() { _ = m.Close() })
	base := m.URL()
	c := apiClient{t, &base, mustKeyToken(t, db, "Office O", service.RoleEditor)}
	pkg := readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")
	_, _, b := c.call(http.MethodPost, "/v1/submissions", "application/json", pkg)
	id := submissionID(t, b)
	restore := storetest.Outage(t, url)
	for _, r := range routesOf(m) {
		if (!strings.HasPrefix(r[1], "/v1/") || r[1] == "/v1/openapi.yaml") && r[1] != "/readyz" {
			continue // routes that never touch the database
		}
		path := strings.ReplaceAll(r[1], ":id", id)
		code, hdr, b := c.call(r[0], path, "application/json", pkg, "Idempotency-Key", "during-outage")
		if code != http.StatusServiceUnavailable || hdr.Get("Retry-After") == "" ||
			hdr.Get("Content-Type") != api.ProblemContentType {
			t.Errorf("%s %s during an outage: %d %v %.200s", r[0], r[1], code, hdr, b)
		}
	}
	restore()
	for i := 0; i < 100 && db.Ping(context.Background()) != nil; i++ {
		time.Sleep(100 * time.Millisecond)
	}
	var n int
	if err := db.Pool.QueryRow(context.Background(), `SELECT count(*) FROM submissions`).Scan(&n); err != nil ||
		n != 1 {
		t.Fatalf("after the outage %d submissions (%v), want the 1 from before", n, err)
	}
}

func submissionID(t *testing.T, b []byte) string {
	t.Helper()
	var v api.SubmissionView
	if err := json.Unmarshal(b, &v); err != nil || v.ID == "" {
		t.Fatalf("no submission in %.200s", b)
	}
	return v.ID
}
