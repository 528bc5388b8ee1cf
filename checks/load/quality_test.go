package load_test

import (
	"bytes"
	"context"
	"encoding/json"
	"math"
	"strings"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/schema/schematest"
)

// column returns n values spread evenly over [lo, hi], then extra.
func column(n int, lo, hi float64, extra ...float64) []float64 {
	out := make([]float64, 0, n+len(extra))
	for i := range n {
		out = append(out, lo+(hi-lo)*float64(i)/float64(n-1))
	}
	return append(out, extra...)
}

func TestSuspects(t *testing.T) {
	nan := math.NaN()
	for _, tc := range []struct {
		name string
		col  []float64
		want []checks.Suspect // Variable, Value, Count, Code are compared
	}{
		{"code -99 repeated", column(40, 1, 5, -99, -99, -99, nan),
			[]checks.Suspect{{Value: -99, Count: 3, Code: true}}},
		{"code 999 above", column(40, 10, 60, 999, 999), []checks.Suspect{{Value: 999, Count: 2, Code: true}}},
		{"two codes at one end", column(40, 1, 5, -99, -99, -98, -98),
			[]checks.Suspect{{Value: -99, Count: 2, Code: true}, {Value: -98, Count: 2}}},
		{"repeated extreme, not a code", column(40, 150, 190, 400, 400, 400),
			[]checks.Suspect{{Value: 400, Count: 3}}},
		{"a single -999 is not repeated", column(40, 1, 5, -999), nil},
		{"99 inside a 0-100 scale", column(40, 0, 100, 99, 99), nil},
		{"fewer than ten other values", column(8, 1, 5, -99, -99), nil},
		{"no spread among the others", append(column(20, 3, 3), -99, -99), nil},
		{"just inside the fence", column(41, 0, 40, 70, 70), nil}, // Q1 10, Q3 30: fence 30 + 3·20 = 90
		{"just outside the fence", column(41, 0, 40, 91, 91), []checks.Suspect{{Value: 91, Count: 2}}},
	} {
		got := load.Suspects("x", tc.col)
		if len(got) != len(tc.want) {
			t.Errorf("%s: got %+v, want %+v", tc.name, got, tc.want)
			continue
		}
		for i, w := range tc.want {
			g := got[i]
			if g.Variable != "x" || g.Value != w.Value || g.Count != w.Count || g.Code != w.Code {
				t.Errorf("%s: got %+v, want %+v", tc.name, g, w)
			}
		}
	}
}

// A missing code left in raw rows is found by the loader and warned about
// by the missing-data check, with the column, the value and the count;
// declared in missing_codes, it is neither.
func TestLoad_UndeclaredMissingCode(t *testing.T) {
	var b strings.Builder
	b.WriteString("x,y\n")
	for i := range 60 {
		y := float64(i%7) + 0.5*float64(i%3)
		if i%15 == 0 {
			b.WriteString("2,-999\n")
			continue
		}
		b.WriteString(strings.Join([]string{ftoa(float64(i % 5)), ftoa(y)}, ",") + "\n")
	}
	doc := `{"format_version": 1, "title": "codes", "design": "observational",
		"variables": [{"name": "x", "scale": "continuous"}, {"name": "y", "scale": "continuous"}],
		"graph": {"edges": [{"from": "x", "to": "y"}]},
		"claims": [{"id": "C1", "text": "x goes with y", "kind": "association", "from": "x", "to": "y"}],
		"data": {"kind": "rows"CODES}}`
	s, err := load.Load([]byte(strings.Replace(doc, "CODES", "", 1)), load.Options{CSV: []byte(b.String())})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Data.Suspects) != 1 || s.Data.Suspects[0].Value != -999 || s.Data.Suspects[0].Count != 4 {
		t.Fatalf("suspects %+v", s.Data.Suspects)
	}
	c := checkOf(t, s, "missing-data")
	reportValid(t, s)
	if c.Status != checks.StatusWarn ||
		!strings.Contains(c.Findings[0].Message, `Column "y" has the value -999 in 4 rows`) ||
		!strings.Contains(c.Findings[0].Message, "/data/missing_codes") {
		t.Errorf("missing-data: %s %+v", c.Status, c.Findings)
	}
	coded := strings.Replace(doc, "CODES", `, "missing_codes": ["-999"]`, 1)
	s, err = load.Load([]byte(coded), load.Options{CSV: []byte(b.String())})
	if err != nil {
		t.Fatal(err)
	}
	if len(s.Data.Suspects) != 0 {
		t.Errorf("declared code still suspect: %+v", s.Data.Suspects)
	}
	if c := checkOf(t, s, "missing-data"); len(c.Findings) > 0 && strings.Contains(c.Findings[0].Message, "-999") {
		t.Errorf("declared code still reported: %+v", c.Findings)
	}
}

// reportValid screens s and validates the report against the shipped
// report schema.
func reportValid(t *testing.T, s *checks.Study) {
	t.Helper()
	r, err := checks.Run(context.Background(), s, checks.Options{})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := json.Marshal(r)
	v, err := jsonschema.UnmarshalJSON(bytes.NewReader(b))
	if err != nil {
		t.Fatal(err)
	}
	if err := schematest.Report(t).Validate(v); err != nil {
		t.Error(err)
	}
}
