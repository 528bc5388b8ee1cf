package store

import (
	"sync"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// Channels on which the database announces changes (migration 00011's
// triggers): keyChannel for every change to a key or an office (a
// revocation, a deletion, a rename), reportChannel, with the submission's
// id, for every report stored or deleted and every submission deleted.
const (
	keyChannel    = "pathvet_keys"
	reportChannel = "pathvet_reports"
)

// CacheTTL is the longest an entry is served from memory.
const CacheTTL = 5 * time.Second

// Bounds of the cache: past them it forgets entries (every key; reports
// at random) to make room.
const (
	maxCachedKeys    = 10000
	maxCachedReports = 64 << 20 // bytes of report JSON
)

// readCache keeps, for a server that reads them on every request, live
// keys by the SHA-256 of their token and each submission's newest report
// with its office and sender (for the scope check). It is correct under
// change because an entry is used only while the cache listens for the
// database's announcements: a key's announcement forgets every key, a
// report's forgets its submission, losing the listening connection
// forgets everything and stops the cache until it listens again, and
// nothing looked up before an announcement is stored after it (gen). A
// revoked key, a new report or a deletion therefore shows as soon as its
// announcement arrives (milliseconds), and at worst after CacheTTL when
// the connection dies without a word.
type readCache struct {
	mu          sync.Mutex
	keys        map[[32]byte]keyEntry
	reports     map[string]reportEntry
	reportBytes int
	gen         uint64 // counts announcements and losses
	listening   bool
	ttl         time.Duration
	hits        int // for tests
}

type keyEntry struct {
	key   service.Key
	until time.Time
}

// reportEntry is a submission's newest report, and who may see it.
type reportEntry struct {
	officeID, senderKeyID int64
	report                service.StoredReport
	until                 time.Time
}

func newReadCache(ttl time.Duration) *readCache {
	return &readCache{keys: map[[32]byte]keyEntry{}, reports: map[string]reportEntry{}, ttl: ttl}
}

// generation is the generation a lookup starts in, and whether its result
// may be kept (never without a cache).
func (c *readCache) generation() (uint64, bool) {
	if c == nil {
		return 0, false
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	return c.gen, c.listening
}

// key returns a copy of the live entry for the token's hash.
func (c *readCache) key(h [32]byte, now time.Time) (*service.Key, bool) {
	c.mu.Lock()
	defer c.mu.Unlock()
	e, ok := c.keys[h]
	if !ok || !c.listening || !now.Before(e.until) {
		return nil, false
	}
	c.hits++
	k := e.key
	return &k, true
}

// putKey keeps a key looked up in generation gen, unless anything was
// announced since.
func (c *readCache) putKey(h [32]byte, k *service.Key, gen uint64, now time.Time) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if gen != c.gen || !c.listening {
		return
	}
	if len(c.keys) >= maxCachedKeys {
		clear(c.keys)
	}
	c.keys[h] = keyEntry{key: *k, until: now.Add(c.ttl)}
}

// report returns the live entry of a submission (none without a cache).
func (c *readCache) report(id string, now time.Time) (reportEntry, bool) {
	if c == nil {
		return reportEntry{}, false
	}
	c.mu.Lock()
	defer c.mu.Unlock()
	e, ok := c.reports[id]
	if !ok || !c.listening || !now.Before(e.until) {
		return reportEntry{}, false
	}
	c.hits++
	return e, true
}

// putReport keeps a submission's newest report read in generation gen,
// unless anything was announced since.
func (c *readCache) putReport(id string, e reportEntry, gen uint64, now time.Time) {
	c.mu.Lock()
	defer c.mu.Unlock()
	if gen != c.gen || !c.listening || len(e.report.JSON) > maxCachedReports/4 {
		return
	}
	c.dropReport(id)
	for other := range c.reports { // room, at random
		if c.reportBytes+len(e.report.JSON) <= maxCachedReports {
			break
		}
		c.dropReport(other)
	}
	e.until = now.Add(c.ttl)
	c.reports[id] = e
	c.reportBytes += len(e.report.JSON)
}

func (c *readCache) dropReport(id string) {
	c.reportBytes -= len(c.reports[id].report.JSON)
	delete(c.reports, id)
}

// announced forgets what an announcement on channel names.
func (c *readCache) announced(channel, payload string) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.gen++
	switch channel {
	case reportChannel:
		c.dropReport(payload)
	default:
		clear(c.keys)
	}
}

// forget drops every entry and says whether entries may be used from now
// on.
func (c *readCache) forget(listening bool) {
	c.mu.Lock()
	defer c.mu.Unlock()
	clear(c.keys)
	clear(c.reports)
	c.reportBytes = 0
	c.gen++
	c.listening = listening
}
