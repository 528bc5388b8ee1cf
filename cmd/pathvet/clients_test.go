package main

import (
	"encoding/json"
	"strings"
	"testing"
	"time"

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
	if code, _, errOut := runCLI("keys", "create", "--database-url", url, "--office", "Review board", "--role", "editor",
		"--label", "R. Editor"); code != exitInvalid ||
		!strings.Contains(errOut, "no office named") {
		t.Fatalf("keys create for an unknown office: %d %q", code, errOut)
	}
	if code, out, errOut := runCLI("offices", "create", "--database-url", url, "Review board"); code != exitOK ||
		!strings.HasSuffix(out, " Review board\n") {
		t.Fatalf("offices create: %d %q %q", code, out, errOut)
	}
	if code, _, _ := runCLI("offices", "create", "--database-url", url, "Review board"); code != exitInvalid {
		t.Fatalf("offices create twice: %d", code)
	}
	code, out, errOut = runCLI("keys", "create", "--database-url", url, "--office", "Review board", "--role", "editor",
		"--label", "R. Editor")
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
	if code != exitOK || !strings.HasPrefix(out, "pathvet screening report: ") ||
		!strings.Contains(errOut, "submitted ") {
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
	if code != exitOK || !strings.HasPrefix(out, "Dear authors,") || !strings.Contains(out, "1. ") ||
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
	checkKeysList(t, url, token)
	// The server's key cache hears of the revocation within milliseconds
	// (README, Configuration: the key cache's bound); until then the key
	// may pass.
	for i := 0; ; i++ {
		code, _, errOut := runCLI("report", "--server", m.URL(), id)
		if code == exitInternal && strings.Contains(errOut, "401") {
			break
		}
		if i == 100 {
			t.Fatalf("report with a key revoked 5 s ago: %d %q", code, errOut)
		}
		time.Sleep(50 * time.Millisecond)
	}
}

// checkKeysList: keys list shows the key's office, role, label and last
// use, never its token; revoke stops it.
func checkKeysList(t *testing.T, url, token string) {
	t.Helper()
	code, out, errOut := runCLI("keys", "list", "--database-url", url)
	lines := strings.Split(strings.TrimSpace(out), "\n")
	if code != exitOK || len(lines) != 2 || strings.Contains(out, token) || strings.Contains(out, "pv_") {
		t.Fatalf("keys list: %d %q %q", code, out, errOut)
	}
	f := strings.Fields(lines[1])
	if f[1] != "Review" || f[3] != "editor" || f[4] != "R." || f[5] != "Editor" || strings.Count(lines[1], " - ") != 0 {
		t.Fatalf("keys list row %q: want the office, role, label and a last use", lines[1])
	}
	if code, out, _ := runCLI("keys", "revoke", "--database-url", url, f[0]); code != exitOK ||
		!strings.Contains(out, "revoked") {
		t.Fatalf("keys revoke: %d %q", code, out)
	}
	if code, _, _ := runCLI("keys", "revoke", "--database-url", url, f[0]); code != exitInvalid {
		t.Fatalf("keys revoke twice: %d", code)
	}
}
