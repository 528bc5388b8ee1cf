package api

import (
	"bytes"
	"encoding/json"
	"fmt"
	"net/http"
	"strconv"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// previewView is what Preview shows: the variables read, what the reader
// guessed, what was carried over, and the package as JSON.
func (b *built) previewView() *render.ScreenPreview {
	p := &render.ScreenPreview{Carried: b.carried, Problems: len(b.errs.list)}
	switch {
	case b.tb != nil:
		p.Variables, p.Guesses = b.tableVariables(), b.tableGuesses()
	case b.rows != nil:
		p.FromRows, p.Variables, p.Guesses = true, b.rowVariables(), b.rowGuesses()
	}
	if b.pkg.Variables != nil {
		p.JSON = packageJSON(b.pkg)
	}
	return p
}

// tableVariables are the variables with the figures the table printed.
func (b *built) tableVariables() []render.PreviewVariable {
	d := b.pkg.Data
	at := map[string]int{}
	for i, n := range d.Variables {
		at[n] = i
	}
	out := make([]render.PreviewVariable, len(b.pkg.Variables))
	for k, v := range b.pkg.Variables {
		i := at[v.Name]
		out[k] = render.PreviewVariable{Name: v.Name, Label: v.Label, Mean: "not printed", SD: "not printed",
			Reliability: "none printed"}
		if d.Means != nil {
			out[k].Mean = render.Num(d.Means[i], decimals(d.Means[i]))
		}
		if d.SDs != nil {
			out[k].SD = render.Num(d.SDs[i], decimals(d.SDs[i]))
		}
		if v.Reliability != nil {
			out[k].Reliability = render.Num(*v.Reliability, decimals(*v.Reliability))
		}
	}
	return out
}

// decimals is how many decimals x needs to be shown exactly (at most 6).
func decimals(x float64) int {
	s := strconv.FormatFloat(x, 'f', -1, 64)
	for i := range s {
		if s[i] == '.' {
			return min(len(s)-i-1, 6)
		}
	}
	return 0
}

// tableGuesses are what the reader took for granted, and where n came
// from when the form gave it.
func (b *built) tableGuesses() []string {
	g := append([]string(nil), b.tb.Guesses...)
	if m := b.tb.MarkCounts(); m != "" {
		g = append(g, "significance marks stripped from the figures: "+m)
	}
	if b.nFromField {
		g = append(g, fmt.Sprintf("n = %d, from the n field (the table's note gives none)", b.pkg.Data.N))
	}
	return append(g, "every scale is set to continuous: a printed table does not show a variable's scale")
}

// earlierScale says why a variable's scale is not the one its column
// suggests.
const earlierScale = "as the earlier version declares it; the rows alone suggest %s (%s)"

// rowVariables are the declared variables with the scale guessed from
// their column and its missing cells.
func (b *built) rowVariables() []render.PreviewVariable {
	cols := map[string]int{}
	for i, c := range b.rows.Columns {
		cols[c.Name] = i
	}
	var out []render.PreviewVariable
	for _, v := range b.pkg.Variables {
		pv := render.PreviewVariable{Name: v.Name, Scale: v.Scale, Why: "no such column in the rows"}
		if i, ok := cols[v.Name]; ok {
			c := b.rows.Columns[i]
			pv.Why, pv.Missing = c.Why, c.Missing
			if c.Scale != v.Scale && c.Scale != "" {
				pv.Why = fmt.Sprintf(earlierScale, c.Scale, c.Why)
			}
		}
		out = append(out, pv)
	}
	return out
}

// rowGuesses are init --data's notes: the columns skipped and why, the
// missing marks and codes, the values to look at.
func (b *built) rowGuesses() []string {
	g := []string{fmt.Sprintf("%s, %s", plural(b.rows.N, "row", "rows"),
		plural(len(b.rows.Columns), "column", "columns"))}
	for _, c := range b.rows.Columns {
		if c.Skip != "" {
			g = append(g, fmt.Sprintf("%s: skipped (listed in ignore_columns): %s", c.Name, c.Skip))
		}
		g = append(g, c.Notes()...)
	}
	if b.rows.Missing > 0 && b.pkg.MissingData == nil {
		g = append(g, fmt.Sprintf("the rows have %s: say how the paper handled missing values",
			plural(b.rows.Missing, "missing cell", "missing cells")))
	}
	return g
}

// packageJSON is the package indented, as the download gives it.
func packageJSON(p *checks.Package) string {
	var out bytes.Buffer
	enc := json.NewEncoder(&out)
	enc.SetEscapeHTML(false)
	enc.SetIndent("", "  ")
	if err := enc.Encode(p); err != nil {
		return err.Error()
	}
	return out.String()
}

// webPackage is GET /submissions/{id}/package.json: the package as it was
// sent, with raw rows sent beside it put inline (data.csv), so that the
// download is one document that pathvet check reads and that hashes as
// the submission does.
func (s *Server) webPackage(c echo.Context) error {
	doc, data, err := s.cfg.Web.SubmissionPackage(c.Request().Context(), c.Param("id"), keyOf(c).Scope())
	if err != nil {
		return err
	}
	if data != nil {
		var p checks.Package
		if err := json.Unmarshal(doc, &p); err != nil {
			return fmt.Errorf("api: a stored package does not decode: %w", err)
		}
		p.Data.CSV = string(data)
		doc = []byte(packageJSON(&p))
	}
	h := c.Response().Header()
	h.Set("Content-Disposition", fmt.Sprintf(`attachment; filename="package-%s.json"`, c.Param("id")))
	h.Set("Cache-Control", "no-store")
	return c.Blob(http.StatusOK, echo.MIMEApplicationJSON, doc)
}
