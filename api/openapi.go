package api

import (
	_ "embed"
	"net/http"
	"strconv"

	"github.com/labstack/echo/v4"
)

// OpenAPI is the API's OpenAPI 3.1 document.
//
//go:embed openapi.yaml
var OpenAPI []byte

func (s *Server) openapi(c echo.Context) error {
	return c.Blob(http.StatusOK, "application/yaml", OpenAPI)
}

// sizeText writes a byte count for Echo's body limit.
func sizeText(n int64) string { return strconv.FormatInt(n, 10) + "B" }
