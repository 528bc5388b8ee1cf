package store_test

import (
	"net"
	"net/http"
	"net/http/httptest"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store"
	"github.com/pathvet/pathvet/store/storetest"
)

// A failed delivery is shown by its class, never by the error's text
// (which would map the workers' network for whoever sets the webhook):
// each case is a real request over loopback, allowed for the test.
func TestDelivery_FailuresByClass(t *testing.T) {
	db, _ := storetest.MustOpenDB(t)
	allow, _ := service.ParseAllow("127.0.0.1")
	loopback := &service.Egress{Allow: allow}
	answer := func(code int) string {
		srv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			if code == http.StatusFound {
				w.Header().Set("Location", "http://169.254.169.254/")
			}
			w.WriteHeader(code)
		}))
		t.Cleanup(srv.Close)
		return srv.URL
	}
	tlsSrv := httptest.NewTLSServer(http.NotFoundHandler())
	t.Cleanup(tlsSrv.Close)
	for _, tc := range []struct {
		name, url string
		e         *service.Egress
		code      int
		want      string
	}{
		{"Delivered", answer(http.StatusNoContent), loopback, 204, ""},
		{"RefusedAddress", answer(http.StatusNoContent), &service.Egress{}, 0, "refused address: the receiver's host " +
			"resolves to a loopback address (see the webhook allow-list)"},
		{"Metadata", "http://169.254.169.254/latest/meta-data/", loopback, 0, "refused address: the receiver's host " +
			"resolves to a cloud metadata address (see the webhook allow-list)"},
		{"ServerError", answer(http.StatusServiceUnavailable), loopback, 503, "HTTP 5xx"},
		{"Redirect", answer(http.StatusFound), loopback, 302, "HTTP 3xx (redirects are not followed)"},
		{"ConnectionRefused", "http://127.0.0.1:" + closedPort(t) + "/", loopback, 0, "connection refused"},
		{"TLS", tlsSrv.URL, loopback, 0, "TLS error"},
		{"TimedOut", "http://" + silentListener(t) + "/", loopback, 0, "timed out"},
		{"Reset", "http://" + closingListener(t) + "/", loopback, 0, "connection reset"},
		{"NoSuchHost", "http://receiver.invalid/", loopback, 0, "DNS lookup failed"},
	} {
		code, got := store.PostWebhook(db, tc.e, tc.url, 2*time.Second)
		if code != tc.code || got != tc.want {
			t.Errorf("%s: %d %q, want %d %q", tc.name, code, got, tc.code, tc.want)
		}
		if strings.Contains(got, "127.0.0.1") {
			t.Errorf("%s: the class %q shows the address", tc.name, got)
		}
	}
}

// closedPort is a loopback port nothing listens on.
func closedPort(t *testing.T) string {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	_, port, _ := net.SplitHostPort(ln.Addr().String())
	ln.Close()
	return port
}

// silentListener accepts connections and never answers.
func silentListener(t *testing.T) string {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	var mu sync.Mutex
	var conns []net.Conn
	t.Cleanup(func() {
		ln.Close()
		mu.Lock()
		defer mu.Unlock()
		for _, c := range conns {
			c.Close()
		}
	})
	go func() {
		for {
			c, err := ln.Accept()
			if err != nil {
				return
			}
			mu.Lock()
			conns = append(conns, c)
			mu.Unlock()
		}
	}()
	return ln.Addr().String()
}

// closingListener closes each connection as soon as it is made.
func closingListener(t *testing.T) string {
	ln, err := net.Listen("tcp", "127.0.0.1:0")
	if err != nil {
		t.Fatal(err)
	}
	t.Cleanup(func() { ln.Close() })
	go func() {
		for {
			c, err := ln.Accept()
			if err != nil {
				return
			}
			c.Close()
		}
	}()
	return ln.Addr().String()
}
