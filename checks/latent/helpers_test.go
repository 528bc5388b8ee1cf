package latent

import (
	"encoding/csv"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/floats/scalar"
	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

const refDir = "../../testdata/reference/latent"

// readColumns reads the named columns of a CSV file written by
// testdata/reference/latent/make_reference.R (a name in that directory)
// or testdata/bench/latent_reference.R (an absolute path).
func readColumns(tb testing.TB, file string, names []string) *mat.Dense {
	tb.Helper()
	if !filepath.IsAbs(file) {
		file = filepath.Join(refDir, file)
	}
	f, err := os.Open(file)
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	rows, err := csv.NewReader(f).ReadAll()
	if err != nil {
		tb.Fatal(err)
	}
	x := mat.NewDense(len(rows)-1, len(names), nil)
	for j, name := range names {
		col := slices.Index(rows[0], name)
		if col < 0 {
			tb.Fatalf("%s: no column %q", file, name)
		}
		for i, row := range rows[1:] {
			v, err := strconv.ParseFloat(row[col], 64)
			if err != nil {
				tb.Fatalf("%s line %d: %v", file, i+2, err)
			}
			x.Set(i, j, v)
		}
	}
	return x
}

// covariance is S with divisor N − 1 (Wishart) or N (Normal).
func covariance(x *mat.Dense, lik Likelihood) (*mat.SymDense, int) {
	n, p := x.Dims()
	s := mat.NewSymDense(p, nil)
	stat.CovarianceMatrix(s, x, nil)
	if lik == Normal {
		s.ScaleSym(float64(n-1)/float64(n), s)
	}
	return s, n
}

// reference is testdata/reference/latent/reference.json.
type reference struct {
	Source string `json:"source"`
	Models map[string]struct {
		Data    string  `json:"data"`
		Wishart refCase `json:"wishart"`
		Normal  refCase `json:"normal"`
	} `json:"models"`
}

type refCase struct {
	Converged bool               `json:"converged"`
	N         int                `json:"n"`
	Fit       map[string]float64 `json:"fit"`
	Params    []refParam         `json:"params"`
}

type refParam struct {
	LHS    string  `json:"lhs"`
	Op     string  `json:"op"`
	RHS    string  `json:"rhs"`
	Est    float64 `json:"est"`
	SE     float64 `json:"se"`
	SEObs  float64 `json:"se_observed"`
	StdAll float64 `json:"std_all"`
}

func loadReference(tb testing.TB) *reference {
	tb.Helper()
	b, err := os.ReadFile(filepath.Join(refDir, "reference.json"))
	if err != nil {
		tb.Fatal(err)
	}
	var r reference
	if err := json.Unmarshal(b, &r); err != nil {
		tb.Fatal(err)
	}
	return &r
}

// named is a model written with names, turned into a Spec.
type named struct {
	columns    []string // the observed variables in node order
	latents    []string
	indicators [][]string
	parents    map[string][]string
	rescov     [][2]string
	// effects are the reference's defined effects: from, to, through.
	effects map[string][]string
}

func (m named) node(name string) int {
	if i := slices.Index(m.columns, name); i >= 0 {
		return i
	}
	if j := slices.Index(m.latents, name); j >= 0 {
		return len(m.columns) + j
	}
	panic("no node " + name)
}

func (m named) spec() Spec {
	s := Spec{Observed: len(m.columns), Parents: make([][]int, len(m.columns)+len(m.latents))}
	for _, items := range m.indicators {
		var idx []int
		for _, it := range items {
			idx = append(idx, m.node(it))
		}
		s.Indicators = append(s.Indicators, idx)
	}
	for to, pa := range m.parents {
		for _, from := range pa {
			s.Parents[m.node(to)] = append(s.Parents[m.node(to)], m.node(from))
		}
	}
	for _, pr := range m.rescov {
		s.ResidualCovariances = append(s.ResidualCovariances, [2]int{m.node(pr[0]), m.node(pr[1])})
	}
	return s
}

// close reports whether got is within rel of want (or abs of it near 0).
func close(got, want, abs, rel float64) bool {
	return scalar.EqualWithinAbsOrRel(got, want, abs, rel)
}

// randomCovariance is the sample covariance of n cases drawn from the
// model of spec at a random θ (randomTheta), so that the model fits up to
// sampling error.
func randomCovariance(spec Spec, r *rand.Rand, n int) *mat.SymDense {
	l, err := newLayout(spec)
	if err != nil {
		panic(err)
	}
	st := l.newState(randomTheta(l, r), mat.NewSymDense(l.p, nil), 0)
	var ch mat.Cholesky
	if !ch.Factorize(st.sigma) {
		panic("random model not positive definite")
	}
	var lo mat.TriDense
	ch.LTo(&lo)
	x := mat.NewDense(n, l.p, nil)
	z := mat.NewVecDense(l.p, nil)
	row := mat.NewVecDense(l.p, nil)
	for i := range n {
		for k := range l.p {
			z.SetVec(k, r.NormFloat64())
		}
		row.MulVec(&lo, z)
		x.SetRow(i, row.RawVector().Data)
	}
	s, _ := covariance(x, Wishart)
	return s
}

func isNaN(x float64) bool { return math.IsNaN(x) }

// randomSpec is k latents with 3 or 4 items each, an observed structural
// variable when withObserved, a random DAG among the structural nodes
// (each pair joined with probability density, in node order) and a
// residual covariance between the first items of the first two latents.
func randomSpec(r *rand.Rand, k int, density float64, withObserved bool) Spec {
	var s Spec
	for range k {
		n := 3 + r.IntN(2)
		items := make([]int, n)
		for i := range items {
			items[i] = s.Observed + i
		}
		s.Observed += n
		s.Indicators = append(s.Indicators, items)
	}
	structural := []int{}
	if withObserved {
		structural = append(structural, s.Observed)
		s.Observed++
	}
	for j := range k {
		structural = append(structural, s.Observed+j)
	}
	r.Shuffle(len(structural), func(i, j int) { structural[i], structural[j] = structural[j], structural[i] })
	s.Parents = make([][]int, s.Nodes())
	for i, v := range structural {
		for _, u := range structural[:i] {
			if r.Float64() < density {
				s.Parents[v] = append(s.Parents[v], u)
			}
		}
	}
	if k >= 2 {
		s.ResidualCovariances = [][2]int{{s.Indicators[0][1], s.Indicators[1][1]}}
	}
	return s
}

// randomTheta is a parameter vector of spec in the ranges randomCovariance uses.
func randomTheta(l *layout, r *rand.Rand) []float64 {
	theta := make([]float64, len(l.params))
	for i, par := range l.params {
		switch par.Kind {
		case Loading:
			theta[i] = 0.5 + r.Float64()
		case Path:
			theta[i] = (0.2 + 0.5*r.Float64()) * float64(1-2*r.IntN(2))
		case Variance:
			theta[i] = 0.3 + 0.7*r.Float64()
		case Covariance:
			theta[i] = 0.1 * (r.Float64() - 0.5)
		}
	}
	return theta
}
