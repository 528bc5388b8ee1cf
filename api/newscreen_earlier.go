package api

import (
	"encoding/json"
	"fmt"
	"strconv"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// earlierVersion is the submission a "new version" form starts from.
type earlierVersion struct {
	sub *service.Submission
	pkg *checks.Package // its data.csv cleared
	// rows are its raw rows (the data part, or the CSV inline in the
	// package); nil for summary statistics.
	rows []byte
}

// earlier reads a submission the session may see, with its package.
func (s *Server) earlier(c echo.Context, id string) (*earlierVersion, error) {
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	sub, err := s.cfg.Store.Submission(ctx, id, sc)
	if err != nil {
		return nil, err
	}
	doc, data, err := s.cfg.Web.SubmissionPackage(ctx, id, sc)
	if err != nil {
		return nil, err
	}
	var p checks.Package
	if err := json.Unmarshal(doc, &p); err != nil {
		return nil, fmt.Errorf("api: a stored package does not decode: %w", err)
	}
	e := &earlierVersion{sub: sub, pkg: &p, rows: data}
	if e.rows == nil && p.Data.Kind == checks.DataRows && p.Data.CSV != "" {
		e.rows = []byte(p.Data.CSV)
	}
	p.Data.CSV = ""
	return e, nil
}

func (e *earlierVersion) view() *render.EarlierVersion {
	return &render.EarlierVersion{ID: e.sub.ID, Title: e.sub.Title, ManuscriptID: e.sub.ManuscriptID,
		Received: e.sub.CreatedAt.UTC().Format(timeFormat)}
}

// formFromPackage fills the form from an earlier version: the summary
// statistics printed as a table the reader reads back, the arrows by
// name, and a claim row for each claim.
func formFromPackage(e *earlierVersion) *screenForm {
	p := e.pkg
	f := &screenForm{Key: newFormKey(), From: e.sub.ID, Title: p.Title, ManuscriptID: p.ManuscriptID,
		Design: p.Design}
	if p.MissingData != nil {
		f.MissingMethod = p.MissingData.Method
	}
	if p.Data.Kind == checks.DataSummary {
		f.Table = printedTable(p)
	}
	if p.Graph != nil {
		var lines []string
		for _, ed := range p.Graph.Edges {
			lines = append(lines, ed.From+" -> "+ed.To)
		}
		f.Arrows = strings.Join(lines, "\n")
	}
	for _, c := range p.Claims {
		f.Claims = append(f.Claims, claimRowOf(c))
	}
	if len(f.Claims) == 0 {
		f.Claims = []claimRow{{Kind: checks.KindDirect}}
	}
	return f
}

func claimRowOf(c checks.Claim) claimRow {
	r := claimRow{ID: c.ID, Text: c.Text, Kind: c.Kind, From: c.From, To: c.To, Estimate: numText(c.Estimate),
		Headline: c.Headline}
	if len(c.CI) == 2 {
		r.CILow, r.CIHigh = numText(&c.CI[0]), numText(&c.CI[1])
	}
	if c.PValue != nil {
		r.P = numText(c.PValue)
		if c.PRelation == "<" || c.PRelation == ">" {
			r.P = c.PRelation + " " + r.P
		}
	}
	return r
}

// numText writes a figure exactly, without an exponent; "" for none.
func numText(x *float64) string {
	if x == nil {
		return ""
	}
	return strconv.FormatFloat(*x, 'f', -1, 64)
}

// printedTable prints summary statistics as a Table 1 that the table
// reader reads back to the same figures: tab-separated, a header, one
// numbered row per variable labelled with its name, M and SD where the
// package has them, the lower triangle with the reliability (or a dash)
// on the diagonal, and N in a note.
func printedTable(p *checks.Package) string {
	d := p.Data
	rel := map[string]*float64{}
	for _, v := range p.Variables {
		rel[v.Name] = v.Reliability
	}
	var b strings.Builder
	b.WriteString("Variable")
	if d.Means != nil {
		b.WriteString("\tM")
	}
	if d.SDs != nil {
		b.WriteString("\tSD")
	}
	for j := range d.Variables {
		fmt.Fprintf(&b, "\t%d", j+1)
	}
	b.WriteString("\n")
	for i := range d.Variables {
		printedRow(&b, d, i, rel[d.Variables[i]])
	}
	fmt.Fprintf(&b, "\nN = %d\n", d.N)
	return b.String()
}

// printedRow prints variable i's row: its number and name, M and SD, its
// correlations with the variables before it, and its diagonal.
func printedRow(b *strings.Builder, d checks.Data, i int, rel *float64) {
	fmt.Fprintf(b, "%d. %s", i+1, d.Variables[i])
	if d.Means != nil {
		b.WriteString("\t" + numText(&d.Means[i]))
	}
	if d.SDs != nil {
		b.WriteString("\t" + numText(&d.SDs[i]))
	}
	for j := 0; j < i; j++ {
		b.WriteString("\t" + numText(&d.Correlations[i][j]))
	}
	if rel != nil {
		b.WriteString("\t(" + numText(rel) + ")\n")
		return
	}
	b.WriteString("\t—\n")
}
