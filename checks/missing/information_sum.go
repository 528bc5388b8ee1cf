package missing

import (
	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/mat"
)

// information carries the sums back by P on every index (see infoAcc),
//
//	Σ n Ã                 = N P − P (Σ n Ẽ) P,
//	Σ Ã_ri ã_j            = P_ri (P Σb̄)_j − Σ (P Ẽ P)_ri (P b̄)_j,
//	Σ vech(Ã) vech(C̃)ᵀ    = vech(P) vech(P ΣY P)ᵀ − Σ vech(P Ẽ P) vech(P Y P)ᵀ,
//
// N the rows with an observed value, and reads the information from them
// (ObservedInformation).
func (acc *infoAcc) information() *mat.SymDense {
	mm, mix, m := acc.meanBlock(), acc.mixed(), acc.pairs()
	return assemble(acc.p, mm, mix, m)
}

// meanBlock is Σ n Ã, p × p.
func (acc *infoAcc) meanBlock() []float64 {
	p := acc.p
	e := make([]float64, acc.v)
	for i := range p {
		for j := 0; j <= i; j++ {
			e[vech(i, j)] = acc.en[i*p+j]
		}
	}
	acc.sandwich(e, 1)
	mm := make([]float64, p*p)
	for i := range p {
		for j := range p {
			mm[i*p+j] = acc.n*acc.full[i*p+j] - e[vech(i, j)]
		}
	}
	return mm
}

// mixed is Σ Ã_ri ã_j at (r p + i) p + j.
func (acc *infoAcc) mixed() []float64 {
	p, v := acc.p, acc.v
	u := make([]float64, p*v) // u[c][vech(r, i)] = Σ (P Ẽ P)_ri b̄_c
	for r := range v {
		for c := range p {
			u[c*v+r] = acc.f[r*p+c]
		}
	}
	acc.sandwich(u, p)
	pr := blas64.General{Rows: p, Cols: p, Stride: p, Data: acc.full}
	ft := blas64.General{Rows: v, Cols: p, Stride: p, Data: make([]float64, v*p)}
	blas64.Gemm(blas.Trans, blas.NoTrans, 1, blas64.General{Rows: p, Cols: v, Stride: v, Data: u}, pr, 0, ft)
	pb := make([]float64, p)
	blas64.Gemv(blas.NoTrans, 1, pr, blas64.Vector{N: p, Inc: 1, Data: acc.beta}, 0,
		blas64.Vector{N: p, Inc: 1, Data: pb})
	mix := make([]float64, p*p*p)
	for r := range p {
		for i := range p {
			for j := range p {
				mix[(r*p+i)*p+j] = acc.full[r*p+i]*pb[j] - ft.Data[vech(r, i)*p+j]
			}
		}
	}
	return mix
}

// pairs is Σ vech(Ã) vech(C̃)ᵀ, v × v, computed in the place of acc.g.
func (acc *infoAcc) pairs() []float64 {
	p, v := acc.p, acc.v
	acc.sandwich(acc.g, v)
	transposeSquare(acc.g, v)
	acc.sandwich(acc.g, v)
	transposeSquare(acc.g, v)
	acc.sandwich(acc.ybar, 1)
	m := acc.g
	for i := range p {
		for k := 0; k <= i; k++ {
			x, pik := vech(i, k), acc.full[i*p+k]
			row := m[x*v : (x+1)*v]
			for y, c := range acc.ybar {
				row[y] = pik*c - row[y]
			}
		}
	}
	return m
}

// sandwichChunk is how many rows sandwich carries at a time.
const sandwichChunk = 32

// sandwich replaces each of the first rows rows of x (v wide), read as
// vech R of a symmetric p × p matrix, by vech(P R P): R P for a chunk of
// rows in one matrix product, each block transposed (P R), then by P again.
func (acc *infoAcc) sandwich(x []float64, rows int) {
	p, v := acc.p, acc.v
	buf, tmp := make([]float64, sandwichChunk*p*p), make([]float64, sandwichChunk*p*p)
	pr := blas64.General{Rows: p, Cols: p, Stride: p, Data: acc.full}
	for r0 := 0; r0 < rows; r0 += sandwichChunk {
		c := min(sandwichChunk, rows-r0)
		gen := func(d []float64) blas64.General { return blas64.General{Rows: c * p, Cols: p, Stride: p, Data: d} }
		for r := range c {
			unpackSym(buf[r*p*p:(r+1)*p*p], x[(r0+r)*v:(r0+r+1)*v], p)
		}
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, gen(buf), pr, 0, gen(tmp))
		for r := range c {
			b, t := buf[r*p*p:(r+1)*p*p], tmp[r*p*p:(r+1)*p*p]
			for i := range p {
				for j := range p {
					b[i*p+j] = t[j*p+i]
				}
			}
		}
		blas64.Gemm(blas.NoTrans, blas.NoTrans, 1, gen(buf), pr, 0, gen(tmp))
		for r := range c {
			t, row := tmp[r*p*p:(r+1)*p*p], x[(r0+r)*v:(r0+r+1)*v]
			for i := range p {
				for j := 0; j <= i; j++ {
					row[vech(i, j)] = t[i*p+j]
				}
			}
		}
	}
}

// unpackSym writes the symmetric p × p matrix of vech s into dst, both
// triangles.
func unpackSym(dst, s []float64, p int) {
	for i := range p {
		for j := 0; j <= i; j++ {
			dst[i*p+j], dst[j*p+i] = s[vech(i, j)], s[vech(i, j)]
		}
	}
}

// transposeSquare transposes the n × n row-major matrix a in place.
func transposeSquare(a []float64, n int) {
	for i := range n {
		for j := range i {
			a[i*n+j], a[j*n+i] = a[j*n+i], a[i*n+j]
		}
	}
}

// assemble reads the information from mm = Σ n Ã (p × p), mix = Σ Ã_ri
// ã_j at (r p + i) p + j and m = Σ vech(Ã) vech(C̃)ᵀ (v × v) by the
// formula of ObservedInformation.
func assemble(p int, mm, mix, m []float64) *mat.SymDense {
	v := p * (p + 1) / 2
	info := mat.NewSymDense(ParamCount(p), nil)
	at := func(x, y int) float64 { return m[x*v+y] }
	weight := func(i, j int) float64 {
		if i == j {
			return 0.5
		}
		return 1
	}
	for r := range p {
		for s := 0; s <= r; s++ {
			info.SetSym(MeanParam(r), MeanParam(s), mm[r*p+s])
		}
	}
	for i := range p {
		for j := 0; j <= i; j++ {
			wij, gij := weight(i, j), CovParam(p, i, j)
			for r := range p {
				info.SetSym(gij, MeanParam(r), wij*(mix[(r*p+i)*p+j]+mix[(r*p+j)*p+i]))
			}
			for k := range p {
				for l := 0; l <= k; l++ {
					if CovParam(p, k, l) > gij {
						continue
					}
					t := at(vech(i, k), vech(j, l)) + at(vech(i, l), vech(j, k)) + at(vech(j, k), vech(i, l)) +
						at(vech(j, l), vech(i, k))
					info.SetSym(gij, CovParam(p, k, l), wij*weight(k, l)*t)
				}
			}
		}
	}
	return info
}
