package main

import (
	"context"
	"fmt"
	"io"
	"strconv"
	"text/tabwriter"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
)

const officesUsage = `Usage:
  pathvet offices create [--database-url URL] NAME
  pathvet offices list [--database-url URL]

An editorial office owns API keys and submissions; create it before its keys.`

// runOffices is `pathvet offices create NAME` and `pathvet offices list`.
func runOffices(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	c := newCommand("offices", officesUsage, stdout, stderr)
	url := c.databaseURLFlag()
	pos, code, ok := c.parse(args)
	switch {
	case !ok:
		return code
	case len(pos) == 2 && pos[0] == "create", len(pos) == 1 && pos[0] == "list":
	default:
		return c.misuse("give create NAME or list")
	}
	db, err := openDB(ctx, url())
	if err != nil {
		return c.fail(exitInternal, err)
	}
	defer db.Close()
	if pos[0] == "create" {
		o, err := db.CreateOffice(ctx, pos[1])
		if err != nil {
			return c.fail(exitFor(err), err)
		}
		fmt.Fprintf(stdout, "%d %s\n", o.ID, o.Name)
		return exitOK
	}
	offices, err := db.Offices(ctx)
	if err != nil {
		return c.fail(exitFor(err), err)
	}
	tw := tabwriter.NewWriter(stdout, 0, 4, 2, ' ', 0)
	fmt.Fprintln(tw, "ID\tOFFICE\tCREATED")
	for _, o := range offices {
		fmt.Fprintf(tw, "%d\t%s\t%s\n", o.ID, o.Name, stamp(&o.CreatedAt))
	}
	return flushed(c, tw)
}

const keysUsage = `Usage:
  pathvet keys create [--database-url URL] --office NAME --role editor|submitter --label TEXT
  pathvet keys list [--database-url URL] [--office NAME]
  pathvet keys revoke [--database-url URL] ID

Run "pathvet keys ACTION --help" for an action's flags.`

// keyActions are the actions of `keys`, each with its own flags.
var keyActions = map[string]struct {
	usage string
	run   func(ctx context.Context, c *command, args []string) int
}{
	"create": {`Usage: pathvet keys create [--database-url URL] --office NAME --role editor|submitter --label TEXT

Makes an API key for an existing office and prints its token alone on one
line, once; only the token's hash is kept.`, createKey},
	"list": {`Usage: pathvet keys list [--database-url URL] [--office NAME]

Lists keys with their office, role, label, creation, last use and
revocation; never a token.`, listKeys},
	"revoke": {`Usage: pathvet keys revoke [--database-url URL] ID

Revokes a key (its ID as keys list shows it): its token stops working at once (a running server's
key cache hears of it within milliseconds).`, revokeKey},
}

// runKeys is `pathvet keys create|list|revoke`.
func runKeys(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	c := newCommand("keys", keysUsage, stdout, stderr)
	if len(args) == 0 {
		return c.misuse("give create, list or revoke")
	}
	action, ok := keyActions[args[0]]
	if !ok {
		if _, code, ok := c.parse(args[:1]); !ok {
			return code // --help
		}
		return c.misuse("unknown action %q", args[0])
	}
	return action.run(ctx, newCommand("keys "+args[0], action.usage, stdout, stderr), args[1:])
}

// withDB opens the database for a command and runs fn on it.
func withDB(ctx context.Context, c *command, url string, fn func(*store.DB) int) int {
	db, err := openDB(ctx, url)
	if err != nil {
		return c.fail(exitInternal, err)
	}
	defer db.Close()
	return fn(db)
}

func createKey(ctx context.Context, c *command, args []string) int {
	url := c.databaseURLFlag()
	office := c.String("office", "", "the office the key belongs to (create it first with offices create)")
	role := c.String(
		"role",
		service.RoleSubmitter,
		"editor (sees all of the office's submissions) or submitter (its own)",
	)
	label := c.String("label", "", "who holds the key, shown on its submissions")
	pos, code, ok := c.parse(args)
	switch {
	case !ok:
		return code
	case len(pos) != 0 || *office == "" || *label == "":
		return c.misuse("give --office and --label, and no arguments")
	}
	return withDB(ctx, c, url(), func(db *store.DB) int {
		token, _, err := db.CreateKey(ctx, service.NewKey{Office: *office, Role: *role, Label: *label})
		if err != nil {
			return c.fail(exitFor(err), err)
		}
		fmt.Fprintln(c.stdout, token)
		return exitOK
	})
}

func listKeys(ctx context.Context, c *command, args []string) int {
	url := c.databaseURLFlag()
	office := c.String("office", "", "only this office's keys")
	pos, code, ok := c.parse(args)
	switch {
	case !ok:
		return code
	case len(pos) != 0:
		return c.misuse("takes no arguments")
	}
	return withDB(ctx, c, url(), func(db *store.DB) int {
		keys, err := db.Keys(ctx, *office)
		if err != nil {
			return c.fail(exitFor(err), err)
		}
		tw := tabwriter.NewWriter(c.stdout, 0, 4, 2, ' ', 0)
		fmt.Fprintln(tw, "ID\tOFFICE\tROLE\tLABEL\tCREATED\tLAST USED\tREVOKED")
		for _, k := range keys {
			fmt.Fprintf(tw, "%d\t%s\t%s\t%s\t%s\t%s\t%s\n", k.ID, k.OfficeName, k.Role, k.Label,
				stamp(&k.CreatedAt), stamp(k.LastUsedAt), stamp(k.RevokedAt))
		}
		return flushed(c, tw)
	})
}

func revokeKey(ctx context.Context, c *command, args []string) int {
	url := c.databaseURLFlag()
	pos, code, ok := c.parse(args)
	if !ok {
		return code
	}
	if len(pos) != 1 {
		return c.misuse("give the key's ID")
	}
	id, err := strconv.ParseInt(pos[0], 10, 64)
	if err != nil {
		return c.misuse("the key ID is a number, as keys list shows it, not %q", pos[0])
	}
	return withDB(ctx, c, url(), func(db *store.DB) int {
		if err := db.RevokeKey(ctx, id); err != nil {
			return c.fail(exitFor(err), err)
		}
		fmt.Fprintf(c.stdout, "revoked key %d\n", id)
		return exitOK
	})
}

// stamp writes a time to the minute, "-" for none.
func stamp(t *time.Time) string {
	if t == nil {
		return "-"
	}
	return t.UTC().Format("2006-01-02 15:04")
}

func flushed(c *command, tw *tabwriter.Writer) int {
	if err := tw.Flush(); err != nil {
		return c.fail(exitInternal, err)
	}
	return exitOK
}
