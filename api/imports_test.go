package api_test

import (
	"os/exec"
	"strings"
	"testing"
)

// nonStandardDeps lists the packages outside the standard library that pkg
// builds with, as `go list -deps` gives them.
func nonStandardDeps(t *testing.T, pkg string) []string {
	t.Helper()
	out, err := exec.Command("go", "list", "-deps", "-f", "{{if not .Standard}}{{.ImportPath}}{{end}}", pkg).Output()
	if err != nil {
		t.Fatalf("go list -deps %s: %v", pkg, err)
	}
	return strings.Fields(string(out))
}

// The API depends on the service core, not on the database driver, the
// job queue or the store that uses them.
func TestImports_APIHasNoDatabase(t *testing.T) {
	for _, dep := range nonStandardDeps(t, "github.com/pathvet/pathvet/api") {
		for _, banned := range []string{"github.com/jackc/", "github.com/riverqueue/", "github.com/pathvet/pathvet/store"} {
			if strings.HasPrefix(dep, banned) {
				t.Errorf("api imports %s", dep)
			}
		}
	}
}

// The service core imports the standard library only.
func TestImports_ServiceIsStandardOnly(t *testing.T) {
	for _, dep := range nonStandardDeps(t, "github.com/pathvet/pathvet/api/service") {
		if dep != "github.com/pathvet/pathvet/api/service" {
			t.Errorf("api/service imports %s", dep)
		}
	}
}
