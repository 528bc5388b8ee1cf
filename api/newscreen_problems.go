package api

import (
	"errors"
	"fmt"
	"regexp"
	"sort"
	"strconv"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// The ids of the form's fields, which its problems are filed under.
const (
	fieldForm    = "screen-form" // the package as a whole
	fieldTitle   = "f-title"
	fieldMS      = "f-manuscript_id"
	fieldDesign  = "f-design"
	fieldMissing = "f-missing_method"
	fieldTable   = "f-table"
	fieldN       = "f-n"
	fieldRows    = "f-rows"
	fieldArrows  = "f-arrows"
	fieldClaims  = "claims"
)

// fieldNames name the fields in the summary of problems, in the form's
// order.
var fieldNames = []struct{ id, words string }{
	{fieldForm, "The package"}, {fieldTitle, "Working title"}, {fieldMS, "Manuscript ID"},
	{fieldDesign, "Design"}, {fieldMissing, "Missing values"}, {fieldTable, "Table 1"},
	{fieldN, "Sample size n"}, {fieldRows, "Raw rows"}, {fieldArrows, "Arrows"}, {fieldClaims, "Claims"},
}

// claimFieldNames name a claim row's fields, in the row's order.
var claimFieldNames = []struct{ id, words string }{{"", ""}, {"id", "ID"}, {"text", "text"}, {"kind", "kind"},
	{"from", "from"}, {"to", "to"}, {"estimate", "estimate"}, {"ci_low", "interval's lower end"},
	{"ci_high", "interval's upper end"}, {"p", "p-value"}, {"headline", "headline"}}

// fieldErrors are the form's problems by field.
type fieldErrors struct {
	by   map[string][]string
	list []render.FieldProblem
	rank []int
}

func newFieldErrors() *fieldErrors { return &fieldErrors{by: map[string][]string{}} }

func (e *fieldErrors) add(field, msg string) {
	label, rank := fieldLabel(field)
	e.by[field] = append(e.by[field], msg)
	e.list = append(e.list, render.FieldProblem{Field: field, Label: label, Message: msg})
	e.rank = append(e.rank, rank)
}

func (e *fieldErrors) any() bool { return len(e.list) > 0 }

// summary lists the problems in the order of the form.
func (e *fieldErrors) summary() []render.FieldProblem {
	idx := make([]int, len(e.list))
	for i := range idx {
		idx[i] = i
	}
	sort.SliceStable(idx, func(a, b int) bool { return e.rank[idx[a]] < e.rank[idx[b]] })
	out := make([]render.FieldProblem, len(idx))
	for i, j := range idx {
		out[i] = e.list[j]
	}
	return out
}

// fieldLabel names a field and gives its place in the form.
func fieldLabel(field string) (string, int) {
	for i, f := range fieldNames {
		if f.id == field {
			return f.words, i
		}
	}
	row, sub, _ := strings.Cut(strings.TrimPrefix(field, "c"), "-")
	n, _ := strconv.Atoi(row)
	for i, f := range claimFieldNames {
		if f.id == sub && f.words == "" {
			return fmt.Sprintf("Claim %d", n), 100 + 20*n
		}
		if f.id == sub {
			return fmt.Sprintf("Claim %d, %s", n, f.words), 100 + 20*n + i
		}
	}
	return field, 1 << 30
}

// placeError files an error of the API's checks under the fields it
// came from: an invalid package's every problem, else its words.
func (b *built) placeError(err error) {
	var ip *checks.InvalidPackageError
	if errors.As(err, &ip) {
		for _, p := range ip.Problems {
			field, msg := b.place(p)
			msg = b.reword(field, msg)
			if _, ok := b.errs.by[field]; ok && !strings.HasPrefix(field, "f-table") && field != fieldRows &&
				field != fieldArrows && field != fieldForm {
				continue // the form's own check already said what is wrong here
			}
			b.errs.add(field, msg)
		}
		return
	}
	p, _ := problemFor(err)
	var he *echo.HTTPError
	if errors.As(err, &he) || p.Status < 500 {
		b.errs.add(fieldForm, p.Detail)
		return
	}
	b.errs.add(fieldForm, "The package could not be checked: "+p.Detail)
}

// place finds the field a problem of the loader came from: a JSON
// pointer into the package built from the form, or a line and column of
// the raw rows.
func (b *built) place(p checks.Problem) (string, string) {
	if p.Line > 0 {
		return fieldRows, p.String()
	}
	seg := strings.Split(strings.TrimPrefix(p.Pointer, "/"), "/")
	switch seg[0] {
	case "title":
		return fieldTitle, p.Detail
	case "manuscript_id":
		return fieldMS, p.Detail
	case "design":
		return fieldDesign, p.Detail
	case "missing_data":
		return b.placeMissing(p)
	case "graph":
		return b.placeGraph(seg, p)
	case "claims":
		return b.placeClaim(seg, p)
	case "variables", "data":
		return b.placeData(seg, p)
	}
	return fieldForm, b.otherWords(p)
}

func (b *built) placeMissing(p checks.Problem) (string, string) {
	if p.Pointer == "/missing_data/method" {
		return fieldMissing, p.Detail
	}
	return fieldForm, b.otherWords(p)
}

// placeGraph: an edge's problem is shown with its line of the arrows box.
func (b *built) placeGraph(seg []string, p checks.Problem) (string, string) {
	if len(seg) >= 3 && seg[1] == "edges" {
		if i, err := strconv.Atoi(seg[2]); err == nil && i < len(b.edgeLines) {
			return fieldArrows, fmt.Sprintf("line %d: %s", b.edgeLines[i], p.Detail)
		}
	}
	if len(seg) == 1 || seg[1] == "edges" {
		return fieldArrows, p.Detail
	}
	return fieldForm, b.otherWords(p)
}

// claimPointerFields are the form fields of a claim's JSON fields.
var claimPointerFields = map[string]string{"id": "id", "text": "text", "kind": "kind", "from": "from", "to": "to",
	"estimate": "estimate", "ci": "ci_low", "p_value": "p", "p_relation": "p", "headline": "headline"}

func (b *built) placeClaim(seg []string, p checks.Problem) (string, string) {
	if len(seg) < 2 {
		return fieldClaims, p.Detail
	}
	i, err := strconv.Atoi(seg[1])
	if err != nil || i >= len(b.claimRows) {
		return fieldClaims, p.Detail
	}
	n := b.claimRows[i]
	if len(seg) < 3 {
		return fmt.Sprintf("c%d", n), p.Detail
	}
	f, ok := claimPointerFields[seg[2]]
	switch {
	case !ok:
		return fmt.Sprintf("c%d", n), b.otherWords(p)
	case seg[2] == "ci" && len(seg) > 3 && seg[3] == "1":
		f = "ci_high"
	}
	return claimField(n, f), p.Detail
}

// placeData: the variables and the data came from the table, the n field
// or the raw rows.
func (b *built) placeData(seg []string, p checks.Problem) (string, string) {
	switch {
	case p.Pointer == "/data/n" && b.tb != nil && (b.nFromField || b.tb.N == 0):
		return fieldN, p.Detail
	case b.rows != nil:
		return fieldRows, pointerWords(p)
	}
	return fieldTable, pointerWords(p)
}

// pointerWords is a problem with its place in the package.
func pointerWords(p checks.Problem) string {
	return fmt.Sprintf("%s (at %s in the package)", p.Detail, p.Pointer)
}

// otherWords is a problem in a part the form has no field for, which
// only an earlier version can have given.
func (b *built) otherWords(p checks.Problem) string {
	switch {
	case p.Pointer == "":
		return p.Detail
	case b.earlier:
		return fmt.Sprintf("%s (at %s in the package, carried over from the earlier version)", p.Detail, p.Pointer)
	}
	return pointerWords(p)
}

// subjects are what a predicate of the loader ("is required", "must be at
// most 1") is said of, by field; a claim row's fields by their suffix.
var subjects = map[string]string{fieldTitle: "The title", fieldMS: "The manuscript ID", fieldDesign: "The design",
	fieldMissing: "The missing-data method", fieldArrows: "The graph", fieldClaims: "The package", fieldN: "n",
	"id": "The ID", "text": "The claim's text", "kind": "The kind", "from": "From", "to": "To",
	"estimate": "The estimate", "ci_low": "The interval", "ci_high": "The interval", "p": "The p-value",
	"headline": "Headline"}

var (
	predicateRE = regexp.MustCompile(`^(is|must|has|repeats|names) `)
	edgeRefRE   = regexp.MustCompile(`/graph/edges/(\d+)`)
	claimRefRE  = regexp.MustCompile(`/claims/(\d+)`)
)

// reword says a loader's problem in the form's words: its subject before
// a bare predicate, and the arrows and claims it refers to by their line
// and row rather than their JSON pointers.
func (b *built) reword(field, msg string) string {
	msg = b.unpoint(msg)
	subject := subjects[field]
	if _, sub, ok := strings.Cut(field, "-"); ok && strings.HasPrefix(field, "c") {
		subject = subjects[sub]
	}
	if loc, rest, ok := strings.Cut(msg, ": "); ok && strings.HasPrefix(loc, "line ") {
		if subject != "" && predicateRE.MatchString(rest) {
			return loc + ": the arrow " + rest
		}
		return msg
	}
	if subject != "" && predicateRE.MatchString(msg) {
		return subject + " " + msg
	}
	return msg
}

// unpoint names the edges and claims a message points to by the line and
// row of the form they came from.
func (b *built) unpoint(msg string) string {
	msg = edgeRefRE.ReplaceAllStringFunc(msg, func(ref string) string {
		if i, err := strconv.Atoi(ref[len("/graph/edges/"):]); err == nil && i < len(b.edgeLines) {
			return fmt.Sprintf("the arrow on line %d", b.edgeLines[i])
		}
		return ref
	})
	return claimRefRE.ReplaceAllStringFunc(msg, func(ref string) string {
		if i, err := strconv.Atoi(ref[len("/claims/"):]); err == nil && i < len(b.claimRows) {
			return fmt.Sprintf("claim %d", b.claimRows[i])
		}
		return ref
	})
}
