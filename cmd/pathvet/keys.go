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

create prints the new token alone on one line, once; only its hash is kept.
list shows office, role, label, created and last used, never a token.
revoke stops a key at once.`

// runKeys is `pathvet keys create|list|revoke`.
func runKeys(ctx context.Context, args []string, stdout, stderr io.Writer) int {
	c := newCommand("keys", keysUsage, stdout, stderr)
	url := c.databaseURLFlag()
	office := c.String("office", "", "create: the office the key belongs to (it must exist); list: only this office's keys")
	role := c.String("role", service.RoleSubmitter, "create: editor (sees all of the office's submissions) or submitter (its own)")
	label := c.String("label", "", "create: who holds the key, shown on its submissions")
	pos, code, ok := c.parse(args)
	if !ok {
		return code
	}
	run, msg := keysAction(pos, *office, *label)
	if run == nil {
		return c.misuse("%s", msg)
	}
	db, err := openDB(ctx, url())
	if err != nil {
		return c.fail(exitInternal, err)
	}
	defer db.Close()
	return run(ctx, c, db, keyFlags{office: *office, role: *role, label: *label}, pos)
}

type keyFlags struct{ office, role, label string }

// keysFunc is one action of `keys`.
type keysFunc func(ctx context.Context, c *command, db *store.DB, f keyFlags, pos []string) int

// keysAction picks the action of `keys` from its arguments, or says what
// is wrong with them.
func keysAction(pos []string, office, label string) (keysFunc, string) {
	switch {
	case len(pos) == 1 && pos[0] == "create" && (office == "" || label == ""):
		return nil, "create needs --office and --label"
	case len(pos) == 1 && pos[0] == "create":
		return createKey, ""
	case len(pos) == 1 && pos[0] == "list":
		return listKeys, ""
	case len(pos) == 2 && pos[0] == "revoke":
		return revokeKey, ""
	}
	return nil, "give create, list or revoke ID"
}

func createKey(ctx context.Context, c *command, db *store.DB, f keyFlags, _ []string) int {
	token, _, err := db.CreateKey(ctx, service.NewKey{Office: f.office, Role: f.role, Label: f.label})
	if err != nil {
		return c.fail(exitFor(err), err)
	}
	fmt.Fprintln(c.stdout, token)
	return exitOK
}

func listKeys(ctx context.Context, c *command, db *store.DB, f keyFlags, _ []string) int {
	keys, err := db.Keys(ctx, f.office)
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
}

func revokeKey(ctx context.Context, c *command, db *store.DB, _ keyFlags, pos []string) int {
	id, err := strconv.ParseInt(pos[1], 10, 64)
	if err != nil {
		return c.misuse("the key ID is a number, as keys list shows it, not %q", pos[1])
	}
	if err := db.RevokeKey(ctx, id); err != nil {
		return c.fail(exitFor(err), err)
	}
	fmt.Fprintf(c.stdout, "revoked key %d\n", id)
	return exitOK
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
