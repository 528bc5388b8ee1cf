package linmod

import (
	"errors"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
)

// borderedRows draws n rows of p correlated variables (each a noisy sum of
// the ones before it), seeded.
func borderedRows(n, p int, seed uint64) *mat.Dense {
	r := rand.New(rand.NewPCG(seed, 3))
	d := mat.NewDense(n, p, nil)
	for i := range n {
		for j := range p {
			v := r.NormFloat64()
			for k := range j {
				v += 0.3 * d.At(i, k) / float64(j)
			}
			d.Set(i, j, 5*float64(j)+v*float64(1+j%3))
		}
	}
	return d
}

// Every fit Bordered makes agrees with the QR fit of the rows (FromRows,
// the package's oracle) on the same predictors: coefficient, SE, p-value
// and interval of the focal variable, whether it lies in base or in the
// set, with an empty base, an empty set, or both non-empty. Tolerances:
// 1e-9 relative (the moments lose a few digits to the QR fit's).
func TestBordered_AgreesWithRows(t *testing.T) {
	const n, p = 300, 12
	d := borderedRows(n, p, 11)
	cov, _ := rowMoments(d)
	r := rand.New(rand.NewPCG(5, 8))
	for trial := range 200 {
		perm := r.Perm(p)
		y, nb := perm[0], r.IntN(5) // base of 0 to 4 predictors
		base, extra := perm[1:1+nb], perm[1+nb:]
		b, err := NewBordered(cov, n, y, base, extra, 0.9)
		if err != nil {
			t.Fatal(err)
		}
		var set []int
		for _, v := range extra {
			if r.IntN(3) == 0 {
				set = append(set, v)
			}
		}
		pred := append(append([]int(nil), base...), set...)
		if len(pred) == 0 {
			continue
		}
		focal := pred[r.IntN(len(pred))]
		got, df, err := b.Coef(set, focal)
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		want, err := FromRows(cols(d, pred...), mat.Col(nil, y, d), 0.9)
		if err != nil {
			t.Fatal(err)
		}
		w := want.Coefs[slices.Index(pred, focal)]
		if df != want.DF || !scalar.EqualWithinAbsOrRel(got.Estimate, w.Estimate, 1e-12, 1e-9) ||
			!scalar.EqualWithinRel(got.StdError, w.StdError, 1e-9) ||
			!scalar.EqualWithinAbsOrRel(got.P, w.P, 1e-14, 1e-8) ||
			!scalar.EqualWithinAbsOrRel(got.CI[0], w.CI[0], 1e-12, 1e-9) {
			t.Errorf("trial %d (base %v, set %v, focal %d): bordered %+v df %d, rows %+v df %d",
				trial, base, set, focal, got, df, w, want.DF)
		}
	}
}

func TestBordered_Errors(t *testing.T) {
	d := borderedRows(40, 5, 2)
	cov, _ := rowMoments(d)
	if _, err := NewBordered(cov, 40, 0, []int{0, 1}, []int{2}, 0.95); !errors.Is(err, ErrBorderedInput) {
		t.Errorf("outcome in base: %v", err)
	}
	if _, err := NewBordered(cov, 40, 0, []int{1}, []int{1, 2}, 0.95); !errors.Is(err, ErrBorderedInput) {
		t.Errorf("overlap: %v", err)
	}
	b, err := NewBordered(cov, 40, 0, []int{1}, []int{2, 3}, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if _, _, err := b.Coef([]int{2}, 4); !errors.Is(err, ErrNotAPredictor) {
		t.Errorf("focal outside: %v", err)
	}
	if _, _, err := b.Coef([]int{4}, 1); !errors.Is(err, ErrBorderedInput) {
		t.Errorf("set outside extra: %v", err)
	}
	tiny, _ := NewBordered(cov, 4, 0, []int{1}, []int{2, 3}, 0.95)
	if _, _, err := tiny.Coef([]int{2, 3}, 1); !errors.Is(err, ErrTooFewCases) { // 4 − 3 − 1 = 0 df
		t.Errorf("no df left: %v", err)
	}
}

// WellConditioned: the identity passes; two variables correlated
// 1 − 1e-12 (condition number about 2e12 for the pair alone) fail, as
// FromMoments refuses them.
func TestWellConditioned(t *testing.T) {
	id := mat.NewSymDense(3, []float64{1, 0, 0, 0, 1, 0, 0, 0, 1})
	if !WellConditioned(id) {
		t.Error("identity")
	}
	near := mat.NewSymDense(3, []float64{1, 1 - 1e-12, 0, 1 - 1e-12, 1, 0, 0, 0, 1})
	if WellConditioned(near) {
		t.Error("nearly collinear pair passes")
	}
	if _, err := FromMoments(near, nil, 100, 2, []int{0, 1}, 0.95); err == nil {
		t.Error("FromMoments fits the nearly collinear pair: the test's premise fails")
	}
}
