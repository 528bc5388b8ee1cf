package missing

import (
	"context"
	"encoding/csv"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// airquality reads R's airquality data (datasets package, Debian's
// r-base-core; testdata/reference/airquality/export.R wrote the CSV):
// Ozone, Solar.R, Wind, Temp, Month, Day; NA is missing.
func airquality(tb testing.TB) [][]float64 {
	tb.Helper()
	f, err := os.Open("../../testdata/reference/airquality/airquality.csv")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	cols := make([][]float64, 6)
	for _, rec := range recs[1:] {
		for j, v := range rec {
			x := math.NaN()
			if v != "NA" {
				if x, err = strconv.ParseFloat(v, 64); err != nil {
					tb.Fatal(err)
				}
			}
			cols[j] = append(cols[j], x)
		}
	}
	return cols
}

// Complete data: EM gives the ML mean and covariance (divisor n) at once.
func TestEM_CompleteData(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	n := 50
	cols := [][]float64{make([]float64, n), make([]float64, n), make([]float64, n)}
	data := mat.NewDense(n, 3, nil)
	for i := range n {
		a, b, c := r.NormFloat64(), r.NormFloat64(), r.NormFloat64()
		for j, v := range []float64{a, a + b, 2 - b + c} {
			cols[j][i] = v
			data.Set(i, j, v)
		}
	}
	em, err := EM(context.Background(), cols, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if em.Iterations > 2 || !em.Converged {
		t.Fatalf("took %d iterations", em.Iterations)
	}
	cov := mat.NewSymDense(3, nil)
	stat.CovarianceMatrix(cov, data, nil)
	for i := range 3 {
		if !scalar.EqualWithinAbs(em.Mean[i], stat.Mean(cols[i], nil), 1e-12) {
			t.Errorf("mean %d", i)
		}
		for j := range 3 {
			want := cov.At(i, j) * float64(n-1) / float64(n)
			if !scalar.EqualWithinAbs(em.Cov.At(i, j), want, 1e-12) {
				t.Errorf("cov %d,%d = %v, want %v", i, j, em.Cov.At(i, j), want)
			}
		}
	}
}

// Bivariate normal with monotone missingness: EM agrees with the closed
// form ML estimates (Anderson 1957; Little & Rubin ch. 7) on airquality's
// Temp (all 153) and Ozone (116 observed), the closed-form figures worked
// from R's airquality (testdata/reference/airquality), to 1e-8; and with the
// closed form computed here from the complete cases.
func TestEM_MonotoneClosedForm(t *testing.T) {
	aq := airquality(t)
	temp, ozone := aq[3], aq[0]
	em, err := EM(context.Background(), [][]float64{temp, ozone}, Options{Tolerance: 1e-13})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"mu2", em.Mean[1], 42.1576370061}, {"s11", em.Cov.At(0, 0), 89.0057670127},
		{"s12", em.Cov.At(0, 1), 216.1686004962}, {"s22", em.Cov.At(1, 1), 1077.6808845474},
		{"beta", em.Cov.At(0, 1) / em.Cov.At(0, 0), 2.4287033049},
	} {
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-8, 1e-10) {
			t.Errorf("%s = %.10f, closed form %.10f", c.name, c.got, c.want)
		}
	}
	// The closed form itself: μ̂1 and σ̂11 from all of Temp; β̂ and the
	// residual variance from the complete pairs.
	var t1, t2 []float64
	for i := range temp {
		if !math.IsNaN(ozone[i]) {
			t1, t2 = append(t1, temp[i]), append(t2, ozone[i])
		}
	}
	mu1, s11 := stat.Mean(temp, nil), stat.PopVariance(temp, nil)
	m1, m2 := stat.Mean(t1, nil), stat.Mean(t2, nil)
	beta := stat.Covariance(t1, t2, nil) / stat.Variance(t1, nil)
	resid := (stat.PopVariance(t2, nil) - beta*beta*stat.PopVariance(t1, nil))
	if mu2 := m2 + beta*(mu1-m1); !scalar.EqualWithinAbs(em.Mean[1], mu2, 1e-8) {
		t.Errorf("mu2 %v vs closed form %v", em.Mean[1], mu2)
	}
	if s22 := resid + beta*beta*s11; !scalar.EqualWithinAbs(em.Cov.At(1, 1), s22, 1e-8) {
		t.Errorf("s22 %v vs closed form %v", em.Cov.At(1, 1), s22)
	}
	// Mean substitution of Ozone shrinks its variance to 817.93 (divisor n)
	// and the slope of Ozone on Temp to 1.8454 (reference-values.md).
	filled := append([]float64(nil), ozone...)
	for i, v := range filled {
		if math.IsNaN(v) {
			filled[i] = m2
		}
	}
	if v := stat.PopVariance(filled, nil); !scalar.EqualWithinAbs(v, 817.93, 0.005) {
		t.Errorf("mean-substituted variance %v", v)
	}
	if b := stat.Covariance(temp, filled, nil) / stat.Variance(temp, nil); !scalar.EqualWithinAbs(b, 1.8454, 5e-5) {
		t.Errorf("mean-substituted slope %v", b)
	}
}

// Little's test and the EM means on all six columns of airquality
// (reference-values.md [computed, agrees with a printed value]): d² =
// 35.106 on 14 df, p = .00142.
func TestLittleMCAR_Airquality(t *testing.T) {
	aq := airquality(t)
	em, err := EM(context.Background(), aq, Options{})
	if err != nil {
		t.Fatal(err)
	}
	for j, want := range []float64{42.5222, 185.5345, 9.9575, 77.8824, 6.9935, 15.8039} {
		if !scalar.EqualWithinAbs(em.Mean[j], want, 5e-5) {
			t.Errorf("EM mean %d = %.5f, want %.4f", j, em.Mean[j], want)
		}
	}
	lt, err := LittleMCAR(aq, em)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(lt.ChiSquare, 35.106, 5e-4) || lt.DF != 14 ||
		!scalar.EqualWithinAbs(lt.P, .00142, 5e-6) {
		t.Fatalf("d² = %.4f on %d df, p = %.5f", lt.ChiSquare, lt.DF, lt.P)
	}
	if s := Summarize(aq); s.Patterns != 4 || s.Rows != 153 || s.CompleteRows != 111 || s.MissingCells != 44 ||
		s.RowsByMissing[0] != 111 || s.RowsByMissing[1] != 40 || s.RowsByMissing[2] != 2 {
		t.Fatalf("summary %+v", s)
	}
}

// Rubin's rules and the Barnard–Rubin df, reference-values.md: Q = (.30,
// .28, .33, .31, .29), U = .0016 each, ν_com = 100 gives Q̄ = .302, B =
// .00037, T = .002044, ν_BR = 40.28 [memory formula, computed numbers];
// and ν_m = (m − 1)(1 + 1/r)² = 484 for m = 5, r = .10 [pub, Rubin 1987].
func TestPool(t *testing.T) {
	r, err := Pool([]float64{.30, .28, .33, .31, .29}, []float64{.0016, .0016, .0016, .0016, .0016}, 100, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(r.Estimate, .302, 1e-12) || !scalar.EqualWithinAbs(r.Between, .00037, 1e-12) ||
		!scalar.EqualWithinAbs(r.Total, .002044, 1e-12) || !scalar.EqualWithinAbs(r.DF, 40.28, 5e-3) {
		t.Fatalf("%+v", r)
	}
	c := math.Sqrt(1.0 / 30) // q with sample variance 1/12, so r = (1 + 1/5)(1/12)/1 = .10
	r, _ = Pool([]float64{-2 * c, -c, 0, c, 2 * c}, []float64{1, 1, 1, 1, 1}, 1e9, 0.95)
	if !scalar.EqualWithinAbs(r.RelativeIncrease, .1, 1e-12) || !scalar.EqualWithinAbs(r.DFRubin, 484, 1e-9) {
		t.Fatalf("r %v, ν_m %v", r.RelativeIncrease, r.DFRubin)
	}
}

// simulate draws n rows of (x, y) with y = 0.5x + e, then hides y where
// hide says so.
func simulate(r *rand.Rand, n int, hide func(x float64) bool) [][]float64 {
	x, y := make([]float64, n), make([]float64, n)
	for i := range n {
		x[i] = r.NormFloat64()
		y[i] = 0.5*x[i] + r.NormFloat64()
		if hide(x[i]) {
			y[i] = math.NaN()
		}
	}
	return [][]float64{x, y}
}

// Little's test: its df is Σ over patterns of the variables observed − p;
// under MCAR it rejects at about the nominal rate (500 seeded
// replications: 25 expected, binomial SD 4.9, bounds 10 to 40, three SDs),
// and under MAR most of the time.
func TestLittleMCAR_RejectionRates(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 8))
	mcar, mar := 0, 0
	for range 500 {
		cols := simulate(r, 200, func(float64) bool { return r.Float64() < 0.2 })
		em, err := EM(context.Background(), cols, Options{})
		if err != nil {
			t.Fatal(err)
		}
		lt, _ := LittleMCAR(cols, em)
		if lt.DF != 1 { // patterns {x, y} and {x}: 2 + 1 − 2
			t.Fatalf("df %d", lt.DF)
		}
		if lt.P < 0.05 {
			mcar++
		}
	}
	for range 100 {
		cols := simulate(r, 200, func(x float64) bool { return x > 0.3 && r.Float64() < 0.7 })
		em, _ := EM(context.Background(), cols, Options{})
		if lt, _ := LittleMCAR(cols, em); lt.P < 0.05 {
			mar++
		}
	}
	if mcar < 10 || mcar > 40 || mar < 80 {
		t.Fatalf("rejections: %d of 500 under MCAR (want 10–40), %d of 100 under MAR (want ≥ 80)", mcar, mar)
	}
}

func TestEM_Cancelled(t *testing.T) {
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	aq := airquality(t)
	if _, err := EM(ctx, aq, Options{}); err != context.Canceled {
		t.Fatalf("EM: %v", err)
	}
	em, _ := EM(context.Background(), aq, Options{})
	if _, err := impute(ctx, aq, em, ImputeOptions{M: 2}); !errors.Is(err, context.Canceled) {
		t.Fatalf("Impute: %v", err)
	}
}

// With no between-imputation variance and ν_com = 1e15, ν_BR ≈ 1e15 and
// the pooled t is the normal to 1e-15: the interval is Q̄ ± z_.975 and
// p = 2Φ(−5) (z_.975 = 1.959963984540054, 2Φ(−5) = 5.733031437583878e-7,
// scipy.stats.norm.ppf and 2*norm.sf). Gonum's incomplete-beta t gives
// 3.23 and a wrong p at such df.
func TestPool_LargeDF(t *testing.T) {
	r, err := Pool([]float64{5, 5, 5}, []float64{1, 1, 1}, 1e15, 0.95)
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbsOrRel(r.CI[1]-r.Estimate, 1.959963984540054, 1e-9, 1e-9) ||
		!scalar.EqualWithinAbsOrRel(r.P, 5.733031437583878e-7, 1e-15, 1e-8) {
		t.Fatalf("ν_BR %v: half-width %v, p %v", r.DF, r.CI[1]-r.Estimate, r.P)
	}
}
