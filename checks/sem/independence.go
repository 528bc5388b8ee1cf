package sem

import (
	"math"
	"sort"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
	"github.com/pathvet/pathvet/checks/linmod"
)

// Independence is one implied statement X ⊥ Y | Given.
type Independence struct {
	X, Y  int
	Given []int
}

// IndependenceTest is the Fisher z test of one statement.
type IndependenceTest struct {
	Independence
	PartialR float64
	Z, P     float64 // NaN when the test cannot be made
	Err      error
}

// ZTest tests X ⊥ Y | Given from the correlation (or
// covariance) matrix r of n cases by the partial correlation and Fisher's
// z, SE = 1/sqrt(n − |Given| − 3) (README, "Checks").
func ZTest(r mat.Symmetric, n int, ind Independence) IndependenceTest {
	t := IndependenceTest{Independence: ind, Z: math.NaN(), P: math.NaN()}
	pr, err := linmod.PartialCorrelation(r, ind.X, ind.Y, ind.Given)
	if err != nil {
		t.PartialR, t.Err = math.NaN(), err
		return t
	}
	t.PartialR = pr
	if z, p, ok := linmod.FisherZ(pr, n, len(ind.Given)); ok {
		t.Z, t.P = z, p
	}
	return t
}

// Holm returns Holm's (1979) step-down adjusted p-values, in the order of
// p: the i-th smallest of m is multiplied by m − i + 1, then made
// non-decreasing and capped at 1. NaN entries stay NaN and do not count.
func Holm(p []float64) []float64 {
	idx := make([]int, 0, len(p))
	for i, v := range p {
		if !math.IsNaN(v) {
			idx = append(idx, i)
		}
	}
	sort.SliceStable(idx, func(a, b int) bool { return p[idx[a]] < p[idx[b]] })
	out := make([]float64, len(p))
	for i := range out {
		out[i] = math.NaN()
	}
	run := 0.0
	for rank, i := range idx {
		run = math.Max(run, math.Min(1, p[i]*float64(len(idx)-rank)))
		out[i] = run
	}
	return out
}

// ShipleyC combines the p-values of a basis set of k independences
// (Shipley 2000): C = −2 Σ ln p_i, χ² with 2k degrees of freedom under the
// model. NaN entries are left out. The p-values come from complementary
// tails and stay exact down to about 1e-308 (|z| ≈ 37.5 for Fisher's z);
// one that underflows to 0 counts as the smallest positive double, so C
// is then a lower bound.
func ShipleyC(p []float64) (c float64, df int, pv float64) {
	for _, v := range p {
		if math.IsNaN(v) {
			continue
		}
		c += -2 * math.Log(math.Max(v, math.SmallestNonzeroFloat64))
		df += 2
	}
	if df == 0 {
		return 0, 0, math.NaN()
	}
	return c, df, effects.ChiSquaredSF(c, float64(df))
}
