package load

import (
	"bytes"
	"encoding/csv"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"reflect"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// Differential tests: the one-pass parser (csvscan.go, csvcells.go) must
// read every text as encoding/csv does and load it as the earlier
// encoding/csv path (csvref_test.go) does: the same columns, bit for bit,
// and the same problems at the same lines and columns.

// diffStudy declares a binary, a continuous and an ordinal variable,
// missing codes and an ignored column.
func diffStudy() *study {
	pkg := &checks.Package{
		Variables: []checks.Variable{{Name: "a", Scale: checks.ScaleBinary}, {Name: "b", Scale: "continuous"},
			{Name: "c", Scale: "ordinal"}},
		Data: checks.Data{Kind: checks.DataRows, MissingCodes: []string{"-9", " x ", "999999"},
			IgnoreColumns: []string{"id"}},
	}
	index := map[string]int{"a": 0, "b": 1, "c": 2}
	return &study{&checks.Study{Package: pkg, Index: index, Names: []string{"a", "b", "c"}}}
}

// cellPool holds cells of every kind the loader tells apart.
var cellPool = []string{"0", "1", "2.5", "-9", " -9 ", "x", "NA", "na", "nA", "", " ", "\t7\t", `"4"`, `"1"""`,
	`"a` + "\n" + `b"`, `"` + "\r\n" + `"`, `"3,5"`, "1e3", "nan", "Inf", "-inf", "0x1p3", ".5", "5.", "+1", "-0",
	"1_0", "0.1234567890123456789", "12345678901234567890", "99", "-999", "1e400", "1e-400", "9007199254740993",
	`a"b`, `"x"y`, "\u00a0" + "2" + "\u00a0", "é", "\xff", "999999", "1.5e-7", "00012.50", "-.0", "no"}

// randomCSV is a header of known, ignored, unknown or repeated columns and
// rows of cells from the pool, with blank lines, CRLF, a missing final
// newline, a byte-order mark and short or long rows here and there.
func randomCSV(rng *rand.Rand) []byte {
	var b bytes.Buffer
	if rng.IntN(8) == 0 {
		b.WriteString("\xef\xbb\xbf")
	}
	head := []string{"a", "b", "c"}
	if rng.IntN(2) == 0 {
		head = append(head, "id")
	}
	if rng.IntN(10) == 0 {
		head = append(head, []string{"zz", "a", ` "b"`, ""}[rng.IntN(4)])
	}
	rng.Shuffle(len(head), func(i, j int) { head[i], head[j] = head[j], head[i] })
	eol := []string{"\n", "\r\n"}[rng.IntN(2)]
	b.WriteString(strings.Join(head, ",") + eol)
	for range rng.IntN(30) {
		n := len(head)
		if rng.IntN(15) == 0 {
			n += rng.IntN(3) - 1
		}
		for k := range n {
			if k > 0 {
				b.WriteByte(',')
			}
			b.WriteString(cellPool[rng.IntN(len(cellPool))])
		}
		b.WriteString([]string{eol, eol, eol, eol + eol, "\r"}[rng.IntN(5)])
	}
	if rng.IntN(4) == 0 {
		b.Truncate(rng.IntN(b.Len() + 1))
	}
	return b.Bytes()
}

// randomText is short text over the bytes that matter to CSV.
func randomText(rng *rand.Rand) []byte {
	const alphabet = "a1,\"\n\r ,\"\n"
	b := make([]byte, rng.IntN(40))
	for i := range b {
		b[i] = alphabet[rng.IntN(len(alphabet))]
	}
	if rng.IntN(10) == 0 && len(b) > 0 {
		b[rng.IntN(len(b))] = 0xc3
	}
	return b
}

func TestScannerMatchesEncodingCSV(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	for range 20_000 {
		text := randomText(rng)
		if rng.IntN(2) == 0 {
			text = randomCSV(rng)
		}
		compareScan(t, text)
	}
}

func TestCSVMatchesReference(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	for k := range 20_000 {
		lim := DefaultLimits
		if k%5 == 0 {
			lim.Rows = rng.IntN(10)
		}
		compareLoad(t, randomCSV(rng), lim)
	}
}

// TestCSVManyErrors covers the cut after maxCSVProblems data errors.
func TestCSVManyErrors(t *testing.T) {
	var b strings.Builder
	b.WriteString("a,b,c\n")
	for range 2 * maxCSVProblems {
		b.WriteString("7,x1,y\n")
	}
	compareLoad(t, []byte(b.String()), DefaultLimits)
}

// compareScan reads text with the scanner and with encoding/csv's Reader
// and fails where records, field lines or errors differ.
func compareScan(t *testing.T, text []byte) {
	t.Helper()
	r := csv.NewReader(bytes.NewReader(text))
	sc := &scanner{text: text}
	for {
		want, werr := r.Read()
		got, gerr := sc.next()
		if !sameError(werr, gerr) {
			t.Fatalf("%q: error %v, want %v", text, gerr, werr)
		}
		if werr == io.EOF {
			return
		}
		if len(got) != len(want) {
			t.Fatalf("%q: %d fields, want %d", text, len(got), len(want))
		}
		for i, f := range want {
			if line, _ := r.FieldPos(i); string(got[i].b) != f || got[i].line != line {
				t.Fatalf("%q: field %d is %q on line %d, want %q on line %d",
					text, i, got[i].b, got[i].line, f, line)
			}
		}
		if werr != nil && !errors.Is(werr, csv.ErrFieldCount) {
			return
		}
	}
}

func sameError(want, got error) bool {
	var pw, pg *csv.ParseError
	if errors.As(want, &pw) && errors.As(got, &pg) {
		return *pw == *pg
	}
	return want == got
}

// compareLoad loads text with the one-pass parser and with the reference
// and fails where the datasets or the problems differ.
func compareLoad(t *testing.T, text []byte, lim Limits) {
	t.Helper()
	var pg, pw problems
	got := diffStudy().parseCSV(text, lim, &pg)
	want := diffStudy().parseCSVRef(text, lim, &pw)
	if !reflect.DeepEqual(pg, pw) {
		t.Fatalf("%q: problems\n%+v\nwant\n%+v", text, pg, pw)
	}
	if (got == nil) != (want == nil) {
		t.Fatalf("%q: dataset %v, want %v", text, got != nil, want != nil)
	}
	if got == nil {
		return
	}
	for j := range want.Columns {
		if !sameBits(got.Columns[j], want.Columns[j]) {
			t.Fatalf("%q: column %d is %v, want %v", text, j, got.Columns[j], want.Columns[j])
		}
	}
	g, w := *got, *want
	g.Columns, w.Columns = nil, nil
	if !reflect.DeepEqual(g, w) {
		t.Fatalf("%q: dataset %+v, want %+v", text, g, w)
	}
}

func sameBits(x, y []float64) bool {
	if len(x) != len(y) {
		return false
	}
	for i := range x {
		if math.Float64bits(x[i]) != math.Float64bits(y[i]) {
			return false
		}
	}
	return true
}

// FuzzCSVParse checks the one-pass parser against encoding/csv and the
// reference loader on arbitrary text.
func FuzzCSVParse(f *testing.F) {
	rng := rand.New(rand.NewPCG(11, 12))
	for range 40 {
		f.Add(randomCSV(rng))
	}
	f.Add([]byte("a,b,c\n\"1\",\"2\n"))
	f.Add([]byte("a,b,c\n1,\"2\"x,3\n"))
	f.Fuzz(func(t *testing.T, text []byte) {
		compareScan(t, text)
		compareLoad(t, text, DefaultLimits)
	})
}
