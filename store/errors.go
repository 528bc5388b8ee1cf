package store

import (
	"context"
	"errors"
	"fmt"
	"io"
	"net"
	"strings"
	"syscall"

	"github.com/jackc/pgx/v5"
	"github.com/jackc/pgx/v5/pgconn"

	"github.com/pathvet/pathvet/api/service"
)

// dbError maps pgx's errors to the service's codes: no rows is not found,
// a unique violation a conflict, a value PostgreSQL cannot take (SQLSTATE
// class 22: a NUL in text, a timestamp out of range) invalid, and a lost
// or refused connection unavailable; a coded error passes through.
func dbError(err error, what string) error {
	var pe *pgconn.PgError
	var ce *service.Error
	switch {
	case err == nil:
		return nil
	case errors.As(err, &ce):
		return err
	case errors.Is(err, pgx.ErrNoRows):
		return service.Errorf(service.ENotFound, "%s not found", what)
	case errors.As(err, &pe) && pe.Code == "23505":
		return service.Errorf(service.EConflict, "%s already exists", what)
	case errors.As(err, &pe) && strings.HasPrefix(pe.Code, "22"):
		return &service.Error{Code: service.EInvalid, Err: err,
			Message: fmt.Sprintf("a value sent for the %s cannot be stored: %s", what, pe.Message)}
	case unavailable(err):
		return &service.Error{Code: service.EUnavailable, Err: err,
			Message: "The database is unavailable; try again shortly."}
	}
	return fmt.Errorf("store: %s: %w", what, err)
}

// unavailableStates are SQLSTATEs of a server that is going away or
// cannot take the connection: class 08 (connection exception), class 53
// (insufficient resources) and the 57P0x shutdowns.
var unavailableStates = []string{"08", "53", "57P01", "57P02", "57P03"}

// unavailable reports whether err says the database cannot be reached or
// dropped the connection, rather than refusing the statement.
func unavailable(err error) bool {
	var connect *pgconn.ConnectError
	if errors.As(err, &connect) {
		return true // whatever the server said, the connection was not made
	}
	var pe *pgconn.PgError
	if errors.As(err, &pe) {
		for _, st := range unavailableStates {
			if strings.HasPrefix(pe.Code, st) {
				return true
			}
		}
		return false
	}
	var netErr net.Error
	return errors.As(err, &netErr) || pgconn.SafeToRetry(err) ||
		errors.Is(err, io.EOF) || errors.Is(err, io.ErrUnexpectedEOF) || errors.Is(err, syscall.ECONNREFUSED) ||
		errors.Is(err, syscall.ECONNRESET) || errors.Is(err, syscall.EPIPE) ||
		errors.Is(err, context.DeadlineExceeded) || strings.Contains(err.Error(), "conn closed") ||
		strings.Contains(err.Error(), "closed pool")
}
