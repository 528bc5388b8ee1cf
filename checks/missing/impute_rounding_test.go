package missing

import (
	"context"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The adaptive rounding threshold of Bernaards, Belin & Schafer (2007,
// Statistics in Medicine 26, 1368–1382; definition recalled from memory):
// c = v̄ − Φ⁻¹(v̄)·sqrt(v̄(1 − v̄)), an imputed value above c rounded to 1.
// It is the point a normal with mean v̄ and variance v̄(1 − v̄) exceeds with
// probability v̄. Hand-worked: Φ⁻¹(0.2) = −0.841621 (standard normal
// table; Python's statistics.NormalDist().inv_cdf(0.2) gives
// −0.8416212335729142), so c(0.2) = 0.2 + 0.841621·0.4 = 0.536648 and
// c(0.8) = 0.8 − 0.841621·0.4 = 0.463352. Each case puts two imputed
// values 0.0035 either side of c, so a threshold at 1 − v̄, of the wrong
// sign, at 0.5 or compared the wrong way rounds at least one of them wrong.
var roundingCases = []struct {
	name       string
	ones       int        // observed 1s among the 97 observed rows
	imputed    [3]float64 // chosen so that the completed column has mean v̄
	want       [3]float64
	prevalence float64 // v̄
}{
	{name: "prevalence 0.2, c = 0.536648", ones: 19, imputed: [3]float64{0.5331, 0.5401, -0.0732},
		want: [3]float64{0, 1, 0}, prevalence: 0.2},
	{name: "prevalence 0.8, c = 0.463352", ones: 77, imputed: [3]float64{0.4599, 0.4668, 2.0733},
		want: [3]float64{0, 1, 1}, prevalence: 0.8},
}

func TestRoundBinary_HandWorkedThreshold(t *testing.T) {
	for _, tc := range roundingCases {
		const n = 100
		orig := make([]float64, n)
		done := mat.NewDense(n, 1, nil)
		for i := range n {
			switch {
			case i >= n-3:
				orig[i] = math.NaN()
				done.Set(i, 0, tc.imputed[i-(n-3)])
			case i < tc.ones:
				orig[i] = 1
				done.Set(i, 0, 1)
			}
		}
		if v := mat.Sum(done) / n; math.Abs(v-tc.prevalence) > 1e-12 {
			t.Fatalf("%s: the case is built wrong: completed mean %v", tc.name, v)
		}
		roundBinary(done, [][]float64{orig}, []bool{true})
		for k, want := range tc.want {
			if got := done.At(n-3+k, 0); got != want {
				t.Errorf("%s: imputed %v rounded to %v, want %v", tc.name, tc.imputed[k], got, want)
			}
		}
		for i := range n - 3 {
			if done.At(i, 0) != orig[i] {
				t.Fatalf("%s: observed value %d changed", tc.name, i)
			}
		}
	}
}

// Under MCAR a binary variable of prevalence 0.2 (n = 4000, half hidden)
// keeps its prevalence through imputation: the imputed values are normal
// draws with the bootstrap EM mean μ* and variance ≈ p̂(1 − p̂), and the
// adaptive threshold makes each round to 1 with probability ≈ v̄ ≈ p̂, the
// observed prevalence (the ML estimate under MCAR). The share f_k of 1s
// among the n_mis imputed cells then has variance at most
// p̂(1 − p̂)(1/n_obs + 1/n_mis) (the parameter draw, whose effect on f_k has
// slope below 1 in μ*, plus the binomial rounding draw), so the mean of
// m = 10 shares has SD at most 0.004 here; the bound is 4 SDs. A threshold
// at 1 − v̄ shifts the share to 0.255 and plain rounding at 0.5 to 0.227.
func TestImpute_BinaryKeepsPrevalence(t *testing.T) {
	const n, m = 4000, 10
	r := rand.New(rand.NewPCG(2007, 1368))
	x := make([]float64, n)
	for i := range x {
		x[i] = boolF(r.Float64() < 0.2)
	}
	var obs, ones float64
	for i := range x {
		if r.Float64() < 0.5 {
			x[i] = math.NaN()
			continue
		}
		obs, ones = obs+1, ones+x[i]
	}
	cols := [][]float64{x}
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	imps, err := impute(context.Background(), cols, em, ImputeOptions{M: m, Seed: 11, Binary: []bool{true}})
	if err != nil {
		t.Fatal(err)
	}
	p, mis := ones/obs, n-obs
	share := 0.0
	for _, imp := range imps {
		for i, v := range imp[0] {
			if math.IsNaN(x[i]) {
				if v != 0 && v != 1 {
					t.Fatalf("imputed binary value %v", v)
				}
				share += v / (mis * m)
			}
		}
	}
	sd := math.Sqrt(p * (1 - p) * (1/obs + 1/mis) / m)
	t.Logf("imputed prevalence %.4f, observed %.4f, SD bound %.4f", share, p, sd)
	if math.Abs(share-p) > 4*sd {
		t.Fatalf("imputed prevalence %.4f, observed %.4f (bound ±%.4f, 4 SDs)", share, p, 4*sd)
	}
}
