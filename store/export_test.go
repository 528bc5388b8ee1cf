package store

import "context"

// SetAfterFinish makes the workers started with cfg call f after each
// transaction that ends a screening commits, and return its error.
func SetAfterFinish(cfg *WorkerConfig, f func(context.Context) error) { cfg.afterFinish = f }
