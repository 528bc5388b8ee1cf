package mediation

import (
	"context"
	"math"
	"slices"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// Indirect effects and their delta-method SEs against the R SEM
// reference's defined parameters (indirect.R), the core fed the
// reference's estimates and its covariance of them: estimates to 1e-12
// (the same products), SEs to 1e-9 relative (they agree to about 1e-15).
// The completely standardized estimates use the SDs the model implies
// (ImpliedCov with the reference's residual variances and the exogenous
// variables' moments, divisor N), to 1e-9.
// The covariance of coefficients of different equations is zero there
// (below 1e-12), as Model assumes.
func TestEffect_AgreesWithReference(t *testing.T) {
	source, models, cols := readReference(t)
	for _, rm := range models {
		if rm.CrossCov > 1e-12 {
			t.Errorf("%s: cross-equation covariance %v in the reference", rm.Name, rm.CrossCov)
		}
		m := rm.model()
		sd := impliedSD(t, rm, m, cols)
		for _, def := range rm.Defined {
			p, ok := refPaths[rm.Name][def.Label]
			if !ok {
				continue
			}
			got, err := Effect(m, p)
			if err != nil || !scalar.EqualWithinAbsOrRel(got.Effect, def.Est, 1e-12, 1e-12) ||
				!scalar.EqualWithinAbsOrRel(got.StdError, def.SE, 1e-12, 1e-9) {
				t.Errorf("%s %s: %v (SE %v, %v); reference %v (SE %v), %s",
					rm.Name, def.Label, got.Effect, got.StdError, err, def.Est, def.SE, source)
			}
			std, err := StandardizedEffect(m, p, sd)
			if err != nil || !scalar.EqualWithinAbsOrRel(std.Effect, def.EstStdAll, 1e-12, 1e-9) {
				t.Errorf("%s %s standardized: %v (%v); reference %v",
					rm.Name, def.Label, std.Effect, err, def.EstStdAll)
			}
		}
	}
}

// impliedSD is the model-implied SD of each node: Ψ holds the
// reference's residual variances for the endogenous nodes and the sample
// moments (divisor N) of the exogenous ones.
func impliedSD(t *testing.T, rm refModel, m *Model, cols [][]float64) []float64 {
	psi := sampleCov(cols, true)
	for j, pa := range m.Parents {
		for i := range len(refNames) {
			if len(pa) > 0 && i != j || len(m.Parents[i]) > 0 && i != j {
				psi.SetSym(i, j, 0)
			}
		}
	}
	for _, eq := range rm.Equations {
		psi.SetSym(node(eq.Y), node(eq.Y), eq.ResidVar)
	}
	s, err := ImpliedCov(m.B, psi)
	if err != nil {
		t.Fatal(err)
	}
	sd := make([]float64, len(refNames))
	for j := range sd {
		sd[j] = math.Sqrt(s.At(j, j))
	}
	return sd
}

// pathvet's own fit with the ML divisor against the reference's, from the
// rows of mtcars.csv: coefficients to 1e-9 relative (they agree to about
// 1e-15), and for the saturated models their covariance (to 1e-9 of its
// largest entry) and the indirect effects and SEs too. For the parallel
// model, which is not saturated, the reference's expected information
// uses the model-implied covariance of the mediators rather than the
// sample's (y's coefficient variances differ by up to 16%), so only the
// estimates are compared.
func TestFitModel_AgreesWithReference(t *testing.T) {
	_, models, cols := readReference(t)
	cov := sampleCov(cols, false)
	for _, rm := range models {
		m, err := FitModel(cov, len(cols[0]), rm.parents(), ML)
		if err != nil {
			t.Fatal(err)
		}
		for _, eq := range rm.Equations {
			j := node(eq.Y)
			for a, x := range eq.X {
				if got := m.B.At(node(x), j); !scalar.EqualWithinAbsOrRel(got, eq.Est[a], 1e-12, 1e-9) {
					t.Errorf("%s: %s ~ %s: %v, reference %v", rm.Name, eq.Y, x, got, eq.Est[a])
				}
			}
			want := mat.NewSymDense(len(eq.X), slices.Clone(eq.VCov))
			if rm.saturated && !mat.EqualApprox(m.Cov[j], want, 1e-9*mat.Max(want)) {
				t.Errorf("%s: %s: covariance %v, reference %v",
					rm.Name, eq.Y, mat.Formatted(m.Cov[j]), mat.Formatted(want))
			}
		}
		for _, def := range rm.Defined {
			p, ok := refPaths[rm.Name][def.Label]
			if !ok || !rm.saturated {
				continue
			}
			got, err := Effect(m, p)
			if err != nil || !scalar.EqualWithinAbsOrRel(got.Effect, def.Est, 1e-12, 1e-9) ||
				!scalar.EqualWithinAbsOrRel(got.StdError, def.SE, 1e-12, 1e-9) {
				t.Errorf("%s %s: %v (SE %v, %v); reference %v (SE %v)", rm.Name, def.Label,
					got.Effect, got.StdError, err, def.Est, def.SE)
			}
		}
	}
}

// finiteSorted returns the reference's bootstrap draws without the failed
// resamples, sorted.
func finiteSorted(draws []*float64) []float64 {
	var out []float64
	for _, d := range draws {
		if d != nil {
			out = append(out, *d)
		}
	}
	slices.Sort(out)
	return out
}

// Percentile reads the reference's own bootstrap draws as the reference
// does: its percentile interval, to 1e-12.
func TestPercentile_AgreesWithReference(t *testing.T) {
	_, models, _ := readReference(t)
	for _, rm := range models {
		for _, def := range rm.Defined {
			d := finiteSorted(def.BootDraws)
			lo, hi := Percentile(d, 0.025), Percentile(d, 0.975)
			if !scalar.EqualWithinAbsOrRel(lo, def.BootLo, 1e-12, 1e-12) ||
				!scalar.EqualWithinAbsOrRel(hi, def.BootHi, 1e-12, 1e-12) {
				t.Errorf("%s %s: [%v, %v] from %d draws, reference [%v, %v]", rm.Name, def.Label, lo, hi, len(d),
					def.BootLo, def.BootHi)
			}
		}
	}
}

// pathvet's percentile bootstrap (2,000 resamples of the rows of
// mtcars.csv) against the reference's (2,000 resamples of its own): both
// estimate the same quantiles of the same bootstrap distribution, so they
// differ by Monte Carlo error alone. Each end must lie within 4.5·√2
// Monte Carlo SEs of a quantile, √(α(1 − α)/B)·dQ/dα, the slope from the
// reference's draws (Q(α + 0.01) − Q(α − 0.01))/0.02, and the draws' SDs
// within 15% (for normal draws the SD's own relative SE is 1/√(2B) = 1.6%;
// the products' tails are heavier).
func TestBootstrap_WithinMonteCarloErrorOfReference(t *testing.T) {
	source, models, cols := readReference(t)
	for _, rm := range models {
		for _, def := range rm.Defined {
			p, ok := refPaths[rm.Name][def.Label]
			if !ok {
				continue
			}
			iv, err := Bootstrap(context.Background(), cols, rm.parents(), p, BootOptions{Seed: 18})
			if err != nil {
				t.Fatal(err)
			}
			d := finiteSorted(def.BootDraws)
			for _, end := range []struct {
				alpha, got, want float64
			}{{0.025, iv.Lo, def.BootLo}, {0.975, iv.Hi, def.BootHi}} {
				slope := (Percentile(d, end.alpha+0.01) - Percentile(d, end.alpha-0.01)) / 0.02
				se := math.Sqrt(end.alpha*(1-end.alpha)/float64(len(d))) * slope
				if math.Abs(end.got-end.want) > 4.5*math.Sqrt2*se {
					t.Errorf("%s %s: %v end %v, reference %v (MC SE %v, %s)", rm.Name, def.Label, end.alpha,
						end.got, end.want, se, source)
				}
			}
			if sdRef := stat.StdDev(d, nil); math.Abs(iv.SD/sdRef-1) > 0.15 {
				t.Errorf("%s %s: bootstrap SD %v, reference %v", rm.Name, def.Label, iv.SD, sdRef)
			}
		}
	}
}
