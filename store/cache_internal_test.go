package store

import (
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// A key looked up before an announcement and stored after it is not kept:
// the lookup may have read the key before its revocation committed.
func TestCache_NoEntryFromBeforeAnAnnouncement(t *testing.T) {
	c := newReadCache(time.Hour)
	c.forget(true)
	now, h := time.Now(), [32]byte{1}
	gen, ok := c.generation()
	if !ok {
		t.Fatal("a listening cache says its lookups may not be kept")
	}
	c.forget(true) // the announcement arrives while the lookup runs
	c.putKey(h, &service.Key{ID: 7}, gen, now)
	if _, ok := c.key(h, now); ok {
		t.Fatal("an entry looked up before an announcement was kept")
	}
	gen, _ = c.generation()
	c.putKey(h, &service.Key{ID: 7}, gen, now)
	k, ok := c.key(h, now)
	if !ok || k.ID != 7 {
		t.Fatal("an entry of the current generation was not kept")
	}
	k.ID = 8
	if again, _ := c.key(h, now); again.ID != 7 {
		t.Fatal("a caller changed the cached key through its copy")
	}
}

// The reports kept never pass maxCachedReports bytes; a report too large
// to share the room is not kept.
func TestCache_ReportRoom(t *testing.T) {
	c := newReadCache(time.Hour)
	c.forget(true)
	now, chunk := time.Now(), maxCachedReports/10
	for i := range 25 {
		gen, _ := c.generation()
		c.putReport(string(rune('a'+i)), reportEntry{report: service.StoredReport{ID: 1, JSON: make([]byte, chunk)}},
			gen, now)
		if c.reportBytes > maxCachedReports || c.reportBytes != len(c.reports)*chunk {
			t.Fatalf("after %d reports: %d bytes counted for %d kept", i+1, c.reportBytes, len(c.reports))
		}
	}
	gen, _ := c.generation()
	c.putReport("big", reportEntry{report: service.StoredReport{ID: 1, JSON: make([]byte, maxCachedReports/2)}}, gen,
		now)
	if _, ok := c.report("big", now); ok {
		t.Fatal("a report of half the room was kept")
	}
}
