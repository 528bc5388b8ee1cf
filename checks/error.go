package checks

import (
	"errors"
	"fmt"
	"strings"
)

// Error codes of the statistics package: a package it cannot analyse, or
// one past a size limit. The service's own codes (not found, conflict,
// unavailable) live in api/service.
const (
	EInvalid  = "invalid"
	ETooLarge = "too_large"
	EInternal = "internal"
)

// Error is an error with a code and a message safe to show a client.
type Error struct {
	Code    string
	Message string
}

func (e *Error) Error() string { return e.Message }

// Errorf returns an *Error with the code and a formatted message.
func Errorf(code, format string, args ...any) *Error {
	return &Error{Code: code, Message: fmt.Sprintf(format, args...)}
}

// ErrorCode returns the code of err: that of an *Error or an
// *InvalidPackageError inside it, EInternal for any other error, "" for nil.
func ErrorCode(err error) string {
	var e *Error
	var ip *InvalidPackageError
	switch {
	case err == nil:
		return ""
	case errors.As(err, &ip):
		if ip.TooLarge {
			return ETooLarge
		}
		return EInvalid
	case errors.As(err, &e):
		return e.Code
	}
	return EInternal
}

// Problem is one thing wrong with a package: where (a JSON pointer, or a
// line and column of the CSV data) and what.
type Problem struct {
	Pointer string `json:"pointer,omitempty"`
	Line    int    `json:"line,omitempty"`
	Column  int    `json:"column,omitempty"`
	Detail  string `json:"detail"`
}

// String gives the problem on one line: "/claims/2/to: ..." or
// "data line 5, column 3: ...".
func (p Problem) String() string {
	switch {
	case p.Line > 0 && p.Column > 0:
		return fmt.Sprintf("data line %d, column %d: %s", p.Line, p.Column, p.Detail)
	case p.Line > 0:
		return fmt.Sprintf("data line %d: %s", p.Line, p.Detail)
	case p.Pointer == "":
		return "package: " + p.Detail
	}
	return p.Pointer + ": " + p.Detail
}

// InvalidPackageError lists every problem found in a package. TooLarge is
// set when a size limit was passed before the package could be read.
type InvalidPackageError struct {
	Problems []Problem
	TooLarge bool
}

func (e *InvalidPackageError) Error() string {
	lines := make([]string, len(e.Problems))
	for i, p := range e.Problems {
		lines[i] = p.String()
	}
	return "invalid package:\n" + strings.Join(lines, "\n")
}
