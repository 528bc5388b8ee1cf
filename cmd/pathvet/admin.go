package main

import (
	"context"
	"errors"
	"flag"
	"fmt"
	"io"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
)

func newFlagSet(name string, stderr io.Writer, usage string) *flag.FlagSet {
	fs := flag.NewFlagSet(name, flag.ContinueOnError)
	fs.SetOutput(stderr)
	fs.Usage = func() {
		fmt.Fprintln(stderr, usage+"\n\nFlags:")
		fs.PrintDefaults()
	}
	return fs
}

// parseFlags parses and reports whether to go on; if not, code is the
// exit status.
func parseFlags(fs *flag.FlagSet, args []string) (code int, ok bool) {
	err := fs.Parse(args)
	switch {
	case errors.Is(err, flag.ErrHelp):
		return exitOK, false
	case err != nil:
		return exitInvalid, false
	}
	return 0, true
}

func openDB(ctx context.Context, url string) (*store.DB, error) {
	if url == "" {
		return nil, fmt.Errorf("no database: set PATHVET_DATABASE_URL or --database-url")
	}
	return store.Open(ctx, url)
}

// runMigrate is `pathvet migrate up|status`.
func runMigrate(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("migrate", stderr, "Usage: pathvet migrate up|status [--database-url URL]")
	url := fs.String("database-url", getenv("PATHVET_DATABASE_URL"), "PostgreSQL URL (PATHVET_DATABASE_URL)")
	pos, err := parseInterspersed(fs, args)
	if err != nil {
		return exitInvalid
	}
	if len(pos) != 1 || (pos[0] != "up" && pos[0] != "status") {
		fs.Usage()
		return exitInvalid
	}
	db, err := openDB(ctx, *url)
	if err != nil {
		fmt.Fprintln(stderr, "pathvet migrate:", err)
		return exitInternal
	}
	defer db.Close()
	if pos[0] == "up" {
		if err := db.Migrate(ctx); err != nil {
			fmt.Fprintln(stderr, "pathvet migrate:", err)
			return exitInternal
		}
	}
	steps, err := db.MigrationStatus(ctx)
	if err != nil {
		fmt.Fprintln(stderr, "pathvet migrate:", err)
		return exitInternal
	}
	for _, s := range steps {
		state := "pending"
		if s.Applied {
			state = "applied " + s.At.UTC().Format("2006-01-02 15:04:05")
		}
		fmt.Fprintf(stdout, "%-28s %s\n", s.Source, state)
	}
	return exitOK
}

// runKeys is `pathvet keys create --office NAME --role editor|submitter`:
// it prints the new token alone on one line, once.
func runKeys(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	fs := newFlagSet("keys", stderr, "Usage: pathvet keys create --office NAME --role editor|submitter")
	url := fs.String("database-url", getenv("PATHVET_DATABASE_URL"), "PostgreSQL URL (PATHVET_DATABASE_URL)")
	office := fs.String("office", "", "the editorial office the key belongs to")
	role := fs.String("role", service.RoleSubmitter, "editor (sees all of the office's submissions) or submitter (its own)")
	pos, err := parseInterspersed(fs, args)
	if err != nil {
		return exitInvalid
	}
	if len(pos) != 1 || pos[0] != "create" || *office == "" {
		fs.Usage()
		return exitInvalid
	}
	db, err := openDB(ctx, *url)
	if err != nil {
		fmt.Fprintln(stderr, "pathvet keys:", err)
		return exitInternal
	}
	defer db.Close()
	token, _, err := db.CreateKey(ctx, *office, *role)
	if err != nil {
		fmt.Fprintln(stderr, "pathvet keys:", err)
		return exitInvalid
	}
	fmt.Fprintln(stdout, token)
	return exitOK
}
