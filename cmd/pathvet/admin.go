package main

import (
	"context"
	"fmt"
	"io"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
)

func openDB(ctx context.Context, url string) (*store.DB, error) {
	if url == "" {
		return nil, fmt.Errorf("no database: set PATHVET_DATABASE_URL or --database-url")
	}
	return store.Open(ctx, url)
}

const migrateUsage = `Usage: pathvet migrate up|status [--database-url URL]

up applies pathvet's migrations and the job queue's (safe to run from
several processes at once); status lists pathvet's migrations.`

// runMigrate is `pathvet migrate up|status`.
func runMigrate(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	c := newCommand("migrate", migrateUsage, stdout, stderr)
	url := c.databaseURLFlag()
	pos, code, ok := c.parse(args)
	switch {
	case !ok:
		return code
	case len(pos) != 1 || (pos[0] != "up" && pos[0] != "status"):
		return c.misuse("give up or status")
	}
	db, err := openDB(ctx, url())
	if err != nil {
		return c.fail(exitInternal, err)
	}
	defer db.Close()
	if pos[0] == "up" {
		if err := db.Migrate(ctx); err != nil {
			return c.fail(exitInternal, err)
		}
	}
	steps, err := db.MigrationStatus(ctx)
	if err != nil {
		return c.fail(exitInternal, err)
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

// exitFor is the exit status for a store error: 2 for what the command
// line asked wrongly (invalid, not found, conflict), 3 for the rest.
func exitFor(err error) int {
	switch service.ErrorCode(err) {
	case service.EInvalid, service.ENotFound, service.EConflict:
		return exitInvalid
	}
	return exitInternal
}
