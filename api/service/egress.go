package service

import (
	"fmt"
	"net/netip"
	"strings"
)

// Address classes a webhook may not reach unless the allow-list names
// them (special-purpose registries of RFC 6890 and IANA; the metadata
// addresses are the cloud providers' documented instance-metadata
// endpoints).
const (
	ClassUnspecified = "unspecified"
	ClassLoopback    = "loopback"
	ClassPrivate     = "private"
	ClassLinkLocal   = "link-local"
	ClassMulticast   = "multicast"
	ClassMetadata    = "cloud metadata"
	ClassReserved    = "reserved"
)

// metadataAddrs are instance-metadata endpoints: 169.254.169.254 (most
// clouds), 169.254.170.2 (container task metadata), fd00:ec2::254 (the
// same over IPv6) and 100.100.100.200 (a provider that uses shared space).
var metadataAddrs = []netip.Addr{
	netip.MustParseAddr("169.254.169.254"), netip.MustParseAddr("169.254.170.2"),
	netip.MustParseAddr("fd00:ec2::254"), netip.MustParseAddr("100.100.100.200"),
}

// classNets are special-purpose blocks the standard library's predicates
// do not cover, with the class they count as.
var classNets = []struct {
	net   netip.Prefix
	class string
}{
	{netip.MustParsePrefix("0.0.0.0/8"), ClassUnspecified},  // "this network", RFC 791
	{netip.MustParsePrefix("100.64.0.0/10"), ClassPrivate},  // shared address space, RFC 6598
	{netip.MustParsePrefix("192.0.0.0/24"), ClassReserved},  // IETF protocol assignments, RFC 6890
	{netip.MustParsePrefix("198.18.0.0/15"), ClassReserved}, // benchmarking, RFC 2544
	{netip.MustParsePrefix("240.0.0.0/4"), ClassReserved},   // reserved and broadcast, RFC 1112
	{netip.MustParsePrefix("::/96"), ClassReserved},         // IPv4-compatible, deprecated by RFC 4291
	{netip.MustParsePrefix("100::/64"), ClassReserved},      // discard-only, RFC 6666
	{netip.MustParsePrefix("2001::/32"), ClassReserved},     // Teredo, RFC 4380
	{netip.MustParsePrefix("64:ff9b:1::/48"), ClassPrivate}, // local-use NAT64, RFC 8215
}

// nat64 and sixToFour carry an IPv4 address inside an IPv6 one (RFC 6052,
// RFC 3056); the IPv4 address is what they reach.
var (
	nat64     = netip.MustParsePrefix("64:ff9b::/96")
	sixToFour = netip.MustParsePrefix("2002::/16")
)

// AddressClass names the class of an address a webhook may not reach,
// or "" for a public one. An IPv4 address inside an IPv6 one (mapped,
// NAT64, 6to4) is judged by the IPv4 address.
func AddressClass(ip netip.Addr) string {
	ip = embeddedIPv4(ip.Unmap().WithZone(""))
	for _, m := range metadataAddrs {
		if ip == m {
			return ClassMetadata
		}
	}
	if c := predicateClass(ip); c != "" {
		return c
	}
	for _, n := range classNets {
		if n.net.Contains(ip) {
			return n.class
		}
	}
	return ""
}

func embeddedIPv4(ip netip.Addr) netip.Addr {
	b := ip.As16()
	switch {
	case nat64.Contains(ip):
		return netip.AddrFrom4([4]byte(b[12:16]))
	case sixToFour.Contains(ip):
		return netip.AddrFrom4([4]byte(b[2:6]))
	}
	return ip
}

func predicateClass(ip netip.Addr) string {
	switch {
	case !ip.IsValid() || ip.IsUnspecified():
		return ClassUnspecified
	case ip.IsLoopback():
		return ClassLoopback
	case ip.IsPrivate():
		return ClassPrivate
	case ip.IsLinkLocalUnicast():
		return ClassLinkLocal
	case ip.IsMulticast(), ip.IsLinkLocalMulticast(), ip.IsInterfaceLocalMulticast():
		return ClassMulticast
	}
	return ""
}

// Allow is the allow-list of webhook receivers on networks otherwise
// refused: networks (CIDRs; a bare address is one address) and host names
// (exactly as in the URL, any case), for on-premises receivers.
type Allow struct {
	Nets  []netip.Prefix
	Hosts []string
}

// ParseAllow reads a comma-separated allow-list: CIDRs, addresses and
// host names, for instance "10.20.0.0/16, hooks.office.internal".
func ParseAllow(list string) (Allow, error) {
	var a Allow
	for _, f := range strings.Split(list, ",") {
		f = strings.TrimSpace(f)
		switch p, err := parsePrefix(f); {
		case f == "":
		case err == nil:
			a.Nets = append(a.Nets, p)
		case strings.ContainsAny(f, "/:") || !validHostName(f):
			return Allow{}, fmt.Errorf("the allow-list entry %q is neither a CIDR, an address nor a host name", f)
		default:
			a.Hosts = append(a.Hosts, strings.ToLower(f))
		}
	}
	return a, nil
}

// parsePrefix reads a CIDR or a bare address (as its one-address prefix).
func parsePrefix(s string) (netip.Prefix, error) {
	if ip, err := netip.ParseAddr(s); err == nil {
		return netip.PrefixFrom(ip, ip.BitLen()), nil
	}
	p, err := netip.ParsePrefix(s)
	return p.Masked(), err
}

// validHostName: letters, digits, hyphens and dots, as DNS names are
// written (RFC 1123, section 2.1).
func validHostName(s string) bool {
	for _, r := range s {
		if !(r == '-' || r == '.' || r >= '0' && r <= '9' || r >= 'a' && r <= 'z' || r >= 'A' && r <= 'Z') {
			return false
		}
	}
	return s != "" && len(s) <= 253
}

// host reports whether the allow-list names this host.
func (a Allow) host(name string) bool {
	for _, h := range a.Hosts {
		if strings.EqualFold(h, name) {
			return true
		}
	}
	return false
}

// addr reports whether the allow-list covers this address.
func (a Allow) addr(ip netip.Addr) bool {
	ip = ip.Unmap().WithZone("")
	for _, n := range a.Nets {
		if n.Contains(ip) {
			return true
		}
	}
	return false
}

// String writes the allow-list as ParseAllow reads it.
func (a Allow) String() string {
	var out []string
	for _, n := range a.Nets {
		out = append(out, n.String())
	}
	return strings.Join(append(out, a.Hosts...), ",")
}
