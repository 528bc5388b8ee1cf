package store

import (
	"context"
	"time"

	"github.com/pathvet/pathvet/api/service"
)

// SetAfterFinish makes the workers started with cfg call f after each
// transaction that ends a screening commits, and return its error.
func SetAfterFinish(cfg *WorkerConfig, f func(context.Context) error) { cfg.afterFinish = f }

// PostWebhook sends one delivery to target as the delivery worker does,
// through e, within timeout; it returns the receiver's status and the
// failure's class as the office would see it ("" when delivered).
func PostWebhook(db *DB, e *service.Egress, target string, timeout time.Duration) (int, string) {
	w := &deliverWorker{db: db, client: webhookClient(e)}
	ctx, cancel := context.WithTimeout(context.Background(), timeout)
	defer cancel()
	code, err := w.post(ctx, target, "whsec_test", 1, []byte(`{}`))
	if err == nil {
		return code, ""
	}
	return code, deliveryFailure(err)
}

// CacheHits counts the lookups the read cache answered.
func CacheHits(db *DB) int {
	db.cache.mu.Lock()
	defer db.cache.mu.Unlock()
	return db.cache.hits
}

// CacheListening reports whether the read cache listens (and so serves
// entries).
func CacheListening(db *DB) bool {
	_, ok := db.cache.generation()
	return ok
}

// SetCacheTTL changes how long the cache keeps an entry.
func SetCacheTTL(db *DB, ttl time.Duration) {
	db.cache.mu.Lock()
	defer db.cache.mu.Unlock()
	db.cache.ttl = ttl
}
