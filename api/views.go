package api

import (
	"io"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// writeHTML is the HTML view of a report: the offline submission page.
func writeHTML(w io.Writer, rep *checks.Report) error {
	return render.WritePage(w, rep, render.PageOptions{})
}
