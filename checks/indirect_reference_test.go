package checks_test

import (
	"encoding/json"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/mediation"
)

// The outside references of the indirect-effect claims, run through the
// whole pipeline: testdata/reference/mediation/indirect.R (complete
// mtcars) and indirect_ml.R (mtcars with values missing, full-information
// ML), both the R SEM reference (Debian's R SEM package) on R's bundled
// mtcars.
const mediationRef = "../testdata/reference/mediation/"

type mlRef struct {
	Source string `json:"source"`
	Models []struct {
		Name    string `json:"name"`
		Defined []struct {
			Label     string  `json:"label"`
			Est       float64 `json:"est"`
			SE        float64 `json:"se"`
			EstStdAll float64 `json:"est_std_all"`
			SEStdAll  float64 `json:"se_std_all"`
			EstH1     float64 `json:"est_h1"`
			EstStdH1  float64 `json:"est_std_h1"`
		} `json:"defined"`
	} `json:"models"`
}

type ccRef struct {
	Source string `json:"source"`
	Models []struct {
		Name      string `json:"name"`
		N         int    `json:"n"`
		Equations []struct {
			Y    string    `json:"y"`
			X    []string  `json:"x"`
			Est  []float64 `json:"est"`
			VCov []float64 `json:"vcov"`
		} `json:"equations"`
		Defined []struct {
			Label     string     `json:"label"`
			Est       float64    `json:"est"`
			EstStdAll float64    `json:"est_std_all"`
			BootLo    float64    `json:"boot_lo"`
			BootHi    float64    `json:"boot_hi"`
			BootDraws []*float64 `json:"boot_draws"` // null where a resample failed
		} `json:"defined"`
	} `json:"models"`
}

// mediationModels are the reference models as packages: the variables,
// the graph and, for each defined parameter that is an effect through
// mediators in pathvet's sense (every path through all of them), the
// claim's mediators.
var mediationModels = map[string]struct {
	vars, ignore []string
	edges        [][2]string
	from, to     string
	through      map[string][]string
}{
	"single": {[]string{"disp", "am", "wt", "mpg"}, []string{"hp", "qsec"},
		[][2]string{{"disp", "wt"}, {"am", "wt"}, {"wt", "mpg"}, {"disp", "mpg"}, {"am", "mpg"}},
		"disp", "mpg", map[string][]string{"ab": {"wt"}}},
	"serial": {[]string{"hp", "wt", "qsec", "mpg"}, []string{"disp", "am"},
		[][2]string{{"hp", "wt"}, {"hp", "qsec"}, {"wt", "qsec"}, {"wt", "mpg"}, {"qsec", "mpg"}, {"hp", "mpg"}},
		"hp", "mpg", map[string][]string{"through_wt": {"wt"}, "ind_serial": {"wt", "qsec"}, "total_ind": {}}},
}

// mediationPackage writes the package of a reference model with one
// indirect claim per defined parameter, on the scale given, and loads it.
func mediationPackage(t *testing.T, model, csvFile, scale string, missing bool) (*checks.Study, []string) {
	t.Helper()
	m := mediationModels[model]
	var vars, edges, claims []string
	for _, v := range m.vars {
		vars = append(vars, fmt.Sprintf(`{"name": %q, "scale": "continuous"}`, v))
	}
	for _, e := range m.edges {
		edges = append(edges, fmt.Sprintf(`{"from": %q, "to": %q}`, e[0], e[1]))
	}
	var labels []string
	for label, through := range m.through {
		b, _ := json.Marshal(through)
		claims = append(claims, fmt.Sprintf(`{"id": %q, "text": "an indirect effect", "kind": "indirect_effect", `+
			`"from": %q, "to": %q, "through": %s, "estimate_scale": %q}`, label, m.from, m.to, b, scale))
		labels = append(labels, label)
	}
	method := ""
	if missing {
		method = `"missing_data": {"method": "complete_cases"},`
	}
	ignore, _ := json.Marshal(m.ignore)
	doc := fmt.Sprintf(`{"format_version": 1, "title": "mtcars reference", "design": "observational",
		"variables": [%s], "graph": {"edges": [%s]}, "claims": [%s], %s
		"data": {"kind": "rows", "file": %q, "ignore_columns": %s}}`,
		strings.Join(vars, ","), strings.Join(edges, ","), strings.Join(claims, ","), method, csvFile, ignore)
	s, err := load.Load([]byte(doc), load.Options{ReadFile: func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(mediationRef, name))
	}})
	if err != nil {
		t.Fatalf("%v\n%s", err, doc)
	}
	return s, labels
}

func readJSON(t *testing.T, name string, v any) {
	t.Helper()
	b, err := os.ReadFile(mediationRef + name)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		t.Fatal(err)
	}
}

// An indirect claim's declared estimate and delta-method SE from the
// pipeline against the R SEM reference's defined parameters (indirect.R)
// on the complete mtcars rows. The estimates are the same least-squares
// products (to 1e-9, the report's 10 significant digits). The SEs follow
// two conventions: the reference's ML divides each equation's residual sum
// of squares by n, pathvet's reports by n − k − 1 (README, "Estimation
// conventions"), so each equation's coefficient covariance is the
// reference's times n/(n − k − 1); the test converts the reference's
// covariance blocks so and holds the pipeline's SE to the delta method of
// the converted blocks (mediation.Effect, itself held to the reference in
// checks/mediation) to 1e-9. The standardized estimates of the saturated
// models equal the reference's completely standardized ones (est_std_all)
// to 1e-9, and the percentile bootstrap's limits (2,000 resamples, other
// draws) lie within 0.35 of the reference's bootstrap SE of its limits:
// four times the Monte Carlo SE of the difference of two 2.5% quantiles of
// 2,000 draws, about 0.085 SD for a normal effect (Efron & Tibshirani 1993,
// sec. 19.3).
func TestIndirect_PipelineAgainstReference(t *testing.T) {
	var ref ccRef
	readJSON(t, "indirect.json", &ref)
	for _, rm := range ref.Models {
		mm, ok := mediationModels[rm.Name]
		if !ok {
			continue
		}
		for _, scale := range []string{"unstandardized", "standardized"} {
			s, _ := mediationPackage(t, rm.Name, "mtcars.csv", scale, false)
			rep := mustRun(t, s)
			for _, def := range rm.Defined {
				through, ok := mm.through[def.Label]
				if !ok {
					continue
				}
				d := claimByID(rep, def.Label).Declared
				if d == nil || d.Estimate == nil || d.StdError == nil {
					t.Fatalf("%s %s: no declared estimate: %+v", rm.Name, def.Label, d)
				}
				want := def.Est
				if scale == "standardized" {
					want = def.EstStdAll
				}
				if !scalar.EqualWithinAbsOrRel(*d.Estimate, want, 1e-9, 1e-9) {
					t.Errorf("%s %s %s: estimate %v, reference %v (%s)", rm.Name, def.Label, scale, *d.Estimate,
						want, ref.Source)
				}
				if scale == "unstandardized" {
					se := convertedSE(t, rm.N, rm.Equations, mm.from, mm.to, through, mm.vars)
					if !scalar.EqualWithinAbsOrRel(*d.StdError, se, 1e-9, 1e-9) {
						t.Errorf("%s %s: SE %v, the reference's blocks converted to n − k − 1 give %v",
							rm.Name, def.Label, *d.StdError, se)
					}
					if d.Significance == nil || d.Significance.Method != checks.IntervalBootstrap {
						t.Fatalf("%s %s: not judged by the bootstrap: %+v", rm.Name, def.Label, d.Significance)
					}
					tol := 0.35 * drawsSD(def.BootDraws)
					if !scalar.EqualWithinAbs(d.CI[0], def.BootLo, tol) ||
						!scalar.EqualWithinAbs(d.CI[1], def.BootHi, tol) {
						t.Errorf("%s %s: bootstrap %v, reference [%v, %v] (tolerance %v)", rm.Name, def.Label,
							d.CI, def.BootLo, def.BootHi, tol)
					}
				}
			}
		}
	}
}

// convertedSE is the delta-method SE of the effect from the reference's
// coefficients, each equation's covariance block scaled by n/(n − k − 1).
func convertedSE(t *testing.T, n int, eqs []struct {
	Y    string    `json:"y"`
	X    []string  `json:"x"`
	Est  []float64 `json:"est"`
	VCov []float64 `json:"vcov"`
}, from, to string, through, vars []string) float64 {
	t.Helper()
	idx := func(v string) int {
		for i, w := range vars {
			if w == v {
				return i
			}
		}
		t.Fatalf("no variable %s", v)
		return -1
	}
	p := len(vars)
	m := &mediation.Model{B: mat.NewDense(p, p, nil), Parents: make([][]int, p), Cov: make([]*mat.SymDense, p)}
	for _, eq := range eqs {
		j, k := idx(eq.Y), len(eq.X)
		for a, x := range eq.X {
			m.Parents[j] = append(m.Parents[j], idx(x))
			m.B.Set(idx(x), j, eq.Est[a])
		}
		c := mat.NewSymDense(k, nil)
		f := float64(n) / float64(n-k-1)
		for a := range k {
			for b := range k {
				c.SetSym(a, b, eq.VCov[a*k+b]*f)
			}
		}
		m.Cov[j] = c
	}
	path := mediation.Path{From: idx(from), To: idx(to)}
	for _, v := range through {
		path.Through = append(path.Through, idx(v))
	}
	e, err := mediation.Effect(m, path)
	if err != nil {
		t.Fatal(err)
	}
	return e.StdError
}

// The maximum-likelihood re-estimate of an indirect claim under missing
// data (the missing-data check) against the R SEM reference's
// full-information ML with observed information on the same rows
// (indirect_ml.R, mtcars with wt and mpg partly missing; each model
// saturated, so both are the delta method on the saturated model's
// observed information), unstandardized and standardized: estimates to
// 1e-8 relative of the effect of the reference's own EM covariance
// (est_h1; both EMs stop below 1e-10), SEs to 1e-5 relative of the
// reference model's (its optimizer stops about 1e-7 short of the maximum,
// and pathvet's gradient is by central differences, the reference's
// analytic).
func TestIndirect_MaximumLikelihoodAgainstReference(t *testing.T) {
	var ref mlRef
	readJSON(t, "indirect_ml.json", &ref)
	for _, rm := range ref.Models {
		for _, scale := range []string{"unstandardized", "standardized"} {
			s, _ := mediationPackage(t, rm.Name, "mtcars_missing.csv", scale, true)
			rep := mustRun(t, s)
			for _, def := range rm.Defined {
				if _, ok := mediationModels[rm.Name].through[def.Label]; !ok {
					continue
				}
				ml := claimByID(rep, def.Label).MissingData[checks.MissingMaximumLikelihood]
				if ml == nil || ml.Estimate == nil || ml.StdError == nil {
					t.Fatalf("%s %s %s: no ML estimate: %+v", rm.Name, def.Label, scale, ml)
				}
				est, se := def.EstH1, def.SE
				if scale == "standardized" {
					est, se = def.EstStdH1, def.SEStdAll
				}
				if !scalar.EqualWithinAbsOrRel(*ml.Estimate, est, 1e-10, 1e-8) ||
					!scalar.EqualWithinAbsOrRel(*ml.StdError, se, 1e-8, 1e-5) {
					t.Errorf("%s %s %s: %v (SE %v), reference %v (SE %v), %s", rm.Name, def.Label, scale,
						*ml.Estimate, *ml.StdError, est, se, ref.Source)
				}
			}
		}
	}
}

// drawsSD is the SD of the reference's bootstrap draws, the failed ones
// left out.
func drawsSD(draws []*float64) float64 {
	var xs []float64
	for _, d := range draws {
		if d != nil {
			xs = append(xs, *d)
		}
	}
	return stat.StdDev(xs, nil)
}
