package missing

import (
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// invertSym by loops (k ≤ smallInverse) gives gonum's inverse of random
// positive definite matrices, and refuses matrices that are not positive
// definite, as the LAPACK route does.
func TestInvertSym_SmallAgreesWithGonum(t *testing.T) {
	r := rand.New(rand.NewPCG(8, 8))
	for k := 1; k <= smallInverse+1; k++ {
		for range 50 {
			a := mat.NewDense(k, k, nil)
			for i := range k {
				for j := range k {
					a.Set(i, j, r.NormFloat64())
				}
			}
			var spd mat.SymDense
			spd.SymOuterK(1, a)
			for i := range k {
				spd.SetSym(i, i, spd.At(i, i)+0.1)
			}
			s := make([]float64, k*k)
			for i := range k {
				for j := range k {
					s[i*k+j] = spd.At(i, j)
				}
			}
			if err := invertSym(s, k); err != nil {
				t.Fatalf("k = %d: %v", k, err)
			}
			var want mat.Dense
			if err := want.Inverse(&spd); err != nil {
				t.Fatal(err)
			}
			got := mat.NewDense(k, k, s)
			if !mat.EqualApprox(got, &want, 1e-9*mat.Norm(&want, 1)) {
				t.Fatalf("k = %d: inverse\n%v\nwant\n%v", k, mat.Formatted(got), mat.Formatted(&want))
			}
		}
		// Not positive definite at the last pivot only: the identity with
		// its last diagonal element zero, then negative.
		for _, last := range []float64{0, -1} {
			s := make([]float64, k*k)
			for i := range k {
				s[i*k+i] = 1
			}
			s[k*k-1] = last
			if err := invertSym(s, k); err != errNotPD {
				t.Errorf("k = %d, last diagonal %v: got %v, want errNotPD", k, last, err)
			}
		}
		// Not positive definite: a zero, then a negative eigenvalue.
		for _, shift := range []float64{0, -1} {
			s := make([]float64, k*k)
			for i := range k {
				for j := range k {
					s[i*k+j] = 1
				}
			}
			if k == 1 {
				s[0] = shift
			} else {
				s[(k-1)*k+k-1] += shift
			}
			if err := invertSym(s, k); err != errNotPD {
				t.Errorf("k = %d, shift %v: got %v, want errNotPD", k, shift, err)
			}
		}
	}
}
