package load_test

import (
	"context"
	"encoding/json"
	"errors"
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// FuzzLoad feeds arbitrary documents to the package decoder: it must
// return a study or an invalid-package error, never panic or hang; a
// study must then screen without any check failing to run. Seeds: every
// demo, calibration and bad package.
func FuzzLoad(f *testing.F) {
	paths, _ := filepath.Glob("../../testdata/bad/*.json")
	calibration, _ := filepath.Glob("../../testdata/calibration/*/package.json")
	paths = append(append(paths, demoPackages(f)...), calibration...)
	for _, p := range paths {
		b, err := os.ReadFile(p)
		if err != nil {
			f.Fatal(err)
		}
		f.Add(b)
	}
	f.Fuzz(func(t *testing.T, doc []byte) {
		s, err := load.Load(doc, load.Options{})
		var invalid *checks.InvalidPackageError
		if err != nil && !errors.As(err, &invalid) {
			t.Fatalf("error of the wrong kind: %v", err)
		}
		if err == nil {
			screenCleanly(t, s)
		}
	})
}

// screenCleanly runs the pipeline and fails on any check that panicked or
// could not encode its result, or a report that does not encode. A check
// may fail to run for a cause in the data (too few cases, collinear
// variables), which it names.
func screenCleanly(t *testing.T, s *checks.Study) {
	r, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Checks {
		if strings.HasPrefix(c.RunError, "internal error") ||
			strings.HasPrefix(c.RunError, "its result could not be encoded") {
			t.Fatalf("%s failed to run: %s", c.ID, c.RunError)
		}
	}
	if _, err := json.Marshal(r); err != nil {
		t.Fatal(err)
	}
}

// FuzzCSV feeds arbitrary CSV data beside a fixed package; data that
// load must then screen without any check failing to run.
func FuzzCSV(f *testing.F) {
	doc := []byte(`{"format_version": 1, "title": "fuzz", "design": "observational",
		"variables": [{"name": "a", "scale": "binary"}, {"name": "b", "scale": "continuous"},
		              {"name": "c", "scale": "continuous"}],
		"graph": {"edges": [{"from": "a", "to": "b"}, {"from": "b", "to": "c"}]},
		"claims": [{"id": "C1", "text": "b raises c", "kind": "direct_effect", "from": "b", "to": "c",
		            "estimate": 0.2, "std_error": 0.1, "p_value": 0.04},
		           {"id": "C2", "text": "c goes with a", "kind": "association", "from": "c", "to": "a",
		            "asserts_absence": true}],
		"missing_data": {"method": "mean_substitution"},
		"data": {"kind": "rows", "missing_codes": ["-9"], "ignore_columns": ["id"]}}`)
	for _, seed := range []string{
		"a,b,c\n1,2.5,1\n0,,2\n1,3,\n0,1,1\n1,2,2\n0,3,1\n", "id,a,b,c\nx,1,NA,1\ny,0,-9,2\n", "a,b,c\n2,1,1\n",
		"\xef\xbb\xbfa,b,c\n1,1e308,1\n0,-1e308,2\n1,1,1\n", "a,b,c\n\"1\",\"2\n", "b,a,c\n1,1,1\n1\n",
		"a,b,c\n1,1,1\n1,1,1\n1,1,1\n1,1,1\n", "a,b,c\n0,1,2\n1,2,4\n0,3,6\n1,4,8\n0,5,10\n",
	} {
		f.Add([]byte(seed))
	}
	f.Fuzz(func(t *testing.T, csv []byte) {
		s, err := load.Load(doc, load.Options{CSV: csv})
		var invalid *checks.InvalidPackageError
		if err != nil && !errors.As(err, &invalid) {
			t.Fatalf("error of the wrong kind: %v", err)
		}
		if err == nil {
			for _, col := range s.Data.Columns {
				if len(col) != s.Data.N {
					t.Fatalf("column of %d values for %d rows", len(col), s.Data.N)
				}
			}
			screenCleanly(t, s)
		}
	})
}

func ftoa(x float64) string { return strconv.FormatFloat(x, 'g', -1, 64) }

// checkOf screens s and returns the check with the id.
func checkOf(t *testing.T, s *checks.Study, id string) checks.CheckResult {
	t.Helper()
	r, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Checks {
		if c.ID == id {
			return c
		}
	}
	t.Fatalf("no check %s", id)
	return checks.CheckResult{}
}
