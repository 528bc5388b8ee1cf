package api

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net/http"
	"sync"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
)

// LargeIngestBytes is the upload size from which an upload counts as
// large: a large upload is checked and stored holding a slot of a
// semaphore, so that a few at once bound the API's memory. The slot is
// taken once the body has arrived (spooled), never while it arrives, so
// a slow client holds nothing but its own connection.
const LargeIngestBytes = 8 << 20

// Defaults of the upload rules (Config): after UploadGrace an upload must
// have arrived at UploadMinRate on average, and no read may wait longer
// than UploadIdle; a spooled large upload waits at most SlotWait for a
// slot.
const (
	DefaultUploadMinRate = 64 << 10
	DefaultUploadGrace   = 10 * time.Second
	DefaultUploadIdle    = 10 * time.Second
	DefaultSlotWait      = 20 * time.Second
)

// Texts of the refusals of the upload rules.
const (
	tooSlowText = "The upload arrived slower than %d bytes a second (or stopped for %s); send it again " +
		"over a faster connection."
	busyKeyText = "This key is already sending a large upload; send the next once that one is answered."
	noSlotText  = "The server is checking as many large uploads as it can at once; try again shortly."
)

// errTooSlow ends the read of an upload that broke the upload rules.
var errTooSlow = errors.New("api: the upload is too slow")

// gateIngest sets the upload rules on the request body, and lets each key
// send one large upload (declared at LargeIngestBytes or more, or of
// unknown length) at a time: a second one while the first is read or
// checked is 429.
func (s *Server) gateIngest(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		req := c.Request()
		req.Body = s.paced(c.Response().Writer, req.Body)
		if n := req.ContentLength; n >= 0 && n < LargeIngestBytes {
			return next(c)
		}
		key := keyOf(c).ID
		if !s.sending.start(key) {
			return problemError(http.StatusTooManyRequests, busyKeyText)
		}
		defer s.sending.end(key)
		return next(c)
	}
}

// largeSlot takes a slot for a spooled upload of size bytes, when it is
// large, waiting at most SlotWait; release gives it back.
func (s *Server) largeSlot(ctx context.Context, size int64) (release func(), err error) {
	if size < LargeIngestBytes {
		return func() {}, nil
	}
	wait := time.NewTimer(s.cfg.SlotWait)
	defer wait.Stop()
	select {
	case s.large <- struct{}{}:
		return func() { <-s.large }, nil
	case <-wait.C:
	case <-ctx.Done():
	}
	return nil, problemError(http.StatusServiceUnavailable, noSlotText)
}

// keysSending counts, by key, the large uploads in progress.
type keysSending struct {
	mu sync.Mutex
	n  map[int64]int
}

func (k *keysSending) start(key int64) bool {
	k.mu.Lock()
	defer k.mu.Unlock()
	if k.n[key] > 0 {
		return false
	}
	if k.n == nil {
		k.n = map[int64]int{}
	}
	k.n[key]++
	return true
}

func (k *keysSending) end(key int64) {
	k.mu.Lock()
	defer k.mu.Unlock()
	if k.n[key]--; k.n[key] <= 0 {
		delete(k.n, key)
	}
}

// pacedBody is a request body held to the upload rules: each read must
// end within idle (the connection's read deadline, moved on before each
// read), and after grace the body must have arrived at minRate on
// average.
type pacedBody struct {
	io.ReadCloser
	rc      *http.ResponseController
	start   time.Time
	n       int64
	minRate int64
	grace   time.Duration
	idle    time.Duration
}

func (s *Server) paced(w http.ResponseWriter, body io.ReadCloser) io.ReadCloser {
	return &pacedBody{ReadCloser: body, rc: http.NewResponseController(w), start: time.Now(),
		minRate: s.cfg.UploadMinRate, grace: s.cfg.UploadGrace, idle: s.cfg.UploadIdle}
}

func (p *pacedBody) Read(b []byte) (int, error) {
	_ = p.rc.SetReadDeadline(time.Now().Add(p.idle)) // not every writer can; the rate still holds
	n, err := p.ReadCloser.Read(b)
	p.n += int64(n)
	var ne interface{ Timeout() bool }
	if errors.As(err, &ne) && ne.Timeout() {
		return n, errTooSlow
	}
	if el := time.Since(p.start); el > p.grace && float64(p.n) < float64(p.minRate)*el.Seconds() {
		return n, errTooSlow
	}
	return n, err
}

// bodyRead lifts the read deadline the upload rules set, once the body is
// read whole: the server's own read of the connection (which notices a
// client that goes away) must not time out while the upload is checked
// and stored, as that would cancel the request. After a failed read the
// deadline stays, so that the server's discarding of the rest of the body
// stops with it.
func bodyRead(c echo.Context) {
	_ = http.NewResponseController(c.Response().Writer).SetReadDeadline(time.Time{})
}

// tooSlow is the refusal of an upload that broke the upload rules; the
// connection is closed, as its body was not read to its end.
func (s *Server) tooSlow(c echo.Context) error {
	_ = http.NewResponseController(c.Response().Writer).SetReadDeadline(time.Now())
	c.Response().Header().Set(echo.HeaderConnection, "close")
	return problemError(http.StatusRequestTimeout, fmt.Sprintf(tooSlowText, s.cfg.UploadMinRate, s.cfg.UploadIdle))
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
