package load

import (
	"math"
	"math/rand/v2"
	"strconv"
	"strings"
	"testing"
)

// randomDecimal is a decimal as data carry them, or near the edges of
// plainDecimal's fast path: up to 25 digits, a point anywhere, a sign, now
// and then an exponent or a stray character.
func randomDecimal(rng *rand.Rand) string {
	var b strings.Builder
	b.WriteString([]string{"", "", "-", "+"}[rng.IntN(4)])
	n := rng.IntN(26)
	dot := rng.IntN(n + 2)
	for i := range n {
		if i == dot {
			b.WriteByte('.')
		}
		b.WriteByte(byte('0' + rng.IntN(10)))
	}
	switch rng.IntN(12) {
	case 0:
		b.WriteString("e" + strconv.Itoa(rng.IntN(40)-20))
	case 1:
		b.WriteByte(".-e_x "[rng.IntN(6)])
	case 2:
		return strconv.FormatFloat(rng.NormFloat64()*math.Pow(10, float64(rng.IntN(30)-15)), 'f', -1, 64)
	}
	return b.String()
}

func TestParseFloatMatchesStrconv(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, s := range []string{"0", "-0", "+0", ".", "-", "+.", "-.5", "5.", "9007199254740991", "9007199254740992",
		"9007199254740993", "1234567890123456789", "12345678901234567890", "0.0000000000000000000001",
		"0.00000000000000000000001", "4503599627370496.5", "1.7976931348623157", "0.1", "0.3", "2.675"} {
		compareFloat(t, s)
	}
	for range 200_000 {
		compareFloat(t, randomDecimal(rng))
	}
}

// compareFloat fails where plainDecimal takes s but differs from
// strconv.ParseFloat in the bits of the value, or takes text strconv
// refuses.
func compareFloat(t *testing.T, s string) {
	t.Helper()
	if s == "" {
		return
	}
	got, ok := plainDecimal([]byte(s))
	want, err := strconv.ParseFloat(s, 64)
	if ok && (math.Float64bits(got) != math.Float64bits(want) || err != nil) {
		t.Fatalf("plainDecimal(%q) = %v; strconv gives %v, %v", s, got, want, err)
	}
}

// TestPlainDecimalTakesPlainData checks that the fast path is taken for
// the decimals data carry, so that the comparison above compares.
func TestPlainDecimalTakesPlainData(t *testing.T) {
	for _, s := range []string{"0", "-0", "+1", "50.1234", ".5", "5.", "-12.75", "0.1234567890123456"} {
		if _, ok := plainDecimal([]byte(s)); !ok {
			t.Errorf("%q takes the slow path", s)
		}
	}
	for _, s := range []string{".", "-", "1e3", "1_0", "12345678901234567890", "9007199254740993", "nan", "1..2"} {
		if _, ok := plainDecimal([]byte(s)); ok {
			t.Errorf("%q takes the fast path", s)
		}
	}
}

// FuzzParseFloat checks plainDecimal against strconv.ParseFloat.
func FuzzParseFloat(f *testing.F) {
	rng := rand.New(rand.NewPCG(5, 6))
	for range 30 {
		f.Add(randomDecimal(rng))
	}
	f.Fuzz(compareFloat)
}

// TestRowAllocations checks that scanning a row of numbers, missing marks,
// codes and quoted cells, and reading it into the columns, allocates
// nothing once the scanner's buffers have grown.
func TestRowAllocations(t *testing.T) {
	s := diffStudy()
	text := []byte("a,b,c\n1, 2.5 ,-9\n0,NA,3\n")
	var ps problems
	ds := s.parseCSV(text, DefaultLimits, &ps)
	if ds == nil || len(ps.list) > 0 {
		t.Fatalf("%+v", ps.list)
	}
	cr := newCells(s, []int{0, 1, 2})
	line := []byte("1, 2.5 ,-9\r\n\"0\",\" 7\n\",na\n")
	sc := &scanner{}
	allocs := testing.AllocsPerRun(100, func() {
		for j := range ds.Columns {
			ds.Columns[j] = ds.Columns[j][:0]
		}
		sc.text = line
		for range 2 {
			row, err := sc.next()
			if err != nil {
				t.Fatal(err)
			}
			cr.row(row, ds, &ps)
		}
	})
	if len(ps.list) > 0 {
		t.Fatalf("%+v", ps.list)
	}
	if allocs != 0 {
		t.Errorf("%v allocations per row, want 0", allocs)
	}
}
