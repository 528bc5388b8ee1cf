package main

import (
	"context"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"net/url"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// printLetter is `pathvet report --letter ID`: the newest report's
// questions for the authors as Markdown, the same as the web page's
// letter.md.
func printLetter(ctx context.Context, c *client, id string, stdout, stderr io.Writer) int {
	b, _, err := c.do(ctx, http.MethodGet, "/v1/submissions/"+url.PathEscape(id)+"/report", "", nil, nil)
	if err != nil {
		return clientFailure(stderr, "report", err)
	}
	var rep checks.Report
	if err := json.Unmarshal(b, &rep); err != nil {
		fmt.Fprintln(stderr, "pathvet report: the server's report does not decode:", err)
		return exitInternal
	}
	if err := render.WriteLetter(stdout, render.DefaultLetter(&rep)); err != nil {
		fmt.Fprintln(stderr, "pathvet report:", err)
		return exitInternal
	}
	return exitOK
}
