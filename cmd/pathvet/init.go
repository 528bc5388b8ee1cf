package main

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strings"

	"github.com/pathvet/pathvet/checks/load"
)

const initUsage = `Usage: pathvet init (--data ROWS.csv | --summary TABLE.txt) [--out PACKAGE.json] [--force]

Writes a starting package from a data file: every column a variable with its
scale guessed from the data, likely missing codes found, an empty graph and
claims section, and placeholders ("TODO: ...") for what only the authors know.
Beside it, PACKAGE.notes.txt says what was guessed, gives an example edge and
claim, and names the command to run next; "pathvet check PACKAGE.json" then
lists every placeholder still to fill in.

--summary reads a paper's printed table of correlations (its Table 1) as
text copied from a PDF, a word processor or a spreadsheet: cells set apart
by spaces, tabs, commas or semicolons; numbered rows with their labels; M
and SD columns in either order, or "M (SD)" in one cell; the lower or upper
triangle or the full matrix, its diagonal a dash, 1, empty or reliabilities
in parentheses ("(.84)", written to the variables); marks such as
* and † after the figures; "N = 812" in a note. A bare header of names over
the matrix is read too. The labels become the variables' names (and stay
as their labels); n, means and SDs are written when the table prints them;
the notes list what the reader guessed, to check against the paper.

Flags:
`

// runInit is `pathvet init`.
func runInit(args []string, stdout, stderr io.Writer) int {
	fs := flag.NewFlagSet("init", flag.ContinueOnError)
	fs.SetOutput(stderr)
	data := fs.String("data", "", "raw rows: a CSV with a header naming the columns")
	summary := fs.String("summary", "", "a printed table of correlations (and means, SDs, n) as text")
	out := fs.String("out", "package.json", "the package to write")
	force := fs.Bool("force", false, "overwrite an existing package and notes")
	fs.Usage = func() {
		fs.SetOutput(stdout)
		fmt.Fprint(stdout, initUsage)
		fs.PrintDefaults()
	}
	switch err := fs.Parse(args); {
	case errors.Is(err, flag.ErrHelp):
		return exitOK
	case err != nil:
		return exitInvalid
	case fs.NArg() > 0 || (*data == "") == (*summary == ""):
		fmt.Fprintln(stderr, "pathvet init: give exactly one of --data or --summary, and no other arguments")
		return exitInvalid
	}
	st, err := starter(*data, *summary, *out)
	if err == nil {
		err = st.write(*out, *force)
	}
	if err != nil {
		fmt.Fprintln(stderr, "pathvet init:", err)
		return exitInvalid
	}
	fmt.Fprint(stdout, st.notes.String())
	return exitOK
}

// start is a starting package and its notes.
type start struct {
	pkg   *obj
	names []string // the variables' names, for the examples
	notes strings.Builder
}

// starter builds the starting package from rows or a summary table.
func starter(data, summary, out string) (*start, error) {
	path := data + summary
	text, err := os.ReadFile(path)
	if err != nil {
		return nil, err
	}
	st := &start{pkg: newObj(
		"format_version", 1,
		"title", load.Placeholder+" the study's working title",
		"design", load.Placeholder+" observational, randomized or quasi_experimental",
		"variables", []any{},
		"graph", newObj("edges", []any{}),
		"claims", []any{},
	)}
	fmt.Fprintf(&st.notes, "pathvet init wrote %s from %s.\n\n", out, path)
	if data != "" {
		rel, err := relativeTo(out, data)
		if err != nil {
			return nil, err
		}
		return st, st.fromRows(text, rel)
	}
	return st, st.fromSummary(text)
}

// relativeTo is the path of file as seen from the package's folder.
func relativeTo(pkg, file string) (string, error) {
	dir, err := filepath.Abs(filepath.Dir(pkg))
	if err != nil {
		return "", err
	}
	abs, err := filepath.Abs(file)
	if err != nil {
		return "", err
	}
	rel, err := filepath.Rel(dir, abs)
	return filepath.ToSlash(rel), err
}

// write writes the package and its notes, refusing to overwrite unless
// forced.
func (st *start) write(out string, force bool) error {
	notes := strings.TrimSuffix(out, filepath.Ext(out)) + ".notes.txt"
	st.finish(out, notes)
	var b bytes.Buffer
	enc := json.NewEncoder(&b)
	enc.SetIndent("", "  ")
	enc.SetEscapeHTML(false)
	if err := enc.Encode(st.pkg); err != nil {
		return err
	}
	flags := os.O_WRONLY | os.O_CREATE | os.O_TRUNC
	if !force {
		flags |= os.O_EXCL
	}
	for _, f := range []struct {
		path string
		data []byte
	}{{out, b.Bytes()}, {notes, []byte(st.notes.String())}} {
		if err := writeFile(f.path, f.data, flags); err != nil {
			return fmt.Errorf("%w (use --force to overwrite)", err)
		}
	}
	return nil
}

func writeFile(path string, data []byte, flags int) error {
	f, err := os.OpenFile(path, flags, 0o644)
	if err != nil {
		return err
	}
	if _, err := f.Write(data); err != nil {
		f.Close()
		return err
	}
	return f.Close()
}

// finish adds the examples, what is left to fill in, and the next
// command to the notes.
func (st *start) finish(out, notes string) {
	a, b := "x", "y"
	if len(st.names) >= 2 {
		a, b = st.names[0], st.names[1]
	}
	fmt.Fprintf(&st.notes, `
Still to fill in: every "TODO:" placeholder, the claims and the graph's edges.
JSON has no comments, so the examples stand here. An edge for graph.edges:

  {"from": %q, "to": %q}

A claim for claims (its figures as the paper prints them; leave out any the
paper does not give):

  {"id": "C1", "text": "TODO: the claim in the paper's words",
   "kind": "direct_effect", "from": %q, "to": %q,
   "estimate": "TODO: the estimate", "std_error": "TODO: its standard error",
   "p_value": "TODO: the p-value", "headline": true}

A mediation claim ("x affects y through m") is "kind": "indirect_effect"
with "through": ["m"] (a list of mediators; [] for the total indirect
effect), and needs a directed path from x through m to y in graph.edges.
Waves, or before and after an exposure, go in graph.tiers, earliest
first, for instance [[%q], [%q]]: nothing in a later tier may point into
an earlier one.

The format: checks/schema/package-format.md in the pathvet repository.
These notes are in %s.

Next: pathvet check %s
`, a, b, a, b, a, b, notes, out)
}
