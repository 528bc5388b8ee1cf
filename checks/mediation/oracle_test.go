package mediation

import (
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// randomModel is a random recursive model on n nodes: arcs forward in a
// random order with the given density, coefficients of either sign with
// magnitude in [0.2, 1.2], and no covariance.
func randomModel(r *rand.Rand, n int, density float64) *Model {
	order := r.Perm(n)
	m := &Model{B: mat.NewDense(n, n, nil), Parents: make([][]int, n)}
	for a := range n {
		for b := a + 1; b < n; b++ {
			if r.Float64() < density {
				i, j := order[a], order[b]
				m.Parents[j] = append(m.Parents[j], i)
				c := 0.2 + r.Float64()
				if r.IntN(2) == 0 {
					c = -c
				}
				m.B.Set(i, j, c)
			}
		}
	}
	return m
}

// randomPath picks a path at random: one time in four any pair and up to
// three mediators, otherwise a pair with a directed path between them and
// up to three mediators among the nodes on such paths (which need not be
// on one chain), half the time from the interior of one such path.
func randomPath(r *rand.Rand, m *Model) Path {
	n := len(m.Parents)
	perm := r.Perm(n)
	k := r.IntN(min(4, n-1))
	if r.IntN(4) == 0 {
		return Path{From: perm[0], To: perm[1], Through: perm[2 : 2+k]}
	}
	reach := reachability(m.Parents, mustOrder(m))
	long := r.IntN(5) > 0 // prefer pairs joined by a path of two arcs or more
	for _, x := range perm {
		for _, y := range perm {
			if !reach[x][y] || long && !hasLongPath(m.Parents, reach, x, y) {
				continue
			}
			var between []int
			for _, v := range perm {
				if reach[x][v] && reach[v][y] {
					between = append(between, v)
				}
			}
			if r.IntN(2) == 0 { // the interior of one random directed path
				between = between[:0]
				for u := x; u != y; {
					var next []int
					for _, v := range perm {
						if slices.Contains(m.Parents[v], u) && (v == y || reach[v][y]) {
							next = append(next, v)
						}
					}
					if u = next[r.IntN(len(next))]; u != y {
						between = append(between, u)
					}
				}
				r.Shuffle(len(between), func(i, j int) { between[i], between[j] = between[j], between[i] })
			}
			return Path{From: x, To: y, Through: between[:min(k, len(between))]}
		}
	}
	return Path{From: perm[0], To: perm[1]}
}

// pathSum is the oracle for Effect: every directed path from p.From to
// p.To, listed by depth-first search, kept when it visits every mediator
// (for no mediators: when it has two arcs or more), its coefficient
// products summed. It uses neither T nor the chain. ok reports whether a
// path was kept.
func pathSum(m *Model, p Path) (sum float64, ok bool) {
	children := make([][]int, len(m.Parents))
	for j, pa := range m.Parents {
		for _, i := range pa {
			children[i] = append(children[i], j)
		}
	}
	var walk func(path []int, prod float64)
	walk = func(path []int, prod float64) {
		u := path[len(path)-1]
		if u == p.To {
			keep := len(path) > 2
			for _, v := range p.Through {
				keep = keep && slices.Contains(path, v)
			}
			if keep {
				sum, ok = sum+prod, true
			}
			return
		}
		for _, v := range children[u] {
			walk(append(path, v), prod*m.B.At(u, v))
		}
	}
	walk([]int{p.From}, 1)
	return sum, ok
}

// recursiveCov is the covariance of the nodes for error variances psi,
// built equation by equation in a topological order,
//
//	Cov(v_j, v_u) = Σ_i B[i,j]·Cov(v_i, v_u) for u before j,  Var(v_j) = Σ_i B[i,j]·Cov(v_i, v_j) + ψ_j,
//
// without the matrix T.
func recursiveCov(m *Model, psi []float64) *mat.SymDense {
	order, _ := topoOrder(m.Parents)
	n := len(order)
	s := mat.NewSymDense(n, nil)
	for k, j := range order {
		for _, u := range order[:k] {
			v := 0.0
			for _, i := range m.Parents[j] {
				v += m.B.At(i, j) * s.At(i, u)
			}
			s.SetSym(j, u, v)
		}
		v := psi[j]
		for _, i := range m.Parents[j] {
			v += m.B.At(i, j) * s.At(i, j)
		}
		s.SetSym(j, j, v)
	}
	return s
}

// qrFit regresses column y on the columns x (with an intercept) of the
// rows given by idx (repeats allowed) through gonum's QR factorization of
// the design: the oracle for the bootstrap's refits from weighted moments.
func qrFit(cols [][]float64, idx []int, y int, x []int) []float64 {
	d := mat.NewDense(len(idx), len(x)+1, nil)
	rhs := mat.NewDense(len(idx), 1, nil)
	for r, i := range idx {
		d.Set(r, 0, 1)
		for c, v := range x {
			d.Set(r, c+1, cols[v][i])
		}
		rhs.Set(r, 0, cols[y][i])
	}
	var qr mat.QR
	qr.Factorize(d)
	var b mat.Dense
	if err := qr.SolveTo(&b, false, rhs); err != nil {
		panic(err)
	}
	return mat.Col(nil, 0, &b)[1:]
}

// naiveBootstrap is the oracle for Bootstrap's draws: resample r takes
// the rows its own stream picks (the same stream and the same n draws of a
// row as Bootstrap), lays them out, refits every equation by QR and
// computes the effect from T; no weights, no moments, no evaluator. With
// standardized, each effect is multiplied by the ratio of the resampled
// rows' SDs of From and To.
func naiveBootstrap(cols [][]float64, parents [][]int, p Path, seed uint64, resamples int,
	standardized bool) []float64 {
	n := len(cols[0])
	out := make([]float64, resamples)
	for r := range resamples {
		rng := stream(seed, r)
		idx := make([]int, n)
		for i := range idx {
			idx[i] = rng.IntN(n)
		}
		m := &Model{B: mat.NewDense(len(parents), len(parents), nil), Parents: parents}
		for j, pa := range parents {
			if len(pa) > 0 {
				for k, c := range qrFit(cols, idx, j, pa) {
					m.B.Set(pa[k], j, c)
				}
			}
		}
		est, err := Effect(m, p)
		if err != nil {
			panic(err)
		}
		out[r] = est.Effect
		if standardized {
			out[r] *= resampledSD(cols[p.From], idx) / resampledSD(cols[p.To], idx)
		}
	}
	slices.Sort(out)
	return out
}

func resampledSD(c []float64, idx []int) float64 {
	v := make([]float64, len(idx))
	for k, i := range idx {
		v[k] = c[i]
	}
	return stat.StdDev(v, nil)
}

// simulate draws n rows from the model with unit-variance normal errors
// (scaled by sd) and the given means added to each node.
func simulate(r *rand.Rand, m *Model, n int, sd, mean []float64) [][]float64 {
	order, _ := topoOrder(m.Parents)
	cols := make([][]float64, len(order))
	for j := range cols {
		cols[j] = make([]float64, n)
	}
	for i := range n {
		for _, j := range order {
			v := sd[j] * r.NormFloat64()
			for _, pa := range m.Parents[j] {
				v += m.B.At(pa, j) * (cols[pa][i] - mean[pa])
			}
			cols[j][i] = v + mean[j]
		}
	}
	return cols
}
