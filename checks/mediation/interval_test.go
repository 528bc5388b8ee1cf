package mediation

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/integrate/quad"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat/distuv"
)

// singleMediator is x → m → y with x → y: a = 0.4 (SE 0.15), b = 0.3
// (SE 0.12), c′ = 0.1, b and c′ correlated (they share y's equation).
func singleMediator() *Model {
	return &Model{
		B:       mat.NewDense(3, 3, []float64{0, 0.4, 0.1, 0, 0, 0.3, 0, 0, 0}),
		Parents: [][]int{nil, {0}, {0, 1}},
		Cov: []*mat.SymDense{nil, mat.NewSymDense(1, []float64{0.15 * 0.15}),
			mat.NewSymDense(2, []float64{0.01, -0.006, -0.006, 0.12 * 0.12})},
	}
}

// productCDF is P(ab ≤ q) for independent a ~ N(ma, sa²), b ~ N(mb, sb²),
// by Gauss–Legendre quadrature over a (split at 0, where b's bound
// changes side): the distribution of the product that the Monte Carlo
// interval samples (MacKinnon, Lockwood & Williams 2004 tabulate it).
func productCDF(q, ma, sa, mb, sb float64) float64 {
	pa := distuv.Normal{Mu: ma, Sigma: sa}
	pb := distuv.Normal{Mu: mb, Sigma: sb}
	f := func(a float64) float64 {
		if a > 0 {
			return pa.Prob(a) * pb.CDF(q/a)
		}
		return pa.Prob(a) * pb.Survival(q/a)
	}
	lo, hi := ma-12*sa, ma+12*sa
	if lo >= 0 || hi <= 0 {
		return quad.Fixed(f, lo, hi, 4000, quad.Legendre{}, 0)
	}
	return quad.Fixed(f, lo, 0, 4000, quad.Legendre{}, 0) + quad.Fixed(f, 0, hi, 4000, quad.Legendre{}, 0)
}

// productQuantile inverts productCDF by bisection.
func productQuantile(p, ma, sa, mb, sb float64) float64 {
	lo, hi := -5.0, 5.0
	for range 200 {
		mid := (lo + hi) / 2
		if productCDF(mid, ma, sa, mb, sb) < p {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2
}

// The Monte Carlo interval's ends against the quantiles of the product of
// the two normals, computed by quadrature (productCDF), within four
// Monte Carlo standard errors of a quantile, √(p(1 − p)/N)/f(q), f the
// product's density there (by differences of productCDF).
func TestMonteCarlo_AgainstProductDistribution(t *testing.T) {
	m := singleMediator()
	iv, err := MonteCarlo(context.Background(), m, Path{From: 0, To: 2, Through: []int{1}}, MCOptions{Seed: 7})
	if err != nil {
		t.Fatal(err)
	}
	if len(iv.Draws) != DefaultDraws || iv.Level != DefaultLevel {
		t.Fatalf("%d draws at level %v", len(iv.Draws), iv.Level)
	}
	for _, end := range []struct {
		p   float64
		got float64
	}{{0.025, iv.Lo}, {0.975, iv.Hi}} {
		q := productQuantile(end.p, 0.4, 0.15, 0.3, 0.12)
		const h = 1e-4
		dens := (productCDF(q+h, 0.4, 0.15, 0.3, 0.12) - productCDF(q-h, 0.4, 0.15, 0.3, 0.12)) / (2 * h)
		se := math.Sqrt(end.p*(1-end.p)/DefaultDraws) / dens
		if math.Abs(end.got-q) > 4*se {
			t.Errorf("%v quantile: Monte Carlo %v, product distribution %v (MC SE %v)", end.p, end.got, q, se)
		}
	}
	// The product is skewed: the interval is not symmetric about ab.
	if ab := 0.4 * 0.3; math.Abs((iv.Hi-ab)-(ab-iv.Lo)) < 0.01 {
		t.Errorf("interval [%v, %v] symmetric about %v", iv.Lo, iv.Hi, ab)
	}
}

// Monte Carlo draws are the same on one worker and on two, and a
// cancelled context stops the run.
func TestMonteCarlo_WorkersAndContext(t *testing.T) {
	m, p := singleMediator(), Path{From: 0, To: 2}
	one, err1 := MonteCarlo(context.Background(), m, p, MCOptions{Seed: 3, Draws: 5500, Workers: 1})
	two, err2 := MonteCarlo(context.Background(), m, p, MCOptions{Seed: 3, Draws: 5500, Workers: 2})
	if err1 != nil || err2 != nil || !slices.Equal(one.Draws, two.Draws) || one.Lo != two.Lo || one.Hi != two.Hi {
		t.Fatalf("one worker %v (%v), two %v (%v)", one, err1, two, err2)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := MonteCarlo(ctx, m, p, MCOptions{Seed: 3}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled: %v", err)
	}
}

// bootData simulates rows from a random model with means far from zero
// (so the sums about the full-data means matter) and picks a connected
// path, the total indirect effect when total is set.
func bootData(r *rand.Rand, rows int, total bool) (*Model, [][]float64, Path) {
	for {
		n := 3 + r.IntN(4)
		m := randomModel(r, n, 0.5+0.4*r.Float64())
		p := randomPath(r, m)
		if total {
			p.Through = nil
		}
		if ok, _ := HasPath(m.Parents, p); !ok {
			continue
		}
		sd, mean := make([]float64, n), make([]float64, n)
		for j := range n {
			sd[j], mean[j] = 0.5+r.Float64(), 1000*r.NormFloat64()
		}
		return m, simulate(r, m, rows, sd, mean), p
	}
}

// Every bootstrap draw against the oracle (naiveBootstrap: the same rows
// laid out and refitted by QR), on 12 random models with 40 to 300 rows
// (blocks of 256 rows cut through the larger ones) and 150 resamples
// (batches of 64 cut through them): every third the total indirect
// effect, every other one standardized. Tolerance 1e-9 relative.
func TestBootstrap_AgainstNaiveResampling(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 5))
	kinds := map[string]bool{}
	for i := range 12 {
		rows := 40 + r.IntN(261)
		m, cols, p := bootData(r, rows, i%3 == 0)
		std := i%2 == 1
		iv, err := Bootstrap(context.Background(), cols, m.Parents, p,
			BootOptions{Seed: uint64(i), Resamples: 150, Standardized: std})
		if err != nil {
			t.Fatal(err)
		}
		kinds[fmt.Sprint(len(p.Through), std)] = true
		want := naiveBootstrap(cols, m.Parents, p, uint64(i), 150, std)
		for k := range want {
			if !scalar.EqualWithinAbsOrRel(iv.Draws[k], want[k], 1e-9, 1e-9) {
				t.Fatalf("model %d (%v, %d rows, %+v, standardized %v): draw %d is %v, resampled rows give %v",
					i, m.Parents, rows, p, std, k, iv.Draws[k], want[k])
			}
		}
		if lo := Percentile(want, 0.025); !scalar.EqualWithinAbsOrRel(iv.Lo, lo, 1e-9, 1e-9) {
			t.Fatalf("model %d: lower end %v, resampled rows give %v", i, iv.Lo, lo)
		}
	}
	if !kinds["0 false"] || !kinds["0 true"] || !kinds["1 true"] {
		t.Fatalf("cases covered: %v", kinds)
	}
}

// The bootstrap gives the same draws on one worker and on two, tells its
// progress in order up to the total, and stops on a cancelled context.
func TestBootstrap_WorkersProgressContext(t *testing.T) {
	m, cols, p := bootData(rand.New(rand.NewPCG(18, 6)), 500, false)
	var seen []int
	one, err1 := Bootstrap(context.Background(), cols, m.Parents, p, BootOptions{Seed: 9, Resamples: 300, Workers: 1,
		Progress: func(done, total int) { seen = append(seen, done*1000+total) }})
	two, err2 := Bootstrap(context.Background(), cols, m.Parents, p, BootOptions{Seed: 9, Resamples: 300, Workers: 2})
	if err1 != nil || err2 != nil || !slices.Equal(one.Draws, two.Draws) {
		t.Fatalf("one worker (%v) and two (%v) differ", err1, err2)
	}
	if len(seen) == 0 || seen[len(seen)-1] != 300*1000+300 || !slices.IsSorted(seen) {
		t.Fatalf("progress %v", seen)
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	if _, err := Bootstrap(ctx, cols, m.Parents, p, BootOptions{Seed: 9}); !errors.Is(err, context.Canceled) {
		t.Fatalf("cancelled: %v", err)
	}
}

// A resample without the one row where a binary covariate is 1 has a
// constant covariate and no fit: such resamples are counted, not used.
// Which they are is known from the streams: exactly those that never draw
// that row.
func TestBootstrap_SingularResamples(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 7))
	const rows = 25
	x, z, mm, y := make([]float64, rows), make([]float64, rows), make([]float64, rows), make([]float64, rows)
	for i := range rows {
		x[i] = r.NormFloat64()
		mm[i] = 0.5*x[i] + r.NormFloat64()
		y[i] = 0.4*mm[i] + 0.2*x[i] + r.NormFloat64()
	}
	z[3] = 1
	parents := [][]int{nil, nil, {0, 1}, {0, 2}} // x=0 z=1 m=2 y=3: z is a covariate of m
	p := Path{From: 0, To: 3, Through: []int{2}}
	iv, err := Bootstrap(context.Background(), [][]float64{x, z, mm, y}, parents, p,
		BootOptions{Seed: 4, Resamples: 400})
	if err != nil {
		t.Fatal(err)
	}
	want := 0
	for k := range 400 {
		rng, hit := stream(4, k), false
		for range rows {
			hit = hit || rng.IntN(rows) == 3
		}
		if !hit {
			want++
		}
	}
	if want == 0 || iv.Failed != want || len(iv.Draws)+iv.Failed != 400 {
		t.Fatalf("failed %d, want %d (draws %d)", iv.Failed, want, len(iv.Draws))
	}
}

// Incomplete or constant columns are refused with the column and row.
func TestBootstrap_BadColumns(t *testing.T) {
	parents := [][]int{nil, {0}, {1}}
	p := Path{From: 0, To: 2, Through: []int{1}}
	cols := [][]float64{{1, 2, 3, 4}, {2, 1, math.NaN(), 3}, {1, 3, 2, 5}}
	if _, err := Bootstrap(context.Background(), cols, parents, p, BootOptions{}); err == nil ||
		!strings.Contains(err.Error(), "column 1, row 3") {
		t.Errorf("NaN: %v", err)
	}
	cols[1] = []float64{2, 2, 2, 2}
	if _, err := Bootstrap(context.Background(), cols, parents, p, BootOptions{}); err == nil ||
		!strings.Contains(err.Error(), "column 1 does not vary") {
		t.Errorf("constant: %v", err)
	}
}

// Percentile by hand (Davison & Hinkley's rule): with R = 9 draws 1..9,
// (R + 1)·0.5 = 5 is whole, giving the 5th, 5; (R + 1)·0.25 = 2.5 lies
// between the 2nd and 3rd, interpolated on the normal scale between
// Φ⁻¹(0.2) and Φ⁻¹(0.3); α below 1/(R + 1) gives the smallest draw.
func TestPercentile_ByHand(t *testing.T) {
	d := []float64{1, 2, 3, 4, 5, 6, 7, 8, 9}
	z := distuv.UnitNormal
	want := 2 + (z.Quantile(0.25)-z.Quantile(0.2))/(z.Quantile(0.3)-z.Quantile(0.2))
	for _, tc := range []struct{ alpha, want float64 }{{0.5, 5}, {0.25, want}, {0.05, 1}, {0.99, 9}} {
		if got := Percentile(d, tc.alpha); !scalar.EqualWithinAbsOrRel(got, tc.want, 1e-15, 1e-15) {
			t.Errorf("α %v: %v, want %v", tc.alpha, got, tc.want)
		}
	}
	if !math.IsNaN(Percentile(nil, 0.5)) {
		t.Error(fmt.Sprint("empty: ", Percentile(nil, 0.5)))
	}
}
