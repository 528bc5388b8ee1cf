package checks

import (
	"math"
	"strings"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// MinEigen is the smallest eigenvalue a correlation matrix may have to
// count as positive definite (README, "Choices where the spec is silent").
const MinEigen = 1e-10

const minEigen = MinEigen

// Moments are the summary statistics that the estimators work from: the
// correlation matrix over all declared variables, and the SDs and means
// where known. For raw rows they come from the complete cases, and Rows
// holds those cases (one row per case, columns in variable order) for the
// logistic regressions.
type Moments struct {
	N     int
	Cor   *mat.SymDense
	SD    []float64 // nil when unknown
	Means []float64 // nil when unknown
	Rows  *mat.Dense
	// Method says where the moments come from: "summary",
	// "complete_cases", a missing-data method or one imputed dataset. It
	// names them uniquely within a run: estimates are cached by it.
	Method string
	// ml is set for maximum-likelihood moments under missing data: what
	// their standard errors need (missing_ml.go).
	ml *mlMoments
	// draws is the number of Monte Carlo draws of an indirect effect's
	// interval on these moments (0: mediation.DefaultDraws); one imputed
	// dataset of m takes DefaultDraws/m, as many as the mixture over the
	// imputations keeps of each (pooledIndirect).
	draws int
}

// Cov returns the covariance matrix, or nil without SDs.
func (m *Moments) Cov() *mat.SymDense {
	if m.SD == nil {
		return nil
	}
	p := m.Cor.SymmetricDim()
	c := mat.NewSymDense(p, nil)
	for i := range p {
		for j := 0; j <= i; j++ {
			c.SetSym(i, j, m.Cor.At(i, j)*m.SD[i]*m.SD[j])
		}
	}
	return c
}

// moments returns the study's moments, computed once.
func (a *Analysis) moments() (*Moments, error) {
	if a.mom == nil && a.momErr == nil {
		a.mom, a.momErr = studyMoments(a.Study.Data)
	}
	return a.mom, a.momErr
}

func studyMoments(d *Dataset) (*Moments, error) {
	if d.Kind == DataSummary {
		return &Moments{N: d.N, Cor: d.Cor, SD: d.SD, Means: d.Means, Method: "summary"}, nil
	}
	rows := completeCases(d.Columns)
	return rowMoments(rows, "complete_cases")
}

// completeCases returns the rows with no missing value.
func completeCases(cols [][]float64) *mat.Dense {
	n := 0
	if len(cols) > 0 {
		n = len(cols[0])
	}
	var keep []int
	for i := range n {
		ok := true
		for _, c := range cols {
			if math.IsNaN(c[i]) {
				ok = false
				break
			}
		}
		if ok {
			keep = append(keep, i)
		}
	}
	if len(keep) == 0 {
		return nil
	}
	m := mat.NewDense(len(keep), len(cols), nil)
	for r, i := range keep {
		for j, c := range cols {
			m.Set(r, j, c[i])
		}
	}
	return m
}

// rowMoments computes means, SDs and correlations (divisor n − 1) of
// complete rows.
func rowMoments(rows *mat.Dense, method string) (*Moments, error) {
	if rows == nil {
		return nil, Errorf(EInvalid, "no case has every variable observed, so no complete-case analysis is possible")
	}
	n, p := rows.Dims()
	if n < 3 {
		return nil, Errorf(EInvalid, "only %d complete cases", n)
	}
	cov := mat.NewSymDense(p, nil)
	stat.CovarianceMatrix(cov, rows, nil)
	means := make([]float64, p)
	for j := range p {
		means[j] = stat.Mean(mat.Col(nil, j, rows), nil)
	}
	return momentsFrom(n, means, cov, rows, method)
}

// momentsFrom turns a mean vector and covariance matrix of n cases into
// Moments: SDs, correlations, and an error naming the cause when a variable
// is constant or the correlations are singular.
func momentsFrom(n int, means []float64, cov *mat.SymDense, rows *mat.Dense, method string) (*Moments, error) {
	p := len(means)
	m := &Moments{N: n, Cor: mat.NewSymDense(p, nil), SD: make([]float64, p), Means: means, Rows: rows, Method: method}
	for j := range p {
		if m.SD[j] = math.Sqrt(cov.At(j, j)); m.SD[j] == 0 {
			return nil, Errorf(EInvalid, "a variable is constant in the %s", casesName(method))
		}
	}
	for i := range p {
		for j := 0; j <= i; j++ {
			m.Cor.SetSym(i, j, cov.At(i, j)/(m.SD[i]*m.SD[j]))
		}
	}
	var eig mat.EigenSym
	if !eig.Factorize(m.Cor, false) || eig.Values(nil)[0] <= minEigen {
		return nil, Errorf(
			EInvalid,
			"the correlation matrix of the %s is singular: some variables are exactly collinear",
			casesName(method),
		)
	}
	return m, nil
}

func casesName(method string) string {
	switch method {
	case "complete_cases":
		return "complete cases"
	case methodCodesMissing:
		return "complete cases with the likely missing codes read as missing"
	}
	return strings.ReplaceAll(method, "_", " ") + " data"
}
