package latent

import "gonum.org/v1/gonum/mat"

// hessian is the exact second derivative of F_ML (the observed
// information of one case, times 2):
//
//	∂²F/∂θ_a∂θ_b = tr(Σ⁻¹Δ_aΣ⁻¹Δ_b) − 2 tr(Σ⁻¹Δ_a Ω Δ_b) + tr(Ω Δ_ab),
//
// Ω = Σ⁻¹(Σ − S)Σ⁻¹, Δ_ab = ∂²Σ/∂θ_a∂θ_b (differentiating the gradient
// tr(Ω Δ_a) once more; the first term is the expected information). With
// Δ_a = u_a v_aᵀ + v_a u_aᵀ the middle term is, for X_yz[a,b] = y_aᵀ X z_b,
//
//	W_vu[b,a] Ω_vu[a,b] + W_uu[a,b] Ω_vv[a,b] + W_vv[a,b] Ω_uu[a,b] + W_vu[a,b] Ω_vu[b,a],
//
// and the last is secondOrder's.
func (l *layout) hessian(st *state, s *mat.SymDense, h *mat.SymDense) {
	l.information(st, h)
	omega := st.omegaOf(s)
	wuu, wvv, wvu := st.bilinear(st.w)
	ouu, ovv, ovu := st.bilinear(omega)
	g, k := st.secondOrderFactors(l.p, omega)
	for a, pa := range l.params {
		for b := 0; b <= a; b++ {
			t2 := wvu.At(b, a)*ovu.At(a, b) + wuu.At(a, b)*ovv.At(a, b) +
				wvv.At(a, b)*ouu.At(a, b) + wvu.At(a, b)*ovu.At(b, a)
			h.SetSym(a, b, h.At(a, b)-2*t2+secondOrder(pa, l.params[b], st, g, k))
		}
	}
}

// secondOrderFactors returns G = (F E)ᵀ Ω (F E) and K = (F C)ᵀ Ω (F E).
func (st *state) secondOrderFactors(p int, omega *mat.Dense) (g, k *mat.Dense) {
	m, _ := st.e.Dims()
	fe := st.e.Slice(0, p, 0, m)
	fc := mat.DenseCopyOf(st.c).Slice(0, p, 0, m)
	var ofe mat.Dense
	ofe.Mul(omega, fe)
	g, k = &mat.Dense{}, &mat.Dense{}
	g.Mul(fe.T(), &ofe)
	k.Mul(fc.T(), &ofe)
	return g, k
}

// secondOrder is tr(Ω ∂²Σ/∂θ_a∂θ_b). Σ is linear in P, so two variance
// or covariance parameters give 0. For paths or loadings a = A(i ← j)
// and b = A(k ← l), from ∂²E = E J_kl E J_ij E + E J_ij E J_kl E,
//
//	2 (E[l,i] K[j,k] + E[j,k] K[l,i] + C[j,l] G[k,i]);
//
// for a = A(i ← j) and a variance P(k, k), 2 E[j,k] G[k,i]; for a
// covariance P(k, l), 2 (E[j,k] G[l,i] + E[j,l] G[k,i]).
func secondOrder(a, b Param, st *state, g, k *mat.Dense) float64 {
	if !a.inA() {
		a, b = b, a
	}
	if !a.inA() {
		return 0
	}
	e, i, j := st.e, a.To, a.From
	switch {
	case b.inA():
		kk, l := b.To, b.From
		return 2 * (e.At(l, i)*k.At(j, kk) + e.At(j, kk)*k.At(l, i) + st.c.At(j, l)*g.At(kk, i))
	case b.To == b.From:
		return 2 * e.At(j, b.To) * g.At(b.To, i)
	}
	return 2 * (e.At(j, b.To)*g.At(b.From, i) + e.At(j, b.From)*g.At(b.To, i))
}
