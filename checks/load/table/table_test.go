package table_test

import (
	"encoding/json"
	"errors"
	"maps"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"

	"github.com/pathvet/pathvet/checks/load/table"
)

// corpusCase is one entry of testdata/tables/cases.json, written by
// testdata/tables/make.py: a printed table (invented) and the figures it
// prints, or a malformed table and its exact problems.
type corpusCase struct {
	File         string         `json:"file"`
	Names        []string       `json:"names"`
	Labels       []string       `json:"labels"`
	Correlations [][]float64    `json:"correlations"`
	Means        []float64      `json:"means"`
	SDs          []float64      `json:"sds"`
	N            int            `json:"n"`
	Marks        map[string]int `json:"marks"`
	Guesses      []string       `json:"guesses"`
	Problems     []string       `json:"problems"`
	// Reliabilities printed on the diagonal, 0 where none; null when none.
	Reliabilities []float64 `json:"reliabilities"`
}

const corpusDir = "../../../testdata/tables"

func corpus(t testing.TB) []corpusCase {
	b, err := os.ReadFile(filepath.Join(corpusDir, "cases.json"))
	if err != nil {
		t.Fatal(err)
	}
	var cases []corpusCase
	if err := json.Unmarshal(b, &cases); err != nil {
		t.Fatal(err)
	}
	return cases
}

// exact is the tolerance for figures read from print: the reader and
// make.py both take the nearest double to the same decimal.
const exact = 1e-12

// Every variant of the corpus gives the figures of the table it prints;
// every malformed one exactly its problems, each with its line and cell.
func TestRead_Corpus(t *testing.T) {
	cases := corpus(t)
	if good := len(cases) - countBad(cases); good < 20 {
		t.Fatalf("the corpus has %d good variants; want at least 20", good)
	}
	for _, c := range cases {
		t.Run(c.File, func(t *testing.T) {
			got, err := table.Read(readCorpusFile(t, c.File))
			if c.Problems != nil {
				wantProblems(t, err, c.Problems)
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			wantTable(t, got, c)
		})
	}
}

func countBad(cases []corpusCase) int {
	n := 0
	for _, c := range cases {
		if c.Problems != nil {
			n++
		}
	}
	return n
}

func wantProblems(t *testing.T, err error, want []string) {
	t.Helper()
	var te *table.Error
	if !errors.As(err, &te) {
		t.Fatalf("error %v; want a *table.Error", err)
	}
	got := make([]string, len(te.Problems))
	for i, p := range te.Problems {
		got[i] = p.String()
	}
	if !slices.Equal(got, want) {
		t.Errorf("problems:\n  %s\nwant:\n  %s", strings.Join(got, "\n  "), strings.Join(want, "\n  "))
	}
}

func wantTable(t *testing.T, got *table.Table, c corpusCase) {
	t.Helper()
	var labels []string
	for _, v := range got.Variables {
		labels = append(labels, v.Label)
	}
	if !slices.Equal(got.Names(), c.Names) || !slices.Equal(labels, c.Labels) {
		t.Errorf("names %q labels %q; want %q %q", got.Names(), labels, c.Names, c.Labels)
	}
	if len(got.Correlations) != len(c.Correlations) {
		t.Fatalf("%d rows of correlations; want %d", len(got.Correlations), len(c.Correlations))
	}
	for i := range c.Correlations {
		vector(t, "correlations row", got.Correlations[i], c.Correlations[i])
	}
	vector(t, "means", got.Means, c.Means)
	vector(t, "sds", got.SDs, c.SDs)
	vector(t, "reliabilities", got.Reliabilities, c.Reliabilities)
	if got.N != c.N {
		t.Errorf("n %d; want %d", got.N, c.N)
	}
	if !maps.Equal(got.Marks, c.Marks) {
		t.Errorf("marks %v; want %v", got.Marks, c.Marks)
	}
	all := strings.Join(got.Guesses, "\n")
	for _, g := range c.Guesses {
		if !strings.Contains(all, g) {
			t.Errorf("guesses lack %q:\n%s", g, all)
		}
	}
}

func vector(t *testing.T, what string, got, want []float64) {
	t.Helper()
	if (got == nil) != (want == nil) || len(got) != len(want) {
		t.Errorf("%s %v; want %v", what, got, want)
		return
	}
	for i := range want {
		if !scalar.EqualWithinAbsOrRel(got[i], want[i], exact, exact) {
			t.Errorf("%s[%d] = %v; want %v", what, i, got[i], want[i])
		}
	}
}

func readCorpusFile(t testing.TB, name string) string {
	b, err := os.ReadFile(filepath.Join(corpusDir, name))
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}
