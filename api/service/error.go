package service

import (
	"errors"
	"fmt"
)

// Error codes of the service. The API maps them to HTTP statuses in one
// place (api/problem.go); storage and the workers return them.
const (
	EInvalid     = "invalid"     // a malformed request: 400
	ENotFound    = "not_found"   // nothing the caller may see: 404
	EConflict    = "conflict"    // the state forbids it: 409
	ETooLarge    = "too_large"   // a size limit: 413
	EUnavailable = "unavailable" // the database or a capacity limit: 503, retry later
	EInternal    = "internal"    // anything else: 500, shown as "internal error"
)

// Error is an error with a code and a message safe to show a client.
type Error struct {
	Code    string
	Message string
	// Err is the cause, kept for logs and errors.Is; never shown.
	Err error
}

func (e *Error) Error() string { return e.Message }

// Unwrap returns the cause.
func (e *Error) Unwrap() error { return e.Err }

// Errorf returns an *Error with the code and a formatted message.
func Errorf(code, format string, args ...any) *Error {
	return &Error{Code: code, Message: fmt.Sprintf(format, args...)}
}

// ErrorCode returns the code of the *Error in err's chain, EInternal for
// any other error and "" for nil.
func ErrorCode(err error) string {
	var e *Error
	switch {
	case err == nil:
		return ""
	case errors.As(err, &e):
		return e.Code
	}
	return EInternal
}
