package main

import (
	"net/http"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store/storetest"
)

var keptRE = regexp.MustCompile(`name="rows_kept" value="([^"]+)"`)

// Raw rows uploaded through the form: the preview lists what init --data
// would guess, the page keeps the rows for the next step, Screen sends
// them beside the package as the API's data part, and the download is
// one document with the rows inline that hashes as the submission does.
// (rows.csv of the sleep-attention demo: 300 rows under its header,
// 4,400 bytes, as wc -l and ls count them.)
func TestWeb_NewScreeningFromRows(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	defer m.Close()
	base, token := m.URL(), mustKeyToken(t, db, "Office R", service.RoleSubmitter)
	w := signedIn(t, base, token)
	_, page := w.get("/submissions/new")
	csv := readFile(t, "../../testdata/demo/sleep-attention/rows.csv")
	form := with(formFields(t, page), "title", "Jobs and sleep (invented)", "design", "observational",
		"missing_method", "mean_substitution", "arrows", "part_time_job -> sleep_hours -> attention",
		"claim_text", "Jobs cost sleep", "claim_from", "part_time_job", "claim_to", "sleep_hours")
	code, _, page := w.postMultipart("/submissions/new", with(form, "action", "preview"), "rows.csv", csv)
	if code != http.StatusOK || !strings.Contains(page, "Ready to screen") {
		t.Fatalf("preview: %d %.3000s", code, page)
	}
	for _, want := range []string{"Variables guessed from the rows", "only 0 and 1",
		"student: skipped (listed in ignore_columns): it holds text", "In use: rows.csv (300 rows, 4 KB)"} {
		if !strings.Contains(page, want) {
			t.Errorf("the preview lacks %q", want)
		}
	}
	if keptRE.FindStringSubmatch(page) == nil {
		t.Fatal("the page does not keep the rows")
	}
	code, hdr, page := w.postMultipart("/submissions/new", with(formFields(t, page), "action", "screen"), "", nil)
	loc := locationRE.FindStringSubmatch(hdr.Get("Location"))
	if code != http.StatusSeeOther || loc == nil {
		t.Fatalf("screen with the kept rows: %d %.2000s", code, page)
	}
	api := apiClient{t, &base, token}
	_, sub := api.submission("/v1/submissions/" + loc[1] + "?wait=30s")
	code, doc := w.get("/submissions/" + loc[1] + "/package.json")
	study, err := load.Load([]byte(doc), load.Options{})
	if code != http.StatusOK || err != nil || study.SHA256 != sub.PackageSHA256 || sub.Status != service.StatusDone ||
		study.Package.Data.CSV != string(csv) {
		t.Errorf("the download: %d %v, hash %s (%s), want %s", code, err, sub.PackageSHA256, sub.Status,
			study.SHA256)
	}
	other := signedIn(t, base, mustKeyToken(t, db, "Office R", service.RoleSubmitter))
	if code, _ := other.get("/submissions/" + loc[1] + "/package.json"); code != http.StatusNotFound {
		t.Errorf("another submitter downloads the package: %d", code)
	}
}

// "New version" fills the form from an earlier version (sent through the
// API): the form sent back unchanged is the earlier package again, a new
// version of the same manuscript; the CSRF token is required.
func TestWeb_NewVersion(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	defer m.Close()
	base, token := m.URL(), mustKeyToken(t, db, "Office V", service.RoleEditor)
	api := apiClient{t, &base, token}
	first := mustSubmit(t, api, "application/json", readFile(t, tutoringDemo))
	w := signedIn(t, base, token)
	code, page := w.get("/submissions/new?from=" + first.ID)
	if code != http.StatusOK || !strings.Contains(page, "1. long_commute") ||
		!strings.Contains(page, "tutor_sessions -&gt; maths_anxiety") || !strings.Contains(page, "DEMO-2026-0141") {
		t.Fatalf("the form from the earlier version: %d %.3000s", code, page)
	}
	fields := formFields(t, page)
	code, _, page = w.postMultipart("/submissions/new", with(fields, "action", "preview"), "", nil)
	for _, want := range []string{"Carried over from the earlier version", "2 alternative graphs", "the target trial",
		"the scale of long_commute", "the standard errors of C1 and C2"} {
		if !strings.Contains(page, want) {
			t.Errorf("the preview lacks %q", want)
		}
	}
	code, hdr, page := w.postMultipart("/submissions/new", with(fields, "action", "screen"), "", nil)
	loc := locationRE.FindStringSubmatch(hdr.Get("Location"))
	if code != http.StatusSeeOther || loc == nil || loc[1] == first.ID {
		t.Fatalf("screen: %d %v %.2000s", code, hdr, page)
	}
	_, second := api.submission("/v1/submissions/" + loc[1])
	if second.PackageSHA256 != first.PackageSHA256 || second.ManuscriptID != "DEMO-2026-0141" {
		t.Errorf("the new version unchanged: hash %s, manuscript %s; the earlier %s", second.PackageSHA256,
			second.ManuscriptID, first.PackageSHA256)
	}
	if code, page := w.get("/"); code != http.StatusOK || !strings.Contains(page, "version 2 of 2") {
		t.Errorf("the dashboard does not list two versions: %d", code)
	}
	if code, _, _ := w.postMultipart("/submissions/new", with(fields[1:], "action", "preview"), "", nil); code !=
		http.StatusBadRequest {
		t.Errorf("the form without its CSRF token: %d", code)
	}
	other := signedIn(t, base, mustKeyToken(t, db, "Office W", service.RoleEditor))
	if code, page := other.get("/submissions/new?from=" + first.ID); code != http.StatusNotFound ||
		!strings.Contains(page, "Not found") {
		t.Errorf("another office's earlier version: %d", code)
	}
	if code, _, _ := api.call(http.MethodDelete, "/v1/submissions/"+first.ID, "", nil); code != http.StatusNoContent {
		t.Fatalf("delete: %d", code)
	}
	code, _, page = w.postMultipart("/submissions/new", with(fields, "action", "preview"), "", nil)
	if code != http.StatusNotFound || !strings.Contains(page, "no longer there") ||
		!strings.Contains(page, `value="Peer tutoring and maths anxiety`) || strings.Contains(page, `name="from"`) {
		t.Errorf("the form after its earlier version was deleted: %d %.500s", code, page)
	}
}
