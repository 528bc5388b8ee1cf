package service

import (
	"context"
	"errors"
	"net"
	"net/netip"
	"sync/atomic"
	"testing"
)

// addressClasses: each address with its class and the registry entry that
// gives it (RFC 6890 and the IANA special-purpose registries; the
// metadata addresses are the providers' documented endpoints).
var addressClasses = []struct {
	addr, class, source string
}{
	{"8.8.8.8", "", "a public resolver's address"},
	{"2606:4700::1111", "", "a public IPv6 address"},
	{"192.0.2.10", "", "documentation, RFC 5737: not internal, so not refused"},
	{"127.0.0.1", ClassLoopback, "RFC 1122, 127/8"},
	{"127.255.0.9", ClassLoopback, "RFC 1122, 127/8"},
	{"::1", ClassLoopback, "RFC 4291"},
	{"::ffff:127.0.0.1", ClassLoopback, "IPv4-mapped, RFC 4291 2.5.5.2"},
	{"0.0.0.0", ClassUnspecified, "RFC 1122"},
	{"0.1.2.3", ClassUnspecified, "this network, RFC 791"},
	{"::", ClassUnspecified, "RFC 4291"},
	{"10.1.2.3", ClassPrivate, "RFC 1918"},
	{"172.31.255.255", ClassPrivate, "RFC 1918"},
	{"172.32.0.1", "", "just past 172.16/12"},
	{"192.168.0.1", ClassPrivate, "RFC 1918"},
	{"fd12:3456::1", ClassPrivate, "unique local, RFC 4193"},
	{"100.64.0.1", ClassPrivate, "shared address space, RFC 6598"},
	{"169.254.1.1", ClassLinkLocal, "RFC 3927"},
	{"fe80::1", ClassLinkLocal, "RFC 4291"},
	{"169.254.169.254", ClassMetadata, "instance metadata"},
	{"fd00:ec2::254", ClassMetadata, "instance metadata over IPv6"},
	{"100.100.100.200", ClassMetadata, "instance metadata in shared space"},
	{"224.0.0.1", ClassMulticast, "RFC 5771"},
	{"ff02::1", ClassMulticast, "RFC 4291"},
	{"255.255.255.255", ClassReserved, "limited broadcast, RFC 919"},
	{"240.0.0.1", ClassReserved, "RFC 1112"},
	{"198.18.0.1", ClassReserved, "benchmarking, RFC 2544"},
	{"64:ff9b::a00:1", ClassPrivate, "NAT64 of 10.0.0.1, RFC 6052"},
	{"64:ff9b::808:808", "", "NAT64 of 8.8.8.8, RFC 6052"},
	{"2002:7f00:1::1", ClassLoopback, "6to4 of 127.0.0.1, RFC 3056"},
	{"2001:0:4136:e378::1", ClassReserved, "Teredo, RFC 4380"},
}

func TestAddressClass(t *testing.T) {
	for _, tc := range addressClasses {
		if got := AddressClass(netip.MustParseAddr(tc.addr)); got != tc.class {
			t.Errorf("%s (%s): class %q, want %q", tc.addr, tc.source, got, tc.class)
		}
	}
}

func TestParseAllow(t *testing.T) {
	a, err := ParseAllow(" 10.20.0.0/16, 192.0.2.7 ,Hooks.Office.Internal,, fd00::/8")
	if err != nil || a.String() != "10.20.0.0/16,192.0.2.7/32,fd00::/8,hooks.office.internal" {
		t.Fatalf("allow-list %q, %v", a.String(), err)
	}
	for _, bad := range []string{"10.0.0.0/33", "http://x", "a b", "10.0.0.1:80"} {
		if _, err := ParseAllow(bad); err == nil {
			t.Errorf("%q accepted", bad)
		}
	}
}

// fixedLookup answers every name with the same addresses.
func fixedLookup(addrs ...string) func(context.Context, string) ([]netip.Addr, error) {
	return func(context.Context, string) ([]netip.Addr, error) {
		out := make([]netip.Addr, len(addrs))
		for i, a := range addrs {
			out[i] = netip.MustParseAddr(a)
		}
		return out, nil
	}
}

func TestEgress_CheckURL(t *testing.T) {
	allowNet, _ := ParseAllow("10.20.0.0/16")
	allowHost, _ := ParseAllow("hooks.office.internal")
	for _, tc := range []struct {
		name, url string
		e         Egress
		code      string
	}{
		{"Public", "https://hooks.example/x", Egress{Lookup: fixedLookup("8.8.8.8")}, ""},
		{"Loopback", "https://hooks.example/x", Egress{Lookup: fixedLookup("127.0.0.1")}, EInvalid},
		{"LiteralMetadata", "http://169.254.169.254/latest", Egress{}, EInvalid},
		{"LiteralIPv6Loopback", "http://[::1]:8080/", Egress{}, EInvalid},
		{"OnePrivateOfTwo", "https://h.example/", Egress{Lookup: fixedLookup("8.8.8.8", "10.0.0.5")}, EInvalid},
		{"AllowedNet", "https://h.example/", Egress{Allow: allowNet, Lookup: fixedLookup("10.20.3.4")}, ""},
		{"OutsideAllowedNet", "https://h.example/", Egress{Allow: allowNet, Lookup: fixedLookup("10.21.0.1")},
			EInvalid},
		{"AllowedHost", "https://hooks.office.internal/", Egress{Allow: allowHost, Lookup: fixedLookup("10.9.9.9")},
			""},
		{"NotAURL", "ftp://x/", Egress{}, EInvalid},
		{"NoHost", "https:///x", Egress{}, EInvalid},
		{"Unknown", "https://nowhere.invalid/", Egress{Lookup: func(context.Context, string) ([]netip.Addr, error) {
			return nil, &net.DNSError{Err: "no such host", Name: "nowhere.invalid", IsNotFound: true}
		}}, EInvalid},
	} {
		if got := ErrorCode(tc.e.CheckURL(context.Background(), tc.url)); got != tc.code {
			t.Errorf("%s: %q, want %q", tc.name, got, tc.code)
		}
	}
}

// A name that resolves to a public address when the webhook is set and to
// loopback when it is delivered (DNS rebinding) is refused at delivery:
// the dialer looks the name up itself and checks what it will dial.
func TestEgress_DialRefusesARebindingName(t *testing.T) {
	ln := listen(t)
	var calls atomic.Int32
	e := Egress{Lookup: func(context.Context, string) ([]netip.Addr, error) {
		if calls.Add(1) == 1 {
			return fixedLookup("8.8.8.8")(context.Background(), "")
		}
		return fixedLookup("127.0.0.1")(context.Background(), "")
	}}
	if err := e.CheckURL(context.Background(), "http://rebind.example/"); err != nil {
		t.Fatalf("registration: %v", err)
	}
	_, err := e.DialContext(context.Background(), "tcp", "rebind.example:"+port(ln))
	var refused *RefusedAddressError
	if !errors.As(err, &refused) || refused.Class != ClassLoopback {
		t.Fatalf("delivery to a name now on loopback: %v", err)
	}
}

// With loopback allowed, the dialer connects to the address it looked up
// and checked, not to the name (which no resolver knows here).
func TestEgress_DialsTheCheckedAddress(t *testing.T) {
	ln := listen(t)
	allow, _ := ParseAllow("127.0.0.0/8")
	e := Egress{Allow: allow, Lookup: fixedLookup("127.0.0.1")}
	conn, err := e.DialContext(context.Background(), "tcp", "receiver.invalid:"+port(ln))
	if err != nil {
		t.Fatal(err)
	}
	defer conn.Close()
	if got := conn.RemoteAddr().String(); got != ln.Addr().String() {
		t.Fatalf("connected to %s, want %s", got, ln.Addr())
	}
	if err := (&Egress{}).control("h")("tcp4", ln.Addr().String(), nil); err == nil {
		t.Fatal("the socket check lets a loopback address through")
	}
}

func listen(t *testing.T) net.Listener {
	t.Helper()
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { ln.Close() })
	return ln
}

func port(ln net.Listener) string {
	_, p, _ := net.SplitHostPort(ln.Addr().String())
	return p
}
