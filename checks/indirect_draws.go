package checks

import (
	"crypto/sha256"
	"encoding/binary"
	"fmt"
	"math"

	"github.com/pathvet/pathvet/checks/mediation"
)

// The randomness of the indirect effects' intervals, and the percentile
// bootstrap of the declared estimate from raw rows.

// studySeed is the seed every Monte Carlo and bootstrap draw of a run
// derives from: a hash of the data alone (the rows with which variables
// are binary, as the imputations' dataSeed; or the summary statistics),
// never of titles, texts or names, so that a cosmetic edit moves no
// number. Computed once.
func (a *Analysis) studySeed() uint64 {
	if a.seeded {
		return a.seed
	}
	d := a.Study.Data
	if d.Kind == DataRows {
		a.seed = dataSeed(d.Columns, a.binaryVariables())
	} else {
		a.seed = summarySeed(d)
	}
	a.seeded = true
	return a.seed
}

func summarySeed(d *Dataset) uint64 {
	h := sha256.New()
	var b [8]byte
	put := func(x float64) {
		binary.BigEndian.PutUint64(b[:], math.Float64bits(x))
		h.Write(b[:])
	}
	put(float64(d.N))
	p := d.Cor.SymmetricDim()
	for i := range p {
		for j := range i + 1 {
			put(d.Cor.At(i, j))
		}
	}
	for _, x := range append(append([]float64(nil), d.SD...), d.Means...) {
		put(x)
	}
	return binary.BigEndian.Uint64(h.Sum(nil)[:8])
}

// drawSeed seeds the draws of the effect p on the moments m for a
// purpose ("monte carlo", "bootstrap"): the study's seed, the moments'
// method and the effect's variables. The graph is left
// out, so that the graphs of a class share their draws (common random
// numbers: two graphs with the same equations give the same interval).
func (a *Analysis) drawSeed(purpose string, m *Moments, p mediation.Path) uint64 {
	h := sha256.New()
	fmt.Fprint(h, a.studySeed(), purpose, m.Method, p.From, p.To, p.Through)
	return binary.BigEndian.Uint64(h.Sum(nil)[:8])
}

// bootstrapNote says what the bootstrap interval of an indirect effect is.
const bootstrapNote = "SE by the delta method; interval: percentile bootstrap of %d resamples of the %d " +
	"complete cases, the effect's equations refitted in each, with the Monte Carlo interval of %d draws beside it; " +
	"its significance is judged by whether the bootstrap interval excludes zero"

// resampled gives the declared estimate e of an indirect-effect claim the
// percentile bootstrap interval of the complete rows behind the moments
// (mediation.Bootstrap: each resample's equations refitted from its
// weighted moments), which then is its interval and judges its
// significance; the Monte Carlo interval stays among its intervals. An
// estimate of another kind, or without rows, is returned as it is.
func (g observedGraph) resampled(c Claim, e est) est {
	a, m := g.a, g.m
	if c.Kind != KindIndirect || !e.ok() || e.method != MethodProduct || m.Rows == nil || g.pa == nil {
		return e
	}
	p := a.claimPath(c)
	parents := effectParents(g.pa, len(a.Study.Names), p.From, p.To)
	cols := make([][]float64, len(parents))
	n, _ := m.Rows.Dims()
	for v := range cols {
		if len(parents[v]) > 0 || v == p.From || v == p.To || usedAsParent(parents, v) {
			cols[v] = make([]float64, n)
			for i := range n {
				cols[v][i] = m.Rows.At(i, v)
			}
		}
	}
	stage := fmt.Sprintf("indirect effect %s: bootstrap resamples", c.ID)
	iv, err := mediation.Bootstrap(g.ctx, cols, parents, p, mediation.BootOptions{
		Resamples: a.resamples(), Level: claimLevel(c), Seed: a.drawSeed("bootstrap", m, p),
		Standardized: e.scale == "standardized",
		Progress:     func(done, total int) { a.reportProgress(stage, done, total) },
	})
	if err != nil {
		e.note = joinNotes(e.note, "no bootstrap interval: "+err.Error())
		return e
	}
	mc := e.intervals[1]
	b := a.withDraws(e, IntervalBootstrap, iv, claimLevel(c))
	b.intervals = append(b.intervals[:1], mc, b.intervals[1])
	b.note = joinNotes(a.indirectNote(c, m, parents), fmt.Sprintf(bootstrapNote, len(iv.Draws)+iv.Failed, n,
		mediation.DefaultDraws))
	return b
}

func usedAsParent(parents [][]int, v int) bool {
	for _, pa := range parents {
		for _, u := range pa {
			if u == v {
				return true
			}
		}
	}
	return false
}

// resamples is the number of bootstrap resamples of the run.
func (a *Analysis) resamples() int {
	if a.bootResamples > 0 {
		return a.bootResamples
	}
	return mediation.DefaultResamples
}
