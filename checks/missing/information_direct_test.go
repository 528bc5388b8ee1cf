package missing

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
)

// directInformation is ObservedInformation's formula taken as it reads:
// per pattern A = Σ_OO⁻¹ by its own inverse, a = A d, C = A S A − (n/2) A,
// and every entry of the pattern's information added one by one.
func directInformation(tb testing.TB, cols [][]float64, em *EMResult) *mat.SymDense {
	p := len(cols)
	info := mat.NewSymDense(ParamCount(p), nil)
	w := func(i, j int) float64 { return map[bool]float64{true: 0.5, false: 1}[i == j] }
	for _, pat := range Patterns(cols) {
		obs := pat.obs
		if len(obs) == 0 {
			continue
		}
		n, q := float64(len(pat.Rows)), len(obs)
		a, d, s := directBlocks(tb, cols, pat, em)
		var ad mat.VecDense
		ad.MulVec(a, d)
		var c mat.Dense
		c.Mul(a, s)
		c.Mul(&c, a)
		c.Apply(func(i, j int, v float64) float64 { return v - n/2*a.At(i, j) }, &c)
		add := func(x, y int, v float64) { info.SetSym(x, y, info.At(x, y)+v) }
		for r := range q {
			for k := range q {
				if k <= r {
					add(MeanParam(obs[r]), MeanParam(obs[k]), n*a.At(r, k))
				}
				for l := 0; l <= k; l++ {
					v := w(k, l) * (a.At(r, k)*ad.AtVec(l) + a.At(r, l)*ad.AtVec(k))
					add(CovParam(p, obs[k], obs[l]), MeanParam(obs[r]), v)
				}
			}
		}
		for i := range q {
			for j := 0; j <= i; j++ {
				for k := range q {
					for l := 0; l <= k; l++ {
						if CovParam(p, obs[k], obs[l]) > CovParam(p, obs[i], obs[j]) {
							continue
						}
						t := a.At(i, k)*c.At(j, l) + a.At(i, l)*c.At(j, k) +
							a.At(j, k)*c.At(i, l) + a.At(j, l)*c.At(i, k)
						add(CovParam(p, obs[i], obs[j]), CovParam(p, obs[k], obs[l]), w(i, j)*w(k, l)*t)
					}
				}
			}
		}
	}
	return info
}

// directBlocks are Σ_OO⁻¹, d and S of pattern pat (see ObservedInformation).
func directBlocks(tb testing.TB, cols [][]float64, pat Pattern, em *EMResult) (*mat.Dense, *mat.VecDense,
	*mat.Dense) {
	obs := pat.obs
	q := len(obs)
	sub := mat.NewDense(q, q, nil)
	for b, i := range obs {
		for c, j := range obs {
			sub.Set(b, c, em.Cov.At(i, j))
		}
	}
	var a mat.Dense
	if err := a.Inverse(sub); err != nil {
		tb.Fatal(err)
	}
	d, s := mat.NewVecDense(q, nil), mat.NewDense(q, q, nil)
	for _, r := range pat.Rows {
		for b, i := range obs {
			d.SetVec(b, d.AtVec(b)+cols[i][r]-em.Mean[i])
			for c, j := range obs {
				s.Set(b, c, s.At(b, c)+(cols[i][r]-em.Mean[i])*(cols[j][r]-em.Mean[j]))
			}
		}
	}
	return &a, d, s
}

// The information summed in the precision matrix's coordinates (infoAcc)
// is the information of ObservedInformation's formula taken entry by
// entry (directInformation): on correlated data of 7 variables and 400
// rows with a pattern for nearly every row, patterns of many rows (the
// complete rows; the first variable alone missing in 60 rows), rows with
// one variable observed and rows with none. Tolerance 1e-9 relative
// (two orders of summation; seen: about 1e-12).
func TestObservedInformation_AgreesWithDirectSum(t *testing.T) {
	const p, n = 7, 400
	r := rand.New(rand.NewPCG(7, 400))
	cols := make([][]float64, p)
	for j := range cols {
		cols[j] = make([]float64, n)
	}
	for i := range n {
		f := r.NormFloat64()
		for j := range p {
			cols[j][i] = 3 + float64(j) + 0.7*f + 0.6*r.NormFloat64()
			switch {
			case i < 100: // complete
			case i < 160:
				cols[0][i] = math.NaN()
			case i < 165: // the first observed alone
				if j > 0 {
					cols[j][i] = math.NaN()
				}
			case i < 168: // none observed
				cols[j][i] = math.NaN()
			case r.Float64() < 0.3:
				cols[j][i] = math.NaN()
			}
		}
	}
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	got, err := ObservedInformation(context.Background(), cols, em)
	if err != nil {
		t.Fatal(err)
	}
	want := directInformation(t, cols, em)
	d := ParamCount(p)
	for i := range d {
		for j := 0; j <= i; j++ {
			if !scalar.EqualWithinAbsOrRel(got.At(i, j), want.At(i, j), 1e-9, 1e-9) {
				t.Errorf("information[%d][%d] = %.12g, direct sum %.12g", i, j, got.At(i, j), want.At(i, j))
			}
		}
	}
}
