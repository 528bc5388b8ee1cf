package guess_test

import (
	"fmt"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/load/guess"
)

// clubCSV is invented: an id of text, a club membership (0/1) with the
// code 99 once, a 1–5 rating, a score with −99 in two rows and a far-out
// 400 in two, a grade with "." once, a count of siblings 0, 1 or 2, and a
// column named "2nd wave".
func clubCSV() string {
	var b strings.Builder
	b.WriteString("id,club,rating,score,grade,siblings,2nd wave\n")
	for i := range 40 {
		club, score, grade := fmt.Sprint(i%2), fmt.Sprint(50+(i*7)%23), fmt.Sprint(1+i%3)
		switch i {
		case 4:
			club = "99"
		case 5, 17:
			score = "-99"
		case 8, 30:
			score = "400"
		case 9:
			grade = "."
		}
		fmt.Fprintf(&b, "P%d,%s,%d,%s,%s,%d,%d\n", i, club, 1+(i*2)%5, score, grade, i%3, i)
	}
	return b.String()
}

// Each column's guess, by the rules of doc.go (counts by construction of
// clubCSV: 40 rows; rating takes the values 1..5, each 8 times; siblings
// 0, 1 and 2, at least 13 times each (so not binary); score 22
// distinct values of 50 + 7i mod 23 and 400, as R's
// length(unique(...)) counts them).
func TestRead_Guesses(t *testing.T) {
	rows, err := guess.Read([]byte(clubCSV()))
	if err != nil {
		t.Fatal(err)
	}
	got := map[string]string{}
	for _, c := range rows.Columns {
		got[c.Name] = c.Scale + "|" + c.Why + "|" + c.Skip
	}
	want := map[string]string{
		"id":       `||it holds text ("P0" on line 2)`,
		"club":     "binary|only 0 and 1|",
		"rating":   "ordinal|5 distinct whole numbers|",
		"score":    "continuous|23 distinct values|",
		"grade":    "ordinal|3 distinct whole numbers|",
		"siblings": "ordinal|3 distinct whole numbers|",
		"2nd wave": "||its name is not a variable name (letters, digits and _, starting with a letter); " +
			"rename it in the CSV to use it",
	}
	for k, w := range want {
		if got[k] != w {
			t.Errorf("%s: %q, want %q", k, got[k], w)
		}
	}
	if rows.N != 40 || !slices.Equal(rows.Ignore, []string{"id", "2nd wave"}) ||
		!slices.Equal(rows.MissingCodes, []string{"-99", ".", "99"}) || rows.Missing != 4 {
		t.Errorf("rows %d, ignore %v, codes %v, missing %d", rows.N, rows.Ignore, rows.MissingCodes, rows.Missing)
	}
	if len(rows.Variables) != 5 || rows.Variables[0].Name != "club" || rows.Variables[0].Scale != "binary" {
		t.Errorf("variables %+v", rows.Variables)
	}
}

// The notes word each count: one row, two rows. The quartiles of score's
// other values (without −99 and 400) are R's quantile(type = 7):
// Rscript -e 'v <- sapply(0:39, function(i) 50+(i*7)%%23); v <- v[-(c(5,17,8,30)+1)];
// quantile(v, c(.25,.75), type=7)' gives 56.00 and 67.25.
func TestColumn_Notes(t *testing.T) {
	rows, err := guess.Read([]byte(clubCSV()))
	if err != nil {
		t.Fatal(err)
	}
	var notes []string
	for _, c := range rows.Columns {
		notes = append(notes, c.Notes()...)
	}
	want := []string{
		"99 in club, 1 row: looks like a missing code, listed in missing_codes; remove it if these are real values",
		"-99 in score, 2 rows: looks like a missing code, listed in missing_codes; remove it if these are real values",
		"400 in score, 2 rows: far outside the other values (quartiles 56 and 67.25); check that these are real",
		`"." in grade, 1 row: a missing mark, listed in missing_codes`,
	}
	if strings.Join(notes, "\n") != strings.Join(want, "\n") {
		t.Errorf("notes:\n%s\nwant:\n%s", strings.Join(notes, "\n"), strings.Join(want, "\n"))
	}
}

func TestRead_Refuses(t *testing.T) {
	for _, text := range []string{"a,b\n", "a,b\n1,2,3\n", "a,\"b\n1,2\n"} {
		if _, err := guess.Read([]byte(text)); err == nil {
			t.Errorf("%q: no error", text)
		}
	}
}
