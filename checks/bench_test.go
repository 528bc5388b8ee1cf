package checks_test

import (
	"context"
	"encoding/json"
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

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
