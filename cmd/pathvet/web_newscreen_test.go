package main

import (
	"context"
	"encoding/json"
	"net/http"
	"os"
	"path/filepath"
	"reflect"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

var (
	keyRE      = regexp.MustCompile(`name="idempotency_key" value="([^"]+)"`)
	locationRE = regexp.MustCompile(`^/submissions/([0-9a-f-]{36})$`)
)

// tutoringForm is the new-screening form for the tutoring demo's Table 1
// (printTable): the arrows by label and by name, in any case; two claims,
// one by labels.
func tutoringForm(csrf, key, table string) []field {
	return []field{{"_csrf", csrf}, {"idempotency_key", key}, {"title", "Tutoring from Table 1 (invented)"},
		{"manuscript_id", "WEB-2026-1"}, {"design", "observational"}, {"missing_method", "none"},
		{"table", table}, {"n", ""},
		{"arrows", "Long commute -> tutor_sessions\nlong commute → Maths anxiety\nlong_commute -> maths_score\n" +
			"TUTOR SESSIONS -> maths anxiety -> maths score\ntutor_sessions -> Maths score"},
		{"claim_id", "C1"}, {"claim_text", "Tutoring reduces maths anxiety"}, {"claim_kind", "direct_effect"},
		{"claim_from", "Tutor sessions"}, {"claim_to", "maths_anxiety"}, {"claim_estimate", "−.29"},
		{"claim_ci_low", "-0.36"}, {"claim_ci_high", "-0.22"}, {"claim_p", "p < .001"}, {"claim_headline", "1"},
		{"claim_id", ""}, {"claim_text", "Long commutes go with fewer sessions"}, {"claim_kind", "association"},
		{"claim_from", "long_commute"}, {"claim_to", "Tutor sessions"}, {"claim_estimate", "-0.18"},
		{"claim_ci_low", ""}, {"claim_ci_high", ""}, {"claim_p", "0.001"}}
}

// tutoringByHand is what the form says, written into the package init
// --summary started from the same table.
func tutoringByHand(t *testing.T, started map[string]any) []byte {
	started["title"], started["manuscript_id"], started["design"] = "Tutoring from Table 1 (invented)",
		"WEB-2026-1", "observational"
	started["missing_data"] = map[string]any{"method": "none"}
	var edges []any
	for _, e := range [][2]string{{"long_commute", "tutor_sessions"}, {"long_commute", "maths_anxiety"},
		{"long_commute", "maths_score"}, {"tutor_sessions", "maths_anxiety"}, {"maths_anxiety", "maths_score"},
		{"tutor_sessions", "maths_score"}} {
		edges = append(edges, map[string]any{"from": e[0], "to": e[1]})
	}
	started["graph"] = map[string]any{"edges": edges}
	started["claims"] = []any{
		map[string]any{"id": "C1", "text": "Tutoring reduces maths anxiety", "kind": "direct_effect",
			"from": "tutor_sessions", "to": "maths_anxiety", "estimate": -0.29, "ci": []any{-0.36, -0.22},
			"p_value": 0.001, "p_relation": "<", "headline": true},
		map[string]any{"id": "C2", "text": "Long commutes go with fewer sessions", "kind": "association",
			"from": "long_commute", "to": "tutor_sessions", "estimate": -0.18, "p_value": 0.001},
	}
	b, _ := json.Marshal(started)
	return b
}

func decodePackage(t *testing.T, doc []byte) checks.Package {
	t.Helper()
	var p checks.Package
	if err := json.Unmarshal(doc, &p); err != nil {
		t.Fatalf("%v in %s", err, doc)
	}
	return p
}

// The tutoring demo's Table 1 pasted into the page gives the package that
// init --summary gives from the same text, filled in with what the form
// says; Screen stores it (its hash is that package's) and queues it, and
// a second press gives the same submission.
func TestWeb_NewScreeningFromTable(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMain(t, dburl)
	defer m.Close()
	base, token := m.URL(), mustKeyToken(t, db, "Office N", service.RoleEditor)
	w := signedIn(t, base, token)
	code, page := w.get("/submissions/new")
	if code != http.StatusOK || keyRE.FindStringSubmatch(page) == nil {
		t.Fatalf("the form: %d %.300s", code, page)
	}
	csrf, key := csrfRE.FindStringSubmatch(page)[1], keyRE.FindStringSubmatch(page)[1]
	text := printTable(t, readJSONFile(t, tutoringDemo)["data"].(map[string]any))
	dir := t.TempDir()
	tablePath, pkgPath := filepath.Join(dir, "table1.txt"), filepath.Join(dir, "package.json")
	os.WriteFile(tablePath, []byte(text), 0o644)
	if code, _, errs := runCLI("init", "--summary", tablePath, "--out", pkgPath); code != exitOK {
		t.Fatalf("init: %s", errs)
	}
	byHand := tutoringByHand(t, readJSONFile(t, pkgPath))

	form := tutoringForm(csrf, key, text)
	code, _, page = w.postMultipart("/submissions/new", with(form, "action", "preview"), "", nil)
	if code != http.StatusOK || !strings.Contains(page, "Ready to screen") {
		t.Fatalf("preview: %d %.2000s", code, page)
	}
	got, want := decodePackage(t, previewPackage(t, page)), decodePackage(t, byHand)
	if !reflect.DeepEqual(got, want) {
		gb, _ := json.Marshal(got)
		wb, _ := json.Marshal(want)
		t.Errorf("the page's package:\n%s\ninit --summary's, filled in:\n%s", gb, wb)
	}
	for _, want := range []string{"maths_anxiety", "Maths anxiety", "2.9", "11.5", "lower triangle"} {
		if !strings.Contains(page, want) {
			t.Errorf("the preview lacks %q", want)
		}
	}
	checkScreenOnce(t, m, db, w, form, byHand, token)
}

// checkScreenOnce presses Screen twice (one submission, the same page),
// then once more with the figures changed under the same key (refused,
// the form sent back with a new key).
func checkScreenOnce(t *testing.T, m *Main, db *store.DB, w *webClient, form []field, byHand []byte, token string) {
	code, hdr, page := w.postMultipart("/submissions/new", with(form, "action", "screen"), "", nil)
	loc := locationRE.FindStringSubmatch(hdr.Get("Location"))
	if code != http.StatusSeeOther || loc == nil {
		t.Fatalf("screen: %d %v %.1000s", code, hdr, page)
	}
	if code, hdr, _ := w.postMultipart("/submissions/new", with(form, "action", "screen"), "", nil); code !=
		http.StatusSeeOther || hdr.Get("Location") != loc[0] {
		t.Errorf("a second press: %d %s, want 303 to %s", code, hdr.Get("Location"), loc[0])
	}
	base := m.URL()
	api := apiClient{t, &base, token}
	_, sub := api.submission("/v1/submissions/" + loc[1] + "?wait=30s")
	study, err := load.Load(byHand, load.Options{})
	if err != nil || sub.PackageSHA256 != study.SHA256 || sub.Status != service.StatusDone {
		t.Errorf("stored hash %s (%s), want init's %s (%v)", sub.PackageSHA256, sub.Status, study.SHA256, err)
	}
	var n int
	db.Pool.QueryRow(context.Background(), `SELECT count(*) FROM submissions`).Scan(&n)
	if n != 1 {
		t.Errorf("%d submissions after two presses, want 1", n)
	}
	code, _, page = w.postMultipart("/submissions/new", with(form, "action", "screen", "title", "Changed"), "", nil)
	if k := keyRE.FindStringSubmatch(page); code != http.StatusConflict || k == nil || k[1] == form[1].value ||
		!strings.Contains(page, "screened before") || !strings.Contains(page, `value="Changed"`) {
		t.Errorf("a changed form under the same key: %d %.500s", code, page)
	}
	code, page = w.get("/submissions/" + loc[1])
	if code != http.StatusOK || !strings.Contains(page, `table class="claims`) ||
		!strings.Contains(page, "/submissions/"+loc[1]+"/package.json") {
		t.Errorf("the submission's page: %d", code)
	}
}
