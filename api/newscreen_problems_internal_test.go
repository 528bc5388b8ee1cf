package api

import (
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// Every problem is filed beside the field it came from: the form's own
// checks, and the loader's JSON pointers mapped back to the form's rows
// and lines.
func TestBuild_ProblemsBesideTheirFields(t *testing.T) {
	for _, tc := range []struct {
		name        string
		edit        func(*screenForm)
		field, want string
	}{
		{"no title", func(f *screenForm) { f.Title = " " }, fieldTitle, "The title is required"},
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
			fieldArrows, "line 6: the arrow repeats the arrow on line 3"},
		{"claim from unknown", func(f *screenForm) { f.Claims[0].From = "nois" }, "c1-from",
			`"nois" is neither a variable's name nor its label`},
		{"claim estimate", func(f *screenForm) { f.Claims[0].Estimate = "minus .2" }, "c1-estimate",
			`"minus .2" is not a number`},
		{"claim half interval", func(f *screenForm) { f.Claims[0].CIHigh = "" }, "c1-ci_high", msgHalfCI},
		{"claim p", func(f *screenForm) { f.Claims[0].P = "1.5" }, "c1-p", "1"},
		{"claim p words", func(f *screenForm) { f.Claims[0].P = "n.s." }, "c1-p", `"n.s." is not a p-value`},
		{"claim outside its interval", func(f *screenForm) { f.Claims[0].Estimate = "0.5" }, "c1-estimate",
			"lies outside its own interval"},
		{"claim twice", func(f *screenForm) { f.Claims = append(f.Claims, f.Claims[0]) }, "c2-id",
			`"C1" is already the id of claim 1`},
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
