package checks

import (
	"context"
	"encoding/json"
	"os"
	"path/filepath"
	"slices"
	"sync"
	"testing"

	"github.com/pathvet/pathvet/checks/dag"
)

// recordingEstimator passes every request to the observed path model and
// notes which moments each check estimated on, and which graphs it fitted.
type recordingEstimator struct {
	observed observedEstimator
	mu       sync.Mutex
	seen     map[string]bool // moments' Method
	fits     int
}

func (r *recordingEstimator) fitGraph(ctx context.Context, g *dag.PDAG, in []bool) (*modelFit, error) {
	r.mu.Lock()
	r.fits++
	r.mu.Unlock()
	return r.observed.fitGraph(ctx, g, in)
}

func (r *recordingEstimator) under(ctx context.Context, m *Moments, pa parentsFunc) fittedGraph {
	r.mu.Lock()
	r.seen[m.Method] = true
	r.mu.Unlock()
	return r.observed.under(ctx, m, pa)
}

// inlineDemo loads a demo package with its data file read into the
// document, as LoadForTest takes it.
func inlineDemo(t *testing.T, dir string) *Study {
	t.Helper()
	path := filepath.Join("..", "testdata", "demo", dir, "package.json")
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var doc map[string]any
	if err := json.Unmarshal(b, &doc); err != nil {
		t.Fatal(err)
	}
	data := doc["data"].(map[string]any)
	if f, ok := data["file"].(string); ok {
		csv, err := os.ReadFile(filepath.Join(filepath.Dir(path), f))
		if err != nil {
			t.Fatal(err)
		}
		delete(data, "file")
		data["csv"] = string(csv)
	}
	out, _ := json.Marshal(doc)
	s, err := LoadForTest(out)
	if err != nil {
		t.Fatal(err)
	}
	return s
}

// Every check that estimates claims or fits graphs does it through the
// study's estimator (estimator.go), whatever the moments: the declared
// graph's, the equivalents', the alternatives', the missing-data
// methods', the imputed datasets' and the corrected correlations'. A
// check that went around the seam would keep a model with latent
// variables from being screened the same way.
func TestEstimator_EveryCheckGoesThroughTheSeam(t *testing.T) {
	want := map[string]map[string][]string{
		"coding-club": {
			"equivalence":      {"complete_cases"},
			"nearby-graphs":    {"complete_cases"},
			"missing-data":     {"complete_cases", "maximum_likelihood", "mean_substitution", "imputation_1_of_20"},
			"effect-reporting": {"complete_cases"},
			"measurement":      {"complete_cases", "corrected_for_attenuation"},
		},
		"tutoring-anxiety": {
			"equivalence":  {"summary"},
			"alternatives": {"summary"},
		},
	}
	fitters := map[string]bool{"graph-fit": true, "alternatives": true, "nearby-graphs": true}
	for demo, checks := range want {
		s := inlineDemo(t, demo)
		for _, c := range Pipeline() {
			rec := &recordingEstimator{seen: map[string]bool{}}
			a := &Analysis{Study: s, Alpha: DefaultAlpha, Claims: claimReports(s.Package), ctx: context.Background()}
			rec.observed = observedEstimator{a: a}
			a.estimation = rec
			if res := runCheck(context.Background(), c, a); res.RunError != "" {
				t.Fatalf("%s %s: %s", demo, c.ID, res.RunError)
			}
			for _, m := range checks[c.ID] {
				if !rec.seen[m] {
					t.Errorf("%s, %s: no estimate on the %s moments went through the estimator (saw %v)",
						demo, c.ID, m, keys(rec.seen))
				}
			}
			if fitters[c.ID] && (demo == "tutoring-anxiety" || c.ID != "alternatives") && rec.fits == 0 {
				t.Errorf("%s, %s: no graph was fitted through the estimator", demo, c.ID)
			}
		}
	}
}

func keys(m map[string]bool) []string {
	var out []string
	for k := range m {
		out = append(out, k)
	}
	slices.Sort(out)
	return out
}
