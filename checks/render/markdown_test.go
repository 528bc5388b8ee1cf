package render

import (
	"bytes"
	"html"
	"regexp"
	"strings"
	"testing"

	"github.com/yuin/goldmark"
	"github.com/yuin/goldmark/extension"

	"github.com/pathvet/pathvet/checks"
)

// TestMarkdownText: markup characters are escaped, names, "p < .001" and
// "e.g." stay as they read.
func TestMarkdownText(t *testing.T) {
	for in, want := range map[string]string{
		"C1 is −0.30 (p < .001) for tutor_sessions, e.g. here": "C1 is −0.30 (p < .001) for tutor_sessions, e.g. here",
		"a *bold* [link] `code` <b>tag</b>":                    `a \*bold\* \[link\] ` + "\\`code\\`" + ` \<b>tag\</b>`,
		"_emphasis_ and x_":                                    `\_emphasis\_ and x\_`,
		"two\n  lines":                                         "two lines",
		"~~gone~~ x@y.org":                                     `\~\~gone\~\~ x\@y\.org`,
		"see https://a.example and www.b.example":              `see https\://a\.example and www\.b\.example`,
		"# 1. &amp;":                                           `\# 1. \&amp;`,
		"12. item":                                             `12\. item`,
		"__init__ and a_b":                                     `\_\_init\_\_ and a_b`,
	} {
		if got := MarkdownText(in); got != want {
			t.Errorf("MarkdownText(%q) = %q, want %q", in, got, want)
		}
	}
}

// hostileTexts are what an author might write into a title, a claim or a
// name to make a letter do more than print it.
var hostileTexts = []string{
	"**bold** __strong__ *em* _em_ ***both***",
	"~~struck~~ and ~one~",
	"https://evil.example/x?a=1 http://b.example ftp://f.example mailto:x@y.example tel:+15551234",
	"www.evil.example and evil.example/path and user@evil.example",
	"<script>alert(1)</script> <b>x</b> <!-- hidden --> <https://auto.example> <x@y.example>",
	"[a link](https://evil.example) ![an image](https://evil.example/i.png) [ref][1]",
	"&lt;b&gt;bold&lt;/b&gt; &amp; &#60;i&#62; &copy;",
	"`code` ``more code``",
	"# A heading",
	"> a quote",
	"- a list item",
	"+ another",
	"1. a numbered item",
	"3) another",
	"===",
	`\*already escaped\* \\`,
	"tutor_sessions and p < .001 and 2 > 1",
}

// The letter of a report whose title, manuscript id, claim text and
// finding carry hostile text, read by a real CommonMark reader with
// GitHub's extensions (goldmark with GFM: autolinks, strike-through,
// tables), holds only the letter's own markup (no heading, a strong
// caution and a strong claim id, one quote, one numbered list, one code
// span for the hash), and its text reads exactly as the author wrote it.
func TestLetter_HostileTextStaysText(t *testing.T) {
	md := goldmark.New(goldmark.WithExtensions(extension.GFM))
	for _, text := range hostileTexts {
		r := loadGolden(t, "coding-club")
		r.Title, r.ManuscriptID = text, text
		r.Claims[0].Text = text
		r.Checks = []checks.CheckResult{{ID: "graph-fit", Title: "Graph fit", Status: checks.StatusWarn,
			Findings: []checks.Finding{{Severity: checks.StatusWarn, Claim: r.Claims[0].ID, Message: text,
				Question: "Could you say?"}}}}
		var letter, page bytes.Buffer
		if err := WriteLetter(&letter, DefaultLetter(r)); err != nil {
			t.Fatal(err)
		}
		if err := md.Convert(letter.Bytes(), &page); err != nil {
			t.Fatal(err)
		}
		out := page.String()
		for tag, want := range map[string]int{"<h1": 0, "<strong": 2, "<blockquote": 1, "<ol": 1, "<li": 1,
			"<code": 1, "<em": 0, "<del": 0, "<a ": 0, "<img": 0, "<h2": 0, "<ul": 0, "<table": 0, "<hr": 0,
			"<script": 0, "<b>": 0, "<i>": 0, "<!--": 0, "<p>": 4} {
			if got := strings.Count(out, tag); got != want {
				t.Errorf("%q: %d of %s in the letter, want %d:\n%s", text, got, tag, want, out)
			}
		}
		plain := html.UnescapeString(tags.ReplaceAllString(out, ""))
		if want := strings.Join(strings.Fields(text), " "); strings.Count(plain, want) != 4 {
			t.Errorf("%q does not read as written (title, manuscript, claim, finding):\n%s", text, plain)
		}
	}
}

var tags = regexp.MustCompile(`<[^>]*>`)
