package api

import (
	"crypto/sha256"
	"encoding/base64"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/checks/render"
)

// styleHash is the CSP source of the one stylesheet the pages carry,
// inline in a <style> element (render.CSS; the offline page is the same
// self-contained document): its SHA-256 (CSP Level 3, section 8.4).
var styleHash = "'sha256-" + func() string {
	sum := sha256.Sum256([]byte(render.CSS()))
	return base64.StdEncoding.EncodeToString(sum[:])
}() + "'"

// contentSecurityPolicy allows no script of any kind and loads nothing:
// the pages are drawn on the server with inline SVG. Styles: the
// stylesheet element by its hash, nothing else as an element, and style
// attributes, which the renderer writes for sizes it computes (a chart's
// width, a label's font size); an attribute can neither run script nor,
// with every fetch refused, send anything anywhere. Forms post to the
// server only; no page may be framed; no <base> may move its links.
var contentSecurityPolicy = "default-src 'none'; style-src " + styleHash + "; style-src-elem " + styleHash +
	"; style-src-attr 'unsafe-inline'; form-action 'self'; frame-ancestors 'none'; base-uri 'none'"

// securityHeaders sets the headers every answer carries, pages, API
// documents and errors alike: the policy above, a refusal to be framed
// for browsers that predate frame-ancestors, no sniffing of media types
// (a report served as JSON is never run as anything else), and no
// Referer sent from the workspace's pages (their paths name submissions).
func securityHeaders(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		h := c.Response().Header()
		h.Set("Content-Security-Policy", contentSecurityPolicy)
		h.Set("X-Frame-Options", "DENY")
		h.Set("X-Content-Type-Options", "nosniff")
		h.Set("Referrer-Policy", "no-referrer")
		return next(c)
	}
}
