package linmod

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// reference holds values from Debian's python3-statsmodels and
// python3-scipy, written by testdata/reference/scipy/make_reference.py.
type reference struct {
	OLS struct {
		Params, BSE, PValues []float64
		ConfInt              [][2]float64 `json:"conf_int"`
		RSquared             float64
	}
	Logit struct {
		Params, BSE, PValues []float64
		ConfInt              [][2]float64 `json:"conf_int"`
		LLF, LLNull, LLR     float64
		LLRPValue            float64 `json:"llr_pvalue"`
	}
	PartialR  float64                       `json:"partial_r_x1_y_given_x2_x3"`
	TTwoSided []struct{ T, DF, P float64 }  `json:"t_two_sided_p"`
	TQuantile []struct{ Q, DF, X float64 }  `json:"t_quantile"`
	ZTwoSided []struct{ Z, P float64 }      `json:"z_two_sided_p"`
	Chi2SF    []struct{ X, DF, SF float64 } `json:"chi2_sf"`
}

func loadReference(tb testing.TB) (*reference, *mat.Dense) {
	tb.Helper()
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		tb.Fatal(err)
	}
	var ref reference
	if err := json.Unmarshal(b, &ref); err != nil {
		tb.Fatal(err)
	}
	f, err := os.Open("../../testdata/reference/scipy/regression.csv")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	data := mat.NewDense(len(recs)-1, 5, nil) // x1 x2 x3 y yb
	for i, rec := range recs[1:] {
		for j := range 5 {
			data.Set(i, j, mustFloat(tb, rec[j]))
		}
	}
	return &ref, data
}

func cols(d *mat.Dense, idx ...int) *mat.Dense {
	n, _ := d.Dims()
	out := mat.NewDense(n, len(idx), nil)
	for j, c := range idx {
		out.SetCol(j, mat.Col(nil, c, d))
	}
	return out
}

func TestFromRows_Statsmodels(t *testing.T) {
	ref, d := loadReference(t)
	fit, err := FromRows(cols(d, 0, 1, 2), mat.Col(nil, 3, d), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	all := append([]Coef{*fit.Intercept}, fit.Coefs...)
	for i, c := range all {
		close := func(a, b float64) bool { return scalar.EqualWithinAbsOrRel(a, b, 1e-12, 1e-9) }
		if !close(c.Estimate, ref.OLS.Params[i]) || !close(c.StdError, ref.OLS.BSE[i]) ||
			!close(c.P, ref.OLS.PValues[i]) ||
			!close(c.CI[0], ref.OLS.ConfInt[i][0]) || !close(c.CI[1], ref.OLS.ConfInt[i][1]) {
			t.Errorf("coefficient %d: %+v; statsmodels %v ± %v, p %v, CI %v",
				i, c, ref.OLS.Params[i], ref.OLS.BSE[i], ref.OLS.PValues[i], ref.OLS.ConfInt[i])
		}
	}
	if !scalar.EqualWithinRel(fit.R2, ref.OLS.RSquared, 1e-10) {
		t.Errorf("R² %v, statsmodels %v", fit.R2, ref.OLS.RSquared)
	}
}

func TestLogistic_Statsmodels(t *testing.T) {
	ref, d := loadReference(t)
	fit, err := Logistic(cols(d, 0, 1), mat.Col(nil, 4, d), 0.95)
	if err != nil {
		t.Fatal(err)
	}
	all := append([]Coef{fit.Intercept}, fit.Coefs...)
	for i, c := range all {
		close := func(a, b float64) bool { return scalar.EqualWithinAbsOrRel(a, b, 1e-9, 1e-7) }
		if !close(c.Estimate, ref.Logit.Params[i]) || !close(c.StdError, ref.Logit.BSE[i]) ||
			!close(c.P, ref.Logit.PValues[i]) || !close(c.CI[0], ref.Logit.ConfInt[i][0]) {
			t.Errorf("coefficient %d: %+v; statsmodels %v ± %v, p %v",
				i, c, ref.Logit.Params[i], ref.Logit.BSE[i], ref.Logit.PValues[i])
		}
	}
	for _, c := range []struct{ got, want float64 }{
		{fit.LogLik, ref.Logit.LLF},
		{fit.NullLogLik, ref.Logit.LLNull},
		{fit.LR, ref.Logit.LLR},
		{fit.LRP, ref.Logit.LLRPValue},
	} {
		if !scalar.EqualWithinAbsOrRel(c.got, c.want, 1e-9, 1e-8) {
			t.Errorf("got %v, statsmodels %v", c.got, c.want)
		}
	}
}

func TestPartialCorrelation_Statsmodels(t *testing.T) {
	ref, d := loadReference(t)
	var cov mat.SymDense
	covOf(&cov, d)
	got, err := PartialCorrelation(&cov, 0, 3, []int{1, 2})
	if err != nil || !scalar.EqualWithinAbs(got, ref.PartialR, 1e-12) {
		t.Fatalf("partial r %v (%v), numpy residuals %v", got, err, ref.PartialR)
	}
}

// The p-values, intervals and Fisher-z tests linmod reports, against
// scipy's t and normal: p from t and df, the t quantile of an interval
// (df to 1e15), and the two-sided p of Fisher's z.
func TestInference_Scipy(t *testing.T) {
	ref, _ := loadReference(t)
	for _, c := range ref.TTwoSided {
		if got := tCoef(c.T, 1, int(c.DF), 0.95).P; !scalar.EqualWithinAbsOrRel(got, c.P, 1e-14, 1e-10) {
			t.Errorf("t = %v, df %v: p %v, scipy %v", c.T, c.DF, got, c.P)
		}
	}
	for _, c := range ref.TQuantile {
		level := 2*c.Q - 1 // the interval whose upper quantile is q
		if level <= 0 {
			continue
		}
		if got := newTInference(int(c.DF), level).q; !scalar.EqualWithinRel(got, c.X, 1e-10) {
			t.Errorf("t quantile %v, df %v: %v, scipy %v", c.Q, c.DF, got, c.X)
		}
	}
	for _, c := range ref.ZTwoSided { // includes z = 4.125 → p = .0000371 (reference-values.md)
		const n = 403 // sqrt(n − 3) = 20
		z, p, ok := FisherZ(math.Tanh(c.Z/20), n, 0)
		if !ok || !scalar.EqualWithinAbs(z, c.Z, 1e-12) || !scalar.EqualWithinRel(p, c.P, 1e-10) {
			t.Errorf("Fisher z = %v: p %v, scipy %v", z, p, c.P)
		}
	}
}

func TestLogistic_Separation(t *testing.T) {
	x := mat.NewDense(8, 1, []float64{1, 2, 3, 4, 5, 6, 7, 8})
	y := []float64{0, 0, 0, 0, 1, 1, 1, 1}
	if _, err := Logistic(x, y, 0.95); err != ErrSeparation {
		t.Fatalf("complete separation: %v", err)
	}
}

// Data simulated from a known linear model: the 95% intervals of the
// slopes cover the true values at about the nominal rate. Seeded; 400
// replications of 3 slopes give a binomial SD of about 0.7 points, so the
// tolerance of ±2.5 points is more than three SDs.
func TestFromRows_Coverage(t *testing.T) {
	r := rand.New(rand.NewPCG(11, 12))
	truth := []float64{0.5, -0.3, 0}
	covered, total := 0, 0
	for range 400 {
		n := 60
		x := mat.NewDense(n, 3, nil)
		y := make([]float64, n)
		for i := range n {
			y[i] = 1
			for j, b := range truth {
				v := r.NormFloat64()
				x.Set(i, j, v)
				y[i] += b * v
			}
			y[i] += r.NormFloat64()
		}
		fit, err := FromRows(x, y, 0.95)
		if err != nil {
			t.Fatal(err)
		}
		for j, b := range truth {
			if fit.Coefs[j].CI[0] <= b && b <= fit.Coefs[j].CI[1] {
				covered++
			}
			total++
		}
	}
	if rate := float64(covered) / float64(total); math.Abs(rate-0.95) > 0.025 {
		t.Fatalf("coverage %.3f, want 0.95 ± 0.025", rate)
	}
}

func covOf(dst *mat.SymDense, d *mat.Dense) {
	_, p := d.Dims()
	dst.ReuseAsSym(p)
	stat.CovarianceMatrix(dst, d, nil)
}
