package main

import (
	"bytes"
	"context"
	"net/http"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// The report is served as stored, byte for byte, with an ETag; a client
// that sends it back hears 304 until a rerun makes a newer report, and
// never for a submission its key may not see.
func TestServer_ReportConditional(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	defer m.Close()
	base := m.URL()
	editor := apiClient{t, &base, mustKeyToken(t, db, "Office E", service.RoleEditor)}
	other := apiClient{t, &base, mustKeyToken(t, db, "Office F", service.RoleEditor)}
	sub := mustSubmit(t, editor, "application/json", readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	code, hdr, body := editor.call(http.MethodGet, sub.Links.Report, "", nil)
	var stored []byte
	if err := db.Pool.QueryRow(context.Background(), `SELECT report::text FROM reports`).Scan(&stored); err != nil {
		t.Fatal(err)
	}
	tag := hdr.Get("ETag")
	if code != 200 || !bytes.Equal(body, stored) || tag == "" || hdr.Get("Cache-Control") != "private, no-cache" {
		t.Fatalf("report: %d, tag %q, %v, the stored bytes as they are: %v", code, tag, hdr, bytes.Equal(body, stored))
	}
	for _, inm := range []string{tag, "W/" + tag, `"r0", ` + tag, "*"} {
		code, hdr, body := editor.call(http.MethodGet, sub.Links.Report, "", nil, "If-None-Match", inm)
		if code != http.StatusNotModified || len(body) != 0 || hdr.Get("ETag") != tag {
			t.Errorf("If-None-Match %s: %d, %d bytes, tag %q", inm, code, len(body), hdr.Get("ETag"))
		}
	}
	if code, _, _ := other.call(http.MethodGet, sub.Links.Report, "", nil, "If-None-Match", tag); code != 404 {
		t.Errorf("another office with the tag: %d, want 404", code)
	}
	checkViewTags(t, editor, sub.Links.Report, tag)
	if code, _, _ := editor.call(http.MethodPost, sub.Links.Self+"/rerun", "", nil); code != http.StatusAccepted {
		t.Fatalf("rerun: %d", code)
	}
	if _, v := editor.submission(sub.Links.Self + "?wait=30s"); v.Reports != 2 {
		t.Fatalf("after the rerun: %+v", v)
	}
	code, hdr, _ = editor.call(http.MethodGet, sub.Links.Report, "", nil, "If-None-Match", tag)
	if code != 200 || hdr.Get("ETag") == tag {
		t.Errorf("the first report's tag after a rerun: %d, tag %q", code, hdr.Get("ETag"))
	}
}

// checkViewTags: the HTML view has a tag of its own; the JSON's does not
// match it.
func checkViewTags(t *testing.T, c apiClient, path, jsonTag string) {
	t.Helper()
	code, hdr, _ := c.call(http.MethodGet, path+"?format=html", "", nil, "If-None-Match", jsonTag)
	html := hdr.Get("ETag")
	if code != 200 || html == "" || html == jsonTag {
		t.Fatalf("HTML view with the JSON's tag: %d, tag %q", code, html)
	}
	if code, _, _ := c.call(http.MethodGet, path+"?format=html", "", nil, "If-None-Match", html); code != 304 {
		t.Errorf("HTML view with its own tag: %d", code)
	}
	if code, _, _ := c.call(http.MethodHead, path, "", nil, "If-None-Match", jsonTag); code != 304 {
		t.Errorf("HEAD with the tag: %d", code)
	}
}
