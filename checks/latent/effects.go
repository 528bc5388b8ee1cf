package latent

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/effects"
)

// EffectEstimate is an effect with its delta-method SE, two-sided normal
// p, and its value in the standardized solution, Estimate sd(from)/sd(to).
type EffectEstimate struct {
	Estimate, SE, P, Std float64
}

// Effect returns the effect of structural node from on structural node to
// with its SE. Without through it is the total effect, the (to, from)
// entry of (I − B)⁻¹ (the sum over directed paths of the products of
// their coefficients; Bollen 1987, Sociological Methodology 17); with
// through = m₁, …, m_k it is the effect along the paths that pass
// m₁, …, m_k in that order,
//
//	T(m₁ ← from) T(m₂ ← m₁) ⋯ T(to ← m_k),  T = (I − B)⁻¹.
//
// The SE is the delta method's, sqrt(gᵀ Cov(θ̂) g) with g the gradient in
// the paths, ∂T(a ← b)/∂B(i ← j) = T(a ← i) T(j ← b) (Sobel 1986).
func Effect(r *Result, from, to int, through []int) (EffectEstimate, error) {
	chain := append(append([]int{from}, through...), to)
	if err := r.checkEffectNodes(chain); err != nil {
		return EffectEstimate{}, err
	}
	value, grad := 1.0, make([]float64, len(r.Params))
	for s := 1; s < len(chain); s++ {
		seg := r.effects.At(chain[s], chain[s-1])
		segGrad := r.totalGradient(chain[s-1], chain[s])
		for k := range grad {
			grad[k] = grad[k]*seg + value*segGrad[k]
		}
		value *= seg
	}
	return r.delta(value, grad, from, to), nil
}

// IndirectEffect is the total effect of from on to less the direct path,
// T(to ← from) − B(to ← from), with its delta-method SE.
func IndirectEffect(r *Result, from, to int) (EffectEstimate, error) {
	if err := r.checkEffectNodes([]int{from, to}); err != nil {
		return EffectEstimate{}, err
	}
	grad := r.totalGradient(from, to)
	for k, e := range r.Params {
		if e.Kind == Path && e.To == to && e.From == from {
			grad[k]--
		}
	}
	return r.delta(r.effects.At(to, from)-r.Coef.At(to, from), grad, from, to), nil
}

// totalGradient is ∂T(to ← from)/∂θ: T(to ← i) T(j ← from) for a path
// i ← j, zero for the other parameters.
func (r *Result) totalGradient(from, to int) []float64 {
	g := make([]float64, len(r.Params))
	for k, e := range r.Params {
		if e.Kind == Path {
			g[k] = r.effects.At(to, e.To) * r.effects.At(e.From, from)
		}
	}
	return g
}

func (r *Result) delta(value float64, grad []float64, from, to int) EffectEstimate {
	g := mat.NewVecDense(len(grad), grad)
	se := math.Sqrt(mat.Inner(g, r.Vcov, g))
	p := math.NaN()
	if se > 0 {
		p = 2 * effects.NormalSF(math.Abs(value)/se)
	}
	std := value * math.Sqrt(r.ImpliedAll.At(from, from)/r.ImpliedAll.At(to, to))
	return EffectEstimate{Estimate: value, SE: se, P: p, Std: std}
}

func (r *Result) checkEffectNodes(chain []int) error {
	m := r.Spec.Nodes()
	seen := map[int]bool{}
	for _, v := range chain {
		switch {
		case v < 0 || v >= m:
			return fmt.Errorf("latent: effect: %d is not a node", v)
		case v < r.Spec.Observed && r.isIndicator(v):
			return fmt.Errorf("latent: effect: node %d is an indicator, not a structural node", v)
		case seen[v]:
			return fmt.Errorf("latent: effect: node %d appears twice", v)
		}
		seen[v] = true
	}
	return nil
}

func (r *Result) isIndicator(v int) bool {
	for _, items := range r.Spec.Indicators {
		for _, w := range items {
			if w == v {
				return true
			}
		}
	}
	return false
}
