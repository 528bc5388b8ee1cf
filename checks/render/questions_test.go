package render

import (
	"strconv"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// TestQuestions: one numbered question per fail and warn finding, fails
// first, and the letter carries the caution and the package hash.
func TestQuestions(t *testing.T) {
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		r := loadGolden(t, demo)
		want := 0
		for _, c := range r.Checks {
			for _, f := range c.Findings {
				if f.Severity == checks.StatusFail || f.Severity == checks.StatusWarn {
					want++
				}
			}
		}
		qs := Questions(r)
		if len(qs) != want || want == 0 {
			t.Fatalf("%s: %d questions, want %d", demo, len(qs), want)
		}
		for i, q := range qs {
			if q.N != i+1 || !strings.HasSuffix(q.Ask, "?") {
				t.Errorf("%s: question %d is %+v", demo, i+1, q)
			}
			if i > 0 && q.Severity == "fail" && qs[i-1].Severity != "fail" {
				t.Errorf("%s: a fail after a warn at %d", demo, q.N)
			}
		}
		var b strings.Builder
		if err := WriteLetter(&b, r); err != nil {
			t.Fatal(err)
		}
		letter := b.String()
		for _, s := range []string{r.PackageSHA256, "automated screen, not a verdict", strconv.Itoa(want) + ". "} {
			if !strings.Contains(letter, s) {
				t.Errorf("%s: the letter lacks %q", demo, s)
			}
		}
	}
}

func TestLetterWithoutQuestions(t *testing.T) {
	r := loadGolden(t, "coding-club")
	r.Checks = nil
	var b strings.Builder
	if err := WriteLetter(&b, r); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "raised no questions") {
		t.Error(b.String())
	}
}

// TestEveryCheckHasAQuestion: a check added to the pipeline gets its own
// question, not the fallback.
func TestEveryCheckHasAQuestion(t *testing.T) {
	for _, c := range checks.Pipeline() {
		if asks[c.ID] == "" {
			t.Errorf("check %s has no question for the authors", c.ID)
		}
	}
}
