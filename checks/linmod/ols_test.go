package linmod

import (
	"bufio"
	"encoding/csv"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// nistCase is a NIST StRD linear regression with its certified values
// (NIST StRD certified values; the data in testdata/reference/nist).
type nistCase struct {
	name      string
	x         *mat.Dense
	y         []float64
	b, sd     []float64 // B0 first
	residSD   float64
	r2        float64
	tolerance float64 // relative: at least 7 significant digits
}

func readLongley(tb testing.TB) (*mat.Dense, []float64) {
	tb.Helper()
	f, err := os.Open("../../testdata/reference/nist/longley.csv")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	x := mat.NewDense(len(recs)-1, 6, nil)
	y := make([]float64, len(recs)-1)
	for i, rec := range recs[1:] {
		y[i] = mustFloat(tb, rec[1]) // TOTEMP
		for j := range 6 {
			x.Set(i, j, mustFloat(tb, rec[2+j])) // GNPDEFL GNP UNEMP ARMED POP YEAR
		}
	}
	return x, y
}

func readNorris(tb testing.TB) (*mat.Dense, []float64) {
	tb.Helper()
	f, err := os.Open("../../testdata/reference/nist/Norris.dat")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	var xs, ys []float64
	sc := bufio.NewScanner(f)
	for line := 1; sc.Scan(); line++ {
		if line < 61 { // data on lines 61 to 96 (the file's header)
			continue
		}
		fs := strings.Fields(sc.Text())
		if len(fs) == 2 {
			ys, xs = append(ys, mustFloat(tb, fs[0])), append(xs, mustFloat(tb, fs[1]))
		}
	}
	return mat.NewDense(len(xs), 1, xs), ys
}

func mustFloat(tb testing.TB, s string) float64 {
	v, err := strconv.ParseFloat(s, 64)
	if err != nil {
		tb.Fatal(err)
	}
	return v
}

func nistCases(tb testing.TB) []nistCase {
	lx, ly := readLongley(tb)
	nx, ny := readNorris(tb)
	return []nistCase{
		{
			name: "Longley", x: lx, y: ly, tolerance: 1e-7,
			// Certified values, NIST StRD Longley.
			b: []float64{-3482258.63459582, 15.0618722713733, -0.0358191792925910, -2.02022980381683,
				-1.03322686717359, -0.0511041056535807, 1829.15146461355},
			sd: []float64{890420.383607373, 84.9149257747669, 0.0334910077722432, 0.488399681651699,
				0.214274163161675, 0.226073200069370, 455.478499142212},
			residSD: 304.854073561965, r2: 0.995479004577296,
		},
		{
			name: "Norris", x: nx, y: ny, tolerance: 1e-7,
			// Certified values, NIST StRD Norris.
			b:       []float64{-0.262323073774029, 1.00211681802045},
			sd:      []float64{0.232818234301152, 0.429796848199937e-03},
			residSD: 0.884796396144373, r2: 0.999993745883712,
		},
	}
}

func checkNIST(t *testing.T, tc nistCase, fit *Fit) {
	t.Helper()
	got := append([]Coef{*fit.Intercept}, fit.Coefs...)
	for i, c := range got {
		if !scalar.EqualWithinRel(c.Estimate, tc.b[i], tc.tolerance) {
			t.Errorf("B%d = %.15g, certified %.15g", i, c.Estimate, tc.b[i])
		}
		if !scalar.EqualWithinRel(c.StdError, tc.sd[i], tc.tolerance) {
			t.Errorf("SD(B%d) = %.15g, certified %.15g", i, c.StdError, tc.sd[i])
		}
	}
	if rsd := math.Sqrt(fit.Sigma2); !scalar.EqualWithinRel(rsd, tc.residSD, tc.tolerance) {
		t.Errorf("residual SD %.15g, certified %.15g", rsd, tc.residSD)
	}
	if !scalar.EqualWithinRel(fit.R2, tc.r2, tc.tolerance) {
		t.Errorf("R² %.15g, certified %.15g", fit.R2, tc.r2)
	}
}

func TestFromRows_NIST(t *testing.T) {
	for _, tc := range nistCases(t) {
		t.Run(tc.name, func(t *testing.T) {
			fit, err := FromRows(tc.x, tc.y, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			checkNIST(t, tc, fit)
		})
	}
}

// The same certified values from the covariance matrix and means computed
// from the rows, as a paper's summary statistics would give them.
func TestFromMoments_NIST(t *testing.T) {
	for _, tc := range nistCases(t) {
		t.Run(tc.name, func(t *testing.T) {
			n, k := tc.x.Dims()
			all := mat.NewDense(n, k+1, nil)
			all.Slice(0, n, 0, k).(*mat.Dense).Copy(tc.x)
			all.SetCol(k, tc.y)
			cov := mat.NewSymDense(k+1, nil)
			stat.CovarianceMatrix(cov, all, nil)
			means := make([]float64, k+1)
			for j := range k + 1 {
				means[j] = stat.Mean(mat.Col(nil, j, all), nil)
			}
			x := make([]int, k)
			for j := range x {
				x[j] = j
			}
			fit, err := FromMoments(cov, means, n, k, x, 0.95)
			if err != nil {
				t.Fatal(err)
			}
			checkNIST(t, tc, fit)
		})
	}
}

func TestFromMoments_Errors(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, 1, 0.5, 1, 1, 0.5, 0.5, 0.5, 1}) // x0 and x1 identical
	if _, err := FromMoments(r, nil, 100, 2, []int{0, 1}, 0.95); err == nil {
		t.Error("collinear predictors gave no error")
	}
	r = mat.NewSymDense(2, []float64{1, 0.3, 0.3, 1})
	if _, err := FromMoments(r, nil, 2, 1, []int{0}, 0.95); err != ErrTooFewCases {
		t.Errorf("n = 2: %v", err)
	}
	one := mat.NewSymDense(2, []float64{1, 1, 1, 1})
	if _, err := FromMoments(one, nil, 50, 1, []int{0}, 0.95); err == nil {
		t.Error("perfect fit gave no error")
	}
}
