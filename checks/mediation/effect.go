package mediation

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"
)

// Estimate is an effect through mediators with its first-order standard
// error.
type Estimate struct {
	Effect float64
	// StdError is the multivariate delta method's (NaN when the model has
	// no covariance blocks).
	StdError float64
	// Connected is false when the graph has no directed path from From to
	// To through every mediator: the effect is then zero, exactly.
	Connected bool
}

// Effect returns the effect of p.From on p.To through the mediators
// p.Through: the sum, over the directed paths from From to To that pass
// through every mediator, of the products of the coefficients along them
// (Wright 1934; Alwin & Hauser 1975; Bollen 1987). With the mediators in
// graph order m_1 … m_k, such a path splits uniquely at the mediators, so
// with T = (I − B)⁻¹ (TotalEffects)
//
//	θ = T[x,m_1] · T[m_1,m_2] · … · T[m_k,y],
//
// zero when the mediators are not on one directed chain. With no
// mediators it is the total indirect effect, total minus direct:
//
//	θ = T[x,y] − B[x,y].
//
// The standard error is the multivariate delta method's (Sobel 1982;
// Bollen 1987) with the analytic gradient: since dT = T dB T,
//
//	∂T[a,b]/∂B[i,j] = T[a,i]·T[j,b],
//	∂θ/∂B[i,j] = Σ_s (Π_{r≠s} T[u_r,u_{r+1}]) · T[u_s,i]·T[j,u_{s+1}]   (u = x, m_1, …, m_k, y),
//	∂θ/∂B[i,j] = T[x,i]·T[j,y] − 1{i = x and j = y}                   (total indirect),
//	SE² = Σ_j g_jᵀ Cov_j g_j,
//
// g_j the gradient over node j's coefficients and Cov_j their covariance
// (block-diagonal by equation in a recursive model). For one mediator
// with a = B[x,m], b = B[m,y] and no other path this is the first-order
// Sobel (1982) form √(b²·s_a² + a²·s_b²). The product's sampling
// distribution is skewed (Preacher & Hayes 2008; MacKinnon, Lockwood &
// Williams 2004), so the SE gives no good symmetric interval: see
// MonteCarlo and Bootstrap.
func Effect(m *Model, p Path) (Estimate, error) {
	if err := m.Validate(); err != nil {
		return Estimate{}, err
	}
	c, err := newChain(m.Parents, p)
	if err != nil {
		return Estimate{}, err
	}
	t, err := TotalEffects(m.B)
	if err != nil {
		return Estimate{}, err
	}
	est := Estimate{Effect: c.value(t, m.B), StdError: math.NaN(), Connected: c.connected}
	if m.Cov != nil {
		est.StdError = math.Sqrt(c.deltaVariance(t, m))
	}
	return est, nil
}

// StandardizedEffect is Effect on the scale of standardized coefficients
// β*[i,j] = B[i,j]·sd_i/sd_j: the products along each path telescope, so
// the effect and its SE are those of Effect times sd_x/sd_y. sd holds the
// standard deviations of the nodes by which coefficients are
// standardized (the sample SDs for standardized regression coefficients;
// the model-implied ones, ImpliedCov, to match a fitted model's
// completely standardized solution). The SE treats the SDs as fixed.
func StandardizedEffect(m *Model, p Path, sd []float64) (Estimate, error) {
	if len(sd) != len(m.Parents) {
		return Estimate{}, fmt.Errorf("mediation: %d SDs for %d nodes", len(sd), len(m.Parents))
	}
	est, err := Effect(m, p)
	if err != nil {
		return est, err
	}
	f := sd[p.From] / sd[p.To]
	est.Effect *= f
	est.StdError *= math.Abs(f)
	return est, nil
}

// value is the effect for total effects t and coefficients b.
func (c *chain) value(t *mat.Dense, b *mat.Dense) float64 {
	if len(c.nodes) == 2 {
		x, y := c.nodes[0], c.nodes[1]
		return t.At(x, y) - b.At(x, y)
	}
	v := 1.0
	for s := 0; s+1 < len(c.nodes); s++ {
		v *= t.At(c.nodes[s], c.nodes[s+1])
	}
	return v
}

// gradient returns ∂θ/∂B[i,j] for the arc i → j.
func (c *chain) gradient(t *mat.Dense, i, j int) float64 {
	u := c.nodes
	if len(u) == 2 {
		g := t.At(u[0], i) * t.At(j, u[1])
		if i == u[0] && j == u[1] {
			g--
		}
		return g
	}
	g := 0.0
	for s := 0; s+1 < len(u); s++ {
		others := 1.0
		for r := 0; r+1 < len(u); r++ {
			if r != s {
				others *= t.At(u[r], u[r+1])
			}
		}
		g += others * t.At(u[s], i) * t.At(j, u[s+1])
	}
	return g
}

// deltaVariance is Σ_j g_jᵀ Cov_j g_j.
func (c *chain) deltaVariance(t *mat.Dense, m *Model) float64 {
	v := 0.0
	for j, pa := range m.Parents {
		if len(pa) == 0 {
			continue
		}
		g := make([]float64, len(pa))
		for k, i := range pa {
			g[k] = c.gradient(t, i, j)
		}
		gv := mat.NewVecDense(len(g), g)
		v += mat.Inner(gv, m.Cov[j], gv)
	}
	return v
}
