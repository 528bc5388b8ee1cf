package missing

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"sync"

	"gonum.org/v1/gonum/mat"
)

// DefaultImputations is m, the number of imputed datasets, by default.
const DefaultImputations = 20

// BootstrapTolerance is the EM tolerance of the bootstrap runs unless
// ImputeOptions.EM says otherwise. Their estimates are draws that spread
// by about n^(−1/2) SDs; a change of 1e−6 SDs is far below that, so
// stopping there changes the imputations by much less than their Monte
// Carlo error.
const BootstrapTolerance = 1e-6

// ImputeOptions tune multiple imputation.
type ImputeOptions struct {
	M    int    // imputations; default DefaultImputations
	Seed uint64 // all randomness comes from it
	// Binary marks 0/1 variables: their imputed values are rounded
	// adaptively (Bernaards, Belin & Schafer 2007), so that each imputed
	// dataset is coded as the analysis needs.
	Binary []bool
	EM     Options // for the EM runs on the bootstrap samples
	// Workers is how many imputations run at once; default GOMAXPROCS.
	// The results do not depend on it.
	Workers int
}

// ImputeEach draws M completed datasets and hands each, as an n × p matrix
// of rows, to use, which must neither change nor keep the matrix: it is
// drawn over by the next imputation, so memory does not grow with M. Each dataset is proper
// (Rubin 1987): the parameters are drawn by running EM on a bootstrap
// resample of the rows (Honaker & King 2010; Efron 1994), a vector of
// multinomial counts over the rows that weights their sufficient
// statistics, and each missing value is then drawn from its conditional
// normal given the observed values of its row under those parameters,
// residual noise included. start, the EM estimate on the full data, starts
// each bootstrap run.
//
// The imputations run on opt.Workers goroutines (default GOMAXPROCS), and
// use is called from them, for each k in 0..M−1 once, in no fixed order.
// Imputation k draws from its own stream, seeded by opt.Seed and k, so the
// datasets do not depend on the number of workers.
func ImputeEach(ctx context.Context, cols [][]float64, start *EMResult, opt ImputeOptions,
	use func(k int, data *mat.Dense) error) error {
	ps := Patterns(cols)
	lay := newLayout(cols, ps) // shared, read only
	return runImputations(ctx, opt, func() imputeFunc {
		w := newImputer(cols, ps, lay, rowMajor(cols))
		return func(ctx context.Context, k int, opt ImputeOptions) error {
			rng := imputationStream(opt.Seed, k)
			theta, err := w.bootstrapEM(ctx, start, opt.EM, rng)
			if err == nil {
				err = w.draw(theta, rng)
			}
			if err != nil {
				return fmt.Errorf("missing: imputation %d: %w", k+1, err)
			}
			roundBinary(w.data, w.cols, opt.Binary)
			return use(k, w.data)
		}
	})
}

// imputeFunc draws imputation k on one worker.
type imputeFunc func(ctx context.Context, k int, opt ImputeOptions) error

// runImputations runs imputations 0..M−1 on opt.Workers goroutines, each
// with the function newWorker makes for it, and returns the first error.
func runImputations(ctx context.Context, opt ImputeOptions, newWorker func() imputeFunc) error {
	if opt.M == 0 {
		opt.M = DefaultImputations
	}
	workers := opt.Workers
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	jobs := make(chan int)
	errs := make([]error, opt.M)
	var wg sync.WaitGroup
	for range min(workers, opt.M) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			impute := newWorker()
			for k := range jobs {
				if errs[k] = safeImpute(ctx, k, opt, impute); errs[k] != nil {
					cancel()
				}
			}
		}()
	}
	dispatch(ctx, jobs, opt.M, errs)
	wg.Wait()
	return firstError(errs)
}

// imputationStream is imputation k's own random stream.
func imputationStream(seed uint64, k int) *rand.Rand {
	return rand.New(rand.NewPCG(seed, 0x9e3779b97f4a7c15+uint64(k)))
}

// dispatch hands out imputations 0..m−1 until the context ends; those not
// handed out then get its error, so that none starts after a deadline.
func dispatch(ctx context.Context, jobs chan<- int, m int, errs []error) {
	defer close(jobs)
	for k := range m {
		select {
		case jobs <- k:
		case <-ctx.Done():
			for ; k < m; k++ {
				errs[k] = ctx.Err()
			}
			return
		}
	}
}

// firstError returns the error of the first imputation that failed for a
// reason of its own, before those stopped by its cancellation.
func firstError(errs []error) error {
	var first error
	for _, err := range errs {
		if err != nil && !errors.Is(err, context.Canceled) {
			return err
		}
		if first == nil {
			first = err
		}
	}
	return first
}

// imputer is one worker's state: its bootstrap weights and, for
// ImputeEach, the dataset it draws into. lay, the data laid out by
// pattern, is shared between the workers.
type imputer struct {
	cols [][]float64
	ps   []Pattern
	lay  *layout
	w    []float64
	data *mat.Dense
	cond condition
}

// newImputer keeps data, the observed values laid out as rows, when not
// nil: the imputations only overwrite the missing cells.
func newImputer(cols [][]float64, ps []Pattern, lay *layout, data *mat.Dense) *imputer {
	return &imputer{cols: cols, ps: ps, lay: lay, w: make([]float64, rows(cols)), data: data}
}

// safeImpute is impute(ctx, k) with a panic turned into an error: a panic
// on a worker goroutine would otherwise end the program, past the recovery
// of whoever called.
func safeImpute(ctx context.Context, k int, opt ImputeOptions, impute imputeFunc) (err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("missing: imputation %d: internal error: %v", k+1, p)
		}
	}()
	if err := ctx.Err(); err != nil {
		return err
	}
	return impute(ctx, k, opt)
}

// bootstrapEM runs EM on a resample of the rows, drawn with replacement,
// as counts; a resample in which some variable is observed in fewer than
// two rows is drawn again.
func (w *imputer) bootstrapEM(ctx context.Context, start *EMResult, opt Options, rng *rand.Rand) (*EMResult, error) {
	n := len(w.w)
	opt.Start = start
	if opt.Tolerance == 0 {
		opt.Tolerance = BootstrapTolerance
	}
	for range 20 {
		clear(w.w)
		for range n {
			w.w[rng.IntN(n)]++
		}
		res, err := emWeighted(ctx, w.cols, w.lay, w.ps, w.w, opt)
		if errors.Is(err, ErrNoData) {
			continue
		}
		return res, err
	}
	return nil, errors.New("no bootstrap resample observed every variable")
}

// draw completes the data with draws from the conditional normals under
// theta: the conditional mean plus L z, L the Cholesky factor of the
// conditional covariance and z standard normal.
func (w *imputer) draw(theta *EMResult, rng *rand.Rand) error {
	prec, err := precision(theta.Cov)
	if err != nil {
		return err
	}
	full := fullSymmetric(prec)
	for _, pat := range w.ps {
		if err := w.cond.setFor(reducible(len(pat.Rows), len(w.cols)), prec, full, theta.Mean, pat.obs, pat.mis); err != nil {
			return err
		}
		l, err := w.cond.factor()
		if err != nil {
			return err
		}
		for _, i := range pat.Rows {
			x := w.data.RawRowView(i)
			w.cond.predict(x)
			addNoise(x, pat.mis, l, rng)
		}
	}
	return nil
}

// addNoise adds L z to x[mis], z standard normal.
func addNoise(x []float64, mis []int, l []float64, rng *rand.Rand) {
	k := len(mis)
	var zs [8]float64
	z := zs[:0]
	if k > len(zs) {
		z = make([]float64, 0, k)
	}
	for range k {
		z = append(z, rng.NormFloat64())
	}
	for a, j := range mis {
		e := 0.0
		for b := 0; b <= a; b++ {
			e += l[a*k+b] * z[b]
		}
		x[j] += e
	}
}

// roundBinary rounds the imputed values of binary variables at the
// adaptive threshold ω = v̄ − Φ⁻¹(v̄)·sqrt(v̄(1 − v̄)) of Bernaards, Belin
// & Schafer (2007), v̄ the mean of the variable after imputation.
func roundBinary(done *mat.Dense, orig [][]float64, binary []bool) {
	n, _ := done.Dims()
	for j, isBin := range binary {
		if !isBin {
			continue
		}
		mean := 0.0
		for i := range n {
			mean += done.At(i, j)
		}
		mean /= float64(n)
		mean = math.Min(math.Max(mean, 1e-6), 1-1e-6)
		omega := mean - normalQuantile(mean)*math.Sqrt(mean*(1-mean))
		for i, x := range orig[j] {
			if math.IsNaN(x) {
				done.Set(i, j, boolFloat(done.At(i, j) > omega))
			}
		}
	}
}

func boolFloat(b bool) float64 {
	if b {
		return 1
	}
	return 0
}
