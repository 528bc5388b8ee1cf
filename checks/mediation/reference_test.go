package mediation

import (
	"encoding/csv"
	"encoding/json"
	"os"
	"slices"
	"strconv"
	"testing"

	"gonum.org/v1/gonum/mat"
	"gonum.org/v1/gonum/stat"
)

// The outside reference: testdata/reference/mediation/indirect.R ran the
// R SEM reference (Debian's R SEM package) on R's bundled mtcars and wrote
// indirect.json (17 significant digits) and mtcars.csv.
const refDir = "../../testdata/reference/mediation/"

type refEquation struct {
	Y        string    `json:"y"`
	X        []string  `json:"x"`
	Est      []float64 `json:"est"`
	SE       []float64 `json:"se"`
	VCov     []float64 `json:"vcov"`
	ResidVar float64   `json:"resid_var"`
}

type refDefined struct {
	Label     string     `json:"label"`
	Est       float64    `json:"est"`
	SE        float64    `json:"se"`
	EstStdAll float64    `json:"est_std_all"`
	BootLo    float64    `json:"boot_lo"`
	BootHi    float64    `json:"boot_hi"`
	BootDraws []*float64 `json:"boot_draws"` // null where a resample failed
}

type refModel struct {
	Name      string        `json:"name"`
	N         int           `json:"n"`
	Equations []refEquation `json:"equations"`
	CrossCov  float64       `json:"largest_cross_equation_cov"`
	Resamples int           `json:"boot_resamples"`
	Defined   []refDefined  `json:"defined"`
	saturated bool          // every equation has all earlier nodes of the model as parents
}

// mtcars columns, as indirect.R writes them.
var refNames = []string{"mpg", "disp", "hp", "wt", "qsec", "am"}

func node(name string) int { return slices.Index(refNames, name) }

// refPaths says which effect each defined parameter of indirect.R is:
// "through_wt := a1*b1 + a1*d*b2" is every path from hp to mpg through
// wt; "ind_serial := a1*d*b2" the path through both wt and qsec; the
// totals the total indirect effect. Parameters that are one specific path
// among several through the same mediators (ind_wt, ind_qsec of the
// serial model) or a total effect are not compared.
var refPaths = map[string]map[string]Path{
	"single": {"ab": {From: node("disp"), To: node("mpg"), Through: []int{node("wt")}}},
	"serial": {
		"through_wt":   {From: node("hp"), To: node("mpg"), Through: []int{node("wt")}},
		"through_qsec": {From: node("hp"), To: node("mpg"), Through: []int{node("qsec")}},
		"ind_serial":   {From: node("hp"), To: node("mpg"), Through: []int{node("qsec"), node("wt")}},
		"total_ind":    {From: node("hp"), To: node("mpg")},
	},
	"parallel": {
		"ind_wt":    {From: node("disp"), To: node("mpg"), Through: []int{node("wt")}},
		"ind_hp":    {From: node("disp"), To: node("mpg"), Through: []int{node("hp")}},
		"total_ind": {From: node("disp"), To: node("mpg")},
	},
}

func readReference(tb testing.TB) (source string, models []refModel, cols [][]float64) {
	b, err := os.ReadFile(refDir + "indirect.json")
	if err != nil {
		tb.Fatal(err)
	}
	var ref struct {
		Source string     `json:"source"`
		Models []refModel `json:"models"`
	}
	if err := json.Unmarshal(b, &ref); err != nil || len(ref.Models) != 3 {
		tb.Fatalf("%v (%d models)", err, len(ref.Models))
	}
	for k := range ref.Models {
		ref.Models[k].saturated = ref.Models[k].Name != "parallel"
	}
	return ref.Source, ref.Models, readMtcars(tb)
}

func readMtcars(tb testing.TB) [][]float64 {
	f, err := os.Open(refDir + "mtcars.csv")
	if err != nil {
		tb.Fatal(err)
	}
	defer f.Close()
	recs, err := csv.NewReader(f).ReadAll()
	if err != nil || !slices.Equal(recs[0], refNames) {
		tb.Fatalf("mtcars.csv: %v, header %v", err, recs[0])
	}
	cols := make([][]float64, len(refNames))
	for _, rec := range recs[1:] {
		for j, s := range rec {
			v, err := strconv.ParseFloat(s, 64)
			if err != nil {
				tb.Fatal(err)
			}
			cols[j] = append(cols[j], v)
		}
	}
	return cols
}

// parents is the model's graph over the mtcars columns.
func (m refModel) parents() [][]int {
	pa := make([][]int, len(refNames))
	for _, eq := range m.Equations {
		for _, x := range eq.X {
			pa[node(eq.Y)] = append(pa[node(eq.Y)], node(x))
		}
	}
	return pa
}

// model is the reference's own fit as a Model: its estimates and the
// blocks of its covariance matrix of the estimates.
func (m refModel) model() *Model {
	p := len(refNames)
	out := &Model{B: mat.NewDense(p, p, nil), Parents: m.parents(), Cov: make([]*mat.SymDense, p)}
	for _, eq := range m.Equations {
		j, k := node(eq.Y), len(eq.X)
		for a, x := range eq.X {
			out.B.Set(node(x), j, eq.Est[a])
		}
		out.Cov[j] = mat.NewSymDense(k, slices.Clone(eq.VCov)) // symmetric: column-major is row-major
	}
	return out
}

func sampleCov(cols [][]float64, divisorN bool) *mat.SymDense {
	n := len(cols[0])
	d := mat.NewDense(n, len(cols), nil)
	for j, c := range cols {
		d.SetCol(j, c)
	}
	var cov mat.SymDense
	stat.CovarianceMatrix(&cov, d, nil)
	if divisorN {
		cov.ScaleSym(float64(n-1)/float64(n), &cov)
	}
	return &cov
}
