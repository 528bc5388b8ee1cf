package render

import (
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// concernCase builds a report from statuses and deductions, scored as
// checks.score does (100 minus the deductions, stopping at 0).
func concernCase(cs ...checks.CheckResult) *checks.Report {
	r := &checks.Report{Checks: cs, Claims: []checks.ClaimReport{{ID: "H1", Headline: true}, {ID: "H2", Headline: true},
		{ID: "X", Headline: false}}}
	off := 0
	for _, c := range cs {
		off += c.Deduction
	}
	r.Score = max(100-off, 0)
	r.Band = checks.Band(r.Score)
	return r
}

func ck(id, status string, off int, fs ...checks.Finding) checks.CheckResult {
	return checks.CheckResult{ID: id, Title: "Check " + id, Status: status, Deduction: off, Findings: fs}
}

// TestConcernWords: the concern's sentences for the worst cases of their
// counts: no check, one check, none failing or warning, one of each, more
// than 100 points, a check that could not finish, one and two headline
// claims, and the checks that took nothing off with one verdict or several.
func TestConcernWords(t *testing.T) {
	failH1 := checks.Finding{Severity: checks.StatusFail, Claim: "H1", Message: "m"}
	failH2 := checks.Finding{Severity: checks.StatusFail, Claim: "H2", Message: "m"}
	failX := checks.Finding{Severity: checks.StatusFail, Claim: "X", Message: "m"}
	broken := ck("b", checks.StatusFail, 20)
	broken.RunError = "the context ended"
	for _, tc := range []struct {
		name                             string
		r                                *checks.Report
		level, gist, headline, unf, rest string
	}{
		{"no checks", &checks.Report{}, "no checks ran",
			"No check ran, so this report says nothing about the submission.", "", "", ""},
		{"one check", concernCase(ck("a", checks.StatusWarn, 5)), "low concern",
			"The one check warns; 5 of the 100 points are taken off, leaving a score of 95.", "", "", ""},
		{"all pass", concernCase(ck("a", checks.StatusPass, 0), ck("b", checks.StatusNotApplicable, 0)),
			"low concern", "None of the 2 checks fails or warns; nothing is taken off the 100 points.", "", "", ""},
		{"one of each", concernCase(ck("a", checks.StatusFail, 25, failX), ck("b", checks.StatusWarn, 1),
			ck("c", checks.StatusPass, 0)), "moderate concern",
			"1 of the 3 checks fails and 1 warns; 26 of the 100 points are taken off, leaving a score of 74.",
			"", "", "The other check passes and takes nothing off."},
		{"one point", concernCase(ck("a", checks.StatusWarn, 1), ck("b", checks.StatusPass, 0),
			ck("c", checks.StatusPass, 0)), "low concern",
			"None of the 3 checks fails and 1 warns; 1 of the 100 points is taken off, leaving a score of 99.",
			"", "", "The other 2 checks pass and take nothing off."},
		{"past 100", concernCase(ck("a", checks.StatusFail, 60, failH1, failH2, failX), broken,
			ck("c", checks.StatusFail, 35, failH1), ck("d", checks.StatusPass, 0), ck("e", checks.StatusNotApplicable, 0),
			ck("f", checks.StatusNotApplicable, 0)), "high concern",
			"3 of the 6 checks fail and none warns; 115 points are taken off, more than the 100 there are, " +
				"so the score stops at 0.",
			"Failing findings are about the headline claims H1 and H2.",
			"One check could not run to the end and counts as failing: Check b.",
			"The other 3 checks take nothing off: 1 passes and 2 do not apply."},
		{"one headline", concernCase(ck("a", checks.StatusFail, 35, failX, failH2)), "moderate concern",
			"The one check fails; 35 of the 100 points are taken off, leaving a score of 65.",
			"A failing finding is about the headline claim H2.", "", ""},
	} {
		c := concernOf(tc.r)
		for _, got := range []struct{ what, got, want string }{
			{"level", c.Level, tc.level}, {"gist", c.Gist, tc.gist}, {"headline", c.Headline, tc.headline},
			{"unfinished", c.Unfinished, tc.unf}, {"rest", c.Rest, tc.rest},
		} {
			if got.got != got.want {
				t.Errorf("%s: %s %q, want %q", tc.name, got.what, got.got, got.want)
			}
		}
	}
	if c := concernOf(concernCase(ck("a", checks.StatusWarn, 5), ck("b", checks.StatusFail, 25))); len(c.Lines) != 2 ||
		c.Lines[0].ID != "b" || c.Off != 30 {
		t.Errorf("ledger %+v (off %d), want the fail's 25 first and 30 in all", c.Lines, c.Off)
	}
}

// TestConcernScale: the levels by points taken off, read from the bands
// the README's "Score" section states (80–100 low, 50–79 moderate, 0–49
// high concern; points off = 100 − score).
func TestConcernScale(t *testing.T) {
	const want = "Levels of concern: low up to 20 points off, moderate from 21 to 50, high from 51."
	if got := concernScale(); got != want {
		t.Errorf("scale %q, want %q", got, want)
	}
}

var (
	oldMargin  = regexp.MustCompile(`(?m)^(PASS|WARN|FAIL|n/a)\b|\s-\d+$`)
	checkHead  = regexp.MustCompile(`(?m)^(\S.*) \(([a-z-]+)\): (fails|warns|passes|does not apply)(, \d+ points? taken off)?$`)
	ledgerLine = regexp.MustCompile(`(?m)^ +(\d+)  (.+) \((fails|warns)\)$`)
)

// TestTextView: the text view of each demo leads with the concern in
// words, lists each check under its title with its verdict in words (no
// upper-case margin, no deduction at the right edge), keeps every finding,
// adds its ledger up to the points taken off and stays within 100 columns.
func TestTextView(t *testing.T) {
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		r := loadGolden(t, demo)
		var b strings.Builder
		if err := WriteText(&b, r); err != nil {
			t.Fatal(err)
		}
		text := b.String()
		if first := strings.SplitN(text, "\n", 2)[0]; first != "pathvet screening report: "+Words(r.Band) {
			t.Errorf("%s: first line %q", demo, first)
		}
		if m := oldMargin.FindString(text); m != "" {
			t.Errorf("%s: the old status margin or a right-edge deduction: %q", demo, m)
		}
		heads, findings := checkHead.FindAllStringSubmatch(text, -1), 0
		for _, c := range r.Checks {
			findings += len(c.Findings)
		}
		if bullets := strings.Count(text, "\n      · "); len(heads) != len(r.Checks) || bullets != findings {
			t.Errorf("%s: %d check headings for %d checks, %d findings for %d", demo, len(heads), len(r.Checks),
				bullets, findings)
		}
		sum := 0
		for _, m := range ledgerLine.FindAllStringSubmatch(text, -1) {
			sum += atoi(m[1])
		}
		if sum != 100-r.Score || !strings.Contains(text, "not a verdict") {
			t.Errorf("%s: the ledger adds up to %d, want %d; or the caution is missing", demo, sum, 100-r.Score)
		}
		for i, line := range strings.Split(text, "\n") {
			if n := len([]rune(line)); n > TextWidth && !strings.HasPrefix(line, "Package sha256") {
				t.Errorf("%s: line %d is %d columns", demo, i+1, n)
			}
		}
	}
}

func atoi(s string) int {
	n := 0
	for _, r := range s {
		n = 10*n + int(r-'0')
	}
	return n
}

// TestPageLeadsWithWords: the page's masthead states the concern as a
// heading and a sentence, with the ledger linking each check, and shows no
// score figure out of 100 and no band badge.
func TestPageLeadsWithWords(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	var b strings.Builder
	if err := WritePage(&b, r, PageOptions{}); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	head := page[:strings.Index(page, `id="questions"`)]
	for _, want := range []string{`<h2 id="concern-h">High concern</h2>`, concernOf(r).Gist,
		`<a href="#check-equivalence">`, "<th scope=\"row\" colspan=\"2\">In all, of 100</th><td>75</td>", "not a verdict"} {
		if !strings.Contains(head, want) {
			t.Errorf("the masthead lacks %q", want)
		}
	}
	for _, old := range []string{"scorefig", "of 100</span>", `class="band`} {
		if strings.Contains(page, old) {
			t.Errorf("the page still has %q", old)
		}
	}
}
