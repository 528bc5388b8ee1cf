package store

import (
	"context"
	"crypto/tls"
	"crypto/x509"
	"errors"
	"fmt"
	"io"
	"net"
	"syscall"

	"github.com/pathvet/pathvet/api/service"
)

// deliveryFailure names the class of a failed delivery, as the office
// sees it: a refused address, a name that does not resolve, a refused or
// reset connection, a time-out, a TLS error, or the receiver's HTTP
// status class.
func deliveryFailure(err error) string {
	var refused *service.RefusedAddressError
	var status *statusError
	var dns *net.DNSError
	switch {
	case errors.As(err, &refused):
		return "refused address: the receiver's host resolves to a " + refused.Class +
			" address (see the webhook allow-list)"
	case errors.As(err, &status):
		return httpClass(status.code)
	case errors.As(err, &dns):
		return "DNS lookup failed"
	case errors.Is(err, syscall.ECONNREFUSED):
		return "connection refused"
	case timedOut(err):
		return "timed out"
	case tlsFailure(err):
		return "TLS error"
	case errors.Is(err, syscall.ECONNRESET), errors.Is(err, io.EOF), errors.Is(err, io.ErrUnexpectedEOF):
		return "connection reset"
	case errors.Is(err, syscall.ENETUNREACH), errors.Is(err, syscall.EHOSTUNREACH):
		return "network unreachable"
	}
	return "request failed"
}

func httpClass(code int) string {
	if code >= 300 && code < 400 {
		return fmt.Sprintf("HTTP %dxx (redirects are not followed)", code/100)
	}
	return fmt.Sprintf("HTTP %dxx", code/100)
}

func timedOut(err error) bool {
	var ne net.Error
	return errors.Is(err, context.DeadlineExceeded) || errors.As(err, &ne) && ne.Timeout()
}

func tlsFailure(err error) bool {
	var rec tls.RecordHeaderError
	var alert tls.AlertError
	var verify *tls.CertificateVerificationError
	var unknown x509.UnknownAuthorityError
	var host x509.HostnameError
	var invalid x509.CertificateInvalidError
	return errors.As(err, &rec) || errors.As(err, &alert) || errors.As(err, &verify) ||
		errors.As(err, &unknown) || errors.As(err, &host) || errors.As(err, &invalid)
}
