package service

import (
	"context"
	"errors"
	"fmt"
	"net"
	"net/netip"
	"net/url"
	"strconv"
	"syscall"
	"time"
)

// WebhookURLRule is what a webhook URL must be.
const WebhookURLRule = "url must be an absolute http or https URL of at most 2000 characters"

// Egress is the way out to webhook receivers: which addresses they may
// have, and how their names are looked up. Its zero value refuses every
// address of a refused class (see AddressClass) and uses the system's
// resolver.
type Egress struct {
	Allow Allow
	// Lookup resolves a host name to its addresses; nil is the system's
	// resolver. Tests give their own.
	Lookup func(ctx context.Context, host string) ([]netip.Addr, error)
}

// RefusedAddressError says that a webhook's host resolves to an address
// of a refused class.
type RefusedAddressError struct {
	Host  string
	Class string
}

func (e *RefusedAddressError) Error() string {
	return fmt.Sprintf("the host %q resolves to a %s address", e.Host, e.Class)
}

// Resolve returns the addresses to dial for host: all it resolves to,
// each checked, so that one refused address refuses the host. A host
// name on the allow-list is not checked; an address in an allowed network
// passes whatever its class.
func (e *Egress) Resolve(ctx context.Context, host string) ([]netip.Addr, error) {
	addrs, err := e.lookup(ctx, host)
	if err != nil || e.Allow.host(host) {
		return addrs, err
	}
	for _, ip := range addrs {
		if err := e.check(host, ip); err != nil {
			return nil, err
		}
	}
	return addrs, nil
}

func (e *Egress) check(host string, ip netip.Addr) error {
	if c := AddressClass(ip); c != "" && !e.Allow.addr(ip) {
		return &RefusedAddressError{Host: host, Class: c}
	}
	return nil
}

func (e *Egress) lookup(ctx context.Context, host string) ([]netip.Addr, error) {
	if ip, err := netip.ParseAddr(host); err == nil {
		return []netip.Addr{ip.Unmap().WithZone("")}, nil
	}
	look := e.Lookup
	if look == nil {
		look = func(ctx context.Context, host string) ([]netip.Addr, error) {
			return net.DefaultResolver.LookupNetIP(ctx, "ip", host)
		}
	}
	addrs, err := look(ctx, host)
	if err == nil && len(addrs) == 0 {
		err = &net.DNSError{Err: "no addresses", Name: host, IsNotFound: true}
	}
	return addrs, err
}

// CheckURL checks a webhook URL as it is registered: its form, and that
// its host resolves to addresses a delivery may reach. The error is an
// *Error to show the editor (never the resolver's own words, which can
// name internal servers).
func (e *Egress) CheckURL(ctx context.Context, rawURL string) error {
	u, err := url.Parse(rawURL)
	if err != nil || (u.Scheme != "http" && u.Scheme != "https") || u.Hostname() == "" || len(rawURL) > 2000 {
		return Errorf(EInvalid, WebhookURLRule)
	}
	_, err = e.Resolve(ctx, u.Hostname())
	var refused *RefusedAddressError
	var dns *net.DNSError
	switch {
	case errors.As(err, &refused):
		return Errorf(EInvalid, "url: %s, which webhooks may not reach; a receiver on such a network needs "+
			"the server's webhook allow-list (--webhook-allow)", refused.Error())
	case errors.As(err, &dns) && dns.IsNotFound:
		return Errorf(EInvalid, "url: the host %q does not resolve", u.Hostname())
	case err != nil:
		return &Error{Code: EUnavailable, Err: err,
			Message: fmt.Sprintf("The host %q could not be looked up; try again shortly.", u.Hostname())}
	}
	return nil
}

// dialTimeout bounds one connection attempt to a receiver.
const dialTimeout = 10 * time.Second

// DialContext is a dialer for an http.Transport: it resolves the host
// once, checks every address, and dials the checked addresses themselves
// (never the name again, so a second answer from DNS cannot swap in
// another address), each checked once more as the socket connects.
func (e *Egress) DialContext(ctx context.Context, network, hostport string) (net.Conn, error) {
	host, portText, err := net.SplitHostPort(hostport)
	if err != nil {
		return nil, err
	}
	port, err := strconv.ParseUint(portText, 10, 16)
	if err != nil {
		return nil, fmt.Errorf("webhook port %q: %w", portText, err)
	}
	addrs, err := e.Resolve(ctx, host)
	if err != nil {
		return nil, err
	}
	d := net.Dialer{Timeout: dialTimeout, Control: e.control(host)}
	var errs []error
	for _, ip := range addrs {
		conn, err := d.DialContext(ctx, network, netip.AddrPortFrom(ip, uint16(port)).String())
		if err == nil {
			return conn, nil
		}
		errs = append(errs, err)
	}
	return nil, errors.Join(errs...)
}

// control checks the address a socket is about to connect to.
func (e *Egress) control(host string) func(network, address string, _ syscall.RawConn) error {
	return func(_, address string, _ syscall.RawConn) error {
		ap, err := netip.ParseAddrPort(address)
		if err != nil || e.Allow.host(host) {
			return err
		}
		return e.check(host, ap.Addr())
	}
}
