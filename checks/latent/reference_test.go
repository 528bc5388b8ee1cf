package latent

import (
	"context"
	"fmt"
	"testing"
)

// The models of testdata/reference/latent/make_reference.R (the R SEM
// reference, Debian's R SEM package), on the data it wrote: Holzinger &
// Swineford (1939) and Bollen (1989).
var referenceModels = map[string]named{
	"hs_cfa": {
		columns:    []string{"x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8", "x9"},
		latents:    []string{"visual", "textual", "speed"},
		indicators: [][]string{{"x1", "x2", "x3"}, {"x4", "x5", "x6"}, {"x7", "x8", "x9"}},
	},
	"hs_structural": {
		columns:    []string{"x1", "x2", "x3", "x4", "x5", "x6", "x7", "x8", "x9", "ageyr"},
		latents:    []string{"visual", "textual", "speed"},
		indicators: [][]string{{"x1", "x2", "x3"}, {"x4", "x5", "x6"}, {"x7", "x8", "x9"}},
		parents:    map[string][]string{"textual": {"visual", "ageyr"}, "speed": {"textual", "visual"}},
		effects: map[string][]string{"ind": {"visual", "speed", "textual"}, "tot": {"visual", "speed"},
			"age_speed": {"ageyr", "speed"}},
	},
	"hs_observed_outcome": {
		columns:    []string{"x1", "x2", "x3", "x4", "x5", "x6", "ageyr"},
		latents:    []string{"visual", "textual"},
		indicators: [][]string{{"x1", "x2", "x3"}, {"x4", "x5", "x6"}},
		parents:    map[string][]string{"ageyr": {"visual", "textual"}},
	},
	"poldem":          poldem(map[string][]string{"dem60": {"ind60"}, "dem65": {"ind60", "dem60"}}),
	"poldem_reversed": poldem(map[string][]string{"dem60": {"dem65"}, "ind60": {"dem60", "dem65"}}),
}

func poldem(parents map[string][]string) named {
	m := named{
		columns:    []string{"y1", "y2", "y3", "y4", "y5", "y6", "y7", "y8", "x1", "x2", "x3"},
		latents:    []string{"ind60", "dem60", "dem65"},
		indicators: [][]string{{"x1", "x2", "x3"}, {"y1", "y2", "y3", "y4"}, {"y5", "y6", "y7", "y8"}},
		parents:    parents,
		rescov:     [][2]string{{"y1", "y5"}, {"y2", "y4"}, {"y2", "y6"}, {"y3", "y7"}, {"y4", "y8"}, {"y6", "y8"}},
	}
	if parents["dem65"] != nil {
		m.effects = map[string][]string{"ind": {"ind60", "dem65", "dem60"}, "tot": {"ind60", "dem65"}}
	}
	return m
}

// fitMeasures maps the reference's fit measures to Indices.
var fitMeasures = map[string]func(Indices) float64{
	"npar":  func(f Indices) float64 { return float64(f.FreeParams) },
	"chisq": func(f Indices) float64 { return f.ChiSquare },
	"df":    func(f Indices) float64 { return float64(f.DF) }, "pvalue": func(f Indices) float64 { return f.P },
	"cfi": func(f Indices) float64 { return f.CFI }, "tli": func(f Indices) float64 { return f.TLI },
	"rmsea": func(f Indices) float64 { return f.RMSEA }, "srmr": func(f Indices) float64 { return f.SRMR },
	"rmsea.ci.lower": func(f Indices) float64 { return f.RMSEACI[0] },
	"rmsea.ci.upper": func(f Indices) float64 { return f.RMSEACI[1] },
	"baseline.chisq": func(f Indices) float64 { return f.BaselineChiSquare },
	"baseline.df":    func(f Indices) float64 { return float64(f.BaselineDF) },
}

// Every fit measure, estimate, SE (expected information), standardized
// value and defined effect of the R SEM reference
// (testdata/reference/latent/reference.json) to 1e-4 relative, under both
// likelihood conventions and with both optimizers.
func TestFit_Reference(t *testing.T) {
	ref := loadReference(t)
	for name, m := range referenceModels {
		rm := ref.Models[name]
		x := readColumns(t, rm.Data, m.columns)
		for _, lik := range []Likelihood{Wishart, Normal} {
			rc := rm.Wishart
			if lik == Normal {
				rc = rm.Normal
			}
			for _, method := range []Method{Scoring, QuasiNewton} {
				t.Run(fmt.Sprintf("%s/%d/%d", name, lik, method), func(t *testing.T) {
					s, n := covariance(x, lik)
					res, err := Fit(context.Background(), s, n, m.spec(), &Options{Likelihood: lik, Method: method})
					if err != nil {
						t.Fatal(err)
					}
					compareReference(t, m, res, rc)
				})
			}
		}
	}
}

const (
	refRel = 1e-4 // the brief's tolerance, relative
	refAbs = 1e-7 // for values that are 0 (a marker's SE, an RMSEA bound)
)

func compareReference(t *testing.T, m named, res *Result, rc refCase) {
	t.Helper()
	if !rc.Converged || rc.N != res.N {
		t.Fatalf("reference converged %v on %d cases", rc.Converged, rc.N)
	}
	for k, want := range rc.Fit {
		if got := fitMeasures[k](res.Fit); !close(got, want, refAbs, refRel) {
			t.Errorf("%s = %.8g, reference %.8g", k, got, want)
		}
	}
	for _, p := range rc.Params {
		got, ok := referenceValue(t, m, res, p)
		if !ok {
			continue
		}
		for i, want := range []float64{p.Est, p.SE, p.StdAll} {
			if !close(got[i], want, refAbs, refRel) {
				t.Errorf("%s %s %s: [est, se, std][%d] = %.8g, reference %.8g", p.LHS, p.Op, p.RHS, i, got[i], want)
			}
		}
	}
	if !res.Proper {
		t.Errorf("improper: %v", res.Problems)
	}
}

// referenceValue returns pathvet's estimate, SE and standardized value of
// the reference's row p.
func referenceValue(t *testing.T, m named, res *Result, p refParam) ([3]float64, bool) {
	switch p.Op {
	case "=~":
		to, from := m.node(p.RHS), m.node(p.LHS)
		return [3]float64{res.Coef.At(to, from), res.CoefSE.At(to, from), res.StdCoef.At(to, from)}, true
	case "~":
		to, from := m.node(p.LHS), m.node(p.RHS)
		return [3]float64{res.Coef.At(to, from), res.CoefSE.At(to, from), res.StdCoef.At(to, from)}, true
	case "~~":
		a, b := m.node(p.LHS), m.node(p.RHS)
		return [3]float64{res.Cov.At(a, b), res.CovSE.At(a, b), res.StdCov.At(a, b)}, true
	case ":=":
		e := m.effects[p.LHS]
		var through []int
		for _, v := range e[2:] {
			through = append(through, m.node(v))
		}
		got, err := Effect(res, m.node(e[0]), m.node(e[1]), through)
		if err != nil {
			t.Fatal(err)
		}
		return [3]float64{got.Estimate, got.SE, got.Std}, true
	}
	t.Errorf("unknown row %v", p)
	return [3]float64{}, false
}

// The SEs from the observed information (the exact Hessian of F_ML)
// against the reference's se_observed, both likelihood conventions.
func TestFit_ReferenceObservedInformation(t *testing.T) {
	ref := loadReference(t)
	for name, m := range referenceModels {
		rm := ref.Models[name]
		x := readColumns(t, rm.Data, m.columns)
		for _, lik := range []Likelihood{Wishart, Normal} {
			rc := rm.Wishart
			if lik == Normal {
				rc = rm.Normal
			}
			s, n := covariance(x, lik)
			res, err := Fit(bg, s, n, m.spec(), &Options{Likelihood: lik, Information: Observed})
			if err != nil {
				t.Fatalf("%s/%d: %v", name, lik, err)
			}
			for _, p := range rc.Params {
				if got, _ := referenceValue(t, m, res, p); !close(got[1], p.SEObs, refAbs, refRel) {
					t.Errorf("%s/%d: %s %s %s: SE %.8g, reference %.8g", name, lik, p.LHS, p.Op, p.RHS, got[1], p.SEObs)
				}
			}
		}
	}
}
