package main

import (
	"context"
	"net/http"
	"net/url"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

// postFrom posts a form with the headers given (name, value, ...).
func (w *webClient) postFrom(path string, form url.Values, headers ...string) int {
	req, _ := http.NewRequest(http.MethodPost, w.base+path, strings.NewReader(form.Encode()))
	req.Header.Set("Content-Type", "application/x-www-form-urlencoded")
	for i := 0; i+1 < len(headers); i += 2 {
		req.Header.Set(headers[i], headers[i+1])
	}
	resp, err := w.http.Do(req)
	if err != nil {
		w.t.Fatal(err)
	}
	resp.Body.Close()
	return resp.StatusCode
}

// signInForm opens the sign-in page and returns its CSRF token.
func (w *webClient) signInForm() string {
	w.t.Helper()
	_, page := w.get("/")
	m := csrfRE.FindStringSubmatch(page)
	if m == nil {
		w.t.Fatalf("no CSRF token on the sign-in page: %.300s", page)
	}
	return m[1]
}

// Guesses alternated with a key of one's own still wait: a success does
// not forget the address's failures.
func TestWeb_SignInAlternatedWithOwnKey(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMainWith(t, dburl, func(c *Config) { c.Workers = 0 })
	defer m.Close()
	own := mustKeyToken(t, db, "Office G", service.RoleSubmitter)
	w := newWebClient(t, m.URL())
	csrf := w.signInForm()
	for i := 1; i <= 4; i++ {
		if code := w.postFrom("/session", url.Values{"key": {"pv_guess"}, "_csrf": {csrf}}); code != 422 {
			t.Fatalf("guess %d: %d", i, code)
		}
		code := w.postFrom("/session", url.Values{"key": {own}, "_csrf": {csrf}})
		if i < 4 && code != http.StatusSeeOther {
			t.Fatalf("own key after guess %d: %d", i, code)
		}
		if i == 4 && code != http.StatusTooManyRequests {
			t.Fatalf("after four guesses between own sign-ins: %d, want 429", code)
		}
		csrf = newWebClientToken(t, w)
	}
}

// newWebClientToken starts the client afresh (signed out) and returns the
// sign-in form's token.
func newWebClientToken(t *testing.T, w *webClient) string {
	*w = *newWebClient(t, w.base)
	return w.signInForm()
}

// From a peer that is not a trusted proxy, X-Forwarded-For is not read: a
// forged header neither puts failures on another's address (locking it
// out) nor gives the guesser a fresh count.
func TestWeb_SignInForgedForwardedFor(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMainWith(t, dburl, func(c *Config) { c.Workers, c.TrustedProxies = 0, "192.0.2.1" })
	defer m.Close()
	w := newWebClient(t, m.URL())
	csrf := w.signInForm()
	for range 4 {
		w.postFrom("/session", url.Values{"key": {"pv_guess"}, "_csrf": {csrf}}, "X-Forwarded-For", "198.51.100.7")
	}
	code := w.postFrom("/session", url.Values{"key": {"pv_guess"}, "_csrf": {csrf}}, "X-Forwarded-For", "198.51.100.99")
	if code != http.StatusTooManyRequests {
		t.Errorf("a fresh forged address after four failures: %d, want 429", code)
	}
	if wait, _ := db.SignInWait(context.Background(), "198.51.100.7"); wait != 0 {
		t.Errorf("the forged address waits %v", wait)
	}
	if wait, _ := db.SignInWait(context.Background(), "127.0.0.1"); wait == 0 {
		t.Error("the real peer does not wait")
	}
}

// Through a trusted proxy the right-most entry it did not write itself is
// the client: the guesser's failures fall on its own address, and the
// address it forged further left signs in at once.
func TestWeb_SignInThroughTrustedProxy(t *testing.T) {
	db, dburl := storetest.MustOpenDB(t)
	m := startMainWith(t, dburl, func(c *Config) { c.Workers, c.TrustedProxies = 0, "127.0.0.1/32" })
	defer m.Close()
	victim := mustKeyToken(t, db, "Office V", service.RoleEditor)
	w := newWebClient(t, m.URL())
	csrf := w.signInForm()
	for range 4 {
		w.postFrom("/session", url.Values{"key": {"pv_guess"}, "_csrf": {csrf}},
			"X-Forwarded-For", "198.51.100.7, 203.0.113.9")
	}
	if code := w.postFrom("/session", url.Values{"key": {"pv_guess"}, "_csrf": {csrf}},
		"X-Forwarded-For", "203.0.113.9"); code != http.StatusTooManyRequests {
		t.Errorf("the guesser after four failures: %d, want 429", code)
	}
	if code := w.postFrom("/session", url.Values{"key": {victim}, "_csrf": {csrf}},
		"X-Forwarded-For", "198.51.100.7"); code != http.StatusSeeOther {
		t.Errorf("the address the guesser forged signs in: %d, want 303", code)
	}
}
