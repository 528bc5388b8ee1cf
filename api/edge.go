package api

import (
	"fmt"
	"net/http"
	"net/url"
	"strings"
	"unicode/utf8"

	"github.com/labstack/echo/v4"
)

// MaxHeaderBytes is the largest request line and header block the API
// answers; past it, 431 as problem details. The HTTP server's own limit
// (HTTPServerMaxHeaderBytes) lies above it, so that Go's plain-text 431
// is left only for requests far past this one.
const MaxHeaderBytes = 64 << 10

// HTTPServerMaxHeaderBytes is the limit to give http.Server.
const HTTPServerMaxHeaderBytes = 2 * MaxHeaderBytes

// checkRequest refuses, before any handler runs, what no handler can use:
// a header block past MaxHeaderBytes (431), and a query string that is
// malformed, not UTF-8 or holds a NUL (400, naming the parameter).
func (s *Server) checkRequest(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		req := c.Request()
		if headerBytes(req) > MaxHeaderBytes {
			return problemError(http.StatusRequestHeaderFieldsTooLarge,
				fmt.Sprintf("The request line and headers are larger than the limit of %d bytes.", MaxHeaderBytes))
		}
		if err := checkQuery(req.URL.RawQuery); err != nil {
			return err
		}
		return next(c)
	}
}

// headerBytes counts the request line and headers as sent.
func headerBytes(req *http.Request) int {
	n := len(req.Method) + len(req.RequestURI) + len(req.Proto) + 4
	for k, vs := range req.Header {
		for _, v := range vs {
			n += len(k) + len(v) + 4
		}
	}
	return n
}

// checkQuery parses a raw query string strictly.
func checkQuery(raw string) error {
	values, err := url.ParseQuery(raw)
	if err != nil {
		return problemError(
			http.StatusBadRequest,
			"The query string is malformed: "+strings.ToValidUTF8(err.Error(), "?"),
		)
	}
	for k, vs := range values {
		name := k
		if !validText(k) {
			return problemError(
				http.StatusBadRequest,
				"A query parameter's name is not valid UTF-8 text or holds a NUL.",
			)
		}
		for _, v := range vs {
			if !validText(v) {
				return problemError(http.StatusBadRequest,
					fmt.Sprintf("The query parameter %q is not valid UTF-8 text or holds a NUL.", name))
			}
		}
	}
	return nil
}

// validText reports whether s is UTF-8 without NUL (which PostgreSQL's
// text cannot hold).
func validText(s string) bool { return utf8.ValidString(s) && !strings.ContainsRune(s, 0) }

// maxIdempotencyKey is the longest Idempotency-Key.
const maxIdempotencyKey = 200

// idempotencyKey reads the Idempotency-Key header: at most 200 printable
// ASCII characters (a quoted string of RFC 8941 is printable ASCII too).
func idempotencyKey(c echo.Context) (string, error) {
	k := c.Request().Header.Get("Idempotency-Key")
	return k, checkIdempotencyKey(k, "Idempotency-Key header")
}

// checkIdempotencyKey holds a key to the header's rule; what names it in
// the error.
func checkIdempotencyKey(k, what string) error {
	if len(k) > maxIdempotencyKey {
		return problemError(http.StatusBadRequest,
			fmt.Sprintf("The %s is longer than %d characters.", what, maxIdempotencyKey))
	}
	for i := 0; i < len(k); i++ {
		if k[i] < 0x20 || k[i] > 0x7e {
			return problemError(http.StatusBadRequest,
				fmt.Sprintf("The %s must be printable ASCII; byte %d is 0x%02x.", what, i+1, k[i]))
		}
	}
	return nil
}
