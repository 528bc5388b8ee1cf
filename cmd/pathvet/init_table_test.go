package main

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

const tutoringDemo = "../../testdata/demo/tutoring-anxiety/package.json"

// printTable prints a summary package's data as a paper's Table 1: a
// title, a header, numbered rows labelled after the names, M and SD with
// two decimals, the lower triangle with leading dots, U+2212 minus signs,
// stars and an em-dash diagonal, and N in a note.
func printTable(t *testing.T, data map[string]any) string {
	t.Helper()
	names := strings.Fields(strings.Trim(fmt.Sprint(data["variables"]), "[]"))
	var b strings.Builder
	b.WriteString("Table 1\nMeans, standard deviations and correlations\n\nVariable            M       SD")
	for j := range names {
		fmt.Fprintf(&b, "      %d", j+1)
	}
	b.WriteString("\n")
	rows := data["correlations"].([]any)
	for i, name := range names {
		label := strings.ToUpper(name[:1]) + strings.ReplaceAll(name[1:], "_", " ")
		fmt.Fprintf(&b, "%-18s  %.2f   %.2f", fmt.Sprintf("%d. %s", i+1, label),
			data["means"].([]any)[i], data["sds"].([]any)[i])
		for j, r := range rows[i].([]any) {
			cell := "—"
			if j < i {
				x := r.(float64)
				cell = strings.Replace(strings.Replace(fmt.Sprintf("%.2f", x), "0.", ".", 1), "-", "−", 1) + "**"
			}
			fmt.Fprintf(&b, "  %-6s", cell)
		}
		b.WriteString("\n")
	}
	fmt.Fprintf(&b, "\nNote. N = %v. **p < .01.\n", data["n"])
	return b.String()
}

func readJSONFile(t *testing.T, path string) map[string]any {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var m map[string]any
	if err := json.Unmarshal(b, &m); err != nil {
		t.Fatal(err)
	}
	return m
}

// The tutoring-anxiety demo's matrix printed as a paper prints it, read
// back by init --summary and screened, gives the report of the
// hand-written demo. The test adds from the demo only what a table cannot
// carry: title, design, graph, alternatives, claims, missing data, target
// trial, and the variables' scales, reliabilities, exogeneity and labels.
func TestInit_TableRoundTrip(t *testing.T) {
	demo := readJSONFile(t, tutoringDemo)
	dir := t.TempDir()
	tablePath, pkgPath := filepath.Join(dir, "table1.txt"), filepath.Join(dir, "package.json")
	text := printTable(t, demo["data"].(map[string]any))
	if err := os.WriteFile(tablePath, []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	if code, _, errs := runCLI("init", "--summary", tablePath, "--out", pkgPath); code != exitOK {
		t.Fatalf("init: %d %s\n%s", code, errs, text)
	}
	started := readJSONFile(t, pkgPath)
	if !reflect.DeepEqual(started["data"], demo["data"]) {
		t.Fatalf("data read from the table:\n%v\nwant the demo's:\n%v\ntable:\n%s",
			started["data"], demo["data"], text)
	}
	merged := withDemoParts(t, started, demo)
	b, _ := json.Marshal(merged)
	if err := os.WriteFile(pkgPath, b, 0o644); err != nil {
		t.Fatal(err)
	}
	got, want := jsonReport(t, pkgPath), jsonReport(t, tutoringDemo)
	if !reflect.DeepEqual(got, want) {
		gb, _ := json.MarshalIndent(got, "", " ")
		wb, _ := json.MarshalIndent(want, "", " ")
		t.Errorf("report from the table differs from the demo's:\n%s\nwant\n%s", gb, wb)
	}
}

// withDemoParts fills a started package with what the table cannot carry,
// from the demo; the data section and the variables' names stay as init
// wrote them.
func withDemoParts(t *testing.T, started, demo map[string]any) map[string]any {
	t.Helper()
	for _, k := range []string{"title", "manuscript_id", "design", "graph", "alternatives", "claims", "missing_data",
		"target_trial"} {
		started[k] = demo[k]
	}
	vars, demoVars := started["variables"].([]any), demo["variables"].([]any)
	if len(vars) != len(demoVars) {
		t.Fatalf("%d variables; the demo has %d", len(vars), len(demoVars))
	}
	for i, v := range vars {
		v, d := v.(map[string]any), demoVars[i].(map[string]any)
		if v["name"] != d["name"] {
			t.Fatalf("variable %d is named %v; the demo's is %v", i, v["name"], d["name"])
		}
		vars[i] = d
	}
	return started
}

// jsonReport screens a package and returns its JSON report without the
// time it was made.
func jsonReport(t *testing.T, pkg string) map[string]any {
	t.Helper()
	code, out, errs := runCLI("check", "--format", "json", pkg)
	if code != exitOK {
		t.Fatalf("check %s: %d %s", pkg, code, errs)
	}
	var rep map[string]any
	if err := json.Unmarshal([]byte(out), &rep); err != nil {
		t.Fatal(err)
	}
	delete(rep, "generated_at")
	return rep
}
