package main

import (
	"context"
	"fmt"
	"io"
	"net/http"
	"net/url"
)

// printLetter is `pathvet report --letter ID`: the letter for the authors
// under the decisions in force, as the server writes it (GET
// /v1/submissions/{id}/letter.md, an editor key's).
func printLetter(ctx context.Context, c *client, id string, stdout, stderr io.Writer) int {
	b, _, err := c.do(ctx, http.MethodGet, "/v1/submissions/"+url.PathEscape(id)+"/letter.md", "", nil, nil)
	if err != nil {
		return clientFailure(stderr, "report", err)
	}
	if _, err := stdout.Write(b); err != nil {
		fmt.Fprintln(stderr, "pathvet report:", err)
		return exitInternal
	}
	return exitOK
}
