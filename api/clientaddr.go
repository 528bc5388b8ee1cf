package api

import (
	"net"
	"net/http"
	"net/netip"
	"strings"
)

// clientAddress is the address a request came from, as sign-in failures
// are counted: the peer's, unless the peer is one of the trusted proxies.
// Then X-Forwarded-For is read from the right (each proxy appends the
// address it saw): the first entry that is not a trusted proxy is the
// client. Entries further left were written by the client and are never
// read, so a forged header cannot put its failures on another's address
// or give it a fresh count. An entry that does not parse stops the walk
// at the hop that passed it on; when every entry is a trusted proxy the
// left-most is the client.
func clientAddress(req *http.Request, trusted []netip.Prefix) string {
	hop, ok := parseHop(req.RemoteAddr)
	if !ok {
		return req.RemoteAddr
	}
	if !isTrusted(hop, trusted) {
		return hop.String()
	}
	entries := forwardedFor(req.Header)
	for i := len(entries) - 1; i >= 0; i-- {
		next, ok := parseHop(entries[i])
		if !ok {
			break
		}
		hop = next
		if !isTrusted(hop, trusted) {
			break
		}
	}
	return hop.String()
}

// forwardedFor lists the X-Forwarded-For entries of every such header,
// in order.
func forwardedFor(h http.Header) []string {
	var out []string
	for _, v := range h.Values("X-Forwarded-For") {
		for _, e := range strings.Split(v, ",") {
			out = append(out, strings.TrimSpace(e))
		}
	}
	return out
}

// parseHop reads an address, with or without a port ("192.0.2.1",
// "192.0.2.1:5000", "[2001:db8::1]:5000", "2001:db8::1").
func parseHop(s string) (netip.Addr, bool) {
	if ip, err := netip.ParseAddr(strings.Trim(s, "[]")); err == nil {
		return ip.Unmap().WithZone(""), true
	}
	host, _, err := net.SplitHostPort(s)
	if err != nil {
		return netip.Addr{}, false
	}
	ip, err := netip.ParseAddr(host)
	return ip.Unmap().WithZone(""), err == nil
}

func isTrusted(ip netip.Addr, trusted []netip.Prefix) bool {
	for _, p := range trusted {
		if p.Contains(ip) {
			return true
		}
	}
	return false
}

// ParseProxies reads a comma-separated list of trusted proxies: CIDRs or
// bare addresses.
func ParseProxies(list string) ([]netip.Prefix, error) {
	var out []netip.Prefix
	for _, f := range strings.Split(list, ",") {
		if f = strings.TrimSpace(f); f == "" {
			continue
		}
		if ip, err := netip.ParseAddr(f); err == nil {
			out = append(out, netip.PrefixFrom(ip.Unmap(), ip.Unmap().BitLen()))
			continue
		}
		p, err := netip.ParsePrefix(f)
		if err != nil {
			return nil, &ProxyListError{Entry: f}
		}
		out = append(out, p.Masked())
	}
	return out, nil
}

// ProxyListError names an entry of the trusted proxies that is neither a
// CIDR nor an address.
type ProxyListError struct{ Entry string }

func (e *ProxyListError) Error() string {
	return "the trusted proxy " + `"` + e.Entry + `"` + " is neither a CIDR nor an address"
}
