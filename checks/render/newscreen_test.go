package render

import (
	"regexp"
	"strings"
	"testing"
)

var (
	idRe        = regexp.MustCompile(`\sid="([^"]+)"`)
	controlRe   = regexp.MustCompile(`<(input|select|textarea)\b[^>]*>`)
	labelForRe  = regexp.MustCompile(`<label[^>]*\sfor="([^"]+)"`)
	describedRe = regexp.MustCompile(`aria-describedby="([^"]+)"`)
	templateRe  = regexp.MustCompile(`(?s)<template id="claim-template">(.*?)</template>`)
	scriptRe    = regexp.MustCompile(`(?i)<script\b[^>]*>`)
)

func newScreeningPage(t *testing.T, p NewScreening) string {
	t.Helper()
	var b strings.Builder
	if err := WriteNewScreening(&b, p); err != nil {
		t.Fatal(err)
	}
	return b.String()
}

// aFilledForm has a problem beside the table, a claim row and the
// preview.
func aFilledForm() NewScreening {
	return NewScreening{Nav: Nav{Office: "Office F", Role: "editor", CSRF: "tok"}, MaxClaims: 60,
		Form: ScreenForm{CSRF: "tok", Key: "k1", Title: "A <study>", Table: "1. Noise  x",
			Claims: []ClaimInput{{N: 1, ID: "C1", Kind: "direct_effect", Headline: true}, {N: 2, Kind: "association"}},
			Rows:   &KeptRows{Name: "rows.csv", Size: "4 KB", Rows: 12, Data: "YSxiCg=="},
			Errors: map[string][]string{"f-table": {`line 1, cell 2 ("x"): expected a number`}, "c2-from": {"bad"}}},
		Problems: []FieldProblem{{"f-table", "Table 1", `line 1, cell 2 ("x"): expected a number`},
			{"c2-from", "Claim 2, from", "bad"}},
		Preview: &ScreenPreview{Variables: []PreviewVariable{{Name: "noise", Label: "Noise", Mean: "59.3", SD: "6.1"}},
			Guesses: []string{"lower triangle"}, JSON: `{"title": "A <study>"}`, Problems: 2}}
}

// The page for people: a viewport, headings that never skip a level,
// every control labelled, every description it points to present, ids
// unique, the caution, and script only as the one file (no inline script,
// no handlers, no style attributes).
func TestNewScreeningForPeople(t *testing.T) {
	page := newScreeningPage(t, aFilledForm())
	outside := templateRe.ReplaceAllString(page, "")
	if !strings.Contains(page, `<meta name="viewport"`) || !strings.Contains(page, "not a verdict") {
		t.Error("viewport or caution missing")
	}
	scripts := scriptRe.FindAllString(page, -1)
	if len(scripts) != 1 || scripts[0] != `<script src="/assets/new-screening.js" defer>` ||
		regexp.MustCompile(`(?i)\son[a-z]+=|style="|javascript:`).MatchString(page) {
		t.Errorf("script or style attributes: %v", scripts)
	}
	last := 0
	for _, m := range headingRe.FindAllStringSubmatch(outside, -1) {
		if level := int(m[1][0] - '0'); level > last+1 {
			t.Errorf("h%d after h%d", level, last)
		} else {
			last = level
		}
	}
	ids := map[string]int{}
	for _, m := range idRe.FindAllStringSubmatch(outside, -1) {
		ids[m[1]]++
	}
	for id, n := range ids {
		if n > 1 {
			t.Errorf("id %s %d times", id, n)
		}
	}
	labelled := map[string]bool{}
	for _, m := range labelForRe.FindAllStringSubmatch(outside, -1) {
		labelled[m[1]] = true
	}
	for _, c := range controlRe.FindAllString(outside, -1) {
		id := idRe.FindStringSubmatch(c)
		if strings.Contains(c, `type="hidden"`) || strings.Contains(c, `hidden>`) {
			continue
		}
		if id == nil || !labelled[id[1]] {
			t.Errorf("a control without a label: %s", c)
		}
	}
	for _, m := range describedRe.FindAllStringSubmatch(outside, -1) {
		for _, id := range strings.Fields(m[1]) {
			if ids[id] == 0 {
				t.Errorf("aria-describedby names %s, which is not on the page", id)
			}
		}
	}
}

// A problem stands beside its field, the field marked invalid and
// described by it; what the user wrote is kept, escaped.
func TestNewScreeningProblemsBesideFields(t *testing.T) {
	page := newScreeningPage(t, aFilledForm())
	for _, want := range []string{
		`aria-invalid="true" aria-describedby="f-table-err f-table-hint">1. Noise  x</textarea>` +
			`<div class="ns-err" id="f-table-err"><p><strong>Problem:</strong> ` +
			`line 1, cell 2 (&#34;x&#34;): expected a number</p></div>`,
		`id="c2-from" name="claim_from" value="" autocomplete="off" aria-invalid="true" ` +
			`aria-describedby="c2-from-err">`,
		`<a href="#f-table">Table 1</a>: line 1, cell 2`, `value="A &lt;study&gt;"`,
		`<input type="checkbox" id="c1-headline" name="claim_headline" value="1" checked>`,
		`<input type="hidden" name="rows_kept" value="YSxiCg==">`, "2 problems to fix",
		`{&#34;title&#34;: &#34;A &lt;study&gt;&#34;}`, `formaction="/submissions/new#c3-id"`,
	} {
		if !strings.Contains(page, want) {
			t.Errorf("the page lacks %s", want)
		}
	}
}

// The row the script copies is numbered __N__ in every id, label and
// value it carries, and holds no input of the rows on the page.
func TestNewScreeningBlankRow(t *testing.T) {
	m := templateRe.FindStringSubmatch(newScreeningPage(t, aFilledForm()))
	if m == nil {
		t.Fatal("no claim template")
	}
	blank := m[1]
	for _, want := range []string{`id="c__N__"`, `<legend>Claim __N__</legend>`, `for="c__N__-from"`,
		`name="claim_headline" value="__N__"`, `placeholder="C__N__"`, `<option value="direct_effect" selected>`} {
		if !strings.Contains(blank, want) {
			t.Errorf("the blank row lacks %s", want)
		}
	}
	if strings.Contains(blank, "autofocus") || strings.Contains(blank, `aria-invalid`) ||
		regexp.MustCompile(`id="c[0-9]`).MatchString(blank) {
		t.Errorf("the blank row carries a row's state: %s", blank)
	}
}
