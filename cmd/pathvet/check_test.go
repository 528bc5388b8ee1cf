package main

import (
	"bytes"
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

func runCLI(args ...string) (code int, stdout, stderr string) {
	var o, e bytes.Buffer
	code = run(context.Background(), args, &o, &e)
	return code, o.String(), e.String()
}

func TestCheck_Demos(t *testing.T) {
	paths, _ := filepath.Glob("../../testdata/demo/*/package.json")
	if len(paths) < 2 {
		t.Fatalf("found %d demos", len(paths))
	}
	for _, p := range paths {
		code, out, errOut := runCLI("check", p)
		if code != exitOK || errOut != "" {
			t.Fatalf("%s: exit %d, stderr %q", p, code, errOut)
		}
		first := strings.SplitN(out, "\n", 2)[0]
		if !strings.HasPrefix(first, "pathvet screening report: ") || !strings.HasSuffix(first, " concern") ||
			!strings.Contains(out, "not a verdict") {
			t.Errorf("%s: text report starts %q", p, first)
		}
		for i, line := range strings.Split(out, "\n") {
			if n := len([]rune(line)); n > 100 && !strings.HasPrefix(line, "Package sha256") {
				t.Errorf("%s: line %d is %d columns wide", p, i+1, n)
			}
		}
		code, out, _ = runCLI("check", "--format", "json", p)
		var rep map[string]any
		if code != exitOK || json.Unmarshal([]byte(out), &rep) != nil || rep["format_version"] != 1.0 {
			t.Fatalf("%s: json report: exit %d", p, code)
		}
	}
}

// --allow-points-off N exits 1 when more than N points are taken off: the
// tutoring demo loses 75 (its golden report), so 74 is exceeded and 75 is
// not. The old --fail-under is refused with its new name, in every
// spelling a flag can have.
func TestCheck_AllowPointsOffAndOut(t *testing.T) {
	pkg := "../../testdata/demo/tutoring-anxiety/package.json" // 75 points taken off
	if code, _, _ := runCLI("check", "--allow-points-off", "74", pkg); code != exitConcern {
		t.Fatalf("--allow-points-off 74: exit %d, want %d", code, exitConcern)
	}
	if code, _, _ := runCLI("check", pkg, "--allow-points-off", "75"); code != exitOK {
		t.Fatalf("--allow-points-off 75, after the package: exit %d", code)
	}
	for _, args := range [][]string{{"--fail-under", "80", pkg}, {pkg, "-fail-under=80"}, {"--fail-under"}} {
		code, _, errOut := runCLI(append([]string{"check"}, args...)...)
		if code != exitInvalid || !strings.Contains(errOut, "--allow-points-off 20") {
			t.Errorf("%v: exit %d, stderr %q; want 2 and the new name", args, code, errOut)
		}
	}
	if code, _, errOut := runCLI("check", "--allow-points-off", "101", pkg); code != exitInvalid ||
		!strings.Contains(errOut, "from 0 to 100") {
		t.Errorf("--allow-points-off 101: exit %d, %q", code, errOut)
	}
	out := filepath.Join(t.TempDir(), "r.json")
	if code, stdout, _ := runCLI("check", "--format", "json", "--out", out, pkg); code != exitOK || stdout != "" {
		t.Fatalf("--out: exit %d, stdout %q", code, stdout)
	}
	if b, err := os.ReadFile(out); err != nil || !json.Valid(b) {
		t.Fatalf("--out file: %v", err)
	}
}

// The offline page is one self-contained file: inline style and SVG,
// nothing fetched.
func TestCheck_HTMLPage(t *testing.T) {
	out := filepath.Join(t.TempDir(), "report.html")
	pkg := "../../testdata/demo/coding-club/package.json"
	if code, _, errOut := runCLI("check", "--format", "html", "--out", out, pkg); code != exitOK {
		t.Fatalf("--format html: exit %d %q", code, errOut)
	}
	b, err := os.ReadFile(out)
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	for _, want := range []string{"<!DOCTYPE html>", "<style>", `<svg class="graph" id="declared-graph"`, `<table class="claims">`} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	for _, bad := range []string{"<link", "<script", "src=", "http://", "https://"} {
		if strings.Contains(page, bad) {
			t.Errorf("the page is not self-contained: it has %q", bad)
		}
	}
}

func TestCheck_Usage(t *testing.T) {
	for _, args := range [][]string{{}, {"check"}, {"check", "a.json", "b.json"}, {"check", "--format", "xml", "a.json"}, {"nope"}} {
		if code, _, _ := runCLI(args...); code != exitInvalid {
			t.Errorf("%v: exit %d, want %d", args, code, exitInvalid)
		}
	}
}

// Every bad input of the corpus: exit 2, and stderr names the place.
func TestCheck_BadInputs(t *testing.T) {
	b, err := os.ReadFile("../../testdata/bad/cases.json")
	if err != nil {
		t.Fatal(err)
	}
	var cases []struct{ File, Place string }
	if err := json.Unmarshal(b, &cases); err != nil {
		t.Fatal(err)
	}
	for _, tc := range cases {
		code, out, errOut := runCLI("check", "../../testdata/bad/"+tc.File)
		if code != exitInvalid || out != "" || !strings.Contains(errOut, tc.Place) {
			t.Errorf("%s: exit %d, stderr %q; want exit 2 naming %q", tc.File, code, errOut, tc.Place)
		}
	}
}

// A package file past the package limit is refused with its size and the
// limit, and read no further than the limit (a sparse file of 3 GiB
// reads in no time only because it is not read whole).
func TestCheck_OversizedFileRefusedUnread(t *testing.T) {
	path := filepath.Join(t.TempDir(), "package.json")
	f, err := os.Create(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := f.Truncate(3 << 30); err != nil {
		t.Fatal(err)
	}
	f.Close()
	code, _, errOut := runCLI("check", path)
	if code != exitInvalid || !strings.Contains(errOut, "is 3221225472 bytes; the limit is 5242880") {
		t.Fatalf("exit %d: %s", code, errOut)
	}
}
