package store

import "time"

// JobTimeout is the deadline of a job whose package has cells data cells
// (rows × columns): the base Timeout plus PerTenMillionCells for every 10
// million cells, in proportion, with cells capped at MaxCells (so that
// no deadline passes the rescue time).
//
//	deadline = Timeout + PerTenMillionCells · min(cells, MaxCells) / 10⁷
func (c WorkerConfig) JobTimeout(cells int64) time.Duration {
	cells = min(max(cells, 0), max(c.MaxCells, 0))
	return c.Timeout + time.Duration(float64(c.PerTenMillionCells)*float64(cells)/1e7)
}

// rescueMargin is how far past the largest deadline a running job is
// taken for stuck, when RescueAfter is not already past it.
const rescueMargin = time.Minute

// rescueAfter is RescueAfter, raised to the largest deadline and a margin
// when it is not past it, so that no job still inside its deadline is
// rescued (run twice at once).
func (c WorkerConfig) rescueAfter() time.Duration {
	if largest := c.JobTimeout(c.MaxCells); c.RescueAfter <= largest {
		return largest + rescueMargin
	}
	return c.RescueAfter
}
