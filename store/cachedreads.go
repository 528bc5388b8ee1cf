package store

import (
	"context"
	"crypto/sha256"

	"github.com/pathvet/pathvet/api/service"
)

// cachedKey looks the token up in the cache, else in the database
// (lookup), keeping what it finds.
func (db *DB) cachedKey(ctx context.Context, token string,
	lookup func(context.Context, string) (*service.Key, error)) (*service.Key, error) {
	c := db.cache
	if c == nil {
		return lookup(ctx, token)
	}
	h, now := sha256.Sum256([]byte(token)), db.now()
	if k, ok := c.key(h, now); ok {
		return k, nil
	}
	gen, _ := c.generation()
	k, err := lookup(ctx, token)
	if err == nil {
		c.putKey(h, k, gen, now)
	}
	return k, err
}

// cachedReport answers LatestReport from the cache when it holds the
// submission: the scope check is the database's (scopeSQL), on the
// submission's office and sender, which never change.
func (db *DB) cachedReport(id string, sc service.Scope, have int64) (*service.StoredReport, bool, error) {
	e, ok := db.cache.report(id, db.now())
	switch {
	case !ok:
		return nil, false, nil
	case e.officeID != sc.OfficeID || !sc.Editor && e.senderKeyID != sc.KeyID:
		return nil, true, service.Errorf(service.ENotFound, "submission not found")
	case e.report.ID == have:
		return &service.StoredReport{ID: have}, true, nil
	}
	r := e.report
	return &r, true, nil
}
