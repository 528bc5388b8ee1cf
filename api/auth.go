package api

import (
	"net/http"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
)

const keyContext = "pathvet.key"

// authenticate requires "Authorization: Bearer <token>" with a live key;
// without one the answer is 401.
func (s *Server) authenticate(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		token, ok := bearerToken(c.Request().Header.Get(echo.HeaderAuthorization))
		if !ok {
			return problemError(http.StatusUnauthorized, "Send an API key as Authorization: Bearer <token>.")
		}
		k, err := s.cfg.Store.KeyByToken(c.Request().Context(), token)
		if service.ErrorCode(err) == service.ENotFound {
			return problemError(http.StatusUnauthorized, "The API key is not valid.")
		}
		if err != nil {
			return err
		}
		c.Set(keyContext, k)
		return next(c)
	}
}

func keyOf(c echo.Context) *service.Key { return c.Get(keyContext).(*service.Key) }

// bearerToken reads "Bearer <token>"; the scheme is case-insensitive
// (RFC 7235, section 2.1) and may be followed by more than one space.
func bearerToken(header string) (string, bool) {
	scheme, token, ok := strings.Cut(strings.TrimSpace(header), " ")
	token = strings.TrimSpace(token)
	return token, ok && strings.EqualFold(scheme, "Bearer") && token != ""
}
