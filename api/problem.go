package api

import (
	"errors"
	"fmt"
	"net/http"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
)

// Problem is an RFC 9457 problem details document.
type Problem struct {
	Type     string           `json:"type"`
	Title    string           `json:"title"`
	Status   int              `json:"status"`
	Detail   string           `json:"detail,omitempty"`
	Instance string           `json:"instance,omitempty"`
	Errors   []checks.Problem `json:"errors,omitempty"`
}

// ProblemContentType is the media type of problem details.
const ProblemContentType = "application/problem+json"

// problemTypes name the kinds of problem this API reports.
var problemTypes = map[int]string{
	http.StatusBadRequest:                  "https://pathvet.example/problems/bad-request",
	http.StatusUnauthorized:                "https://pathvet.example/problems/unauthorized",
	http.StatusNotFound:                    "https://pathvet.example/problems/not-found",
	http.StatusMethodNotAllowed:            "https://pathvet.example/problems/method-not-allowed",
	http.StatusRequestTimeout:              "https://pathvet.example/problems/upload-too-slow",
	http.StatusConflict:                    "https://pathvet.example/problems/conflict",
	http.StatusUnsupportedMediaType:        "https://pathvet.example/problems/unsupported-media-type",
	http.StatusRequestEntityTooLarge:       "https://pathvet.example/problems/too-large",
	http.StatusUnprocessableEntity:         "https://pathvet.example/problems/invalid-package",
	http.StatusTooManyRequests:             "https://pathvet.example/problems/too-many-uploads",
	http.StatusRequestHeaderFieldsTooLarge: "https://pathvet.example/problems/headers-too-large",
	http.StatusServiceUnavailable:          "https://pathvet.example/problems/unavailable",
	http.StatusGatewayTimeout:              "https://pathvet.example/problems/timeout",
}

// invalidRequestType is the type of a 422 about a request's fields rather
// than a package.
const invalidRequestType = "https://pathvet.example/problems/invalid-request"

// problemError is an error with the HTTP status and detail to show.
func problemError(status int, detail string) error {
	return &echo.HTTPError{Code: status, Message: detail}
}

// codeStatus maps the service's error codes to HTTP statuses.
var codeStatus = map[string]int{
	service.EInvalid:     http.StatusBadRequest,
	service.ENotFound:    http.StatusNotFound,
	service.EConflict:    http.StatusConflict,
	service.ETooLarge:    http.StatusRequestEntityTooLarge,
	service.EUnavailable: http.StatusServiceUnavailable,
}

const invalidPackageDetail = "The package is not valid; every problem is listed with its JSON pointer " +
	"or CSV line and column."

// problemFor maps an error to its problem: the one place where error
// codes become HTTP statuses. An internal error shows only "internal
// error".
func problemFor(err error) (Problem, bool) {
	var he *echo.HTTPError
	var ip *checks.InvalidPackageError
	var ce *checks.Error
	var inv *invalidFields
	switch {
	case errors.As(err, &he):
		detail, _ := he.Message.(string)
		return Problem{Status: he.Code, Detail: detail}, false
	case errors.As(err, &ip) && ip.TooLarge:
		return Problem{
			Status: http.StatusRequestEntityTooLarge,
			Detail: ip.Problems[0].Detail,
			Errors: ip.Problems,
		}, false
	case errors.As(err, &ip):
		return Problem{Status: http.StatusUnprocessableEntity, Detail: invalidPackageDetail,
			Errors: ip.Problems}, false
	case errors.As(err, &inv):
		return Problem{Type: invalidRequestType, Status: http.StatusUnprocessableEntity, Detail: invalidFieldsDetail,
			Errors: inv.problems}, false
	case errors.As(err, &ce) && ce.Code == checks.EInvalid:
		return Problem{Status: http.StatusUnprocessableEntity, Detail: ce.Message}, false
	case errors.Is(err, errTimeout):
		return Problem{Status: http.StatusGatewayTimeout, Detail: "The request took too long."}, false
	}
	if status, ok := codeStatus[service.ErrorCode(err)]; ok {
		return Problem{Status: status, Detail: err.Error()}, false
	}
	return Problem{Status: http.StatusInternalServerError, Detail: "internal error"}, true
}

var errTimeout = errors.New("timeout")

// invalidFields is a request whose fields break the rules (a decision on
// a finding): 422 with each field's JSON pointer.
type invalidFields struct{ problems []checks.Problem }

func (e *invalidFields) Error() string {
	parts := make([]string, len(e.problems))
	for i, p := range e.problems {
		parts[i] = p.String()
	}
	return strings.Join(parts, "; ")
}

const invalidFieldsDetail = "The request's fields break a rule; each problem is named by its JSON pointer."

// retryAfter is the Retry-After of every 503, in seconds.
const retryAfter = "5"

// handleError is Echo's error handler: every error becomes problem
// details.
func (s *Server) handleError(err error, c echo.Context) {
	if c.Response().Committed {
		return
	}
	p := s.problem(err, c)
	h := c.Response().Header()
	switch p.Status {
	case http.StatusUnauthorized:
		h.Set("WWW-Authenticate", `Bearer realm="pathvet"`)
	case http.StatusServiceUnavailable, http.StatusTooManyRequests:
		h.Set("Retry-After", retryAfter)
	}
	h.Set(echo.HeaderContentType, ProblemContentType)
	c.Response().WriteHeader(p.Status)
	if c.Request().Method == http.MethodHead {
		return
	}
	_ = c.JSONBlob(0, mustJSON(p))
}

// problem fills in the problem for err on this request; an internal
// error is logged with its request id.
func (s *Server) problem(err error, c echo.Context) Problem {
	p, internal := problemFor(err)
	if internal {
		s.cfg.Logger.Error("internal error", "error", err, "path", c.Path(),
			"request_id", c.Response().Header().Get(echo.HeaderXRequestID))
	}
	if errors.Is(err, echo.ErrStatusRequestEntityTooLarge) {
		p.Detail = fmt.Sprintf("The request body is larger than the limit of %d bytes.", s.bodyLimit())
	}
	if allow := c.Response().Header().Get(echo.HeaderAllow); p.Status == http.StatusMethodNotAllowed && allow != "" {
		p.Detail = fmt.Sprintf("%s is not a method of this path; it answers %s.", c.Request().Method, allow)
	}
	if p.Type == "" {
		p.Type = problemTypes[p.Status]
	}
	if p.Type == "" {
		p.Type = "about:blank"
	}
	p.Title = http.StatusText(p.Status)
	p.Instance = c.Request().URL.Path
	return p
}
