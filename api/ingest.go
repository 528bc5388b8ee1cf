package api

import (
	"net/http"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
)

// LargeIngestBytes is the request size from which an upload counts as
// large: large uploads take a slot of a semaphore, so that a few at once
// bound the API's memory. A body of unknown length counts as large.
const LargeIngestBytes = 8 << 20

// limitLargeIngests lets at most Config.LargeIngests large uploads run at
// once; one more is 503 with Retry-After, before its body is read.
func (s *Server) limitLargeIngests(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		if n := c.Request().ContentLength; n >= 0 && n < LargeIngestBytes {
			return next(c)
		}
		select {
		case s.large <- struct{}{}:
			defer func() { <-s.large }()
			return next(c)
		default:
			return problemError(http.StatusServiceUnavailable,
				"The server is taking as many large uploads as it can at once; try again shortly.")
		}
	}
}

// checkMemory refuses, before loading, raw data whose screening would
// need more memory than a job has: the CSV part, or the data inline in
// the package (service.CheckPackageMemory, as the workers check it).
func (s *Server) checkMemory(doc, data []byte) error {
	if err := service.CheckPackageMemory(doc, data, s.cfg.JobMemory); err != nil {
		return &checks.InvalidPackageError{Problems: []checks.Problem{{Pointer: "/data", Detail: err.Error()}}}
	}
	return nil
}
