package checks_test

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// benchPackage is a summary-data package on p variables from a random
// linear SEM (about two parents a node), with one claim per ten variables.
func benchPackage(p int) []byte {
	r := rand.New(rand.NewPCG(uint64(p), 17))
	type obj = map[string]any
	names := make([]string, p)
	var vars, edges, claims []obj
	coef := make([][]float64, p)
	for i := range p {
		names[i] = fmt.Sprintf("v%03d", i)
		vars = append(vars, obj{"name": names[i], "scale": "continuous"})
		coef[i] = make([]float64, p)
		for j := range i {
			if r.Float64() < 2/float64(i+1) || j == i-1 {
				coef[i][j] = 0.15 + 0.2*r.Float64()
				edges = append(edges, obj{"from": names[j], "to": names[i]})
				if len(claims) < max(p/10, 1) && j == i-1 {
					claims = append(claims, obj{"id": fmt.Sprintf("C%d", len(claims)+1), "text": "t",
						"kind": "direct_effect", "from": names[j], "to": names[i], "headline": len(claims) == 0})
				}
			}
		}
	}
	// Covariance of the SEM with unit residual variances, in causal order.
	cov := make([][]float64, p)
	for i := range p {
		cov[i] = make([]float64, p)
		for j := 0; j <= i; j++ {
			s := 0.0
			for k := range i {
				s += coef[i][k] * cov[k][j]
			}
			if i == j {
				s = 1
				for k := range i {
					for l := range i {
						s += coef[i][k] * coef[i][l] * cov[k][l]
					}
				}
			}
			cov[i][j], cov[j][i] = s, s
		}
	}
	lower := make([][]float64, p)
	for i := range p {
		for j := 0; j <= i; j++ {
			lower[i] = append(lower[i], math.Round(cov[i][j]/math.Sqrt(cov[i][i]*cov[j][j])*1e6)/1e6)
		}
	}
	doc, _ := json.Marshal(obj{"format_version": 1, "title": "bench", "design": "observational",
		"variables": vars, "graph": obj{"edges": edges}, "claims": claims,
		"data": obj{"kind": "summary", "n": 1000, "variables": names, "correlations": lower}})
	return doc
}

func BenchmarkPipelineSummary(b *testing.B) {
	for _, p := range []int{10, 30, 100} {
		doc := benchPackage(p)
		b.Run(fmt.Sprintf("p=%d", p), func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				s, err := load.Load(doc, load.Options{})
				if err != nil {
					b.Fatal(err)
				}
				if _, err := checks.Run(context.Background(), s, checks.Options{}); err != nil {
					b.Fatal(err)
				}
			}
		})
	}
}

func TestBenchPackagesLoad(t *testing.T) {
	for _, p := range []int{10, 30, 100} {
		if _, err := load.Load(benchPackage(p), load.Options{}); err != nil {
			t.Fatalf("p=%d: %v", p, err)
		}
	}
}

// BenchmarkNearbyGraphs runs the nearby-graphs check alone (neighbourhood,
// search, and the claims across the close classes) on the summary
// packages above, up to the variable limit.
func BenchmarkNearbyGraphs(b *testing.B) {
	var nearby []checks.Check
	for _, c := range checks.Pipeline() {
		if c.ID == "nearby-graphs" {
			nearby = append(nearby, c)
		}
	}
	for _, p := range []int{10, 30, 100, 500} {
		for _, sampled := range []bool{false, true} {
			doc := benchPackage(p)
			if sampled {
				doc = sampledPackage(b, doc, 1000)
			}
			s, err := load.Load(doc, load.Options{})
			if err != nil {
				b.Fatal(err)
			}
			b.Run(fmt.Sprintf("p=%d/sampled=%v", p, sampled), func(b *testing.B) {
				b.ReportAllocs()
				for b.Loop() {
					r, err := checks.Run(context.Background(), s, checks.Options{Checks: nearby})
					if err != nil || r.Checks[0].RunError != "" || r.Checks[0].Status == checks.StatusNotApplicable {
						b.Fatalf("%v %+v", err, r.Checks[0])
					}
				}
			})
		}
	}
}

// sampledPackage replaces a bench package's correlation matrix by that of
// n cases drawn from it: implied independences then hold only up to noise,
// so thousands of nearby classes fall within ΔBIC 2 at 500 variables.
func sampledPackage(tb testing.TB, doc []byte, n int) []byte {
	var pkg map[string]any
	if err := json.Unmarshal(doc, &pkg); err != nil {
		tb.Fatal(err)
	}
	data := pkg["data"].(map[string]any)
	lower := data["correlations"].([]any)
	p := len(lower)
	c := mat.NewSymDense(p, nil)
	for i := range p {
		for j, v := range lower[i].([]any) {
			c.SetSym(i, j, v.(float64))
		}
	}
	var ch mat.Cholesky
	if !ch.Factorize(c) {
		tb.Fatal("not positive definite")
	}
	var l mat.TriDense
	ch.LTo(&l)
	r := rand.New(rand.NewPCG(uint64(p), 23))
	x := mat.NewDense(n, p, nil)
	z := mat.NewVecDense(p, nil)
	for i := range n {
		for k := range p {
			z.SetVec(k, r.NormFloat64())
		}
		var row mat.VecDense
		row.MulVec(&l, z)
		x.SetRow(i, row.RawVector().Data)
	}
	s := mat.NewSymDense(p, nil)
	stat.CorrelationMatrix(s, x, nil)
	out := make([][]float64, p)
	for i := range p {
		for j := 0; j <= i; j++ {
			out[i] = append(out[i], s.At(i, j))
		}
	}
	data["correlations"] = out
	b, err := json.Marshal(pkg)
	if err != nil {
		tb.Fatal(err)
	}
	return b
}
