package mediation

import (
	"context"
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"

	"gonum.org/v1/gonum/stat"
	"gonum.org/v1/gonum/stat/distuv"
)

// DefaultLevel is the confidence level of an interval unless set.
const DefaultLevel = 0.95

// Interval is a percentile interval from draws of an effect.
type Interval struct {
	Lo, Hi float64
	Level  float64
	// Draws are the draws' values, sorted.
	Draws []float64
	// SD is the draws' standard deviation (divisor count − 1).
	SD float64
	// Failed counts the draws that gave no value (bootstrap resamples
	// whose design was singular); they are left out, as the R SEM
	// reference (testdata/reference/mediation/indirect.R, Debian's R SEM
	// package) leaves them out.
	Failed int
}

// Percentile returns the α-quantile of the sorted draws t by the rule
// for bootstrap percentile intervals of Davison & Hinkley (1997,
// Bootstrap Methods and Their Application, ch. 5): the order statistic
// t_(k) with k = (R + 1)α when that is a whole number, else interpolation
// between t_(k) and t_(k+1), k = ⌊(R + 1)α⌋, on the normal quantile scale,
//
//	t_(k) + (Φ⁻¹(α) − Φ⁻¹(k/(R+1))) / (Φ⁻¹((k+1)/(R+1)) − Φ⁻¹(k/(R+1))) · (t_(k+1) − t_(k)),
//
// and the extreme draw when k is 0 or R. The R SEM reference uses the same
// rule (its outputs in testdata/reference/mediation).
func Percentile(t []float64, alpha float64) float64 {
	r := len(t)
	if r == 0 {
		return math.NaN()
	}
	rk := float64(r+1) * alpha
	k := int(math.Trunc(rk))
	switch {
	case k <= 0:
		return t[0]
	case k >= r:
		return t[r-1]
	case float64(k) == rk:
		return t[k-1]
	}
	z := distuv.UnitNormal
	q := func(p float64) float64 { return z.Quantile(p) }
	lo, hi := q(float64(k)/float64(r+1)), q(float64(k+1)/float64(r+1))
	return t[k-1] + (q(alpha)-lo)/(hi-lo)*(t[k]-t[k-1])
}

// IntervalOf is the percentile interval (Percentile) of draws at level,
// as MonteCarlo and Bootstrap make it: the draws that are not finite are
// counted in Failed and left out, and draws is sorted in place. It serves
// intervals from draws made elsewhere (a mixture over imputed datasets).
func IntervalOf(draws []float64, level float64) (*Interval, error) { return newInterval(draws, level) }

// newInterval sorts the finite draws and reads the interval off them.
func newInterval(draws []float64, level float64) (*Interval, error) {
	ok := slices.DeleteFunc(draws, func(v float64) bool { return math.IsNaN(v) || math.IsInf(v, 0) })
	failed := len(draws) - len(ok)
	if len(ok) < 2 {
		return nil, fmt.Errorf("mediation: %d of %d draws gave no value", failed, len(draws))
	}
	slices.Sort(ok)
	a := (1 - level) / 2
	return &Interval{Lo: Percentile(ok, a), Hi: Percentile(ok, 1-a), Level: level, Draws: ok,
		SD: stat.StdDev(ok, nil), Failed: failed}, nil
}

// stream is the random stream of chunk k of a run seeded by seed; each
// chunk has its own, so the draws do not depend on the number of workers.
func stream(seed uint64, k int) *rand.Rand {
	return rand.New(rand.NewPCG(seed, 0x6a09e667f3bcc909+uint64(k)))
}

// parallel runs the chunks [lo, hi) of 0..total−1, chunk units each, on
// workers goroutines (GOMAXPROCS when 0), each with a function of its own
// from newWorker that is called with the chunk's number. progress, when
// set, hears of the units done after each chunk, one call at a time. It
// stops at the context's end or at the first error, and turns a panic
// into an error.
func parallel(ctx context.Context, total, chunk, workers int, progress func(done, total int),
	newWorker func() func(k, lo, hi int) error) error {
	chunks := (total + chunk - 1) / chunk
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	ctx, cancel := context.WithCancel(ctx)
	defer cancel()
	jobs := make(chan int)
	errs := make([]error, chunks)
	var mu sync.Mutex
	var wg sync.WaitGroup
	done := 0
	for range min(workers, chunks) {
		wg.Go(func() {
			work := newWorker()
			for k := range jobs {
				lo, hi := k*chunk, min((k+1)*chunk, total)
				if errs[k] = safe(ctx, func() error { return work(k, lo, hi) }); errs[k] != nil {
					cancel()
					continue
				}
				mu.Lock()
				done += hi - lo
				if progress != nil {
					progress(done, total)
				}
				mu.Unlock()
			}
		})
	}
	dispatch(ctx, jobs, chunks, errs)
	wg.Wait()
	return firstError(errs)
}

func safe(ctx context.Context, f func() error) (err error) {
	defer func() {
		if p := recover(); p != nil {
			err = fmt.Errorf("mediation: internal error: %v", p)
		}
	}()
	if err := ctx.Err(); err != nil {
		return err
	}
	return f()
}

// dispatch hands out chunks until the context ends; those not handed out
// then get its error.
func dispatch(ctx context.Context, jobs chan<- int, chunks int, errs []error) {
	defer close(jobs)
	for k := range chunks {
		select {
		case jobs <- k:
		case <-ctx.Done():
			for ; k < chunks; k++ {
				errs[k] = ctx.Err()
			}
			return
		}
	}
}

// firstError returns the first error of a chunk's own, before those that
// its cancellation caused.
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
