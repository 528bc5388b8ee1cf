package missing

import (
	"gonum.org/v1/gonum/floats"
	"gonum.org/v1/gonum/mat"
)

// infoAcc sums the patterns' information (ObservedInformation) in the
// coordinates of the precision matrix P = Σ⁻¹. A pattern with missing set
// M has, with Ẽ = P_MM⁻¹ set into M × M (zero elsewhere) and K = −P_MM⁻¹
// P_MO = Σ_MO Σ_OO⁻¹ (condition), A set into p × p (zero outside O)
//
//	Ã = P − P_·M P_MM⁻¹ P_M· = P Z P,  Z = Σ − Ẽ,
//
// (Little & Rubin, sec. 11.2: the inverse of a principal block of Σ from
// the precision matrix), and likewise ã = P b̄ and C̃ = P Y P with
//
//	b̄ = T d,  Y = T S Tᵀ − (n/2) Z,  T = [I_O; K] (x_O ↦ x_O and its conditional mean x_M).
//
// Z differs from Σ only in M × M, so the sums of Z ⊗ Y and Z ⊗ b̄ over the
// patterns are Σ ⊗ ΣY and Σ ⊗ Σb̄ less the sums of Ẽ ⊗ Y and Ẽ ⊗ b̄, which
// touch only the m(m+1)/2 rows of a pattern's missing pairs: about m² v
// operations a pattern of m missing variables, where A ⊗ C costs v².
type infoAcc struct {
	p, v  int
	mean  []float64
	sigma []float64 // vech Σ
	prec  *mat.SymDense
	full  []float64 // P, p × p, both triangles
	n     float64   // rows with an observed value
	en    []float64 // Σ n Ẽ, p × p
	beta  []float64 // Σ b̄, p
	ybar  []float64 // Σ vech Y, v
	f     []float64 // Σ vech(Ẽ) b̄ᵀ, v × p
	g     []float64 // Σ vech(Ẽ) vech(Y)ᵀ, v × v
	cond  condition
	// scratch: d and S of a pattern (q, q × q), K S (m × q), b̄ (p), vech Y
	// (v), a row (p)
	d, s, ks, b, y, x []float64
}

func newInfoAcc(em *EMResult) (*infoAcc, error) {
	p := len(em.Mean)
	prec, err := precision(em.Cov)
	if err != nil {
		return nil, errorf("the EM covariance is not positive definite")
	}
	v := p * (p + 1) / 2
	acc := &infoAcc{p: p, v: v, mean: em.Mean, sigma: make([]float64, v), prec: prec, full: fullSymmetric(prec),
		en: make([]float64, p*p), beta: make([]float64, p), ybar: make([]float64, v), f: make([]float64, v*p),
		g: make([]float64, v*v), b: make([]float64, p), y: make([]float64, v)}
	for i := range p {
		for j := 0; j <= i; j++ {
			acc.sigma[vech(i, j)] = em.Cov.At(i, j)
		}
	}
	return acc, nil
}

// vech is the index of (i, j) in the lower triangle, row by row.
func vech(i, j int) int {
	if i < j {
		i, j = j, i
	}
	return i*(i+1)/2 + j
}

// add sums pattern pat (see infoAcc).
func (acc *infoAcc) add(cols [][]float64, pat Pattern) error {
	obs, mis, p, v := pat.obs, pat.mis, acc.p, acc.v
	if len(obs) == 0 {
		return nil
	}
	n := float64(len(pat.Rows))
	if err := acc.cond.set(acc.prec, acc.mean, obs, mis); err != nil {
		return errorf("the EM covariance is not positive definite")
	}
	acc.completed(cols, pat)
	acc.n += n
	floats.Add(acc.beta, acc.b)
	floats.Add(acc.ybar, acc.y)
	m := len(mis)
	for x, a := range mis {
		for z, b := range mis[:x+1] {
			e, r := acc.cond.c[x*m+z], vech(a, b)
			acc.en[a*p+b] += n * e
			if a != b {
				acc.en[b*p+a] += n * e
			}
			floats.AddScaled(acc.f[r*p:(r+1)*p], e, acc.b)
			floats.AddScaled(acc.g[r*v:(r+1)*v], e, acc.y)
		}
	}
	return nil
}

// completed sets b̄ = T d and vech Y, Y = T S Tᵀ − (n/2)(Σ − Ẽ) (see
// infoAcc), for the rows of pat under its condition: T S Tᵀ from the
// pattern's d and S where it has enough rows to be reduced to them (EM's
// rule, reducible), else as Σ b bᵀ over its rows completed, b = T (x_O −
// μ_O), |M| |O| + v a row.
func (acc *infoAcc) completed(cols [][]float64, pat Pattern) {
	n, m := float64(len(pat.Rows)), len(pat.mis)
	for r, s := range acc.sigma {
		acc.y[r] = -n / 2 * s
	}
	if reducible(len(pat.Rows), acc.p) {
		acc.centredSums(cols, pat)
		acc.sandwichObserved(pat.obs, pat.mis)
	} else {
		acc.completeRows(cols, pat)
	}
	for x, i := range pat.mis {
		for z, j := range pat.mis[:x+1] {
			acc.y[vech(i, j)] += n / 2 * acc.cond.c[x*m+z]
		}
	}
}

// completeRows adds Σ vech(b bᵀ) to acc.y and sets acc.b to Σ b over the
// rows of pat, b = T (x_O − μ_O).
func (acc *infoAcc) completeRows(cols [][]float64, pat Pattern) {
	obs, mis, k := pat.obs, pat.mis, acc.cond.b
	q := len(obs)
	acc.x = grow(acc.x, acc.p)
	x := acc.x
	clear(acc.b)
	for _, r := range pat.Rows {
		for _, j := range obs {
			x[j] = cols[j][r] - acc.mean[j]
		}
		for a, i := range mis {
			x[i] = 0
			for c, j := range obs {
				x[i] += k[a*q+c] * x[j]
			}
		}
		floats.Add(acc.b, x)
		for i, xi := range x {
			floats.AddScaled(acc.y[vech(i, 0):vech(i, i)+1], xi, x[:i+1])
		}
	}
}

// sandwichObserved adds vech(T S Tᵀ) to acc.y, S on O × O, K S on M × O and
// K S Kᵀ on M × M, and sets acc.b to T d, from the pattern's d and S.
func (acc *infoAcc) sandwichObserved(obs, mis []int) {
	q, k, y := len(obs), acc.cond.b, acc.y
	acc.ks = grow(acc.ks, len(mis)*q)
	clear(acc.ks)
	for x, i := range mis {
		row := acc.ks[x*q : (x+1)*q]
		for z, kz := range k[x*q : (x+1)*q] {
			floats.AddScaled(row, kz, acc.s[z*q:(z+1)*q])
		}
		acc.b[i] = floats.Dot(k[x*q:(x+1)*q], acc.d)
	}
	for b, i := range obs {
		acc.b[i] = acc.d[b]
		for c, j := range obs[:b+1] {
			y[vech(i, j)] += acc.s[b*q+c]
		}
	}
	for x, i := range mis {
		row := acc.ks[x*q : (x+1)*q]
		for c, j := range obs {
			y[vech(i, j)] += row[c]
		}
		for z, j := range mis[:x+1] {
			y[vech(i, j)] += floats.Dot(row, k[z*q:(z+1)*q])
		}
	}
}

// centredSums sets d = Σ (x_O − μ_O) and S = Σ (x_O − μ_O)(x_O − μ_O)ᵀ
// (both triangles) over the rows of pat.
func (acc *infoAcc) centredSums(cols [][]float64, pat Pattern) {
	q := len(pat.obs)
	acc.d, acc.s, acc.x = grow(acc.d, q), grow(acc.s, q*q), grow(acc.x, acc.p)
	clear(acc.d)
	clear(acc.s)
	x := acc.x[:q]
	for _, i := range pat.Rows {
		for b, j := range pat.obs {
			x[b] = cols[j][i] - acc.mean[j]
			acc.d[b] += x[b]
		}
		for b := range q {
			floats.AddScaled(acc.s[b*q:b*q+b+1], x[b], x[:b+1])
		}
	}
	for b := range q {
		for c := 0; c < b; c++ {
			acc.s[c*q+b] = acc.s[b*q+c]
		}
	}
}
