package render

import (
	"embed"
	"fmt"
	"html/template"
	"io"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

//go:embed page.html workspace.html review.html
var pageFiles embed.FS

//go:embed style.css
var styleCSS string

var pageTmpl = template.Must(template.New("page").Funcs(template.FuncMap{
	"css": CSS, "sub0": func(i int) int { return -i }, "words": Words, "head": head,
	"list": func(s ...string) []string { return s }, "plural": plural, "upper": upperFirst,
	"screening": screening, "rankingHint": func() string { return rankingHint },
}).ParseFS(pageFiles, "*.html"))

// PageOptions are the parts of the workspace around a report; all are
// empty for the offline page.
type PageOptions struct {
	Nav     template.HTML // navigation, at the top
	Actions template.HTML // forms acting on the submission
	History template.HTML // the report history section
	// Since compares a newer version with the previous one, near the top;
	// Review is the reviewer's decisions on the findings, after the
	// questions; Letter, when set, is the letter under those decisions,
	// whose points the questions show (else every fail and warn finding).
	Since, Review template.HTML
	Letter        *review.Letter
}

// pageView is what the page template reads.
type pageView struct {
	R         *checks.Report
	Opts      PageOptions
	Generated string
	Design    string
	Band      string
	Questions []ItemView
	Claims    []ClaimRow
	Graph     *GraphView
	Nearby    []NearbyRow
	Charts    []chartView
	Concern   Concern
	Checks    []checkView
}

type chartView struct {
	ID, Arrow, Kind string
	SVG             template.HTML
}

type checkView struct {
	checks.CheckResult
	Verdict  string
	Findings []findingView
}

// findingView is a finding with the group it is shown in (fail, warn or
// info) and the word it is led by.
type findingView struct {
	checks.Finding
	Group, Lead string
	Question    int // the question for the authors made from it, or 0
}

// findingLead is the word before a finding on the page.
var findingLead = map[string]string{checks.StatusFail: "failure", checks.StatusWarn: "warning",
	checks.SeverityInfo: "note"}

// WritePage writes the submission page of a report: the level of concern
// in words with the ledger of what was taken off and the caution first,
// the questions for the authors, the claims table, the drawn graph, the
// stability charts and the checks in detail; one self-contained HTML document (inline CSS and SVG, no
// script).
func WritePage(w io.Writer, r *checks.Report, o PageOptions) error {
	v, err := newPageView(r, o)
	if err != nil {
		return err
	}
	return pageTmpl.ExecuteTemplate(w, "report", v)
}

func newPageView(r *checks.Report, o PageOptions) (*pageView, error) {
	g, err := graphView(r)
	if err != nil {
		return nil, fmt.Errorf("render: drawing the graph: %w", err)
	}
	v := &pageView{R: r, Opts: o, Generated: r.GeneratedAt.UTC().Format("2 January 2006, 15:04 UTC"),
		Design: Words(r.Design), Band: bandWords(r.Band), Questions: pageQuestions(r, o), Claims: claimRows(r),
		Graph: g, Nearby: nearbyRows(r.Graph), Concern: concernOf(r)}
	for _, c := range r.Claims {
		v.Charts = append(v.Charts, chartView{ID: c.ID, Arrow: c.From + " → " + c.To, Kind: Words(c.Kind),
			SVG: StabilityChart(c, r.SignificanceLevel, r.Graph)})
	}
	v.Checks = checkViews(r.Checks, v.Questions)
	return v, nil
}

// checkViews are the checks worst first, each finding with its group and
// lead word and the number of the question made from it.
func checkViews(cs []checks.CheckResult, qs []ItemView) []checkView {
	asked := map[string]int{}
	for _, q := range qs {
		for _, k := range q.Keys {
			asked[k] = q.N
		}
	}
	var out []checkView
	for _, c := range ByConcern(cs) {
		c.Summary, c.RunError = Prose(c.Summary), Prose(c.RunError)
		cv := checkView{CheckResult: c, Verdict: verdict(c.Status)}
		for _, f := range c.Findings {
			f.Message = Prose(f.Message)
			cv.Findings = append(cv.Findings, findingView{Finding: f, Group: findingGroup(f.Severity),
				Lead: findingLead[findingGroup(f.Severity)], Question: asked[f.Key]})
		}
		out = append(out, cv)
	}
	return out
}

// pageQuestions are the letter's points: the reviewer's letter, else the
// default one.
func pageQuestions(r *checks.Report, o PageOptions) []ItemView {
	if o.Letter != nil {
		return ItemViews(o.Letter.Items)
	}
	return Questions(r)
}

// shellView is a page of the workspace in the project's frame.
type shellView struct {
	Title string
	Nav   template.HTML
	Body  template.HTML
}

// WriteShell writes a workspace page: the document frame with the shared
// stylesheet around body.
func WriteShell(w io.Writer, title string, nav, body template.HTML) error {
	return pageTmpl.ExecuteTemplate(w, "shell", shellView{Title: title, Nav: nav, Body: body})
}

// CSS is the stylesheet every page carries inline.
func CSS() template.CSS { return template.CSS(styleCSS) }

// headData is what the document head shows.
type headData struct {
	Title   string
	Refresh bool
}

func head(title string, refresh bool) headData { return headData{title, refresh} }
