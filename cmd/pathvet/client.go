package main

import (
	"bytes"
	"context"
	"encoding/json"
	"fmt"
	"io"
	"mime/multipart"
	"net/http"
	"net/url"
	"os"
	"path/filepath"
	"strings"
	"time"
)

// client talks to a pathvet server with a token.
type client struct {
	base  string
	token string
	http  *http.Client
}

func newClient(server, token string) (*client, error) {
	u, err := url.Parse(server)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Host == "" {
		return nil, fmt.Errorf("--server must be an http(s) URL such as http://127.0.0.1:8080")
	}
	if token == "" {
		return nil, fmt.Errorf("set PATHVET_TOKEN to an API key (pathvet keys create)")
	}
	return &client{
		base:  strings.TrimRight(server, "/"),
		token: token,
		http:  &http.Client{Timeout: 5 * time.Minute},
	}, nil
}

// apiError is a problem details answer.
type apiError struct {
	Status int
	Title  string `json:"title"`
	Detail string `json:"detail"`
	Errors []struct {
		Pointer string `json:"pointer"`
		Line    int    `json:"line"`
		Column  int    `json:"column"`
		Detail  string `json:"detail"`
	} `json:"errors"`
}

func (e *apiError) Error() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d %s: %s", e.Status, e.Title, e.Detail)
	for _, p := range e.Errors {
		switch {
		case p.Line > 0 && p.Column > 0:
			fmt.Fprintf(&b, "\ndata line %d, column %d: %s", p.Line, p.Column, p.Detail)
		case p.Line > 0:
			fmt.Fprintf(&b, "\ndata line %d: %s", p.Line, p.Detail)
		default:
			fmt.Fprintf(&b, "\n%s: %s", map[bool]string{true: "package", false: p.Pointer}[p.Pointer == ""], p.Detail)
		}
	}
	return b.String()
}

func (c *client) do(
	ctx context.Context,
	method, path, contentType string,
	body io.Reader,
	headers map[string]string,
) ([]byte, int, error) {
	req, err := http.NewRequestWithContext(ctx, method, c.base+path, body)
	if err != nil {
		return nil, 0, err
	}
	req.Header.Set("Authorization", "Bearer "+c.token)
	if contentType != "" {
		req.Header.Set("Content-Type", contentType)
	}
	for k, v := range headers {
		req.Header.Set(k, v)
	}
	resp, err := c.http.Do(req)
	if err != nil {
		return nil, 0, err
	}
	defer resp.Body.Close()
	b, err := io.ReadAll(resp.Body)
	if err != nil {
		return nil, resp.StatusCode, err
	}
	if resp.StatusCode >= 400 {
		e := &apiError{Status: resp.StatusCode, Title: http.StatusText(resp.StatusCode)}
		_ = json.Unmarshal(b, e)
		return nil, resp.StatusCode, e
	}
	return b, resp.StatusCode, nil
}

// submission is the part of a submission the CLI reads.
type submission struct {
	ID     string  `json:"id"`
	Status string  `json:"status"`
	Score  *int    `json:"score"`
	Band   *string `json:"band"`
	Error  string  `json:"error"`
}

// anySize bounds no file the client sends: the server, whose limits the
// client does not know, refuses what is too large.
const anySize = 1 << 50

// packageBody returns the request body for a package file: JSON as it is,
// or multipart with the data file beside it when data.file names one.
func packageBody(path string) (contentType string, body []byte, err error) {
	doc, err := os.ReadFile(path)
	if err != nil {
		return "", nil, err
	}
	var head struct {
		Data struct{ Kind, File string } `json:"data"`
	}
	if json.Unmarshal(doc, &head) != nil || head.Data.File == "" {
		return "application/json", doc, nil
	}
	csv, err := readBeside(filepath.Dir(path), head.Data.File, anySize)
	if err != nil {
		return "", nil, fmt.Errorf("data.file: %w", err)
	}
	var buf bytes.Buffer
	mw := multipart.NewWriter(&buf)
	for _, part := range []struct {
		name, file string
		b          []byte
	}{{"package", filepath.Base(path), doc}, {"data", filepath.Base(head.Data.File), csv}} {
		w, err := mw.CreateFormFile(part.name, part.file)
		if err != nil {
			return "", nil, err
		}
		if _, err := w.Write(part.b); err != nil {
			return "", nil, err
		}
	}
	if err := mw.Close(); err != nil {
		return "", nil, err
	}
	return mw.FormDataContentType(), buf.Bytes(), nil
}

const submitUsage = `Usage: pathvet submit [--server URL] [--wait] [--format text|json] [--idempotency-key K] PACKAGE.json

Sends a package (and the CSV file its data.file names) for screening and
prints the submission's id and status, or with --wait its report.
The API key comes from PATHVET_TOKEN.`

const reportUsage = `Usage: pathvet report [--server URL] [--format text|json] [--letter] ID

Prints the newest report of a submission, or with --letter the letter for
the authors as Markdown: the points the office asks, under the reviewers'
decisions (an editor key's; a submitter key is refused). The API key comes
from PATHVET_TOKEN.`

// runSubmit is `pathvet submit --server URL PACKAGE.json [--wait]`.
func runSubmit(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newCommand("submit", submitUsage, stdout, stderr)
	server := serverFlag(fs)
	wait := fs.Bool("wait", false, "wait for the report and print it")
	idem := fs.String("idempotency-key", "", "send this Idempotency-Key, so that a retry cannot submit twice")
	format := fs.String("format", "text", "with --wait: the report as text or json")
	c, pos, code := clientArgs(fs, args, server)
	if c == nil {
		return code
	}
	ct, body, err := packageBody(pos[0])
	if err != nil {
		fmt.Fprintln(stderr, "pathvet submit:", err)
		return exitInvalid
	}
	b, _, err := c.do(
		ctx,
		http.MethodPost,
		"/v1/submissions",
		ct,
		bytes.NewReader(body),
		map[string]string{"Idempotency-Key": *idem},
	)
	if err != nil {
		return clientFailure(stderr, "submit", err)
	}
	var sub submission
	if err := json.Unmarshal(b, &sub); err != nil {
		fmt.Fprintln(stderr, "pathvet submit: unexpected answer:", err)
		return exitInternal
	}
	if !*wait {
		fmt.Fprintf(stdout, "%s %s\n", sub.ID, sub.Status)
		return exitOK
	}
	fmt.Fprintf(stderr, "submitted %s; waiting for the report\n", sub.ID)
	for sub.Status != "done" && sub.Status != "failed" {
		if b, _, err = c.do(ctx, http.MethodGet, "/v1/submissions/"+sub.ID+"?wait=30s", "", nil, nil); err != nil {
			return clientFailure(stderr, "submit", err)
		}
		if err := json.Unmarshal(b, &sub); err != nil {
			fmt.Fprintln(stderr, "pathvet submit: unexpected answer:", err)
			return exitInternal
		}
	}
	if sub.Status == "failed" {
		fmt.Fprintf(stderr, "pathvet submit: screening %s failed: %s\n", sub.ID, sub.Error)
		return exitInternal
	}
	return printReport(ctx, c, sub.ID, *format, stdout, stderr)
}

func clientFailure(stderr io.Writer, cmd string, err error) int {
	fmt.Fprintf(stderr, "pathvet %s: %v\n", cmd, err)
	if e, ok := err.(*apiError); ok &&
		(e.Status == http.StatusUnprocessableEntity || e.Status == http.StatusRequestEntityTooLarge) {
		return exitInvalid
	}
	return exitInternal
}

func printReport(ctx context.Context, c *client, id, format string, stdout, stderr io.Writer) int {
	if format != "text" && format != "json" {
		fmt.Fprintf(stderr, "pathvet report: --format is text or json, not %q\n", format)
		return exitInvalid
	}
	b, _, err := c.do(ctx, http.MethodGet, "/v1/submissions/"+url.PathEscape(id)+"/report?format="+format, "", nil, nil)
	if err != nil {
		return clientFailure(stderr, "report", err)
	}
	_, _ = stdout.Write(b)
	if format == "json" && !bytes.HasSuffix(b, []byte("\n")) {
		fmt.Fprintln(stdout)
	}
	return exitOK
}

// runReport is `pathvet report --server URL ID [--format json|text]`.
func runReport(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newCommand("report", reportUsage, stdout, stderr)
	server := serverFlag(fs)
	format := fs.String("format", "text", "text or json")
	letter := fs.Bool("letter", false, "print the letter for the authors as Markdown instead (an editor key)")
	c, pos, code := clientArgs(fs, args, server)
	if c == nil {
		return code
	}
	if *letter {
		return printLetter(ctx, c, pos[0], stdout, stderr)
	}
	return printReport(ctx, c, pos[0], *format, stdout, stderr)
}

func serverFlag(fs *command) *string {
	return fs.String("server", "http://127.0.0.1:8080", "the pathvet server")
}

// clientArgs parses a client command's flags and its one positional
// argument and makes the client; on failure c is nil and code the exit
// status.
func clientArgs(fs *command, args []string, server *string) (c *client, pos []string, code int) {
	pos, code, ok := fs.parse(args)
	switch {
	case !ok:
		return nil, nil, code
	case len(pos) != 1:
		return nil, nil, fs.misuse("give exactly one argument")
	}
	c, err := newClient(*server, getenv("PATHVET_TOKEN"))
	if err != nil {
		return nil, nil, fs.fail(exitInvalid, err)
	}
	return c, pos, 0
}
