package nearby

import (
	"context"
	"maps"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/mat"
)

// The search's bucketed pool holds as valid exactly the rows' improving
// edits scored from the current rows, and picks, at every step, the edit a
// full rescan picks: every allowed edit of the current graph (eachEdit) rescored from
// the current rows, the lowest ΔBIC below −improvement, ties to the first
// in eachEdit's order. Random correlation matrices and DAGs of 4 to 9
// nodes, with background knowledge, walked by the search's steps and,
// every third step, a random allowed reversal (which changes two rows).
func TestPool_AgreesWithFullRescan(t *testing.T) {
	r := rand.New(rand.NewPCG(17, 4))
	steps, reversals := 0, 0
	for trial := range 150 {
		p := 4 + trial%6
		s := poolCorrelation(r, p)
		pa := make([][]int, p)
		for v := 1; v < p; v++ {
			for u := range v {
				if r.IntN(3) == 0 {
					pa[v] = append(pa[v], u)
				}
			}
		}
		k := Knowledge{Exogenous: make([]bool, p)}
		k.Exogenous[0] = len(pa[0]) == 0 && trial%2 == 0
		m := Model{S: s, N: 50 + r.IntN(500)}
		g, rw, kn, err := setUp(m, pa, k)
		if err != nil {
			t.Fatal(err)
		}
		pl := newPool(g, rw, kn)
		for i := range 60 {
			if got, want := pl.valid(), rescored(g, rw, kn, pl.version); !maps.Equal(got, want) {
				t.Fatalf("trial %d step %d: pool %v, rescored %v", trial, steps, got, want)
			}
			got, ok := pl.best()
			want, wok := rescan(m, g, rw, kn)
			if ok != wok || got != want {
				t.Fatalf("trial %d step %d: pool %v %v, full rescan %v %v", trial, steps, got, ok, want, wok)
			}
			if rev, any := randomReversal(r, m, g, kn); i%3 == 2 && any {
				got, ok = rev, true // the pool must follow any edit, not only the best
			}
			if !ok {
				break
			}
			if err := step(g, rw, got); err != nil {
				t.Fatal(err)
			}
			pl.refresh(got)
			steps++
			if got.Op == Reverse {
				reversals++
			}
		}
	}
	if steps < 500 || reversals < 100 {
		t.Fatalf("only %d steps taken, %d of them reversals", steps, reversals)
	}
}

// valid is every edit the pool holds and does not count as stale, with
// its ΔBIC.
func (p *pool) valid() map[Edit]float64 {
	out := map[Edit]float64{}
	for _, b := range p.buckets {
		for _, c := range b {
			if !p.stale(c) {
				out[c.e] = c.d
			}
		}
	}
	return out
}

// rescored is every row's improving edits scored from the current rows.
func rescored(g *graph, r *rows, kn *knowledge, version []int) map[Edit]float64 {
	fresh := &pool{g: g, r: r, kn: kn, version: version, buckets: make([][]pooled, g.n)}
	for w := range g.n {
		fresh.fill(w)
	}
	return fresh.valid()
}

// randomReversal picks one of g's allowed reversals, if there is one.
func randomReversal(r *rand.Rand, m Model, g *graph, kn *knowledge) (Edit, bool) {
	var revs []Edit
	_ = eachEdit(context.Background(), m, g, kn, func(e Edit) {
		if e.Op == Reverse {
			revs = append(revs, e)
		}
	})
	if len(revs) == 0 {
		return Edit{}, false
	}
	return revs[r.IntN(len(revs))], true
}

func rescan(m Model, g *graph, r *rows, kn *knowledge) (Edit, bool) {
	var best Edit
	bestD, found := math.Inf(1), false
	_ = eachEdit(context.Background(), m, g, kn, func(e Edit) {
		if d := r.delta(e); d < -improvement && d < bestD { // eachEdit's order: the first of equals stays
			best, bestD, found = e, d, true
		}
	})
	return best, found
}

// poolCorrelation is the correlation matrix of p variables, each a random
// mix of the ones before it and noise.
func poolCorrelation(r *rand.Rand, p int) *mat.SymDense {
	const n = 400
	x := mat.NewDense(n, p, nil)
	for i := range n {
		for j := range p {
			v := r.NormFloat64()
			for k := range j {
				v += (r.Float64() - 0.5) * x.At(i, k) * 0.8
			}
			x.Set(i, j, v)
		}
	}
	s := mat.NewSymDense(p, nil)
	for a := range p {
		for b := 0; b <= a; b++ {
			s.SetSym(a, b, corr(mat.Col(nil, a, x), mat.Col(nil, b, x)))
		}
	}
	return s
}

func corr(a, b []float64) float64 {
	var ma, mb float64
	for i := range a {
		ma, mb = ma+a[i], mb+b[i]
	}
	ma, mb = ma/float64(len(a)), mb/float64(len(b))
	var sab, saa, sbb float64
	for i := range a {
		sab += (a[i] - ma) * (b[i] - mb)
		saa += (a[i] - ma) * (a[i] - ma)
		sbb += (b[i] - mb) * (b[i] - mb)
	}
	return sab / math.Sqrt(saa*sbb)
}
