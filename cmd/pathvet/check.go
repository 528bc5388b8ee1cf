package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"os"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/mediation"
	"github.com/pathvet/pathvet/checks/render"
)

func toolVersion() string { return checks.ToolVersion }

// parseInterspersed parses flags that may stand before or after the
// positional arguments, and returns the positional ones.
func parseInterspersed(fs *flag.FlagSet, args []string) ([]string, error) {
	var pos []string
	for {
		if err := fs.Parse(args); err != nil {
			return nil, err
		}
		if fs.NArg() == 0 {
			return pos, nil
		}
		pos = append(pos, fs.Arg(0))
		args = fs.Args()[1:]
	}
}

// runCheck is `pathvet check`: screen a package offline and print the
// report.
func runCheck(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newCommand("check", checkUsage, stdout, stderr)
	format := fs.String("format", "text", "report format: text, json or html (one self-contained page)")
	out := fs.String("out", "", "write the report to this file instead of standard output")
	allowOff := fs.Int("allow-points-off", 100,
		"exit with status 1 when more than this many of the 100 points are taken off (0 to 100)")
	alpha := fs.Float64("alpha", checks.DefaultAlpha, "significance level")
	resamples := fs.Int("resamples", mediation.DefaultResamples,
		"bootstrap resamples of an indirect effect with raw rows ("+resamplesRange+")")
	quiet := fs.Bool("quiet", false, "draw no progress line on standard error")
	if renamed := renamedFlag(args); renamed != "" {
		fmt.Fprintln(stderr, "pathvet check: "+renamed)
		return exitInvalid
	}
	pos, code, ok := fs.parse(args)
	switch {
	case !ok:
		return code
	case *allowOff < 0 || *allowOff > 100:
		fmt.Fprintf(stderr, "pathvet check: --allow-points-off is a number of points from 0 to 100, not %d\n",
			*allowOff)
		return exitInvalid
	case len(pos) != 1:
		fmt.Fprintln(stderr, "pathvet check: give exactly one package file")
		return exitInvalid
	case *format != "text" && *format != "json" && *format != "html":
		fmt.Fprintf(stderr, "pathvet check: --format is text, json or html, not %q\n", *format)
		return exitInvalid
	case *alpha <= 0 || *alpha >= 1:
		fmt.Fprintln(stderr, "pathvet check: --alpha must lie strictly between 0 and 1")
		return exitInvalid
	case badResamples(*resamples):
		fmt.Fprintln(stderr, "pathvet check: --resamples must be "+resamplesRange)
		return exitInvalid
	}
	opt := checks.Options{Alpha: *alpha, Resamples: *resamples}
	rep, code := screenFile(ctx, pos[0], opt, stderr, newProgressLine(stderr, *quiet))
	if rep == nil {
		return code
	}
	if err := writeReport(rep, *format, *out, stdout); err != nil {
		fmt.Fprintln(stderr, "pathvet check:", err)
		return exitInternal
	}
	if 100-rep.Score > *allowOff {
		return exitConcern
	}
	return exitOK
}

// failUnderRenamed is what check says when the old threshold option is
// given: its new name, and how to turn an old threshold into the new one.
const failUnderRenamed = "--fail-under is gone: use --allow-points-off N, which exits with status 1 " +
	"when more than N of the 100 points are taken off (--fail-under S was --allow-points-off 100−S, " +
	"for instance --fail-under 80 is --allow-points-off 20)"

// renamedFlag returns the message for an option that was renamed, or ""
// when args use none; it reads the flags before a "--".
func renamedFlag(args []string) string {
	for _, a := range args {
		if a == "--" {
			break
		}
		name, _, _ := strings.Cut(strings.TrimLeft(a, "-"), "=")
		if strings.HasPrefix(a, "-") && name == "fail-under" {
			return failUnderRenamed
		}
	}
	return ""
}

// screenFile loads the package at path and runs the pipeline on it. On
// failure it prints the problems and returns a nil report and the exit
// code.
func screenFile(
	ctx context.Context,
	path string,
	opt checks.Options,
	stderr io.Writer,
	progress *progressLine,
) (*checks.Report, int) {
	lim := load.DefaultLimits
	doc, err := readUpTo(path, lim.PackageBytes)
	if err != nil {
		fmt.Fprintln(stderr, "pathvet check:", err)
		return nil, exitInvalid
	}
	dir := filepath.Dir(path)
	study, err := load.Load(doc, load.Options{
		ReadFile: func(name string) ([]byte, error) { return readBeside(dir, name, lim.CSVBytes) },
	})
	var invalid *checks.InvalidPackageError
	if errors.As(err, &invalid) {
		for _, p := range invalid.Problems {
			fmt.Fprintf(stderr, "%s: %s\n", path, p)
		}
		return nil, exitInvalid
	}
	if err != nil {
		fmt.Fprintln(stderr, "pathvet check:", err)
		return nil, exitInternal
	}
	opt.Progress = progress.callback()
	rep, err := checks.Run(ctx, study, opt)
	progress.clear()
	if err != nil {
		fmt.Fprintln(stderr, "pathvet check:", err)
		return nil, exitInternal
	}
	return rep, exitOK
}

// The bounds of --resamples: enough resamples for the tails of a 95%
// percentile interval, and a cost that stays within a job's deadline.
const (
	minResamples   = 200
	maxResamples   = 100_000
	resamplesRange = "from 200 to 100000"
)

func badResamples(n int) bool { return n < minResamples || n > maxResamples }

// readBeside reads a data file named relative to the package's folder,
// of at most limit bytes.
func readBeside(dir, name string, limit int64) ([]byte, error) {
	if !filepath.IsAbs(name) {
		name = filepath.Join(dir, filepath.FromSlash(name))
	}
	return readUpTo(name, limit)
}

// readUpTo reads a file of at most limit bytes; a larger one is refused
// unread, with its size and the limit.
func readUpTo(name string, limit int64) ([]byte, error) {
	f, err := os.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	b, err := io.ReadAll(io.LimitReader(f, limit+1))
	if err != nil {
		return nil, err
	}
	if int64(len(b)) > limit {
		size := "more than " + strconv.FormatInt(limit, 10)
		if fi, err := f.Stat(); err == nil && fi.Mode().IsRegular() {
			size = strconv.FormatInt(fi.Size(), 10)
		}
		return nil, fmt.Errorf("%s is %s bytes; the limit is %d", name, size, limit)
	}
	return b, nil
}

func writeReport(rep *checks.Report, format, out string, stdout io.Writer) error {
	var b strings.Builder
	if format == "html" {
		if err := render.WritePage(&b, rep, render.PageOptions{}); err != nil {
			return err
		}
	} else if format == "json" {
		enc := json.NewEncoder(&b)
		enc.SetIndent("", "  ")
		enc.SetEscapeHTML(false)
		if err := enc.Encode(rep); err != nil {
			return err
		}
	} else if err := render.WriteText(&b, rep); err != nil {
		return err
	}
	if out == "" {
		_, err := io.WriteString(stdout, b.String())
		return err
	}
	return os.WriteFile(out, []byte(b.String()), 0o644)
}
