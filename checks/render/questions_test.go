package render

import (
	"flag"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

var updateLetters = flag.Bool("update-letters", false, "rewrite the golden letters in testdata/demo")

var letterDemos = []string{"tutoring-anxiety", "coding-club", "sleep-attention", "mentoring-waves"}

// scoreWords are what the triage figures look like in words: a letter
// holds none of them once the authors' own texts are taken out.
var scoreWords = regexp.MustCompile(`(?i)\bscor(e|es|ed|ing)\b|of 100\b|points? off|\bconcern\b|\bband\b`)

// pointers are words that point to parts of a report, which the authors do
// not see.
var pointers = regexp.MustCompile(`(?i)\b(below|above|see the|see \w+-\w+|(the|this) (report|check|finding)s?)\b`)

// claimID finds the claim ids a letter names.
var claimID = regexp.MustCompile(`\b[A-Z][0-9]+\b`)

// The letter of each demo, with nobody's decisions: a greeting and the
// caution; every question once; no score or band; nothing that points to
// a part of the report ("below", "see the"); every claim it names quoted
// with its text; headline claims first; the package hash.
func TestLetter_Demos(t *testing.T) {
	for _, demo := range letterDemos {
		r := loadGolden(t, demo)
		l := DefaultLetter(r)
		var b strings.Builder
		if err := WriteLetter(&b, l); err != nil {
			t.Fatal(err)
		}
		letter := b.String()
		for _, s := range []string{"Dear authors,", "automated screen, not a verdict", r.PackageSHA256} {
			if !strings.Contains(letter, s) {
				t.Errorf("%s: the letter lacks %q", demo, s)
			}
		}
		checkLetterItems(t, demo, r, l)
		checkLetterText(t, demo, r, letter)
	}
}

func checkLetterItems(t *testing.T, demo string, r *checks.Report, l review.Letter) {
	asked, seen := 0, map[string]bool{}
	for _, e := range review.Entries(r) {
		if e.Severity == checks.StatusFail || e.Severity == checks.StatusWarn {
			asked++
		}
	}
	n, headlineDone := 0, false
	for i, it := range l.Items {
		n += len(it.Findings)
		if seen[it.Question] || !strings.HasSuffix(it.Question, "?") || it.N != i+1 {
			t.Errorf("%s: item %d repeats or lacks its question: %+v", demo, i+1, it)
		}
		seen[it.Question] = true
		headline := false
		for _, c := range it.Claims {
			headline = headline || c.Headline
		}
		if headline && headlineDone {
			t.Errorf("%s: item %d is about a headline claim but comes after one that is not", demo, it.N)
		}
		headlineDone = headlineDone || !headline
	}
	if n != asked {
		t.Errorf("%s: %d findings in %d items, want all %d fail and warn findings", demo, n, len(l.Items), asked)
	}
}

func checkLetterText(t *testing.T, demo string, r *checks.Report, letter string) {
	own := letter
	for _, c := range r.Claims {
		if strings.Contains(letter, c.ID+"**") && !strings.Contains(letter, "**"+c.ID+"**, “"+c.Text+"”") {
			t.Errorf("%s: claim %s is named without its text", demo, c.ID)
		}
		own = strings.ReplaceAll(own, c.Text, "")
	}
	for _, id := range claimID.FindAllString(own, -1) {
		if !strings.Contains(letter, "**"+id+"**, “") {
			t.Errorf("%s: %s is named but never quoted with its text", demo, id)
		}
	}
	if m := scoreWords.FindString(own); m != "" {
		t.Errorf("%s: the letter speaks of the triage figures (%q):\n%s", demo, m, letter)
	}
	if m := pointers.FindString(own); m != "" {
		t.Errorf("%s: the letter points to what the authors do not see (%q):\n%s", demo, m, letter)
	}
}

// A golden letter per demo, read as the authors would get it before it was
// committed; go test ./checks/render -update-letters rewrites them.
func TestLetter_Golden(t *testing.T) {
	for _, demo := range letterDemos {
		var b strings.Builder
		if err := WriteLetter(&b, DefaultLetter(loadGolden(t, demo))); err != nil {
			t.Fatal(err)
		}
		path := filepath.Join("..", "..", "testdata", "demo", demo, "letter.golden.md")
		if *updateLetters {
			if err := os.WriteFile(path, []byte(b.String()), 0o644); err != nil {
				t.Fatal(err)
			}
		}
		want, err := os.ReadFile(path)
		if err != nil {
			t.Fatal(err)
		}
		if b.String() != string(want) {
			t.Errorf("%s: the letter differs from %s; run go test ./checks/render -update-letters and read it", demo,
				path)
		}
	}
}

func TestLetterWithoutQuestions(t *testing.T) {
	r := loadGolden(t, "coding-club")
	r.Checks = nil
	var b strings.Builder
	if err := WriteLetter(&b, DefaultLetter(r)); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(b.String(), "raised no point") || strings.Contains(b.String(), "1. ") {
		t.Error(b.String())
	}
}

// The reviewer's decisions: a dismissed finding and a noted one leave the
// letter, a reworded question replaces the default in its item, and a
// note asked gets its reviewer's question.
func TestLetter_Decisions(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	l0 := DefaultLetter(r)
	first, second := l0.Items[0].Keys[0], l0.Items[1].Keys[0]
	eff := map[string]review.Annotation{
		first:  {Decision: review.Dismiss, Reason: "the authors' design settles it"},
		second: {Decision: review.Ask, Question: "Could you say more about the alternative you stated?"},
	}
	for _, e := range review.Entries(r) {
		if e.Severity == checks.SeverityInfo {
			eff[e.Key] = review.Annotation{Decision: review.Ask, Question: "Why was this so?"}
			break
		}
	}
	var b strings.Builder
	if err := WriteLetter(&b, review.Compose(r, review.Decide(r, eff))); err != nil {
		t.Fatal(err)
	}
	letter := b.String()
	for _, s := range []string{"Could you say more about the alternative you stated?", "Why was this so?"} {
		if !strings.Contains(letter, s) {
			t.Errorf("the letter lacks the reviewer's %q:\n%s", s, letter)
		}
	}
	if strings.Contains(letter, MarkdownText(Prose(l0.Items[0].Findings[0]))) {
		t.Errorf("the dismissed finding is in the letter:\n%s", letter)
	}
	if strings.Contains(letter, l0.Items[1].Question) && len(l0.Items[1].Keys) == 1 {
		t.Errorf("the default question stays beside the reviewer's:\n%s", letter)
	}
}
