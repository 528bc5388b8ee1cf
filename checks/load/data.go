package load

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/mat"

	"github.com/pathvet/pathvet/checks"
)

// maxCSVProblems is how many data errors are listed before the rest are
// summed up in one line.
const maxCSVProblems = 50

// Numerical tolerances for summary matrices as papers print them.
const (
	symmetryTol = 1e-6
	diagonalTol = 1e-6
)

// fileUnreadable is the problem of a data file named where no file can be
// read.
const fileUnreadable = "cannot be read here: send the CSV as the multipart part named data, or inline as csv"

// setField is a field of the data section and whether the package set it.
type setField struct {
	name string
	set  bool
}

// misplaced reports each set field of fs, which the data kind does not use.
func misplaced(ps *problems, detail string, fs []setField) {
	for _, f := range fs {
		if f.set {
			ps.at("/data/"+f.name, "%s", detail)
		}
	}
}

// resolveData checks the data section and fills s.Data; it returns the
// CSV text for the package hash.
func (s *study) resolveData(opt Options, lim Limits, ps *problems) []byte {
	d := s.Package.Data
	if dataKind(d) == checks.DataSummary {
		misplaced(ps, "is for data of kind rows, not summary", []setField{
			{"file", d.File != ""},
			{"csv", d.CSV != ""},
			{"missing_codes", d.MissingCodes != nil},
			{"ignore_columns", d.IgnoreColumns != nil},
		})
		if opt.CSV != nil {
			ps.at("/data/kind", "is summary, but CSV data were sent beside the package")
		}
		s.Data = summaryData(d, s.Index, len(s.Names), ps)
		return nil
	}
	misplaced(ps, "is for data of kind summary, not rows", []setField{
		{"n", d.N != 0},
		{"variables", d.Variables != nil},
		{"correlations", d.Correlations != nil},
		{"sds", d.SDs != nil},
		{"means", d.Means != nil},
	})
	text, ok := csvSource(d, opt, lim, ps)
	if !ok {
		return nil
	}
	s.Data = s.parseCSV(text, lim, ps)
	return text
}

// dataKind is the data's kind, or, when the package names no valid kind
// (an error reported already), the kind its fields suggest, so that their
// own problems are found too.
func dataKind(d checks.Data) string {
	switch {
	case d.Kind == checks.DataRows || d.Kind == checks.DataSummary:
		return d.Kind
	case d.N != 0 || d.Variables != nil || d.Correlations != nil:
		return checks.DataSummary
	}
	return checks.DataRows
}

// csvSource finds the CSV bytes: inline, sent beside, or from a file.
func csvSource(d checks.Data, opt Options, lim Limits, ps *problems) ([]byte, bool) {
	sources := 0
	for _, set := range []bool{d.CSV != "", d.File != "" && opt.CSV == nil, opt.CSV != nil} {
		if set {
			sources++
		}
	}
	var text []byte
	switch {
	case sources > 1:
		ps.at("/data", "gives its rows twice: use one of csv, file, or data sent beside the package")
		return nil, false
	case d.CSV != "":
		text = []byte(d.CSV)
	case opt.CSV != nil:
		text = opt.CSV
	case d.File != "" && opt.ReadFile == nil:
		ps.at("/data/file", "%s", fileUnreadable)
		return nil, false
	case d.File != "":
		b, err := opt.ReadFile(d.File)
		if err != nil {
			ps.at("/data/file", "cannot be read: %v", err)
			return nil, false
		}
		text = b
	default:
		ps.at("/data", "has no rows: give csv, file, or send the data beside the package")
		return nil, false
	}
	if int64(len(text)) > lim.CSVBytes {
		ps.at("/data", "the CSV data are %d bytes; the limit is %d", len(text), lim.CSVBytes)
		return nil, false
	}
	return text, true
}

// summaryData checks printed summary statistics and orders them like the
// declared variables.
func summaryData(d checks.Data, index map[string]int, p int, ps *problems) *checks.Dataset {
	before := ps.count()
	pos := summaryOrder(d.Variables, index, ps)
	if d.N < 3 {
		ps.at("/data/n", "must be at least 3 for data of kind summary")
	}
	k := len(d.Variables)
	r := correlationMatrix(d.Correlations, k, ps)
	checkVector("sds", d.SDs, k, true, ps)
	checkVector("means", d.Means, k, false, ps)
	if ps.count() > before || r == nil {
		return nil
	}
	ds := &checks.Dataset{Kind: checks.DataSummary, N: d.N, Cor: mat.NewSymDense(p, nil)}
	for i := range k {
		for j := range k {
			ds.Cor.SetSym(pos[i], pos[j], r.At(i, j))
		}
	}
	ds.SD, ds.Means = reorder(d.SDs, pos), reorder(d.Means, pos)
	return ds
}

// summaryOrder maps the summary's variables, in their order, to the
// declared variables' indices, and reports unknown, repeated and missing
// names.
func summaryOrder(names []string, index map[string]int, ps *problems) []int {
	pos := make([]int, len(names)) // data order → variable index
	seen := map[string]int{}
	for i, name := range names {
		at := pointer("data", "variables", i)
		j, ok := index[name]
		switch _, dup := seen[name]; {
		case !ok:
			ps.unknown(at, name, index)
		case dup:
			ps.at(at, "%s is listed twice", quoted(name))
		}
		seen[name], pos[i] = i, j
	}
	for name, j := range index {
		if _, ok := seen[name]; !ok {
			ps.at(pointer("variables", j, "name"), "%s has no entry in /data/variables", quoted(name))
		}
	}
	return pos
}

func reorder(v []float64, pos []int) []float64 {
	if v == nil {
		return nil
	}
	out := make([]float64, len(v))
	for i, x := range v {
		out[pos[i]] = x
	}
	return out
}

func checkVector(name string, v []float64, k int, positive bool, ps *problems) {
	if v == nil {
		return
	}
	if len(v) != k {
		ps.at("/data/"+name, "has %d entries; /data/variables has %d", len(v), k)
		return
	}
	for i, x := range v {
		if positive && x <= 0 {
			ps.at(pointer("data", name, i), "must be greater than 0")
		}
	}
}

// correlationMatrix reads a full matrix or its lower triangle and checks
// it by the rules of CheckCorrelations, reporting each problem at its JSON
// pointer.
func correlationMatrix(rows [][]float64, k int, ps *problems) *mat.SymDense {
	if len(rows) != k {
		ps.at("/data/correlations", "has %d rows; /data/variables has %d", len(rows), k)
		return nil
	}
	m, faults := CheckCorrelations(rows, func(i, j int) string { return pointer("data", "correlations", i, j) })
	for _, f := range faults {
		switch {
		case f.Row < 0:
			ps.at("/data/correlations", "%s", f.Detail)
		case f.Col < 0:
			ps.at(pointer("data", "correlations", f.Row), "%s", f.Detail)
		default:
			ps.at(pointer("data", "correlations", f.Row, f.Col), "%s", f.Detail)
		}
	}
	return m
}

// A MatrixProblem is one way a correlation matrix breaks the package
// format's rules: at entry (Row, Col) of the rows as given, at row Row
// (Col < 0), or in the matrix as a whole (Row < 0). Detail is worded to
// follow the place's name ("is 1.2; a correlation lies in [-1, 1]").
type MatrixProblem struct {
	Row, Col int
	Detail   string
}

// CheckCorrelations applies the package format's rules to a correlation
// matrix given by rows, full or as its lower triangle (row i has i+1
// entries): every row of the shape's length, a unit diagonal (to 1e-6),
// entries in [-1, 1], a full matrix symmetric (to 1e-6), and the whole
// positive definite (smallest eigenvalue above checks.MinEigen, from
// gonum's symmetric eigendecomposition). It returns the matrix, or nil and
// every problem found; entry names entry (i, j) in the caller's terms for
// the problems that cite a second entry. package-format.md, "Summary
// statistics", states the rules.
func CheckCorrelations(rows [][]float64, entry func(i, j int) string) (*mat.SymDense, []MatrixProblem) {
	k := len(rows)
	if k == 0 {
		return nil, []MatrixProblem{{Row: -1, Col: -1, Detail: emptyMatrix}}
	}
	full := k > 1 && len(rows[0]) == k
	var faults []MatrixProblem
	checkRowLengths(rows, full, &faults)
	if len(faults) > 0 {
		return nil, faults
	}
	m := correlationEntries(rows, full, entry, &faults)
	if len(faults) > 0 {
		return nil, faults
	}
	return positiveDefinite(m, &faults), faults
}

// Formats of the problems with the entries of a correlation matrix.
const (
	rowLength    = "has %d entries; want %d (%s)"
	fullShape    = "full matrix, as row 0"
	lowerShape   = "lower triangle: row i has i+1 entries"
	offDiagonal  = "is %g; a correlation matrix has 1 on its diagonal"
	outOfRange   = "is %g; a correlation lies in [-1, 1]"
	notSymmetric = "is %g, but %s is %g: the matrix is not symmetric"
	emptyMatrix  = "has no rows"
)

// checkRowLengths reports each row whose length does not fit the shape:
// k entries in a full matrix, i+1 in row i of a lower triangle.
func checkRowLengths(rows [][]float64, full bool, faults *[]MatrixProblem) {
	for i, row := range rows {
		want, shape := i+1, lowerShape
		if full {
			want, shape = len(rows), fullShape
		}
		if len(row) != want {
			*faults = append(*faults, MatrixProblem{Row: i, Col: -1,
				Detail: fmt.Sprintf(rowLength, len(row), want, shape)})
		}
	}
}

// correlationEntries reads the lower triangle of rows into a matrix and
// reports each entry off the unit diagonal, outside [-1, 1], or (in a full
// matrix) unequal to its mirror entry.
func correlationEntries(rows [][]float64, full bool, entry func(i, j int) string,
	faults *[]MatrixProblem) *mat.SymDense {
	m := mat.NewSymDense(len(rows), nil)
	for i, row := range rows {
		for j := 0; j <= i; j++ {
			x, detail := row[j], ""
			switch {
			case i == j && math.Abs(x-1) > diagonalTol:
				detail = fmt.Sprintf(offDiagonal, x)
			case x < -1 || x > 1:
				detail = fmt.Sprintf(outOfRange, x)
			case full && math.Abs(x-rows[j][i]) > symmetryTol:
				detail = fmt.Sprintf(notSymmetric, x, entry(j, i), rows[j][i])
			}
			if detail != "" {
				*faults = append(*faults, MatrixProblem{Row: i, Col: j, Detail: detail})
			}
			m.SetSym(i, j, x)
		}
	}
	return m
}

// positiveDefinite returns m when its smallest eigenvalue exceeds
// checks.MinEigen, and reports it otherwise.
func positiveDefinite(m *mat.SymDense, faults *[]MatrixProblem) *mat.SymDense {
	var eig mat.EigenSym
	detail := ""
	if !eig.Factorize(m, false) {
		detail = "its eigenvalues could not be computed"
	} else if low := eig.Values(nil)[0]; low <= checks.MinEigen {
		detail = fmt.Sprintf("is not positive definite: its smallest eigenvalue is %.6g", low)
	}
	if detail != "" {
		*faults = append(*faults, MatrixProblem{Row: -1, Col: -1, Detail: detail})
		return nil
	}
	return m
}
