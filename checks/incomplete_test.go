package checks_test

import (
	"bytes"
	"encoding/json"
	"fmt"
	"os"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// codingClubWith is the coding-club demo with its rows replaced by csv.
func codingClubWith(tb testing.TB, csv string) *checks.Study {
	tb.Helper()
	doc, err := os.ReadFile("../testdata/demo/coding-club/package.json")
	if err != nil {
		tb.Fatal(err)
	}
	inline, _ := json.Marshal(csv)
	doc = bytes.Replace(doc, []byte(`"file": "rows.csv"`), []byte(`"csv": `+string(inline)), 1)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		tb.Fatal(err)
	}
	return s
}

const clubHeader = "participant_id,parent_degree,club_member,practice_hours,persistence\n"

// fewRows has four complete rows and one with a missing cell: fewer rows
// than the equations have parameters.
func fewRows() string {
	return clubHeader + "P1,1,0,2.1,3.7\nP2,0,1,6.0,3.3\nP3,1,1,4.0,5.1\nP4,0,0,1.5,2.2\nP5,1,0,-99,4.0\n"
}

// collinearRows: persistence = practice_hours + parent_degree exactly.
func collinearRows() string {
	var b strings.Builder
	b.WriteString(clubHeader)
	for i := range 40 {
		pd, cm := i%2, (i/2)%2
		ph := float64(i%7) + 0.5*float64(cm)
		fmt.Fprintf(&b, "P%d,%d,%d,%g,%g\n", i, pd, cm, ph, ph+float64(pd))
	}
	return b.String()
}

// A screen that could estimate nothing does not look clean: the checks
// that need the data's estimates fail to run, each with the real cause,
// and the score falls below the low-concern band.
func TestRun_NothingEstimable(t *testing.T) {
	for _, tc := range []struct {
		name, csv, cause string
	}{
		{"fewer rows than parameters", fewRows(), "only 4 complete cases for 4 variables"},
		{"collinear", collinearRows(), "parent_degree, practice_hours, persistence are exactly collinear"},
	} {
		t.Run(tc.name, func(t *testing.T) {
			r := mustRun(t, codingClubWith(t, tc.csv))
			for _, id := range []string{"graph-fit", "nearby-graphs", "measurement"} {
				c := checkOf(r, id)
				if c.Status != checks.StatusFail || !strings.Contains(c.RunError, tc.cause) || c.Deduction == 0 {
					t.Errorf(
						"%s: %s, deduction %d, run error %q; want fail with %q",
						id,
						c.Status,
						c.Deduction,
						c.RunError,
						tc.cause,
					)
				}
			}
			for _, cl := range r.Claims {
				if !strings.Contains(cl.Declared.Error, tc.cause) {
					t.Errorf("%s declared: %q, want the cause %q", cl.ID, cl.Declared.Error, tc.cause)
				}
			}
			if !strings.Contains(r.Data.Note, tc.cause) {
				t.Errorf("data note %q, want the cause %q", r.Data.Note, tc.cause)
			}
			if eq := checkOf(r, "equivalence"); eq.Status == checks.StatusPass {
				t.Errorf("equivalence passes with no claim estimated: %s", eq.Summary)
			}
			if r.Band == checks.BandLow {
				t.Errorf("score %d (%s) for a screen that estimated nothing", r.Score, r.Band)
			}
		})
	}
}

// Summary statistics with fewer cases than a regression has parameters:
// the claims say so in numbers, and the fit fails to run.
func TestRun_TooFewCasesSummary(t *testing.T) {
	doc, _ := os.ReadFile("../testdata/demo/tutoring-anxiety/package.json")
	doc = bytes.Replace(doc, []byte(`"n": 640`), []byte(`"n": 4`), 1)
	s, err := load.Load(doc, load.Options{})
	if err != nil {
		t.Fatal(err)
	}
	r := mustRun(t, s)
	for _, cl := range r.Claims {
		if cl.Declared.Error != "" && !strings.Contains(cl.Declared.Error, "4 cases for a regression with") {
			t.Errorf("%s: %q", cl.ID, cl.Declared.Error)
		}
	}
	if c := checkOf(r, "graph-fit"); c.Status != checks.StatusFail ||
		!strings.Contains(c.RunError, "and the data 4 cases; it needs at least 5") {
		t.Errorf("graph-fit %s: %q", c.Status, c.RunError)
	}
	if c := checkOf(r, "measurement"); c.Status == checks.StatusPass {
		t.Errorf("measurement passes with a claim it could not estimate: %s", c.Summary)
	}
	if r.Band == checks.BandLow {
		t.Errorf("score %d (%s)", r.Score, r.Band)
	}
}
