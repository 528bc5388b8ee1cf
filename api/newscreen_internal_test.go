package api

import (
	"crypto/sha256"
	"encoding/base64"
	"encoding/json"
	"errors"
	"net/http"
	"net/http/httptest"
	"os"
	"reflect"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/render"
)

// noiseTable is testdata/tables/noise-pdf-wide.txt: invented figures as a
// PDF prints them (n = 812 in its note).
func noiseTable(t *testing.T) string {
	t.Helper()
	b, err := os.ReadFile("../testdata/tables/noise-pdf-wide.txt")
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

func formServer() *Server { return &Server{cfg: Config{Limits: load.DefaultLimits}} }

// noiseForm is a complete form on the noise table: its arrows by label
// and by name, in any case, and one claim.
func noiseForm(t *testing.T) *screenForm {
	return &screenForm{Title: "Noise and recall (invented)", ManuscriptID: "M-7", Design: "observational",
		MissingMethod: "complete_cases", Table: noiseTable(t),
		Arrows: "Noise exposure (dB) -> sleep_duration_h\n\n  SLEEP   duration (h) → Recall score\r\n" +
			"noise_exposure_db --> recall_score",
		Claims: []claimRow{{ID: "C1", Text: "Noise shortens sleep", Kind: "direct_effect",
			From: "noise exposure (db)", To: "Sleep_Duration_H", Estimate: "−.22", CILow: "-0.29", CIHigh: "−0,15",
			P: "p < .001", Headline: true}}}
}

func TestBuild_ArrowsByNameAndLabel(t *testing.T) {
	b := formServer().build(noiseForm(t), nil)
	defer b.close()
	if b.errs.any() {
		t.Fatalf("problems: %v", b.errs.by)
	}
	want := []checks.Edge{{From: "noise_exposure_db", To: "sleep_duration_h"},
		{From: "sleep_duration_h", To: "recall_score"}, {From: "noise_exposure_db", To: "recall_score"}}
	if !reflect.DeepEqual(b.pkg.Graph.Edges, want) || !slices.Equal(b.edgeLines, []int{1, 3, 4}) {
		t.Errorf("edges %v from lines %v, want %v from lines 1, 3, 4", b.pkg.Graph.Edges, b.edgeLines, want)
	}
	if b.n == nil || b.n.Title != "Noise and recall (invented)" || b.n.ManuscriptID != "M-7" {
		t.Fatalf("the API's checks did not accept the package: %+v", b.n)
	}
}

// A chain is one arrow after another; a name that is neither a name nor a
// label is reported on its line with the nearest name or label.
func TestBuild_ArrowProblems(t *testing.T) {
	f := noiseForm(t)
	f.Arrows = "noise_exposure_db -> sleep_duration_h -> recall_score\nnoise_exposure_bd -> recall_score\n" +
		"Sleep duration (hours) -> recall_score\nrecall_score sleep_duration_h\n-> recall_score"
	b := formServer().build(f, nil)
	defer b.close()
	want := []string{
		`line 2: "noise_exposure_bd" is neither a variable's name nor its label; did you mean "noise_exposure_db"?`,
		`line 3: "Sleep duration (hours)" is neither a variable's name nor its label; did you mean "Sleep duration (h)"?`,
		`line 4: no arrow in "recall_score sleep_duration_h"; write one arrow a line, cause first: noise -> sleep`,
		"line 5: nothing on one side of an arrow; write the cause, the arrow, then the effect",
	}
	if got := b.errs.by[fieldArrows]; !slices.Equal(got, want) {
		t.Errorf("arrow problems:\n%s\nwant\n%s", strings.Join(got, "\n"), strings.Join(want, "\n"))
	}
	if len(b.pkg.Graph.Edges) != 2 || !slices.Equal(b.edgeLines, []int{1, 1}) {
		t.Errorf("edges %v from lines %v", b.pkg.Graph.Edges, b.edgeLines)
	}
}

// Claim rows: numbers as people type them, p with its relation, a row left
// empty left out, an ID from the row's number, every figure optional.
func TestBuild_ClaimRows(t *testing.T) {
	f := noiseForm(t)
	f.Claims = append(f.Claims, claimRow{Kind: "direct_effect"}, claimRow{Text: "Sleep helps recall",
		Kind: "total_effect", From: "Sleep duration (h)", To: "recall score", Estimate: "0.41", P: "0.03"},
		claimRow{Text: "Noise predicts recall", Kind: "association", From: "noise_exposure_db", To: "recall_score",
			P: "> .05"})
	b := formServer().build(f, nil)
	defer b.close()
	if b.errs.any() {
		t.Fatalf("problems: %v", b.errs.by)
	}
	est, lo, hi, p1, p3, p4, e3 := -0.22, -0.29, -0.15, 0.001, 0.03, 0.05, 0.41
	want := []checks.Claim{
		{ID: "C1", Text: "Noise shortens sleep", Kind: "direct_effect", From: "noise_exposure_db",
			To: "sleep_duration_h", Estimate: &est, CI: []float64{lo, hi}, PValue: &p1, PRelation: "<", Headline: true},
		{ID: "C3", Text: "Sleep helps recall", Kind: "total_effect", From: "sleep_duration_h", To: "recall_score",
			Estimate: &e3, PValue: &p3},
		{ID: "C4", Text: "Noise predicts recall", Kind: "association", From: "noise_exposure_db",
			To: "recall_score", PValue: &p4, PRelation: ">"},
	}
	if !reflect.DeepEqual(b.pkg.Claims, want) || !slices.Equal(b.claimRows, []int{1, 3, 4}) {
		got, _ := json.Marshal(b.pkg.Claims)
		wb, _ := json.Marshal(want)
		t.Errorf("claims %s from rows %v\nwant %s from rows 1, 3, 4", got, b.claimRows, wb)
	}
}

// Raw rows: the variables and data section init --data would write, the
// CSV sent beside the package, and n refused.
func TestBuild_Rows(t *testing.T) {
	csv, err := os.ReadFile("../testdata/demo/sleep-attention/rows.csv")
	if err != nil {
		t.Fatal(err)
	}
	f := noiseForm(t)
	f.Table, f.Arrows, f.Rows = "", "part_time_job -> sleep_hours\nsleep_hours -> attention", &formRows{Data: csv}
	f.Claims = []claimRow{{Text: "Jobs cost sleep", Kind: "direct_effect", From: "part_time_job", To: "sleep_hours"}}
	b := formServer().build(f, nil)
	defer b.close()
	if b.errs.any() || b.n == nil || b.n.DataReader == nil || b.n.DataSize != int64(len(csv)) {
		t.Fatalf("problems %v, submission %+v", b.errs.by, b.n)
	}
	want := []checks.Variable{{Name: "part_time_job", Scale: "binary"}, {Name: "sleep_hours", Scale: "continuous"},
		{Name: "attention", Scale: "continuous"}}
	if !reflect.DeepEqual(b.pkg.Variables, want) || !slices.Equal(b.pkg.Data.IgnoreColumns, []string{"student"}) {
		t.Errorf("variables %+v, data %+v", b.pkg.Variables, b.pkg.Data)
	}
	f.N = "240"
	b2 := formServer().build(f, nil)
	defer b2.close()
	if !strings.Contains(strings.Join(b2.errs.by[fieldN], ""), "Leave n empty") {
		t.Errorf("n with raw rows: %v", b2.errs.by)
	}
}

// n from the field stands in for a table's missing note.
func TestBuild_NFromField(t *testing.T) {
	f := noiseForm(t)
	f.Table, f.N = strings.Replace(f.Table, "N = 812. ", "", 1), "1,204"
	b := formServer().build(f, nil)
	defer b.close()
	if b.errs.any() || b.pkg.Data.N != 1204 || !b.nFromField {
		t.Errorf("n %d (from the field: %v), problems %v", b.pkg.Data.N, b.nFromField, b.errs.by)
	}
}

var styleElemRE = regexp.MustCompile(`(?s)<style>(.*?)</style>`)

// The page's policy lets its two stylesheets through by their hashes and
// script from this server only: no inline script, no style attributes.
func TestScreeningPolicy_AllowsThePage(t *testing.T) {
	var b strings.Builder
	if err := render.WriteNewScreening(&b, render.NewScreening{Form: render.ScreenForm{Claims: []render.ClaimInput{{N: 1}}}}); err != nil {
		t.Fatal(err)
	}
	styles := styleElemRE.FindAllStringSubmatch(b.String(), -1)
	if len(styles) != 2 {
		t.Fatalf("%d style elements, want the shared one and the page's", len(styles))
	}
	for _, st := range styles {
		sum := sha256.Sum256([]byte(st[1]))
		src := "'sha256-" + base64.StdEncoding.EncodeToString(sum[:]) + "'"
		if !strings.Contains(screeningPolicy, src) {
			t.Errorf("the policy %q lacks the stylesheet's hash %s", screeningPolicy, src)
		}
	}
	for _, want := range []string{"default-src 'none'", "script-src 'self';", "form-action 'self'",
		"frame-ancestors 'none'"} {
		if !strings.Contains(screeningPolicy, want) {
			t.Errorf("the policy lacks %s", want)
		}
	}
	if strings.Contains(screeningPolicy, "unsafe") {
		t.Errorf("the policy allows something unsafe: %s", screeningPolicy)
	}
}

// A store that does not answer keeps the form: 503 with Retry-After,
// what was typed on the page, and a word that nothing was stored.
func TestKeepForm_Unavailable(t *testing.T) {
	s := formServer()
	e := echo.New()
	c := e.NewContext(httptest.NewRequest(http.MethodPost, "/submissions/new", nil), httptest.NewRecorder())
	c.Set(keyContext, &service.Key{ID: 1, OfficeID: 1, Role: service.RoleEditor, OfficeName: "Office K"})
	f := noiseForm(t)
	if err := s.keepForm(c, f, service.Errorf(service.EUnavailable, "database down")); err != nil {
		t.Fatal(err)
	}
	rr := c.Response().Writer.(*httptest.ResponseRecorder)
	body := rr.Body.String()
	if rr.Code != http.StatusServiceUnavailable || rr.Header().Get("Retry-After") == "" ||
		!strings.Contains(body, "database down. Nothing was stored") || !strings.Contains(body, `value="Noise and recall (invented)"`) {
		t.Errorf("%d %v %.300s", rr.Code, rr.Header(), body)
	}
	if err := s.keepForm(c, f, errors.New("a bug")); err == nil {
		t.Error("an internal error was shown in the form")
	}
}
