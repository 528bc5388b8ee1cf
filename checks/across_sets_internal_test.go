package checks

import (
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
)

// denseSEMPackage is a summary package on p continuous variables: a random
// DAG in which each earlier variable is a parent with probability density,
// the implied correlations of a linear SEM on it (unit residual variances,
// coefficients 0.1 to 0.5 of either sign), SDs, and claims of every kind
// and scale between random pairs.
func denseSEMPackage(p int, density float64, seed uint64) []byte {
	r := rand.New(rand.NewPCG(seed, 41))
	type obj = map[string]any
	names := make([]string, p)
	var vars, edges, claims []obj
	coef := make([][]float64, p)
	for i := range p {
		names[i] = fmt.Sprintf("v%d", i)
		vars = append(vars, obj{"name": names[i], "scale": "continuous"})
		coef[i] = make([]float64, p)
		for j := range i {
			if r.Float64() < density {
				coef[i][j] = (0.1 + 0.4*r.Float64()) * float64(1-2*r.IntN(2))
				edges = append(edges, obj{"from": names[j], "to": names[i]})
			}
		}
	}
	cov := semCovariance(coef)
	lower, sds := make([][]float64, p), make([]float64, p)
	for i := range p {
		sds[i] = 1 + float64(i%3)
		for j := 0; j <= i; j++ {
			lower[i] = append(lower[i], cov[i][j]/math.Sqrt(cov[i][i]*cov[j][j]))
		}
	}
	kinds := []string{KindDirect, KindTotal}
	scales := []string{"standardized", "unstandardized", "odds_ratio"}
	for k := range 12 {
		i, j := r.IntN(p-1), 0
		j = i + 1 + r.IntN(p-1-i)
		claims = append(claims, obj{"id": fmt.Sprintf("C%d", k), "text": "t", "kind": kinds[k%2],
			"from": names[i], "to": names[j], "estimate_scale": scales[k%3], "ci_level": 0.9})
	}
	doc, err := json.Marshal(obj{"format_version": 1, "title": "t", "design": "observational", "variables": vars,
		"graph": obj{"edges": edges}, "claims": claims,
		"data": obj{"kind": "summary", "n": 120, "variables": names, "correlations": lower, "sds": sds}})
	if err != nil {
		panic(err)
	}
	return doc
}

// semCovariance is the covariance of x_i = Σ_j coef[i][j] x_j + e_i (unit
// residual variances, j < i).
func semCovariance(coef [][]float64) [][]float64 {
	p := len(coef)
	cov := make([][]float64, p)
	for i := range p {
		cov[i] = make([]float64, p)
		for j := 0; j <= i; j++ {
			s := 0.0
			if i == j {
				s = 1
			}
			for k := range i {
				if i == j {
					for l := range i {
						s += coef[i][k] * coef[i][l] * cov[k][l]
					}
				} else {
					s += coef[i][k] * cov[k][j]
				}
			}
			cov[i][j], cov[j][i] = s, s
		}
	}
	return cov
}

// The shared-base fits that cover the parent sets (setEstimator) give, in
// every locally valid parent set of every claim's node, what estimating
// each set on its own gives (estimateClaim, whose fits the linmod tests
// hold to a QR fit of rows): the same method, scale, note, df and
// adjustment set, and the estimate, SE, interval and p-value within
// 1e-10 (relative, or absolute below 1e-12). Random dense DAGs, so that
// the nodes have compelled parents and undirected neighbours in many
// mixtures; direct and total effects on three scales.
func TestSetEstimator_AgreesWithEstimateClaim(t *testing.T) {
	close := func(x, y float64) bool {
		return scalar.EqualWithinAbsOrRel(x, y, 1e-12, 1e-10) || math.IsNaN(x) && math.IsNaN(y)
	}
	compared := 0
	for seed := range uint64(12) {
		s, err := LoadForTest(denseSEMPackage(9, 0.75, seed))
		if err != nil {
			t.Fatal(err)
		}
		a := &Analysis{Study: s, Alpha: DefaultAlpha}
		cpdag := a.equivalenceClass().cpdag
		for _, c := range s.Package.Claims {
			node := a.parentsNode(c)
			graphs, err := a.localGraphs(node)
			if err != nil {
				t.Fatal(err)
			}
			fast := a.setEstimator(c, cpdag, node)
			for _, g := range graphs {
				got, want := fast(g), a.estimateClaim(c, g.pa)
				if got.method != want.method || got.scale != want.scale || got.note != want.note ||
					got.df != want.df || !slices.Equal(got.adjusted, want.adjusted) || !close(got.value, want.value) ||
					!close(got.se, want.se) || !close(got.lo, want.lo) || !close(got.hi, want.hi) ||
					!close(got.p, want.p) || (got.err == nil) != (want.err == nil) {
					t.Fatalf("seed %d, %s, parents %v: shared-base %+v, own fit %+v", seed, c.ID, g.parents, got, want)
				}
				compared++
			}
		}
	}
	if compared < 500 {
		t.Fatalf("only %d parent sets compared", compared)
	}
}
