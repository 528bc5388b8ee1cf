package api

import (
	"crypto/hmac"
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"net/http"

	"github.com/labstack/echo/v4"
)

// csrf guards every state-changing request of the workspace. Its token
// is tied to the browser's session: an HMAC-SHA256 (RFC 2104) keyed by
// the session id, which only the HttpOnly cookie holds, so no other
// session's token and no token made before sign-in passes; before
// sign-in it is keyed by a random cookie of its own (SameSite=Lax, so a
// cross-site POST carries none). A POST must bring it in the form body
// (_csrf) or the X-CSRF-Token header, never the query string, which the
// request log writes; a missing token is 400, a wrong one 403.
func (s *Server) csrf(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		key, err := s.csrfKey(c)
		if err != nil {
			return err
		}
		want := csrfTokenFor(key)
		c.Set(csrfContext, want)
		switch c.Request().Method {
		case http.MethodGet, http.MethodHead, http.MethodOptions:
			return next(c)
		}
		got := c.Request().PostFormValue(csrfField)
		if got == "" {
			got = c.Request().Header.Get(csrfHeader)
		}
		if got == "" {
			return problemError(http.StatusBadRequest, "The form lacks its security token (csrf).")
		}
		if !hmac.Equal([]byte(got), []byte(want)) {
			return problemError(http.StatusForbidden, "The form's security token is not this session's (csrf).")
		}
		return next(c)
	}
}

// csrfKey is what the token is tied to: the live session's id, or the
// browser's pre-session cookie, set here when it has none.
func (s *Server) csrfKey(c echo.Context) (string, error) {
	if id, ok := c.Get(sessionCtx).(string); ok {
		return "session:" + id, nil
	}
	if ck, err := c.Cookie(csrfCookie); err == nil && len(ck.Value) >= 32 {
		return "browser:" + ck.Value, nil
	}
	raw := make([]byte, 32)
	if _, err := rand.Read(raw); err != nil {
		return "", err
	}
	v := base64.RawURLEncoding.EncodeToString(raw)
	c.SetCookie(&http.Cookie{Name: csrfCookie, Value: v, Path: "/", MaxAge: 86400, HttpOnly: true,
		SameSite: http.SameSiteLaxMode, Secure: s.cfg.TLSProxy})
	return "browser:" + v, nil
}

// csrfTokenFor is the token of a key: base64url of HMAC-SHA256 under the
// key of a fixed label.
func csrfTokenFor(key string) string {
	m := hmac.New(sha256.New, []byte(key))
	m.Write([]byte("pathvet csrf token v1"))
	return base64.RawURLEncoding.EncodeToString(m.Sum(nil))
}

func csrfToken(c echo.Context) string {
	t, _ := c.Get(csrfContext).(string)
	return t
}
