package checks_test

import (
	"bytes"
	"os"
	"path/filepath"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/schema/schematest"
)

func init() {
	checks.LoadForTest = func(doc []byte) (*checks.Study, error) { return load.Load(doc, load.Options{}) }
}

// demoPackages returns the path of every demo package.
func demoPackages(tb testing.TB) []string {
	tb.Helper()
	paths, err := filepath.Glob("../testdata/demo/*/package.json")
	if err != nil || len(paths) == 0 {
		tb.Fatalf("no demo packages: %v", err)
	}
	return paths
}

// MustLoad loads a package file, reading its data file beside it.
func MustLoad(tb testing.TB, path string) *checks.Study {
	tb.Helper()
	doc, err := os.ReadFile(path)
	if err != nil {
		tb.Fatal(err)
	}
	s, err := load.Load(doc, load.Options{ReadFile: func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(filepath.Dir(path), name))
	}})
	if err != nil {
		tb.Fatalf("%s: %v", path, err)
	}
	return s
}

// The shipped report schema accepts every golden report and every report
// of the calibration packages.
func TestReportSchema(t *testing.T) {
	sch := schematest.Report(t)
	paths, _ := filepath.Glob("../testdata/calibration/*/package.json")
	for _, path := range append(demoPackages(t), paths...) {
		b := encode(t, mustRun(t, MustLoad(t, path)))
		v, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
		if err != nil {
			t.Fatal(err)
		}
		if err := sch.Validate(v); err != nil {
			t.Errorf("%s: %v", path, err)
		}
	}
	bad := bytes.Replace(
		encode(t, mustRun(t, MustLoad(t, demoPackages(t)[0]))),
		[]byte(`"band": "`),
		[]byte(`"band": "no-`),
		1,
	)
	v, _ := jsonschema.UnmarshalJSON(bytes.NewReader(bad))
	if sch.Validate(v) == nil {
		t.Error("the report schema accepts an unknown band")
	}
}
