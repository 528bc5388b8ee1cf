package render

import (
	"bytes"
	_ "embed"
	"html/template"
	"io"
	"strconv"
)

// The workspace's "new screening" page: a form that builds a package from
// a paper's printed Table 1 (or raw rows), its arrows and its claims, a
// preview of what was read, and every problem beside the field it came
// from. Its template, stylesheet and script are its own files; the page
// carries the shared stylesheet too, and the navigation bar of the other
// workspace pages.

//go:embed newscreen.html
var newScreenHTML string

//go:embed newscreen.css
var newScreenCSS string

//go:embed newscreen.js
var newScreenJS []byte

var newScreenTmpl = template.Must(template.New("newscreen").Funcs(template.FuncMap{
	"plural": plural, "fe": fieldErrs, "claimView": newClaimView,
}).Parse(newScreenHTML))

// NewScreening is the page: the form as the user left it, its problems,
// and the preview when one was asked for.
type NewScreening struct {
	Nav  Nav
	Form ScreenForm
	// Problems lists every problem in the order of the form, for the
	// summary at the top; each is also shown beside its field.
	Problems []FieldProblem
	Preview  *ScreenPreview
	// Notice is a sentence about the last step (a conflict, a row that
	// could not be added); Earlier the version the form was filled from.
	Notice  string
	Earlier *EarlierVersion
	// MaxClaims is how many claim rows the form takes.
	MaxClaims int
}

// ScreenForm is what the form's fields hold. Errors are the problems by
// the id of the field they belong to ("f-table", "c2-from", "claims").
type ScreenForm struct {
	CSRF, Key, From                            string
	Title, ManuscriptID, Design, MissingMethod string
	Table, N, Arrows                           string
	Rows                                       *KeptRows
	Claims                                     []ClaimInput
	// Focus is the id of the field the page puts the cursor in (the
	// first field of a claim row just added), or "".
	Focus  string
	Errors map[string][]string
}

// ClaimInput is one claim row of the form; N counts from 1.
type ClaimInput struct {
	N                                                 int
	ID, Text, Kind, From, To, Estimate, CILow, CIHigh string
	P                                                 string
	Headline                                          bool
}

// KeptRows are raw rows the form holds between steps: an upload kept in
// the page (Data, base64), or the earlier version's rows (Data empty).
// NotKept, when set, is the limit an upload was too large to be kept
// under: it must be attached again.
type KeptRows struct {
	Name, Size string // the file's name; its size in words
	Rows       int    // 0 when not known
	Data       string
	Earlier    bool
	NotKept    string
}

// FieldProblem is one problem in the summary: the field's id and name,
// and what is wrong.
type FieldProblem struct {
	Field, Label, Message string
}

// ScreenPreview is what the form gave: the variables read, what the
// reader guessed, what was carried over from an earlier version, and the
// package.
type ScreenPreview struct {
	// FromRows: the variables come from raw rows (scales guessed), not a
	// printed table (means and SDs).
	FromRows  bool
	Variables []PreviewVariable
	Guesses   []string
	Carried   []string
	JSON      string
	// Problems counts the package's problems; 0 means it may be screened.
	Problems int
}

// PreviewVariable is one variable as read: from a table its label, M, SD
// and reliability; from rows its scale and why, and its missing cells.
type PreviewVariable struct {
	Name, Label, Mean, SD, Reliability string
	Scale, Why                         string
	Missing                            int
}

// EarlierVersion is the submission a "new version" form was filled from.
type EarlierVersion struct {
	ID, Title, ManuscriptID, Received string
}

// screenView is what the template reads.
type screenView struct {
	NewScreening
	NavHTML      template.HTML
	CSS, FormCSS template.CSS
	Blank        ClaimInput // the row the script adds, numbered __N__
	NextClaim    int
	Designs      []option
	Methods      []option
	Kinds        []option
	ScriptPath   string
}

// fieldErr is a field's problems for the template: its id, its messages
// and the id of its hint, which the input is described by.
type fieldErr struct {
	ID, Hint string
	Msgs     []string
}

func fieldErrs(errs map[string][]string, id, hint string) fieldErr {
	return fieldErr{ID: id, Hint: hint, Msgs: errs[id]}
}

// claimView is one claim row for the template; the blank row the script
// copies is numbered __N__, which it replaces.
type claimView struct {
	N      string
	C      ClaimInput
	Errors map[string][]string
	Kinds  []option
	Focus  bool
}

func newClaimView(v screenView, c ClaimInput) claimView {
	n := "__N__"
	if c.N > 0 {
		n = strconv.Itoa(c.N)
	}
	return claimView{N: n, C: c, Errors: v.Form.Errors, Kinds: v.Kinds, Focus: c.N > 0 && v.Form.Focus == "c"+n+"-id"}
}

type option struct{ Value, Words string }

var designOptions = []option{{"", "choose the design"}, {"observational", "observational"},
	{"randomized", "randomized"}, {"quasi_experimental", "quasi-experimental"}}

var methodOptions = []option{{"", "not stated in the paper"}, {"none", "none: no values were missing"},
	{"complete_cases", "complete cases (listwise deletion)"},
	{"available_cases", "available cases (pairwise deletion)"},
	{"mean_substitution", "mean substitution"}, {"single_regression", "single regression imputation"},
	{"carry_forward", "last value carried forward"}, {"multiple_imputation", "multiple imputation"},
	{"maximum_likelihood", "maximum likelihood (full-information ML or EM)"}, {"other", "other"}}

var kindOptions = []option{{"direct_effect", "direct effect (the arrow's own coefficient)"},
	{"total_effect", "total effect (through every path)"}, {"association", "association (adjusted, predictive)"}}

// ScreeningScriptPath is where the page's script is served.
const ScreeningScriptPath = "/assets/new-screening.js"

// WriteNewScreening writes the "new screening" page.
func WriteNewScreening(w io.Writer, p NewScreening) error {
	var nav bytes.Buffer
	if err := pageTmpl.ExecuteTemplate(&nav, "navbar", p.Nav); err != nil {
		return err
	}
	v := screenView{NewScreening: p, NavHTML: template.HTML(nav.String()), CSS: CSS(),
		FormCSS: NewScreeningCSS(), Blank: ClaimInput{Kind: "direct_effect"}, NextClaim: len(p.Form.Claims) + 1,
		Designs: designOptions, Methods: methodOptions, Kinds: kindOptions, ScriptPath: ScreeningScriptPath}
	return newScreenTmpl.Execute(w, v)
}

// NewScreeningCSS is the page's own stylesheet, in a second <style>
// element beside the shared one.
func NewScreeningCSS() template.CSS { return template.CSS(newScreenCSS) }

// NewScreeningScript is the page's script: "add a claim" in place. The
// page works the same without it.
func NewScreeningScript() []byte { return newScreenJS }
