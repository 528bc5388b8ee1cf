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
// testdata/reference/latent/make_reference.R.
func readColumns(tb testing.TB, file string, names []string) *mat.Dense {
	tb.Helper()
	f, err := os.Open(filepath.Join(refDir, file))
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

// randomCovariance simulates the covariance implied by a spec with
// random loadings in [0.5, 1.5], paths in ±[0.2, 0.7], residual
// variances in [0.3, 1] and unit source variances, plus noise of a
// Wishart draw of n cases (so the model does not fit exactly).
func randomCovariance(spec Spec, r *rand.Rand, n int) *mat.SymDense {
	l, err := newLayout(spec)
	if err != nil {
		panic(err)
	}
	theta := make([]float64, len(l.params))
	for i, par := range l.params {
		switch {
		case par.Kind == Loading:
			theta[i] = 0.5 + r.Float64()
		case par.Kind == Path:
			theta[i] = (0.2 + 0.5*r.Float64()) * float64(1-2*r.IntN(2))
		case par.Kind == Variance:
			theta[i] = 0.3 + 0.7*r.Float64()
		}
	}
	st := l.newState(theta, mat.NewSymDense(l.p, nil), 0)
	var ch mat.Cholesky
	ch.Factorize(st.sigma)
	var lo mat.TriDense
	ch.LTo(&lo)
	x := mat.NewDense(n, l.p, nil)
	z := make([]float64, l.p)
	for i := range n {
		for k := range z {
			z[k] = r.NormFloat64()
		}
		row := mat.NewVecDense(l.p, nil)
		row.MulVec(&lo, mat.NewVecDense(l.p, z))
		x.SetRow(i, row.RawVector().Data)
	}
	s, _ := covariance(x, Wishart)
	return s
}

func isNaN(x float64) bool { return math.IsNaN(x) }
