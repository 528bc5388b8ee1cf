package latent

import (
	"math"

	"gonum.org/v1/gonum/mat"
)

// singularTol is the smallest eigenvalue of the scaled information
// D^−½ H D^−½ (a correlation-like matrix, D its diagonal) below which H is
// taken as singular.
const singularTol = 1e-8

// nullTol is the share of a null vector's length above which a parameter
// is named as moving in it.
const nullTol = 0.05

// checkCounts applies the counting rules before any fitting: every latent
// has three indicators, or two and an arrow or covariance to another
// structural node (the t-rule's local form and the two-indicator rule,
// Bollen 1989, ch. 7), and df = p(p + 1)/2 − q ≥ 0.
func (l *layout) checkCounts() error {
	for j, items := range l.spec.Indicators {
		if len(items) == 1 || (len(items) == 2 && !l.connected(l.spec.Latent(j))) {
			return &UnidentifiedError{Reason: TooFewIndicators, Latent: j, Indicators: len(items)}
		}
	}
	if df := l.df(); df < 0 {
		return &UnidentifiedError{Reason: NegativeDF, DF: df}
	}
	return nil
}

// connected reports whether structural node v has a parent, a child, or
// a free covariance with another source.
func (l *layout) connected(v int) bool {
	for _, par := range l.params {
		switch {
		case par.Kind == Path && (par.To == v || par.From == v):
			return true
		case par.Kind == Covariance && l.roles.structural[par.To] && (par.To == v || par.From == v):
			return true
		}
	}
	return false
}

// checkInformation returns an *UnidentifiedError naming the parameters
// of H's (numerical) null space, or nil when H is nonsingular.
func (l *layout) checkInformation(h *mat.SymDense) error {
	var ch mat.Cholesky
	inv := mat.NewSymDense(h.SymmetricDim(), nil)
	if ch.Factorize(h) && ch.InverseTo(inv) == nil && wellConditioned(h, inv) {
		return nil
	}
	return l.nullSpace(h)
}

// nullSpace names the parameters that move in the eigenvectors of the
// scaled information whose eigenvalues are below singularTol (or that
// carry no information at all); nil when there are none.
func (l *layout) nullSpace(h *mat.SymDense) error {
	scaled, dead := scaleInformation(h)
	if len(dead) > 0 {
		return l.unidentified(dead)
	}
	var eig mat.EigenSym
	if !eig.Factorize(scaled, true) {
		return l.unidentified(nil)
	}
	if idx := nullParams(&eig); len(idx) > 0 {
		return l.unidentified(idx)
	}
	return nil
}

// scaleInformation returns D^−½ H D^−½ and the parameters whose diagonal
// entry is not positive.
func scaleInformation(h *mat.SymDense) (*mat.SymDense, []int) {
	q := h.SymmetricDim()
	scaled := mat.NewSymDense(q, nil)
	var dead []int
	for a := range q {
		if !(h.At(a, a) > 0) {
			dead = append(dead, a)
		}
		for b := 0; b <= a; b++ {
			scaled.SetSym(a, b, h.At(a, b)/math.Sqrt(h.At(a, a)*h.At(b, b)))
		}
	}
	return scaled, dead
}

// nullParams lists, in order, the parameters whose entry in an
// eigenvector of a small eigenvalue exceeds nullTol.
func nullParams(eig *mat.EigenSym) []int {
	vals := eig.Values(nil)
	var vecs mat.Dense
	eig.VectorsTo(&vecs)
	var idx []int
	for a := range vals {
		for k, ev := range vals {
			if ev < singularTol && math.Abs(vecs.At(a, k)) > nullTol {
				idx = append(idx, a)
				break
			}
		}
	}
	return idx
}

func (l *layout) unidentified(idx []int) error {
	e := &UnidentifiedError{Reason: SingularInformation}
	for _, a := range idx {
		e.Params = append(e.Params, l.params[a])
	}
	return e
}

// wellConditioned reports whether the scaled information D^−½ H D^−½ has
// no eigenvalue below singularTol, from its inverse D^½ H⁻¹ D^½: its
// largest eigenvalue, at most the trace, must stay below 1/singularTol.
// (A cheap sufficient test; when it fails checkInformation decides.)
func wellConditioned(h, inv *mat.SymDense) bool {
	trace := 0.0
	for a := range h.SymmetricDim() {
		trace += h.At(a, a) * inv.At(a, a)
	}
	return trace < 1/singularTol
}
