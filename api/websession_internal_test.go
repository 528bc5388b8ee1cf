package api

import (
	"net/http"
	"net/http/httptest"
	"net/url"
	"strings"
	"testing"

	"github.com/labstack/echo/v4"
)

// TestCookieFlags: the session and CSRF cookies are HttpOnly and
// SameSite=Lax always, and Secure exactly when the server sits behind TLS.
func TestCookieFlags(t *testing.T) {
	for _, tls := range []bool{false, true} {
		s := &Server{cfg: Config{TLSProxy: tls}, echo: echo.New()}
		rec := httptest.NewRecorder()
		c := s.echo.NewContext(httptest.NewRequest(http.MethodGet, "/", nil), rec)
		s.setSessionCookie(c, "id", 60)
		if err := s.csrf(func(echo.Context) error { return nil })(c); err != nil {
			t.Fatal(err)
		}
		cookies := rec.Result().Cookies()
		if len(cookies) != 2 {
			t.Fatalf("%d cookies, want the session's and the CSRF token's", len(cookies))
		}
		for _, ck := range cookies {
			if !ck.HttpOnly || ck.SameSite != http.SameSiteLaxMode || ck.Secure != tls || ck.Path != "/" {
				t.Errorf("behind TLS %v: cookie %s is %+v", tls, ck.Name, ck)
			}
		}
	}
}

// csrfPost runs a POST through the CSRF guard, as a browser with the
// session (or, for "", the pre-session cookie "browser-cookie-...") sends
// it, with a form body, a query string and headers; it returns the
// guard's status (204 when it let the request through).
func csrfPost(t *testing.T, session, query string, form url.Values, headers ...string) int {
	t.Helper()
	s := &Server{echo: echo.New()}
	req := httptest.NewRequest(http.MethodPost, "/session/end?"+query, strings.NewReader(form.Encode()))
	req.Header.Set(echo.HeaderContentType, echo.MIMEApplicationForm)
	req.Header.Set(echo.HeaderSecFetchSite, "same-origin")
	req.AddCookie(&http.Cookie{Name: csrfCookie, Value: preSession})
	for i := 0; i+1 < len(headers); i += 2 {
		req.Header.Set(headers[i], headers[i+1])
	}
	c := s.echo.NewContext(req, httptest.NewRecorder())
	if session != "" {
		c.Set(sessionCtx, session)
	}
	err := s.csrf(func(c echo.Context) error { return c.NoContent(http.StatusNoContent) })(c)
	if he, ok := err.(*echo.HTTPError); ok {
		return he.Code
	}
	if err != nil {
		t.Fatal(err)
	}
	return http.StatusNoContent
}

const preSession = "browser-cookie-0123456789abcdef0123456789abcdef"

// The token comes from the form body or the X-CSRF-Token header, never
// the query string; the browser's fetch metadata is no substitute.
func TestCSRF_WhereTheTokenIsRead(t *testing.T) {
	tok := csrfTokenFor("session:A")
	for _, tc := range []struct {
		name    string
		query   string
		form    url.Values
		headers []string
		want    int
	}{
		{"Body", "", url.Values{csrfField: {tok}}, nil, http.StatusNoContent},
		{"Header", "", nil, []string{csrfHeader, tok}, http.StatusNoContent},
		{"None", "", nil, nil, http.StatusBadRequest},
		{"QueryOnly", url.Values{csrfField: {tok}}.Encode(), nil, nil, http.StatusBadRequest},
		{"WrongInBody", "", url.Values{csrfField: {tok + "x"}}, nil, http.StatusForbidden},
	} {
		if got := csrfPost(t, "A", tc.query, tc.form, tc.headers...); got != tc.want {
			t.Errorf("%s: %d, want %d", tc.name, got, tc.want)
		}
	}
}

// The token is the session's: another session's token is refused, and so
// is the pre-session token once the browser has signed in (and the
// reverse).
func TestCSRF_TiedToTheSession(t *testing.T) {
	for _, tc := range []struct {
		name, session, tokenOf string
		want                   int
	}{
		{"OwnSession", "A", "session:A", http.StatusNoContent},
		{"OtherSession", "B", "session:A", http.StatusForbidden},
		{"PreSessionTokenAfterSignIn", "A", "browser:" + preSession, http.StatusForbidden},
		{"PreSession", "", "browser:" + preSession, http.StatusNoContent},
		{"SessionTokenWithoutSession", "", "session:A", http.StatusForbidden},
	} {
		form := url.Values{csrfField: {csrfTokenFor(tc.tokenOf)}}
		if got := csrfPost(t, tc.session, "", form); got != tc.want {
			t.Errorf("%s: %d, want %d", tc.name, got, tc.want)
		}
	}
}
