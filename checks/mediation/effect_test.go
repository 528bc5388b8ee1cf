package mediation

import (
	"fmt"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks/linmod"
)

// Effect against the enumeration of every directed path (pathSum), on
// 3,000 random DAGs with 2 to 9 nodes and random paths with up to three
// mediators; and the evaluator the intervals use, from the same
// coefficients. Tolerance: 1e-10 absolute or relative (sums of at most a
// few hundred products of numbers near 1).
func TestEffect_AgainstPathEnumeration(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 2))
	nonzero := 0
	for i := range 3000 {
		n := 2 + r.IntN(8)
		m := randomModel(r, n, 0.2+0.7*r.Float64())
		p := randomPath(r, m)
		want, ok := pathSum(m, p)
		got, err := Effect(m, p)
		if err != nil {
			t.Fatal(err)
		}
		name := fmt.Sprintf("model %d (%v, path %+v)", i, m.Parents, p)
		if got.Connected != ok || !scalar.EqualWithinAbsOrRel(got.Effect, want, 1e-10, 1e-10) {
			t.Fatalf("%s: effect %v (connected %v), paths give %v (%v)", name, got.Effect, got.Connected, want, ok)
		}
		if has, _ := HasPath(m.Parents, p); has != ok {
			t.Fatalf("%s: HasPath %v, paths %v", name, has, ok)
		}
		if v := evalAt(m, p); !scalar.EqualWithinAbsOrRel(v, want, 1e-10, 1e-10) {
			t.Fatalf("%s: evaluator %v, paths give %v", name, v, want)
		}
		if ok {
			nonzero++
		}
	}
	if nonzero < 1200 {
		t.Fatalf("only %d of 3000 random paths connected: the test no longer exercises the sums", nonzero)
	}
}

// evalAt runs the evaluator on the model's own coefficients.
func evalAt(m *Model, p Path) float64 {
	c, _ := newChain(m.Parents, p)
	e := newEvaluator(m.Parents, c)
	beta := make([]float64, len(e.arcs))
	for k, a := range e.arcs {
		beta[k] = m.B.At(a[0], a[1])
	}
	return e.eval(beta, make([]float64, len(e.nodes)))
}

// The total indirect effect is total minus direct, with the total effect
// taken from the reduced-form regression of y on x and x's parents
// (linmod's least squares from moments) on the covariance the model
// implies, built equation by equation (recursiveCov), on 500 random models.
// Tolerance 1e-10.
func TestTotalIndirect_AgainstReducedForm(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 3))
	for i := range 500 {
		n := 3 + r.IntN(7)
		m := randomModel(r, n, 0.3+0.6*r.Float64())
		x, y := r.IntN(n), r.IntN(n)
		if x == y || reachability(m.Parents, mustOrder(m))[y][x] {
			continue
		}
		psi := make([]float64, n)
		for j := range psi {
			psi[j] = 0.5 + r.Float64()
		}
		cov := recursiveCov(m, psi)
		fit, err := linmod.FromMoments(cov, nil, 1_000_000, y, append([]int{x}, m.Parents[x]...), 0.95)
		if err != nil {
			t.Fatal(err)
		}
		want := fit.Coefs[0].Estimate - m.B.At(x, y)
		got, err := Effect(m, Path{From: x, To: y})
		if err != nil || !scalar.EqualWithinAbsOrRel(got.Effect, want, 1e-10, 1e-10) {
			t.Fatalf("model %d (%v) %d → %d: total indirect %v (%v), reduced form − direct %v",
				i, m.Parents, x, y, got.Effect, err, want)
		}
		implied, err := ImpliedCov(m.B, diag(psi))
		if err != nil || !mat.EqualApprox(implied, cov, 1e-10) {
			t.Fatalf("model %d: ImpliedCov differs from the recursive covariance (%v)", i, err)
		}
	}
}

func mustOrder(m *Model) []int {
	o, err := topoOrder(m.Parents)
	if err != nil {
		panic(err)
	}
	return o
}

func diag(v []float64) *mat.SymDense {
	s := mat.NewSymDense(len(v), nil)
	for i, x := range v {
		s.SetSym(i, i, x)
	}
	return s
}

// The analytic gradient behind the delta method against central finite
// differences of Effect (step 1e-6; agreement to 1e-6 relative), on 300
// random models, for every coefficient.
func TestDeltaGradient_AgainstFiniteDifferences(t *testing.T) {
	r := rand.New(rand.NewPCG(18, 4))
	for i := range 300 {
		n := 2 + r.IntN(7)
		m := randomModel(r, n, 0.3+0.6*r.Float64())
		p := randomPath(r, m)
		c, _ := newChain(m.Parents, p)
		tm, _ := TotalEffects(m.B)
		for j, pa := range m.Parents {
			for _, a := range pa {
				const h = 1e-6
				b0 := m.B.At(a, j)
				m.B.Set(a, j, b0+h)
				up, _ := Effect(m, p)
				m.B.Set(a, j, b0-h)
				down, _ := Effect(m, p)
				m.B.Set(a, j, b0)
				fd := (up.Effect - down.Effect) / (2 * h)
				if g := c.gradient(tm, a, j); !scalar.EqualWithinAbsOrRel(g, fd, 1e-6, 1e-6) {
					t.Fatalf("model %d (%v) path %+v: ∂θ/∂B[%d,%d] = %v, finite differences %v",
						i, m.Parents, p, a, j, g, fd)
				}
			}
		}
	}
}

// The delta method's SE for x → m → y with x → y and correlated
// coefficients within y's equation: by hand, θ = ab, the gradient is
// (b, a) over (a, b), and c′ (in y's equation, correlated with b) has
// gradient 0, so SE² = b²s_a² + a²s_b² (Sobel 1982), whatever Cov(b, c′).
// For two parallel mediators the cross term 2·b₁b₂... enters through
// Cov(b₁, b₂): θ = a₁b₁ + a₂b₂, SE² = b₁²s_a₁² + b₂²s_a₂² + a₁²s_b₁² + a₂²s_b₂²
// + 2a₁a₂·Cov(b₁, b₂), worked by hand.
func TestDeltaSE_ByHand(t *testing.T) {
	// x=0 m=1 y=2: a = 0.5, b = 0.7, c′ = 0.2.
	b := mat.NewDense(3, 3, []float64{0, 0.5, 0.2, 0, 0, 0.7, 0, 0, 0})
	m := &Model{B: b, Parents: [][]int{nil, {0}, {0, 1}},
		Cov: []*mat.SymDense{nil, mat.NewSymDense(1, []float64{0.04}),
			mat.NewSymDense(2, []float64{0.03, 0.01, 0.01, 0.09})}}
	got, err := Effect(m, Path{From: 0, To: 2, Through: []int{1}})
	want := math.Sqrt(0.7*0.7*0.04 + 0.5*0.5*0.09)
	if err != nil || !scalar.EqualWithinAbsOrRel(got.Effect, 0.35, 1e-15, 1e-15) ||
		!scalar.EqualWithinAbsOrRel(got.StdError, want, 1e-15, 1e-14) {
		t.Fatalf("one mediator: %+v (%v), want 0.35 and SE %v", got, err, want)
	}
	// x=0 m1=1 m2=2 y=3: a1 = 0.5, a2 = −0.4, b1 = 0.7, b2 = 0.3, c′ = 0.1.
	b = mat.NewDense(4, 4, []float64{0, 0.5, -0.4, 0.1, 0, 0, 0, 0.7, 0, 0, 0, 0.3, 0, 0, 0, 0})
	covY := mat.NewSymDense(3, []float64{0.02, 0.005, 0.004, 0.005, 0.05, 0.012, 0.004, 0.012, 0.03})
	m = &Model{B: b, Parents: [][]int{nil, {0}, {0}, {0, 1, 2}},
		Cov: []*mat.SymDense{nil, mat.NewSymDense(1, []float64{0.01}), mat.NewSymDense(1, []float64{0.02}), covY}}
	got, err = Effect(m, Path{From: 0, To: 3})
	want = math.Sqrt(0.49*0.01 + 0.09*0.02 + 0.25*0.05 + 0.16*0.03 + 2*0.5*-0.4*0.012)
	if err != nil || !scalar.EqualWithinAbsOrRel(got.Effect, 0.5*0.7-0.4*0.3, 1e-15, 1e-14) ||
		!scalar.EqualWithinAbsOrRel(got.StdError, want, 1e-15, 1e-14) {
		t.Fatalf("two mediators: %+v (%v), want %v and SE %v", got, err, 0.35-0.12, want)
	}
}

// Bad models and paths are refused with the field at fault.
func TestEffect_Errors(t *testing.T) {
	ok := &Model{B: mat.NewDense(2, 2, []float64{0, 1, 0, 0}), Parents: [][]int{nil, {0}}}
	cases := []struct {
		name string
		m    *Model
		p    Path
	}{
		{"cycle", &Model{B: mat.NewDense(2, 2, []float64{0, 1, 1, 0}), Parents: [][]int{{1}, {0}}},
			Path{From: 0, To: 1}},
		{"coefficient off the arcs", &Model{B: mat.NewDense(2, 2, []float64{0, 1, 0, 0}), Parents: [][]int{nil, nil}},
			Path{From: 0, To: 1}},
		{"bad parent", &Model{B: mat.NewDense(2, 2, nil), Parents: [][]int{nil, {5}}}, Path{From: 0, To: 1}},
		{"mediator equal to outcome", ok, Path{From: 0, To: 1, Through: []int{1}}},
		{"node out of range", ok, Path{From: 0, To: 2}},
		{"covariance block missing", &Model{B: ok.B, Parents: ok.Parents, Cov: []*mat.SymDense{nil, nil}},
			Path{From: 0, To: 1}},
	}
	for _, tc := range cases {
		if _, err := Effect(tc.m, tc.p); err == nil {
			t.Errorf("%s: no error", tc.name)
		}
	}
}
