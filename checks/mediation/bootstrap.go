package mediation

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/mat"
)

// DefaultResamples is the number of bootstrap resamples unless set.
const DefaultResamples = 2000

// BootOptions tune Bootstrap.
type BootOptions struct {
	Resamples int     // default DefaultResamples
	Level     float64 // default DefaultLevel
	Seed      uint64  // all randomness comes from it
	Workers   int     // goroutines; default GOMAXPROCS; the draws do not depend on it
	// Progress, when set, hears how many resamples are done, one call at a
	// time, from the workers' goroutines.
	Progress func(done, total int)
	// Standardized gives the effect on the scale of standardized
	// coefficients, each resample standardized by its own sample SDs:
	// θ*·sd*_x/sd*_y.
	Standardized bool
}

// Bootstrap returns the percentile bootstrap interval of an effect from
// raw rows (Efron & Tibshirani 1993, ch. 13; for indirect effects
// Shrout & Bolger 2002, Preacher & Hayes 2008): each resample draws n rows
// with replacement, as a vector of multinomial counts over the rows, the
// equations the effect depends on are refitted by least squares from the
// resample's weighted moments, and the interval is read off the effects'
// percentiles (Percentile),
//
//	w* ~ Multinomial(n; 1/n, …, 1/n),  b*_j = S*_PP⁻¹ s*_Pj,  θ* = θ(b*),
//	[θ*_(α/2), θ*_(1−α/2)].
//
// cols holds one column per node, n rows, complete and finite in the
// columns the refits use (the nodes on paths of the effect, their parents,
// From and To). Resample r draws from its own stream, seeded by opt.Seed
// and r, so the interval does not depend on opt.Workers; a resample
// whose design is singular is counted in Failed and left out. Workers
// weigh batches of resamples at once, the sums of each row block a matrix
// product (weightedMoments), and check the context between batches.
func Bootstrap(ctx context.Context, cols [][]float64, parents [][]int, p Path, opt BootOptions) (*Interval, error) {
	if opt.Resamples == 0 {
		opt.Resamples = DefaultResamples
	}
	if opt.Level == 0 {
		opt.Level = DefaultLevel
	}
	c, err := newChain(parents, p)
	if err != nil {
		return nil, err
	}
	e := newEvaluator(parents, c)
	eqs, vars := refits(parents, e, p)
	rows, err := newStandardRows(cols, vars)
	if err != nil {
		return nil, err
	}
	b := &booter{rows: rows, eval: e, eqs: localEquations(eqs, vars), opt: opt,
		x: slices.Index(vars, p.From), y: slices.Index(vars, p.To)}
	draws := make([]float64, opt.Resamples)
	err = parallel(ctx, opt.Resamples, rows.batchSize(), opt.Workers, opt.Progress, func() func(k, lo, hi int) error {
		return b.worker(draws)
	})
	if err != nil {
		return nil, err
	}
	return newInterval(draws, opt.Level)
}

// equation is one refit: the node, its parents, and for each relevant
// coefficient its position among the parents and its evaluator slot.
type equation struct {
	y, localY int   // the node, and its column among the refits' variables
	x, localX []int // its parents, and their columns
	pos, slot []int
}

// refits lists the equations the effect depends on and the variables
// they (and the standardization) read, sorted.
func refits(parents [][]int, e *evaluator, p Path) ([]equation, []int) {
	vars := []int{p.From, p.To}
	var eqs []equation
	for j := range parents {
		pos, slot := e.slots(parents, j)
		if len(pos) == 0 {
			continue
		}
		eqs = append(eqs, equation{y: j, x: parents[j], pos: pos, slot: slot})
		vars = append(append(vars, j), parents[j]...)
	}
	slices.Sort(vars)
	return eqs, slices.Compact(vars)
}

func localEquations(eqs []equation, vars []int) []equation {
	for k := range eqs {
		eqs[k].localY = slices.Index(vars, eqs[k].y)
		for _, i := range eqs[k].x {
			eqs[k].localX = append(eqs[k].localX, slices.Index(vars, i))
		}
	}
	return eqs
}

// booter is a bootstrap run's shared, read-only state.
type booter struct {
	rows *standardRows
	eval *evaluator
	eqs  []equation
	opt  BootOptions
	x, y int // local columns of From and To
}

// worker returns one worker's function: it weighs resamples lo..hi−1 and
// writes their effects into draws.
func (b *booter) worker(draws []float64) func(k, lo, hi int) error {
	r := b.rows
	batch := r.batchSize()
	w, sums := make([]float64, batch*r.n), make([]float64, batch*r.q)
	z, prod := make([]float64, rowsPerBlock*r.p), make([]float64, rowsPerBlock*r.q)
	cov := mat.NewSymDense(r.p, nil)
	beta, t := make([]float64, len(b.eval.arcs)), make([]float64, len(b.eval.nodes))
	return func(_, lo, hi int) error {
		m := hi - lo
		clear(w[:m*r.n])
		clear(sums[:m*r.q])
		for d := range m {
			rng := stream(b.opt.Seed, lo+d)
			counts(w[d*r.n:(d+1)*r.n], rng)
		}
		r.weightedMoments(w, m, sums, z, prod)
		for d := range m {
			draws[lo+d] = math.NaN()
			if r.covariance(sums[d*r.q:(d+1)*r.q], cov) {
				draws[lo+d] = b.effect(cov, beta, t)
			}
		}
		return nil
	}
}

// counts draws the multinomial counts of one resample into w: n draws of a
// row, uniformly, with replacement.
func counts(w []float64, rng *rand.Rand) {
	n := len(w)
	for range n {
		w[rng.IntN(n)]++
	}
}

// effect refits the equations from one resample's standardized covariance
// and returns the effect in the data's units (or standardized), NaN when
// a design is singular. On the standardized scale every coefficient is
// b·sd_i/sd_j, so the effect is θ·sd_x/sd_y and is scaled back.
func (b *booter) effect(cov *mat.SymDense, beta, t []float64) float64 {
	for _, eq := range b.eqs {
		coef, _, _, err := solveEquation(cov, eq.localY, eq.localX)
		if err != nil {
			return math.NaN()
		}
		for k, pos := range eq.pos {
			beta[eq.slot[k]] = coef[pos]
		}
	}
	theta := b.eval.eval(beta, t)
	if b.opt.Standardized {
		return theta * math.Sqrt(cov.At(b.x, b.x)/cov.At(b.y, b.y))
	}
	r := b.rows
	return theta * r.sd[b.y] / r.sd[b.x]
}
