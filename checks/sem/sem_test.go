package sem

import (
	"context"
	"encoding/json"
	"errors"
	"math"
	"math/rand/v2"
	"os"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"

	"github.com/pathvet/pathvet/checks/linmod"
)

// A worked example computed by hand (the demos' fit figures are checked
// against numpy/scipy too, testdata/reference/demos; formulas Steiger 1990, Browne & Cudeck 1993, Bentler
// 1990, Tucker & Lewis 1973, Shipley 2000): X → M → Y with r_XM = .5,
// r_XY = .3, r_MY = .4 and N = 200.
func TestFitDAG_WorkedExample(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, .5, .3, .5, 1, .4, .3, .4, 1}) // X, M, Y
	f, err := FitDAG(context.Background(), r, 200, [][]int{nil, {0}, {1}})
	if err != nil {
		t.Fatal(err)
	}
	const tol = 5e-5 // the reference is printed to 4 decimals
	for _, c := range []struct {
		name      string
		got, want float64
	}{
		{"b_MX", f.Coefficients[1][0], .5}, {"b_YM", f.Coefficients[2][0], .4},
		{"psi_M", f.Residual[1], .75}, {"psi_Y", f.Residual[2], .84},
		{"T", f.ChiSquare, 3.1841}, {"p", f.P, .0744},
		{"T_B", f.BaselineChiSquare, 95.129}, {"RMSEA", f.RMSEA, .1048},
		{"RMSEA low", f.RMSEACI[0], 0}, {"RMSEA high", f.RMSEACI[1], .2431},
		{"CFI", f.CFI, .9763}, {"TLI", f.TLI, .9289}, {"SRMR", f.SRMR, .0408},
	} {
		if !scalar.EqualWithinAbs(c.got, c.want, tol) && !scalar.EqualWithinRel(c.got, c.want, 1e-4) {
			t.Errorf("%s = %.6f, want %.4f", c.name, c.got, c.want)
		}
	}
	if f.DF != 1 || f.BaselineDF != 3 {
		t.Errorf("df %d, baseline df %d", f.DF, f.BaselineDF)
	}
	// The one implied independence X ⊥ Y | M: partial r = .125988, p = .0762.
	it := ZTest(r, 200, Independence{X: 0, Y: 2, Given: []int{1}})
	if !scalar.EqualWithinAbs(it.PartialR, .125988, 1e-6) || !scalar.EqualWithinAbs(it.P, .0762, 5e-5) {
		t.Errorf("partial r %.6f, p %.5f", it.PartialR, it.P)
	}
	// Shipley's C = −2 ln p. reference-values.md prints 5.1487, which is
	// −2 ln(.0762), from the rounded p; from the unrounded p scipy gives
	// 5.149150 (testdata/reference/scipy/reference.json, worked_example).
	c, df, p := ShipleyC([]float64{it.P})
	if !scalar.EqualWithinAbs(c, 5.149150, 5e-6) || df != 2 || !scalar.EqualWithinAbs(p, .0762, 5e-5) {
		t.Errorf("Shipley C %.4f on %d, p %.4f", c, df, p)
	}
}

// Closed forms: the partial correlation of a and c given b is
// (r_ac − r_ab r_bc)/sqrt((1 − r_ab²)(1 − r_bc²)).
func TestPartialCorrelation_ClosedForm(t *testing.T) {
	rab, rac, rbc := .35, -.2, .6
	r := mat.NewSymDense(3, []float64{1, rab, rac, rab, 1, rbc, rac, rbc, 1})
	want := (rac - rab*rbc) / math.Sqrt((1-rab*rab)*(1-rbc*rbc))
	got := ZTest(r, 100, Independence{X: 0, Y: 2, Given: []int{1}}).PartialR
	if !scalar.EqualWithinAbs(got, want, 1e-12) {
		t.Fatalf("got %v, want %v", got, want)
	}
}

// A saturated model has χ² = 0 and df = 0; df is the number of
// non-adjacent pairs.
func TestFitDAG_Saturated(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, .5, .3, .5, 1, .4, .3, .4, 1})
	f, err := FitDAG(context.Background(), r, 200, [][]int{nil, {0}, {0, 1}})
	if err != nil {
		t.Fatal(err)
	}
	if f.ChiSquare != 0 || f.DF != 0 || f.RMSEA != 0 || f.CFI != 1 || !math.IsNaN(f.P) {
		t.Fatalf("saturated: T %v df %d RMSEA %v CFI %v p %v", f.ChiSquare, f.DF, f.RMSEA, f.CFI, f.P)
	}
	r4 := mat.NewSymDense(4, []float64{1, .3, .2, .1, .3, 1, .4, .2, .2, .4, 1, .3, .1, .2, .3, 1})
	// a → b → c, d alone: non-adjacent pairs a–c, a–d, b–d, c–d: df 4.
	f, err = FitDAG(context.Background(), r4, 100, [][]int{nil, {0}, {1}, nil})
	if err != nil || f.DF != 4 {
		t.Fatalf("df %d (%v), want 4", f.DF, err)
	}
}

// Markov-equivalent DAGs give the same χ² on the same data: a → b → c,
// a ← b ← c and a ← b → c.
func TestFitDAG_EquivalentGraphsFitAlike(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, .45, .1, .45, 1, .3, .1, .3, 1})
	var ts []float64
	for _, pa := range [][][]int{{nil, {0}, {1}}, {{1}, {2}, nil}, {{1}, nil, {1}}} {
		f, err := FitDAG(context.Background(), r, 150, pa)
		if err != nil {
			t.Fatal(err)
		}
		ts = append(ts, f.ChiSquare)
	}
	if !scalar.EqualWithinRel(ts[0], ts[1], 1e-10) || !scalar.EqualWithinRel(ts[0], ts[2], 1e-10) {
		t.Fatalf("χ² differ: %v", ts)
	}
	f, _ := FitDAG(context.Background(), r, 150, [][]int{nil, nil, {0, 1}}) // a → c ← b: not equivalent
	if scalar.EqualWithinRel(f.ChiSquare, ts[0], 1e-6) {
		t.Fatalf("a non-equivalent graph fits alike: %v", f.ChiSquare)
	}
}

func TestHolm(t *testing.T) {
	got := Holm([]float64{0.01, 0.04, 0.03, math.NaN(), 0.005})
	want := []float64{0.03, 0.06, 0.06, math.NaN(), 0.02} // 4 tests: .005·4, .01·3, .03·2, max(.04·1, .06)
	for i := range want {
		if !(math.IsNaN(want[i]) && math.IsNaN(got[i])) && !scalar.EqualWithinAbs(got[i], want[i], 1e-12) {
			t.Errorf("Holm[%d] = %v, want %v", i, got[i], want[i])
		}
	}
}

type scipyRef struct {
	Chi2SF []struct{ X, DF, SF float64 } `json:"chi2_sf"`
	NCX2   []struct {
		X, DF, NC, CDF float64
	} `json:"ncx2_cdf"`
	NCX2PPF []struct {
		Q, DF, NC, PPF float64
	} `json:"ncx2_ppf"`
}

// Noncentral chi-square values from Debian's python3-scipy, recorded by
// testdata/reference/scipy/make_reference.py.
func TestNoncentralChiSquared_Scipy(t *testing.T) {
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref scipyRef
	if err := json.Unmarshal(b, &ref); err != nil {
		t.Fatal(err)
	}
	for _, c := range ref.NCX2 {
		got := NoncentralChiSquaredCDF(c.X, c.DF, c.NC)
		if !scalar.EqualWithinAbsOrRel(got, c.CDF, 1e-9, 1e-8) {
			t.Errorf("ncx2 cdf(%v; %v, %v) = %.12g, scipy %.12g", c.X, c.DF, c.NC, got, c.CDF)
		}
	}
	// The quantiles, through the root-finding on the noncentrality: the λ
	// at which scipy's ppf is the q-th quantile is the λ we started from.
	for _, c := range ref.NCX2PPF {
		got, _ := noncentrality(context.Background(), c.PPF, c.DF, c.Q)
		if !scalar.EqualWithinAbsOrRel(got, c.NC, 1e-6, 1e-6) {
			t.Errorf("noncentrality for ppf %.6g (q %v, df %v) = %.8g, want %v",
				c.PPF, c.Q, c.DF, got, c.NC)
		}
	}
}

func sqrt(x float64) float64 { return math.Sqrt(x) }

// Data simulated from a known linear SEM: the fitted coefficients of the
// true DAG recover the generating ones, and the model is not rejected.
// Seeded; with 20,000 cases the coefficients' SEs are below .01, so a
// tolerance of .03 is three SEs and more.
func TestFitDAG_RecoversSimulatedSEM(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	n := 20000
	rows := mat.NewDense(n, 3, nil)
	for i := range n {
		x := r.NormFloat64()
		m := 0.5*x + r.NormFloat64()
		y := 0.4*m - 0.3*x + r.NormFloat64()
		rows.SetRow(i, []float64{x, m, y})
	}
	cov := mat.NewSymDense(3, nil)
	stat.CovarianceMatrix(cov, rows, nil)
	f, err := FitDAG(context.Background(), cov, n, [][]int{nil, {0}, {0, 1}})
	if err != nil {
		t.Fatal(err)
	}
	if !scalar.EqualWithinAbs(f.Coefficients[1][0], 0.5, 0.03) ||
		!scalar.EqualWithinAbs(f.Coefficients[2][0], -0.3, 0.03) ||
		!scalar.EqualWithinAbs(f.Coefficients[2][1], 0.4, 0.03) {
		t.Fatalf("coefficients %v", f.Coefficients)
	}
	// A wrong graph (X → M → Y without X → Y) is rejected.
	wrong, _ := FitDAG(context.Background(), cov, n, [][]int{nil, {0}, {1}})
	if !(wrong.P < 1e-6) {
		t.Fatalf("the wrong graph is not rejected: p = %v", wrong.P)
	}
}

// Both sides of the switch to Sankaran's approximation, and far past it,
// at scipy's 5th, 50th and 95th percentiles (testdata/reference/scipy,
// ncx2_cdf_switch); just below the switch the mixture and the
// approximation agree as well.
func TestNoncentralChiSquared_Switch(t *testing.T) {
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		Switch []struct{ X, DF, NC, CDF float64 } `json:"ncx2_cdf_switch"`
	}
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Switch) == 0 {
		t.Fatalf("reference: %v", err)
	}
	for _, c := range ref.Switch {
		if got := NoncentralChiSquaredCDF(c.X, c.DF, c.NC); !scalar.EqualWithinAbs(got, c.CDF, 1e-5) {
			t.Errorf("ncx2 cdf(%v; %v, %v) = %.8f, scipy %.8f", c.X, c.DF, c.NC, got, c.CDF)
		}
		if c.NC < SankaranLambda {
			if s := sankaranCDF(c.X, c.DF, c.NC); !scalar.EqualWithinAbs(s, c.CDF, 1e-5) {
				t.Errorf("Sankaran at λ %v: %.8f, scipy %.8f", c.NC, s, c.CDF)
			}
		}
	}
}

// A fit with n = 1e15 (and at the int64 maximum) returns, with a finite or
// NaN-handled RMSEA interval (the noncentral chi-square's cost does not
// grow with λ); a cancelled context stops it with its error.
func TestFitDAG_HugeNAndCancel(t *testing.T) {
	r := mat.NewSymDense(3, []float64{1, .5, .3, .5, 1, .4, .3, .4, 1})
	for _, n := range []int{1e12, 1e15, math.MaxInt64} {
		f, err := FitDAG(context.Background(), r, n, [][]int{nil, {0}, {1}})
		if err != nil {
			t.Fatalf("n = %d: %v", n, err)
		}
		lo, hi := f.RMSEACI[0], f.RMSEACI[1]
		if math.IsNaN(lo) || math.IsNaN(hi) || !(lo <= f.RMSEA && f.RMSEA <= hi) || math.IsNaN(f.P) {
			t.Errorf("n = %d: RMSEA %v, interval [%v, %v], p %v", n, f.RMSEA, lo, hi, f.P)
		}
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := FitDAG(ctx, r, 1e15, [][]int{nil, {0}, {1}}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled: %v", err)
	}
}

// Shipley's C from Fisher-z tests far in the tail (z = 8.5, 10, 12): the
// p-values stay numbers (1 − Φ would round them to 0 and C to about
// 4,470), so C and its p agree with scipy (testdata/reference/scipy,
// shipley_tiny).
func TestShipleyC_TinyP(t *testing.T) {
	b, err := os.ReadFile("../../testdata/reference/scipy/reference.json")
	if err != nil {
		t.Fatal(err)
	}
	var ref struct {
		S struct {
			Z    []float64
			C, P float64
		} `json:"shipley_tiny"`
	}
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.S.Z) == 0 {
		t.Fatalf("reference: %v", err)
	}
	const n = 403 // sqrt(n − 3) = 20
	var ps []float64
	for _, z := range ref.S.Z {
		_, p, ok := linmod.FisherZ(math.Tanh(z/20), n, 0)
		if !ok || p == 0 {
			t.Fatalf("z = %v: p %v", z, p)
		}
		ps = append(ps, p)
	}
	c, df, p := ShipleyC(ps)
	if !scalar.EqualWithinRel(c, ref.S.C, 1e-9) || df != 6 || !scalar.EqualWithinRel(p, ref.S.P, 1e-6) {
		t.Fatalf("C = %v on %d, p %v; scipy C %v, p %v", c, df, p, ref.S.C, ref.S.P)
	}
}
