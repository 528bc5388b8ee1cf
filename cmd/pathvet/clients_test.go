package main

import (
	"encoding/json"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/store/storetest"
)

// The operator and client commands, as a user runs them, against a real
// PostgreSQL and a server on port 0.
func TestCommands_KeysSubmitReport(t *testing.T) {
	_, url := storetest.MustOpenDB(t)
	code, out, errOut := runCLI("migrate", "status", "--database-url", url)
	if code != exitOK || !strings.Contains(out, "00001_init.sql") || !strings.Contains(out, "applied") {
		t.Fatalf("migrate status: %d %q %q", code, out, errOut)
	}
	code, out, errOut = runCLI("keys", "create", "--database-url", url, "--office", "Review board", "--role", "editor")
	token := strings.TrimSuffix(out, "\n")
	if code != exitOK || !strings.HasPrefix(token, "pv_") || strings.Contains(token, "\n") || errOut != "" {
		t.Fatalf("keys create: %d %q %q", code, out, errOut)
	}
	if code, _, _ := runCLI("keys", "create", "--database-url", url, "--office", "x", "--role", "admin"); code != exitInvalid {
		t.Fatalf("bad role: exit %d", code)
	}
	m := startMain(t, url)
	defer m.Close()
	old := getenv
	getenv = func(k string) string {
		if k == "PATHVET_TOKEN" {
			return token
		}
		return ""
	}
	defer func() { getenv = old }()

	code, out, errOut = runCLI("submit", "--server", m.URL(), "--wait", "../../testdata/demo/coding-club/package.json")
	if code != exitOK || !strings.HasPrefix(out, "Score ") || !strings.Contains(errOut, "submitted ") {
		t.Fatalf("submit --wait: %d %q %q", code, out, errOut)
	}
	id := strings.Fields(strings.TrimPrefix(errOut, "submitted "))[0]
	id = strings.TrimSuffix(id, ";")
	code, out, _ = runCLI("report", "--server", m.URL(), "--format", "json", id)
	var rep map[string]any
	if code != exitOK || json.Unmarshal([]byte(out), &rep) != nil || rep["band"] == nil {
		t.Fatalf("report: %d %.200q", code, out)
	}
	code, out, _ = runCLI("report", "--server", m.URL(), "--letter", id)
	if code != exitOK || !strings.HasPrefix(out, "# Questions for the authors") || !strings.Contains(out, "1. ") ||
		!strings.Contains(out, rep["package_sha256"].(string)) {
		t.Fatalf("report --letter: %d %.300q", code, out)
	}
	code, _, errOut = runCLI("submit", "--server", m.URL(), "../../testdata/bad/cycle.json")
	if code != exitInvalid || !strings.Contains(errOut, "/graph/edges: has a cycle") {
		t.Fatalf("invalid package: %d %q", code, errOut)
	}
	if code, _, _ := runCLI("report", "--server", m.URL(), "00000000-0000-0000-0000-000000000000"); code != exitInternal {
		t.Fatalf("unknown id: exit %d", code)
	}
}
