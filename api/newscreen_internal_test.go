package api

import (
	"encoding/json"
	"os"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
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

// Every problem is filed beside the field it came from: the form's own
// checks, and the loader's JSON pointers mapped back to the form's rows
// and lines.
func TestBuild_ProblemsBesideTheirFields(t *testing.T) {
	for _, tc := range []struct {
		name        string
		edit        func(*screenForm)
		field, want string
	}{
		{"no title", func(f *screenForm) { f.Title = " " }, fieldTitle, "is required"},
		{"no design", func(f *screenForm) { f.Design = "" }, fieldDesign, "is required"},
		{"bad cell", func(f *screenForm) { f.Table = strings.Replace(f.Table, ".41***", "x", 1) },
			fieldTable, `line 6, cell 5 ("x")`},
		{"no n", func(f *screenForm) { f.Table = strings.Replace(f.Table, "N = 812. ", "", 1) }, fieldN,
			msgNoN},
		{"n disagrees", func(f *screenForm) { f.N = "800" }, fieldN, "The table's note says N = 812"},
		{"n not a number", func(f *screenForm) { f.N = "812a" }, fieldN, `"812a" is not`},
		{"no data", func(f *screenForm) { f.Table = "" }, fieldTable, msgNoData},
		{"both data", func(f *screenForm) { f.Rows = &formRows{Data: []byte("a,b\n1,2\n")} }, fieldTable,
			msgBothData},
		{"cycle", func(f *screenForm) { f.Arrows += "\nrecall_score -> noise_exposure_db" }, fieldArrows,
			"has a cycle"},
		{"an arrow twice", func(f *screenForm) { f.Arrows += "\nrecall score <- x\nSleep duration (h) -> recall_score" },
			fieldArrows, "line 6: "},
		{"claim from unknown", func(f *screenForm) { f.Claims[0].From = "nois" }, "c1-from",
			`"nois" is neither a variable's name nor its label`},
		{"claim estimate", func(f *screenForm) { f.Claims[0].Estimate = "minus .2" }, "c1-estimate",
			`"minus .2" is not a number`},
		{"claim half interval", func(f *screenForm) { f.Claims[0].CIHigh = "" }, "c1-ci_high", msgHalfCI},
		{"claim p", func(f *screenForm) { f.Claims[0].P = "1.5" }, "c1-p", "1"},
		{"claim p words", func(f *screenForm) { f.Claims[0].P = "n.s." }, "c1-p", `"n.s." is not a p-value`},
		{"claim outside its interval", func(f *screenForm) { f.Claims[0].Estimate = "0.5" }, "c1-estimate",
			"lies outside its own interval"},
		{"claim twice", func(f *screenForm) { f.Claims = append(f.Claims, f.Claims[0]) }, "c2-id", "C1"},
		{"claim without kind", func(f *screenForm) { f.Claims[0].Kind = "" }, "c1-kind", ""},
		{"no claims", func(f *screenForm) { f.Claims = []claimRow{{Kind: "direct_effect"}} }, fieldClaims, ""},
		{"missing method", func(f *screenForm) { f.MissingMethod = "guessing" }, fieldMissing, "must be one of"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			f := noiseForm(t)
			tc.edit(f)
			b := formServer().build(f, nil)
			defer b.close()
			got := strings.Join(b.errs.by[tc.field], " | ")
			if got == "" || !strings.Contains(got, tc.want) {
				t.Errorf("%s: %q, want %q; all: %v", tc.field, got, tc.want, b.errs.by)
			}
			if b.n != nil && tc.field != fieldN && tc.field != fieldArrows && !strings.HasPrefix(tc.field, "c1-") {
				t.Errorf("the API's checks accepted a package with this problem")
			}
		})
	}
}

// The loader's pointers and CSV places lead to the form's fields: an edge
// to its line of the arrows box, a claim to its row (rows left empty are
// not counted in the package), a CSV cell to the raw rows.
func TestPlace_Pointers(t *testing.T) {
	b := &built{errs: newFieldErrors(), edgeLines: []int{1, 4}, claimRows: []int{2, 5}, rows: nil}
	for ptr, want := range map[string]string{
		"/title": fieldTitle + ": d", "/manuscript_id": fieldMS + ": d", "/design": fieldDesign + ": d",
		"/missing_data/method": fieldMissing + ": d", "/graph/edges/1/to": fieldArrows + ": line 4: d",
		"/graph/edges": fieldArrows + ": d", "/claims": fieldClaims + ": d", "/claims/1/from": "c5-from: d",
		"/claims/0/ci": "c2-ci_low: d", "/claims/0/ci/1": "c2-ci_high: d", "/claims/1/p_relation": "c5-p: d",
		"/claims/0": "c2: d", "/claims/1/std_error": "c5: d (at /claims/1/std_error in the package)",
		"/data/correlations":           fieldTable + ": d (at /data/correlations in the package)",
		"/alternatives/0/edges/0/from": fieldForm + ": d (at /alternatives/0/edges/0/from in the package)",
	} {
		f, m := b.place(checks.Problem{Pointer: ptr, Detail: "d"})
		if got := f + ": " + m; got != want {
			t.Errorf("%s: %q, want %q", ptr, got, want)
		}
	}
	b.earlier = true
	if _, m := b.place(checks.Problem{Pointer: "/target_trial/population", Detail: "d"}); !strings.Contains(m,
		"carried over from the earlier version") {
		t.Errorf("a carried part: %q", m)
	}
	if f, m := b.place(checks.Problem{Line: 5, Column: 3, Detail: "d"}); f != fieldRows ||
		m != "data line 5, column 3: d" {
		t.Errorf("a CSV cell: %s %q", f, m)
	}
}

// The summary lists the problems in the order of the form, whatever the
// order they were found in.
func TestFieldErrors_Summary(t *testing.T) {
	e := newFieldErrors()
	for _, f := range []string{"c2-p", fieldArrows, "c10-id", fieldTitle, "c2", fieldForm, "c2-id"} {
		e.add(f, "x")
	}
	var got []string
	for _, p := range e.summary() {
		got = append(got, p.Label)
	}
	want := []string{"The package", "Working title", "Arrows", "Claim 2", "Claim 2, ID", "Claim 2, p-value",
		"Claim 10, ID"}
	if !slices.Equal(got, want) {
		t.Errorf("summary %v, want %v", got, want)
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

// A new version filled from an earlier one and screened unchanged is the
// earlier package again: the table printed from its figures reads back
// to them, and what the form has no field for is carried over.
func TestNewVersion_Unchanged(t *testing.T) {
	for _, dir := range []string{"tutoring-anxiety", "sleep-attention", "coding-club"} {
		t.Run(dir, func(t *testing.T) {
			e := demoEarlier(t, dir)
			f := formFromPackage(e)
			b := formServer().build(f, e)
			defer b.close()
			if b.errs.any() || b.n == nil {
				t.Fatalf("problems: %v", b.errs.summary())
			}
			want, err := load.Load(demoDoc(t, dir), load.Options{CSV: e.rows})
			if err != nil {
				t.Fatal(err)
			}
			if b.n.PackageSHA256 != want.SHA256 {
				got, _ := json.MarshalIndent(b.pkg, "", " ")
				t.Errorf("hash %s, want the demo's %s; package:\n%s\nform table:\n%s", b.n.PackageSHA256,
					want.SHA256, got, f.Table)
			}
		})
	}
}

func demoDoc(t *testing.T, dir string) []byte {
	b, err := os.ReadFile("../testdata/demo/" + dir + "/package.json")
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// demoEarlier is a demo as an earlier version: its rows, when it has
// them, as the data part the API stored.
func demoEarlier(t *testing.T, dir string) *earlierVersion {
	var p checks.Package
	if err := json.Unmarshal(demoDoc(t, dir), &p); err != nil {
		t.Fatal(err)
	}
	e := &earlierVersion{sub: &service.Submission{ID: "00000000-0000-0000-0000-000000000001"}, pkg: &p}
	if p.Data.File != "" {
		rows, err := os.ReadFile("../testdata/demo/" + dir + "/" + p.Data.File)
		if err != nil {
			t.Fatal(err)
		}
		e.rows, p.Data.File = rows, ""
	}
	return e
}
