package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"
)

// rowsCSV is invented: a club membership, study hours with one empty
// cell, a 1–5 rating, a score with the code −99 in two rows, a grade with
// "." for missing, and an id column of text.
func rowsCSV() string {
	var b strings.Builder
	b.WriteString("id,club,hours,rating,score,grade\n")
	for i := range 40 {
		score, grade := fmt.Sprint(50+(i*7)%23), fmt.Sprint(1+i%3)
		if i == 5 || i == 17 {
			score = "-99"
		}
		if i == 9 {
			grade = "."
		}
		hours := fmt.Sprintf("%.1f", 2+float64((i*3)%17)/4)
		if i == 3 {
			hours = ""
		}
		fmt.Fprintf(&b, "P%d,%d,%s,%d,%s,%s\n", i, i%2, hours, 1+(i*2)%5, score, grade)
	}
	return b.String()
}

// From a CSV to a first report in three commands: init, fill in, check.
func TestInit_Rows(t *testing.T) {
	dir := t.TempDir()
	data, pkg := filepath.Join(dir, "rows.csv"), filepath.Join(dir, "package.json")
	if err := os.WriteFile(data, []byte(rowsCSV()), 0o644); err != nil {
		t.Fatal(err)
	}
	code, out, errs := runCLI("init", "--data", data, "--out", pkg)
	if code != exitOK {
		t.Fatalf("init: %d %s", code, errs)
	}
	for _, want := range []string{"club                 binary", "rating               ordinal", "hours                continuous",
		"-99 in score, 2 rows: looks like a missing code", `"." in grade, 1 row:`, "id                   skipped",
		"Next: pathvet check " + pkg} {
		if !strings.Contains(out, want) {
			t.Errorf("notes lack %q:\n%s", want, out)
		}
	}
	var p map[string]any
	b, _ := os.ReadFile(pkg)
	if err := json.Unmarshal(b, &p); err != nil {
		t.Fatal(err)
	}
	d := p["data"].(map[string]any)
	if fmt.Sprint(d["missing_codes"]) != "[-99 .]" || fmt.Sprint(d["ignore_columns"]) != "[id]" ||
		d["file"] != "rows.csv" {
		t.Errorf("data section %v", d)
	}
	code, _, errs = runCLI("check", pkg)
	want := []string{"/title: is still to be filled in", "/design: is still to be filled in",
		"/missing_data/method: is still to be filled in", "/claims: has no claims yet"}
	for _, w := range want {
		if code != exitInvalid || !strings.Contains(errs, w) {
			t.Errorf("check of the starting package: %d, want %q in\n%s", code, w, errs)
		}
	}
	if n := strings.Count(strings.TrimSpace(errs), "\n") + 1; n != len(want) {
		t.Errorf("check lists %d problems, want exactly %d:\n%s", n, len(want), errs)
	}
	fillIn(t, pkg, p)
	if code, out, errs := runCLI("check", pkg); code != exitOK || !strings.Contains(out, "score") {
		t.Errorf("check of the filled-in package: %d\n%s\n%s", code, out, errs)
	}
}

// fillIn does what an author does with the notes: replaces the
// placeholders and adds an edge and a claim.
func fillIn(t *testing.T, path string, p map[string]any) {
	t.Helper()
	p["title"], p["design"] = "Club and study hours (invented)", "observational"
	p["missing_data"] = map[string]any{"method": "complete_cases"}
	p["graph"] = map[string]any{"edges": []any{map[string]any{"from": "club", "to": "hours"}}}
	p["claims"] = []any{map[string]any{"id": "C1", "text": "the club raises study hours", "kind": "direct_effect",
		"from": "club", "to": "hours", "headline": true}}
	b, _ := json.Marshal(p)
	if err := os.WriteFile(path, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

func TestInit_Summary(t *testing.T) {
	dir := t.TempDir()
	table, pkg := filepath.Join(dir, "table.csv"), filepath.Join(dir, "p.json")
	os.WriteFile(table, []byte("noise,sleep,recall\n1,,\n-0.22,1,\n-0.14,0.41,1\n"), 0o644)
	if code, _, errs := runCLI("init", "--summary", table, "--out", pkg); code != exitOK {
		t.Fatalf("init: %d %s", code, errs)
	}
	code, _, errs := runCLI("check", pkg)
	if code != exitInvalid || !strings.Contains(errs, "/data/n: is still to be filled in (the sample size)") ||
		strings.Contains(errs, "/data/correlations") {
		t.Errorf("check: %d\n%s", code, errs)
	}
	if _, err := os.Stat(filepath.Join(dir, "p.notes.txt")); err != nil {
		t.Error(err)
	}
	if code, _, errs := runCLI("init", "--summary", table, "--out", pkg); code != exitInvalid ||
		!strings.Contains(errs, "--force") {
		t.Errorf("second init overwrote: %d %s", code, errs)
	}
	// The bare form (a header of names, the matrix by rows) is read as
	// before; a bad cell is named by its line and cell.
	for text, want := range map[string]string{
		"a,b,c\n1\n0.2,1\n0.1,0.3,1\n":             "",
		"a,b,c\n1,0.2,0.1\n0.2,1,0.3\n0.1,0.3,1\n": "",
		"a,b,c\n1,0.2,0.1\n0.25,1,0.3\n0.1,0.3,1\n": `line 3, cell 1 ("0.25"): the correlation of b and a is 0.25, ` +
			"but line 2, cell 2 is 0.2: the matrix is not symmetric",
		"a,b,c\n1\n0.2,x\n0.1,0.3,1\n": `line 3, cell 2 ("x"): expected the diagonal of b: —, 1, nothing, or a ` +
			"reliability",
		"a,b\n1\n": "table: found 1 row of numbers; a correlation table has at least two variables",
	} {
		os.WriteFile(table, []byte(text), 0o644)
		code, _, errs := runCLI("init", "--summary", table, "--out", pkg, "--force")
		if want == "" && code != exitOK || want != "" && (code != exitInvalid || !strings.Contains(errs, want)) {
			t.Errorf("%q: %d %s", text, code, errs)
		}
	}
}

// A paper's Table 1 as copied from a PDF: init writes n, means, SDs and
// the labels, and the notes list what the reader guessed and the marks it
// stripped; check then asks only for what a table cannot give.
func TestInit_SummaryTable(t *testing.T) {
	dir := t.TempDir()
	pkg := filepath.Join(dir, "p.json")
	code, out, errs := runCLI("init", "--summary", "../../testdata/tables/noise-pdf-wide.txt", "--out", pkg)
	if code != exitOK {
		t.Fatalf("init: %d %s", code, errs)
	}
	for _, want := range []string{"noise_exposure_db        Noise exposure (dB)",
		"Read from the table: the correlations, means, SDs, n = 812.",
		"  - columns set apart by runs of two or more spaces", "  - line 1 skipped as the table's title: \"Table 1\"",
		`  - M read from the column headed "M" (cell 2 of line 3)`, "  - n = 812, from line 7",
		`  - significance marks stripped from the figures: "*" once, "**" once, "***" once`} {
		if !strings.Contains(out, want) {
			t.Errorf("notes lack %q:\n%s", want, out)
		}
	}
	p := readJSONFile(t, pkg)
	d := p["data"].(map[string]any)
	v0 := p["variables"].([]any)[0].(map[string]any)
	if d["n"] != 812.0 || fmt.Sprint(d["means"]) != "[59.3 7.4 52]" || fmt.Sprint(d["sds"]) != "[6.1 0.9 11]" ||
		fmt.Sprint(d["correlations"]) != "[[1] [-0.22 1] [-0.14 0.41 1]]" || v0["label"] != "Noise exposure (dB)" {
		t.Errorf("package: %v", p)
	}
	code, _, errs = runCLI("check", pkg)
	want := []string{"/title: is still to be filled in", "/design: is still to be filled in",
		"/claims: has no claims yet"}
	for _, w := range want {
		if code != exitInvalid || !strings.Contains(errs, w) {
			t.Errorf("check: %d, want %q in\n%s", code, w, errs)
		}
	}
	if n := strings.Count(strings.TrimSpace(errs), "\n") + 1; n != len(want) {
		t.Errorf("check lists %d problems, want exactly %d:\n%s", n, len(want), errs)
	}
}

// Reliabilities printed on the diagonal go to the variables that have one.
func TestInit_SummaryReliabilities(t *testing.T) {
	pkg := filepath.Join(t.TempDir(), "p.json")
	code, out, errs := runCLI("init", "--summary", "../../testdata/tables/garden-reliabilities-wide.txt", "--out", pkg)
	if code != exitOK || !strings.Contains(out, "reliabilities (written to the variables that have one)") {
		t.Fatalf("%d %s\n%s", code, errs, out)
	}
	var rel []any
	for _, v := range readJSONFile(t, pkg)["variables"].([]any) {
		rel = append(rel, v.(map[string]any)["reliability"])
	}
	if fmt.Sprint(rel) != "[0.81 0.77 0.79 0.9 <nil>]" { // as printed: (.81) (.77) (.79) (.90) —
		t.Errorf("reliabilities %v", rel)
	}
}

// A table without n, means or SDs: the notes say what to add.
func TestInit_SummaryTableWithoutDescriptives(t *testing.T) {
	pkg := filepath.Join(t.TempDir(), "p.json")
	code, out, _ := runCLI("init", "--summary", "../../testdata/tables/garden-csv-full.txt", "--out", pkg)
	if code != exitOK || !strings.Contains(out, "Read from the table: the correlations only.") ||
		!strings.Contains(out, "The table gives no sample size: fill in data.n.") ||
		!strings.Contains(out, `Add "sds" and "means" to data`) {
		t.Errorf("%d\n%s", code, out)
	}
	d := readJSONFile(t, pkg)["data"].(map[string]any)
	if _, ok := d["sds"]; ok || d["n"] != "TODO: the sample size" {
		t.Errorf("data %v", d)
	}
}

func TestInit_Usage(t *testing.T) {
	if code, out, _ := runCLI("init", "--help"); code != exitOK || !strings.Contains(out, "--summary") {
		t.Errorf("--help: %d %q", code, out)
	}
	for _, args := range [][]string{{"init"}, {"init", "--data", "a.csv", "--summary", "b.csv"}, {"init", "--data", "missing.csv"}} {
		if code, _, _ := runCLI(args...); code != exitInvalid {
			t.Errorf("%v: exit %d", args, code)
		}
	}
}

// The template names every part of a package, and check on it lists
// nothing but what is still to be filled in.
func TestTemplate_OnlyPlaceholders(t *testing.T) {
	code, _, errs := runCLI("check", "../../testdata/template/package.json")
	lines := strings.Split(strings.TrimSpace(errs), "\n")
	if code != exitInvalid || len(lines) < 10 {
		t.Fatalf("%d %s", code, errs)
	}
	if i := slices.IndexFunc(lines, func(l string) bool { return !strings.Contains(l, "is still to be filled in") }); i >= 0 {
		t.Errorf("not a placeholder: %s", lines[i])
	}
}
