package render

import (
	"regexp"
	"strings"
)

// MarkdownText makes text safe to print in Markdown as the plain text it
// is: whatever an author wrote (a title, a claim's text, a variable's
// name or label), it makes no emphasis, strike-through, code, link,
// image, autolink, HTML, character reference, heading, quote or list
// item, under CommonMark or GitHub's extensions to it (autolinks of
// www., http(s)://, other schemes and e-mail addresses; strike-through
// with ~). It writes the text on one line (white space runs become one
// space) and escapes with a backslash, which every CommonMark reader
// drops, the characters that would start markup; an underscore inside a
// name such as tutor_sessions, which CommonMark never reads as emphasis,
// and "<" before a space, as in "p < .001", stay as they read. Every
// letter's text from a package goes through it.
func MarkdownText(s string) string {
	s = underscores(markupChars.Replace(strings.Join(strings.Fields(s), " ")))
	for _, r := range markupRules {
		s = r.re.ReplaceAllString(s, r.with)
	}
	s = blockStart.ReplaceAllString(s, `\$1`)
	return listNumber.ReplaceAllString(s, `$1\$2`)
}

// markupChars are escaped wherever they stand: emphasis and strong (*),
// code (`), links and images ([ ]), strike-through (~), e-mail autolinks
// (@) and the escape itself.
var markupChars = strings.NewReplacer(`\`, `\\`, "*", `\*`, "`", "\\`", "[", `\[`, "]", `\]`, "~", `\~`, "@", `\@`)

// markupRules escape what starts markup only in context.
var markupRules = []struct {
	re   *regexp.Regexp
	with string
}{
	{regexp.MustCompile(`<([A-Za-z/!?])`), `\<$1`},                    // an HTML tag, comment or autolink
	{regexp.MustCompile(`&(#?[A-Za-z0-9]+;)`), `\&$1`},                // a character reference
	{regexp.MustCompile(`([A-Za-z]):(\S)`), `$1\:$2`},                 // a scheme: http://, mailto:
	{regexp.MustCompile(`(?i)\b(www)\.`), `$1\.`},                     // a www. autolink
	{regexp.MustCompile(`([A-Za-z0-9])\.([A-Za-z]{2,}\b)`), `$1\.$2`}, // a bare domain, as some readers link
}

// blockStart and listNumber are what starts a block at the beginning of
// a line: a heading (#), a quote (>), a list item (-, +, or digits and .
// or )), a setext underline (=).
var (
	blockStart = regexp.MustCompile(`^([#>+=-])`)
	listNumber = regexp.MustCompile(`^(\d+)([.)])`)
)

// underscores escapes every underscore but one between two letters or
// digits, which can neither open nor close emphasis (CommonMark 0.31,
// section 6.2, the rules for _).
func underscores(s string) string {
	if !strings.Contains(s, "_") {
		return s
	}
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		if s[i] == '_' && !(i > 0 && alnum(s[i-1]) && i+1 < len(s) && alnum(s[i+1])) {
			b.WriteByte('\\')
		}
		b.WriteByte(s[i])
	}
	return b.String()
}

func alnum(c byte) bool { return c >= '0' && c <= '9' || c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }
