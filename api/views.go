package api

import (
	_ "embed"
	"html/template"
	"io"

	"github.com/pathvet/pathvet/checks"
)

//go:embed report.html
var reportHTML string

// reportPage is the HTML view of a report, drawn from the report alone,
// worst checks first as in the text view.
var reportPage = template.Must(template.New("report").Parse(reportHTML))

func writeHTML(w io.Writer, rep *checks.Report) error {
	view := *rep
	view.Checks = checks.ByConcern(rep.Checks)
	return reportPage.Execute(w, &view)
}
