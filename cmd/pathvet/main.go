// Command pathvet screens path-model submissions: offline with `check`,
// and as a service with `serve` and `work`, `migrate`, `keys`, and the
// clients `submit` and `report`.
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
	exitConcern   = 1 // more points were taken off than --allow-points-off allows
	exitInvalid   = 2 // the package is invalid, or the command line is wrong
	exitInternal  = 3 // anything else went wrong
	usageOverview = `pathvet screens the statistics of path-model submissions.

Usage:
  pathvet init (--data ROWS.csv | --summary TABLE.csv) [--out PACKAGE.json] [--force]
  pathvet check [--format text|json|html] [--out FILE] [--allow-points-off N] [--alpha A] [--quiet] PACKAGE.json
  pathvet serve [--addr HOST:PORT] [--database-url URL] [--workers N] [--migrate] [flags]
  pathvet work [--database-url URL] [--workers N] [flags]
  pathvet migrate up|status [--database-url URL]
  pathvet offices create NAME | offices list
  pathvet keys create --office NAME --role editor|submitter --label TEXT
  pathvet keys list [--office NAME] | keys revoke ID
  pathvet submit [--server URL] [--wait] [flags] PACKAGE.json
  pathvet report [--server URL] [--format text|json] ID
  pathvet version

The server reads PATHVET_DATABASE_URL and PATHVET_ADDR (default 127.0.0.1:8080);
the clients read PATHVET_TOKEN.

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
	case "init":
		return runInit(args[1:], stdout, stderr)
	case "serve", "work":
		return runServe(ctx, args[0], args[1:], stdout, stderr)
	case "migrate":
		return runMigrate(ctx, args[1:], stdout, stderr)
	case "keys":
		return runKeys(ctx, args[1:], stdout, stderr)
	case "offices":
		return runOffices(ctx, args[1:], stdout, stderr)
	case "submit":
		return runSubmit(ctx, args[1:], stdout, stderr)
	case "report":
		return runReport(ctx, args[1:], stdout, stderr)
	case "help", "-h", "--help":
		fmt.Fprint(stdout, usageOverview)
		return exitOK
	case "version", "--version":
		if len(args) > 1 && (args[1] == "--help" || args[1] == "-h") {
			fmt.Fprintln(stdout, "Usage: pathvet version\n\nPrints the version of pathvet and of its checks.")
			return exitOK
		}
		fmt.Fprintln(stdout, "pathvet", toolVersion())
		return exitOK
	}
	fmt.Fprintf(stderr, "pathvet: unknown command %q\n\n%s", args[0], usageOverview)
	return exitInvalid
}
