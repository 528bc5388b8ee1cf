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
		token, ok := strings.CutPrefix(c.Request().Header.Get(echo.HeaderAuthorization), "Bearer ")
		if !ok || strings.TrimSpace(token) == "" {
			return problemError(http.StatusUnauthorized, "Send an API key as Authorization: Bearer <token>.")
		}
		k, err := s.cfg.Store.KeyByToken(c.Request().Context(), strings.TrimSpace(token))
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
