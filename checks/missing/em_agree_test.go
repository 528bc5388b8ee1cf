package missing

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// randomData makes n rows of p correlated normal variables; each cell of
// the first k columns is missing with probability share.
func randomData(seed uint64, n, p, k int, share float64) [][]float64 {
	r := rand.New(rand.NewPCG(seed, 3))
	cols := make([][]float64, p)
	for j := range cols {
		cols[j] = make([]float64, n)
	}
	for i := range n {
		f := r.NormFloat64()
		for j := range p {
			cols[j][i] = float64(j) + (0.3+0.1*float64(j%4))*f + r.NormFloat64()
			if j < k && r.Float64() < share {
				cols[j][i] = math.NaN()
			}
		}
	}
	return cols
}

// assertSameEstimates fails unless the means and covariances agree to tol
// relative to the SDs.
func assertSameEstimates(t *testing.T, got, want *EMResult, tol float64) {
	t.Helper()
	if d := maxChange(want.Mean, want.Cov, got.Mean, got.Cov); !(d < tol) {
		t.Errorf("estimates differ by %g (relative to the SDs), want < %g", d, tol)
	}
}

// The EM on sufficient statistics by pattern, with SQUAREM, reaches the
// estimates of the plain row-by-row EM it replaced, to the EM tolerance:
// with few patterns (sufficient statistics), with a pattern for nearly
// every row (rows in blocks), and mixed.
func TestEM_AgreesWithRowByRow(t *testing.T) {
	for _, c := range []struct {
		n, p, k int
		share   float64
	}{
		{2000, 6, 3, 0.2}, {300, 8, 8, 0.1}, {1000, 10, 10, 0.05},
		{150, 4, 2, 0.4}, {400, 3, 3, 0.6}, {200, 5, 5, 0.5},
	} {
		t.Run(fmt.Sprint(c), func(t *testing.T) {
			cols := randomData(uint64(c.n), c.n, c.p, c.k, c.share)
			opt := Options{Tolerance: 1e-12, MaxIter: 100000}
			want, err := emRowByRow(context.Background(), cols, opt)
			if err != nil {
				t.Fatal(err)
			}
			got, err := EM(context.Background(), cols, opt)
			if err != nil {
				t.Fatal(err)
			}
			if !got.Converged || !want.Converged {
				t.Fatalf("converged: %v, row by row %v", got.Converged, want.Converged)
			}
			assertSameEstimates(t, got, want, 1e-8)
			t.Logf("EM steps: %d with SQUAREM, %d without", got.Iterations, want.Iterations)
		})
	}
}

// Weights that count rows give the EM of the data with those rows
// repeated: the bootstrap copies no column.
func TestEM_WeightsRepeatRows(t *testing.T) {
	cols := randomData(9, 400, 5, 5, 0.15)
	r := rand.New(rand.NewPCG(4, 4))
	w := make([]float64, 400)
	copied := make([][]float64, len(cols))
	for range 400 {
		i := r.IntN(400)
		w[i]++
		for j, c := range cols {
			copied[j] = append(copied[j], c[i])
		}
	}
	opt := Options{Tolerance: 1e-12}
	want, err := emRowByRow(context.Background(), copied, Options{Tolerance: 1e-12, MaxIter: 100000})
	if err != nil {
		t.Fatal(err)
	}
	ps := Patterns(cols)
	got, err := emWeighted(context.Background(), cols, newLayout(cols, ps), ps, w, opt)
	if err != nil {
		t.Fatal(err)
	}
	assertSameEstimates(t, got, want, 1e-8)
}

// The imputed datasets do not depend on how many workers draw them.
func TestImputeEach_WorkersDoNotMatter(t *testing.T) {
	cols := randomData(5, 300, 4, 3, 0.2)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	sums := func(workers int) []float64 {
		out := make([]float64, 6)
		err := ImputeEach(context.Background(), cols, em, ImputeOptions{M: 6, Seed: 11, Workers: workers},
			func(k int, data *mat.Dense) error {
				out[k] = mat.Sum(data)
				return nil
			})
		if err != nil {
			t.Fatal(err)
		}
		return out
	}
	sameForWorkers(t, "sum", sums)
}

// sameForWorkers fails unless figure, one number per imputation, gives the
// same with one worker and with two, and differs between the first two
// imputations.
func sameForWorkers(t *testing.T, what string, figure func(workers int) []float64) {
	t.Helper()
	one, two := figure(1), figure(2)
	for k := range one {
		if one[k] != two[k] {
			t.Errorf("imputation %d: %s %v with one worker, %v with two", k+1, what, one[k], two[k])
		}
	}
	if one[0] == one[1] {
		t.Errorf("the first two imputations have the same %s", what)
	}
}

// RowMoments gives stat.CovarianceMatrix's covariance and stat.Mean's
// means, without copying the rows.
func TestRowMoments(t *testing.T) {
	x := rowMajor(randomData(2, 700, 5, 0, 0))
	mean, cov := RowMoments(x)
	want := mat.NewSymDense(5, nil)
	stat.CovarianceMatrix(want, x, nil)
	if !mat.EqualApprox(cov, want, 1e-12) {
		t.Errorf("covariance\n%v\nwant\n%v", mat.Formatted(cov), mat.Formatted(want))
	}
	for j := range mean {
		if m := stat.Mean(mat.Col(nil, j, x), nil); math.Abs(mean[j]-m) > 1e-12 {
			t.Errorf("mean %d = %v, want %v", j, mean[j], m)
		}
	}
}

// A panic in use comes back as an error, and use's error stops the rest.
func TestImputeEach_PanicAndError(t *testing.T) {
	cols := randomData(6, 100, 3, 2, 0.2)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	boom := func(k int, _ *mat.Dense) error {
		if k == 2 {
			panic("boom")
		}
		return nil
	}
	err = ImputeEach(context.Background(), cols, em, ImputeOptions{M: 4, Workers: 2}, boom)
	if err == nil || !strings.Contains(err.Error(), "imputation 3: internal error: boom") {
		t.Fatalf("got %v", err)
	}
	stop := errors.New("stop")
	fail := func(int, *mat.Dense) error { return stop }
	err = ImputeEach(context.Background(), cols, em, ImputeOptions{M: 4, Workers: 1}, fail)
	if !errors.Is(err, stop) {
		t.Fatalf("got %v", err)
	}
}

// EM is equivariant under a shift of the data: adding a million to every
// value moves the means by a million and leaves the covariance, to 1e-9 of
// the SDs; the sums about the starting means lose no digits to it.
func TestEM_ShiftEquivariant(t *testing.T) {
	cols := randomData(31, 3000, 6, 6, 0.2)
	base, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	const shift = 1e6
	moved := make([][]float64, len(cols))
	for j, c := range cols {
		for _, v := range c {
			moved[j] = append(moved[j], v+shift)
		}
	}
	got, err := EM(context.Background(), moved, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for j := range got.Mean {
		got.Mean[j] -= shift
	}
	assertSameEstimates(t, got, base, 1e-9)
}
