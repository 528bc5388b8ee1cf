package api

import (
	"net/http"
	"net/http/httptest"
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
		if err := s.csrf()(func(echo.Context) error { return nil })(c); err != nil {
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

// TestCSRFNeedsTheToken: a same-origin POST without the form's token is
// refused even though the browser's fetch metadata would let it through.
func TestCSRFNeedsTheToken(t *testing.T) {
	s := &Server{echo: echo.New()}
	h := tokenOnly(s.csrf()(func(c echo.Context) error { return c.NoContent(http.StatusNoContent) }))
	req := httptest.NewRequest(http.MethodPost, "/session/end", strings.NewReader(""))
	req.Header.Set(echo.HeaderSecFetchSite, "same-origin")
	req.Header.Set(echo.HeaderContentType, echo.MIMEApplicationForm)
	err := h(s.echo.NewContext(req, httptest.NewRecorder()))
	if he, ok := err.(*echo.HTTPError); !ok || he.Code != http.StatusBadRequest {
		t.Fatalf("a POST without its token: %v", err)
	}
}
