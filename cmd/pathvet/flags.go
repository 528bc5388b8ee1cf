package main

import (
	"errors"
	"flag"
	"fmt"
	"io"
	"strings"
)

// command is a subcommand's flags and its usage text. --help prints the
// usage to standard output and exits 0; a wrong command line prints it to
// standard error and exits 2.
type command struct {
	*flag.FlagSet
	usage          string
	stdout, stderr io.Writer
}

func newCommand(name, usage string, stdout, stderr io.Writer) *command {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {} // parse prints the usage where it belongs
	return &command{FlagSet: fs, usage: usage, stdout: stdout, stderr: stderr}
}

// writeUsage prints the usage text and the flags with their defaults.
func (c *command) writeUsage(w io.Writer) {
	fmt.Fprintln(w, strings.TrimRight(c.usage, "\n"))
	n := 0
	c.VisitAll(func(*flag.Flag) { n++ })
	if n == 0 {
		return
	}
	fmt.Fprintln(w, "\nFlags:")
	c.SetOutput(w)
	c.PrintDefaults()
	c.SetOutput(c.stderr)
}

// parse parses flags that may stand before or after the positional
// arguments and returns the positional ones; when ok is false the command
// ends with code.
func (c *command) parse(args []string) (pos []string, code int, ok bool) {
	pos, err := parseInterspersed(c.FlagSet, args)
	switch {
	case errors.Is(err, flag.ErrHelp):
		c.writeUsage(c.stdout)
		return nil, exitOK, false
	case err != nil:
		c.writeUsage(c.stderr)
		return nil, exitInvalid, false
	}
	return pos, 0, true
}

// misuse reports a wrong command line with the usage and returns 2.
func (c *command) misuse(format string, args ...any) int {
	fmt.Fprintf(c.stderr, "pathvet %s: %s\n\n", c.Name(), fmt.Sprintf(format, args...))
	c.writeUsage(c.stderr)
	return exitInvalid
}

// fail reports an error of a command that ran and returns code.
func (c *command) fail(code int, err error) int {
	fmt.Fprintf(c.stderr, "pathvet %s: %v\n", c.Name(), err)
	return code
}

// databaseURLFlag is --database-url. Its default is read from
// PATHVET_DATABASE_URL after parsing, so that help never prints the URL
// (and its password).
func (c *command) databaseURLFlag() func() string {
	v := c.String("database-url", "", "PostgreSQL URL (default $PATHVET_DATABASE_URL)")
	return func() string {
		if *v != "" {
			return *v
		}
		return getenv("PATHVET_DATABASE_URL")
	}
}

// checkUsage is the usage of `pathvet check`, with every exit status.
const checkUsage = `Usage: pathvet check [--format text|json|html] [--out FILE] [--allow-points-off N] [--alpha A]
       [--resamples N] [--quiet] PACKAGE.json

Screens a submission package offline and prints its report. A data file
named in data.file is read relative to the package file.

Exit status:
  0  a report was made (and no more points were taken off than --allow-points-off allows)
  1  more of the 100 points were taken off than --allow-points-off allows
  2  the package is invalid (every problem on standard error), or the command line is wrong
  3  anything else went wrong`
