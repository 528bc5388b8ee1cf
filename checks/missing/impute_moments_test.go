package missing

import (
	"context"
	"fmt"
	"math"
	"math/rand/v2"
	"strings"
	"sync/atomic"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// ImputeMoments gives, imputation by imputation, the means and covariance
// that stat.CovarianceMatrix computes from ImputeEach's completed rows
// (the same draws from the same streams): with few patterns (the reduced
// path), with a pattern for nearly every row (rows completed in blocks),
// mixed, and with means far from zero, where sums about zero would lose
// digits.
func TestImputeMoments_AgreesWithCompletedRows(t *testing.T) {
	for _, c := range []struct {
		name         string
		n, p, k      int
		share, shift float64
		workers      int
	}{
		{"few patterns", 5000, 6, 2, 0.3, 0, 2},
		{"a pattern a row", 400, 12, 12, 0.25, 0, 1},
		{"mixed", 3000, 9, 9, 0.05, 0, 2},
		{"means far from zero", 4000, 5, 3, 0.2, 1e6, 2},
	} {
		t.Run(c.name, func(t *testing.T) {
			cols := randomData(21, c.n, c.p, c.k, c.share)
			for _, col := range cols {
				for i := range col {
					col[i] += c.shift
				}
			}
			em, err := EM(context.Background(), cols, Options{})
			if err != nil {
				t.Fatal(err)
			}
			opt := ImputeOptions{M: 4, Seed: 3, Workers: c.workers}
			type mo struct {
				mean []float64
				cov  *mat.SymDense
			}
			want := make([]mo, opt.M)
			err = ImputeEach(context.Background(), cols, em, opt, func(k int, data *mat.Dense) error {
				cov := mat.NewSymDense(c.p, nil)
				stat.CovarianceMatrix(cov, data, nil)
				mean := make([]float64, c.p)
				for j := range mean {
					mean[j] = stat.Mean(mat.Col(nil, j, data), nil)
				}
				want[k] = mo{mean, cov}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			var seen atomic.Int64
			err = ImputeMoments(context.Background(), cols, em, opt, func(k int, mean []float64, cov *mat.SymDense) error {
				seen.Add(1)
				w := want[k]
				for i := range c.p {
					sd := math.Sqrt(w.cov.At(i, i))
					if d := math.Abs(mean[i]-w.mean[i]) / sd; d > 1e-9 {
						t.Errorf("imputation %d: mean %d = %v, want %v", k+1, i, mean[i], w.mean[i])
					}
					for j := range c.p {
						s := sd * math.Sqrt(w.cov.At(j, j))
						if d := math.Abs(cov.At(i, j)-w.cov.At(i, j)) / s; d > 1e-9 {
							t.Errorf("imputation %d: cov(%d, %d) = %v, want %v", k+1, i, j, cov.At(i, j), w.cov.At(i, j))
						}
					}
				}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			if int(seen.Load()) != opt.M {
				t.Errorf("use called %d times, want %d", seen.Load(), opt.M)
			}
		})
	}
}

// A binary variable with missing values needs its imputations rounded row
// by row, which moments cannot do: ImputeMoments says so. A binary
// variable that is complete is no obstacle.
func TestImputeMoments_RefusesBinaryWithMissing(t *testing.T) {
	cols := randomData(8, 200, 3, 1, 0.2)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	noop := func(int, []float64, *mat.SymDense) error { return nil }
	err = ImputeMoments(context.Background(), cols, em, ImputeOptions{M: 2, Binary: []bool{true, false, false}}, noop)
	if err == nil || !strings.Contains(err.Error(), "binary") {
		t.Fatalf("got %v, want a refusal naming the binary variable", err)
	}
	if err := ImputeMoments(context.Background(), cols, em, ImputeOptions{M: 2, Binary: []bool{false, true, false}}, noop); err != nil {
		t.Fatal(err)
	}
}

// The moments do not depend on how many workers draw them, and a
// cancelled context stops the imputations with its error.
func TestImputeMoments_WorkersAndCancel(t *testing.T) {
	cols := randomData(5, 3000, 4, 3, 0.2)
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	firstMeans := func(workers int) []float64 {
		out := make([]float64, 6)
		err := ImputeMoments(context.Background(), cols, em, ImputeOptions{M: 6, Seed: 11, Workers: workers},
			func(k int, mean []float64, _ *mat.SymDense) error {
				out[k] = mean[0]
				return nil
			})
		if err != nil {
			t.Fatal(err)
		}
		return out
	}
	sameForWorkers(t, "first mean", firstMeans)
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	err = ImputeMoments(ctx, cols, em, ImputeOptions{M: 6}, func(int, []float64, *mat.SymDense) error {
		t.Error("use called after the context ended")
		return nil
	})
	if err != context.Canceled {
		t.Errorf("got %v, want context.Canceled", err)
	}
}

// patternData makes rows of p correlated normal variables, counts[k] of
// them with the pattern pats[k] ('1' observed, '0' missing), in a shuffled
// order.
func patternData(seed uint64, p int, pats []string, counts []int) [][]float64 {
	r := rand.New(rand.NewPCG(seed, 1))
	var masks []string
	for k, pat := range pats {
		for range counts[k] {
			masks = append(masks, pat)
		}
	}
	r.Shuffle(len(masks), func(a, b int) { masks[a], masks[b] = masks[b], masks[a] })
	cols := make([][]float64, p)
	for j := range cols {
		cols[j] = make([]float64, len(masks))
	}
	for i, mask := range masks {
		f := r.NormFloat64()
		for j := range p {
			cols[j][i] = float64(j) + 0.6*f + r.NormFloat64()
			if mask[j] == '0' {
				cols[j][i] = math.NaN()
			}
		}
	}
	return cols
}

// The moments path agrees with the completed rows at its edges: one
// variable, patterns with no observed variable (reduced and row by row),
// two or three rows in all, patterns of exactly 2(p+1) rows (the smallest
// reduced) and one fewer, and patterns of chunkRows rows, one fewer and
// one more, and twice that.
func TestImputeMoments_EdgePatterns(t *testing.T) {
	for i, c := range []struct {
		p      int
		pats   []string
		counts []int
	}{
		{1, []string{"1", "0"}, []int{50, 3}},
		{1, []string{"1", "0"}, []int{50, 30}},
		{1, []string{"1", "0"}, []int{2, 1}},
		{1, []string{"1"}, []int{2}},
		{3, []string{"111", "000", "100"}, []int{100, 20, 8}},
		{3, []string{"111", "000", "100"}, []int{100, 3, 7}},
		{3, []string{"111", "010", "001"}, []int{chunkRows, 8, 7}},
		{3, []string{"111", "010", "001"}, []int{2 * chunkRows, chunkRows, chunkRows + 1}},
		{3, []string{"111", "010", "001"}, []int{chunkRows - 1, 1, 2*chunkRows + 1}},
		{9, []string{"111111111", "000000000", "101010101", "111111110"}, []int{500, 20, 20, 19}},
	} {
		t.Run(fmt.Sprint(i, c.pats, c.counts), func(t *testing.T) {
			cols := patternData(uint64(i+1), c.p, c.pats, c.counts)
			em, err := EM(context.Background(), cols, Options{})
			if err != nil {
				t.Fatal(err)
			}
			opt := ImputeOptions{M: 3, Seed: 7, Workers: 1}
			want := make([][]float64, opt.M) // means, then the covariance by rows
			err = ImputeEach(context.Background(), cols, em, opt, func(k int, data *mat.Dense) error {
				cov := mat.NewSymDense(c.p, nil)
				stat.CovarianceMatrix(cov, data, nil)
				for j := range c.p {
					want[k] = append(want[k], stat.Mean(mat.Col(nil, j, data), nil))
				}
				for a := range c.p {
					for b := range c.p {
						want[k] = append(want[k], cov.At(a, b))
					}
				}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
			err = ImputeMoments(context.Background(), cols, em, opt, func(k int, mean []float64, cov *mat.SymDense) error {
				w := want[k]
				sd := func(j int) float64 { return math.Sqrt(w[c.p+j*c.p+j]) }
				for j := range c.p {
					if d := math.Abs(mean[j]-w[j]) / sd(j); !(d < 1e-9) {
						t.Errorf("imputation %d: mean %d = %v, want %v", k+1, j, mean[j], w[j])
					}
					for b := range c.p {
						if d := math.Abs(cov.At(j, b)-w[c.p+j*c.p+b]) / (sd(j) * sd(b)); !(d < 1e-9) {
							t.Errorf("imputation %d: cov(%d, %d) = %v, want %v", k+1, j, b, cov.At(j, b), w[c.p+j*c.p+b])
						}
					}
				}
				return nil
			})
			if err != nil {
				t.Fatal(err)
			}
		})
	}
}
