package api

import (
	"net/http"
	"testing"
)

// The client's address: the peer's unless the peer is a trusted proxy,
// then the right-most X-Forwarded-For entry that is not one (each proxy
// appends the address it saw; what lies further left the client wrote).
func TestClientAddress(t *testing.T) {
	trusted, err := ParseProxies("10.0.0.1, 10.0.1.0/24, 2001:db8::/32")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		name, peer string
		xff        []string
		want       string
	}{
		{"NoProxy", "203.0.113.9:5000", nil, "203.0.113.9"},
		{"HeaderFromAnUntrustedPeer", "203.0.113.9:5000", []string{"198.51.100.7"}, "203.0.113.9"},
		{"PrivatePeerNotTrusted", "10.0.0.50:5000", []string{"198.51.100.7"}, "10.0.0.50"},
		{"OneProxy", "10.0.0.1:443", []string{"203.0.113.9"}, "203.0.113.9"},
		{"ForgedLeftEntry", "10.0.0.1:443", []string{"198.51.100.7, 203.0.113.9"}, "203.0.113.9"},
		{"TwoProxies", "10.0.0.1:443", []string{"198.51.100.7, 203.0.113.9, 10.0.1.7"}, "203.0.113.9"},
		{"TwoHeaders", "10.0.0.1:443", []string{"198.51.100.7", "203.0.113.9"}, "203.0.113.9"},
		{"Malformed", "10.0.0.1:443", []string{"203.0.113.9, not-an-address"}, "10.0.0.1"},
		{"MalformedBehindTwo", "10.0.0.1:443", []string{"junk, 10.0.1.7"}, "10.0.1.7"},
		{"AllTrusted", "10.0.0.1:443", []string{"10.0.1.8, 10.0.1.7"}, "10.0.1.8"},
		{"EmptyHeader", "10.0.0.1:443", []string{""}, "10.0.0.1"},
		{"WithPort", "10.0.0.1:443", []string{"203.0.113.9:61000"}, "203.0.113.9"},
		{"IPv6", "[2001:db8::2]:443", []string{"[2001:db9::5]:4711"}, "2001:db9::5"},
		{"Mapped", "[::ffff:10.0.0.1]:443", []string{"::ffff:203.0.113.9"}, "203.0.113.9"},
	} {
		req := &http.Request{RemoteAddr: tc.peer, Header: http.Header{}}
		for _, v := range tc.xff {
			req.Header.Add("X-Forwarded-For", v)
		}
		if got := clientAddress(req, trusted); got != tc.want {
			t.Errorf("%s: %s, want %s", tc.name, got, tc.want)
		}
	}
	if _, err := ParseProxies("10.0.0.0/8, proxy.example"); err == nil {
		t.Error("a host name taken for a trusted proxy")
	}
}
