package table_test

import (
	"errors"
	"fmt"
	"regexp"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load/table"
)

// A text past the limit is refused at once, saying so.
func TestRead_TooLarge(t *testing.T) {
	_, err := table.Read(strings.Repeat("a", table.MaxBytes+1))
	var te *table.Error
	want := fmt.Sprintf("table: the text is %d bytes; the limit is %d", table.MaxBytes+1, table.MaxBytes)
	if !errors.As(err, &te) || !te.TooLarge || len(te.Problems) != 1 || te.Problems[0].String() != want {
		t.Fatalf("%#v", err)
	}
}

// Past 100 problems the rest are counted, and the error says how many.
func TestRead_ManyProblems(t *testing.T) {
	text := "Variable  M  SD  1  2\n1. A  x  y  —\n2. B  x  y  .2  —\n"
	for i := 3; i <= 60; i++ {
		text += fmt.Sprintf("%d. V%d  x  y  %s—\n", i, i, strings.Repeat(".1  ", i-1))
	}
	_, err := table.Read(text)
	var te *table.Error
	if !errors.As(err, &te) {
		t.Fatal(err)
	}
	// 60 rows, each with a word for M and for SD: 120 problems, 100 listed.
	if len(te.Problems) != 100 || te.More != 20 || !strings.HasSuffix(te.Error(), "and 20 further problems") {
		t.Errorf("%d listed, %d more:\n%s", len(te.Problems), te.More, te.Error())
	}
}

// Texts no table can be are refused before they are read cell by cell:
// too many lines, a line of too many cells (counted for each separator).
func TestRead_Bounds(t *testing.T) {
	const cells = "line 2: has 1011 cells; a row of a table of at most 500 variables has at most 1010"
	for text, want := range map[string]string{
		strings.Repeat("1\n", 2001): "table: has more than 2000 non-blank lines, more than a table of at most 500 " +
			"variables has",
		"a\n" + strings.Repeat("1,", 1010):       cells,
		"a\n" + strings.Repeat(".1  ", 1011):     cells,
		"a\n" + strings.Repeat("\t", 1010) + "x": cells,
	} {
		_, err := table.Read(text)
		var te *table.Error
		if !errors.As(err, &te) || len(te.Problems) != 1 || te.Problems[0].String() != want {
			t.Errorf("%.20q...: %v; want %s", text, err, want)
		}
	}
	// At the limits the text is read: 2000 lines (blank ones not counted), 1010 cells.
	ok := "a,b\n1,\n.2,1\n" + strings.Repeat("\n", 5000) + strings.Repeat("Note.\n", 1997)
	if _, err := table.Read(ok); err != nil {
		t.Errorf("2000 lines: %v", err)
	}
	if _, err := table.Read("a,b\n1,\n.2,1" + strings.Repeat(",", 1008) + "\n"); err != nil {
		t.Errorf("1010 cells: %v", err)
	}
}

// Data is the package's data section of kind summary; Names the order.
func TestTable_Data(t *testing.T) {
	tb, err := table.Read("Variable  M  SD  1  2\n1. Noise  59.3  6.1  —\n2. Sleep  7.4  0.9  −.22  —\nN = 812\n")
	if err != nil {
		t.Fatal(err)
	}
	d := tb.Data()
	if d.Kind != checks.DataSummary || d.N != 812 || !slices.Equal(d.Variables, []string{"noise", "sleep"}) ||
		fmt.Sprint(d.Correlations) != "[[1] [-0.22 1]]" || fmt.Sprint(d.Means) != "[59.3 7.4]" ||
		fmt.Sprint(d.SDs) != "[6.1 0.9]" {
		t.Errorf("%+v", d)
	}
}

// varName is the package format's rule for a variable name
// (package-format.md, "Variables").
var varName = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]{0,63}$`)

// FuzzRead feeds arbitrary text to the reader: it must return a table or
// a *table.Error, never panic; a table must be what the package format
// takes (unique valid names, a lower triangle with a unit diagonal and
// entries in [-1, 1], one mean and SD per variable or none, SDs above 0,
// reliabilities in (0, 1] or 0 for none);
// a problem's line lies in the text. Seeds: the corpus.
func FuzzRead(f *testing.F) {
	for _, c := range corpus(f) {
		f.Add(readCorpusFile(f, c.File))
	}
	f.Fuzz(func(t *testing.T, text string) {
		tb, err := table.Read(text)
		if err != nil {
			checkError(t, err, text)
			return
		}
		checkTable(t, tb)
	})
}

func checkError(t *testing.T, err error, text string) {
	var te *table.Error
	if !errors.As(err, &te) || len(te.Problems) == 0 {
		t.Fatalf("error of the wrong kind or with no problem: %v", err)
	}
	lines := strings.Count(strings.ReplaceAll(text, "\r\n", "\n"), "\n") + strings.Count(text, "\r") -
		strings.Count(text, "\r\n") + 1
	for _, p := range te.Problems {
		if p.Line < 0 || p.Line > lines || p.Cell < 0 || p.Detail == "" {
			t.Fatalf("problem out of place: %+v in %d lines", p, lines)
		}
	}
}

func checkTable(t *testing.T, tb *table.Table) {
	k := len(tb.Variables)
	seen := map[string]bool{}
	for _, v := range tb.Variables {
		if !varName.MatchString(v.Name) || seen[v.Name] {
			t.Fatalf("name %q not valid or repeated", v.Name)
		}
		seen[v.Name] = true
	}
	if k < 2 || len(tb.Correlations) != k {
		t.Fatalf("%d variables, %d rows", k, len(tb.Correlations))
	}
	for i, row := range tb.Correlations {
		if len(row) != i+1 || row[i] != 1 {
			t.Fatalf("row %d: %v", i, row)
		}
		for _, x := range row {
			if !(x >= -1 && x <= 1) {
				t.Fatalf("row %d: %v", i, row)
			}
		}
	}
	for _, v := range [][]float64{tb.Means, tb.SDs} {
		if v != nil && len(v) != k {
			t.Fatalf("%d values for %d variables", len(v), k)
		}
	}
	for _, s := range tb.SDs {
		if !(s > 0) {
			t.Fatalf("SD %v", s)
		}
	}
	if tb.Reliabilities != nil && len(tb.Reliabilities) != k {
		t.Fatalf("%d reliabilities for %d variables", len(tb.Reliabilities), k)
	}
	for _, r := range tb.Reliabilities {
		if !(r >= 0 && r <= 1) {
			t.Fatalf("reliability %v", r)
		}
	}
}

// BenchmarkRead_Full500 reads a full matrix of 500 variables printed with
// PDF spacing, marks and Unicode minus signs (about 3 MB), the largest
// table the package format takes.
func BenchmarkRead_Full500(b *testing.B) {
	var sb strings.Builder
	for i := range 500 {
		fmt.Fprintf(&sb, "%d. Variable %d", i+1, i+1)
		for j := range 500 {
			if j == i {
				sb.WriteString("   —")
			} else {
				sb.WriteString("   .01**")
			}
		}
		sb.WriteString("\n")
	}
	text := sb.String()
	b.SetBytes(int64(len(text)))
	for b.Loop() {
		if _, err := table.Read(text); err != nil {
			b.Fatal(err)
		}
	}
}
