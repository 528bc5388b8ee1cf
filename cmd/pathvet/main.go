// Command pathvet screens path-model submissions: offline with `check`,
// and (in later subcommands) as a service.
package main

import (
	"context"
	"fmt"
	"io"
	"os"
	"os/signal"
	"syscall"
)

// Exit codes.
const (
	exitOK        = 0
	exitBelow     = 1 // the score is below --fail-under
	exitInvalid   = 2 // the package is invalid, or the command line is wrong
	exitInternal  = 3 // anything else went wrong
	usageOverview = `pathvet screens the statistics of path-model submissions.

Usage:
  pathvet check [--format text|json] [--out FILE] [--fail-under N] [--alpha A] PACKAGE.json

Run "pathvet COMMAND --help" for a command's flags.
`
)

func main() {
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt, syscall.SIGTERM)
	code := run(ctx, os.Args[1:], os.Stdout, os.Stderr)
	stop()
	os.Exit(code)
}

// run dispatches a subcommand and returns the process exit code.
func run(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	if len(args) == 0 {
		fmt.Fprint(stderr, usageOverview)
		return exitInvalid
	}
	switch args[0] {
	case "check":
		return runCheck(ctx, args[1:], stdout, stderr)
	case "help", "-h", "--help":
		fmt.Fprint(stdout, usageOverview)
		return exitOK
	case "version", "--version":
		fmt.Fprintln(stdout, "pathvet", toolVersion())
		return exitOK
	}
	fmt.Fprintf(stderr, "pathvet: unknown command %q\n\n%s", args[0], usageOverview)
	return exitInvalid
}
