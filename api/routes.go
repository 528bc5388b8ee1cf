package api

import (
	"net/http"

	"github.com/labstack/echo/v4"
	"github.com/labstack/echo/v4/middleware"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks/render"
)

// routes registers every route of the API, in one place.
func (s *Server) routes() {
	e := s.echo
	e.Pre(headAsGet)
	e.Use(securityHeaders)
	e.Use(middleware.RequestID())
	e.Use(s.logRequests())
	e.Use(middleware.RecoverWithConfig(middleware.RecoverConfig{DisableStackAll: true}))
	e.Use(s.cfg.Metrics.middleware())
	e.Use(middleware.ContextTimeout(s.cfg.RequestTimeout))
	e.Use(s.checkRequest)

	e.GET("/healthz", s.healthz)
	e.GET("/readyz", s.readyz)
	e.GET("/metrics", echo.WrapHandler(s.cfg.Metrics.Handler()))
	e.GET("/v1/openapi.yaml", s.openapi)

	// Authentication is per route, not on the group: a group's middleware
	// would catch every path under /v1 and hide 405 behind 404.
	v1, auth := e.Group("/v1"), s.authenticate
	v1.POST("/submissions", s.createSubmission, auth, s.gateIngest,
		middleware.BodyLimitWithConfig(middleware.BodyLimitConfig{Limit: sizeText(s.bodyLimit())}))
	v1.GET("/submissions", s.listSubmissions, auth)
	v1.GET("/submissions/:id", s.getSubmission, auth)
	v1.DELETE("/submissions/:id", s.deleteSubmission, auth)
	v1.POST("/submissions/:id/rerun", s.rerunSubmission, auth)
	v1.GET("/submissions/:id/report", s.getReport, auth)
	v1.PUT("/webhook", s.putWebhook, auth, editorOnly)
	v1.GET("/webhook", s.getWebhook, auth, editorOnly)
	v1.DELETE("/webhook", s.deleteWebhook, auth, editorOnly)
	v1.GET("/webhook/deliveries", s.listDeliveries, auth, editorOnly)
	if s.cfg.Review != nil {
		s.reviewRoutes(v1, auth)
	}

	if s.cfg.Web != nil {
		s.webRoutes()
	}
}

// webRoutes registers the web workspace: pages for a browser with a
// session (sign-in at /), every form behind a CSRF token tied to the
// session (csrf, after withSession).
func (s *Server) webRoutes() {
	e := s.echo
	page := []echo.MiddlewareFunc{s.webPage, middleware.BodyLimit("64K"), s.withSession, s.csrf}
	signedIn := append(page[:len(page):len(page)], requireSession)
	e.GET("/", s.home, page...)
	e.POST("/session", s.signIn, page...)
	e.POST("/session/end", s.signOut, page...)
	e.GET("/submissions/:id", s.webSubmission, signedIn...)
	e.GET("/submissions/:id/letter.md", s.webLetter, signedIn...)
	e.POST("/submissions/:id/rerun", s.webRerun, signedIn...)
	e.POST("/submissions/:id/delete", s.webDelete, signedIn...)
	e.GET("/submissions/:id/package.json", s.webPackage, signedIn...)
	// The new-screening form takes an upload as large as the API does,
	// under the API's upload rules, read whole before its token is checked.
	form := []echo.MiddlewareFunc{s.webPage, s.withSession, requireSession, s.gateIngest,
		middleware.BodyLimitWithConfig(middleware.BodyLimitConfig{Limit: sizeText(s.bodyLimit())}),
		s.readForm, s.csrf}
	e.GET("/submissions/new", s.newScreening, signedIn...)
	e.POST("/submissions/new", s.postScreening, form...)
	e.GET(render.ScreeningScriptPath, s.screeningScript, s.webPage)
	if s.cfg.Review != nil {
		e.GET("/submissions/:id/delete", s.webConfirmDelete, signedIn...)
		e.POST("/submissions/:id/findings/:key/annotation", s.webAnnotate, signedIn...)
		e.POST("/submissions/:id/comment", s.webPublish, signedIn...)
		e.POST("/submissions/:id/comment/withdraw", s.webWithdraw, signedIn...)
	}
}

// reviewRoutes registers the review: findings with their decisions, the
// letter and the published comment, for editor keys; and the published
// comment's page, for anyone with its address (no key, no session).
func (s *Server) reviewRoutes(v1 *echo.Group, auth echo.MiddlewareFunc) {
	v1.GET("/submissions/:id/findings", s.listFindings, auth, reviewersOnly)
	v1.PUT("/submissions/:id/findings/:key/annotation", s.putAnnotation, auth, reviewersOnly)
	v1.GET("/submissions/:id/annotations", s.listAnnotations, auth, reviewersOnly)
	v1.GET("/submissions/:id/letter.md", s.apiLetter, auth, reviewersOnly)
	v1.POST("/submissions/:id/comment", s.publishComment, auth, reviewersOnly)
	v1.GET("/submissions/:id/comment", s.getComment, auth, reviewersOnly)
	v1.DELETE("/submissions/:id/comment", s.withdrawComment, auth, reviewersOnly)
	s.echo.GET(commentPath+":token", s.publishedComment)
}

// reviewersOnly lets editor keys through; a submitter key gets 403.
func reviewersOnly(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		if keyOf(c).Role != service.RoleEditor {
			return problemError(http.StatusForbidden, "Only an editor key may read or make the review's decisions.")
		}
		return next(c)
	}
}

func (s *Server) healthz(c echo.Context) error {
	return c.JSON(http.StatusOK, map[string]string{"status": "ok"})
}

func (s *Server) readyz(c echo.Context) error {
	if err := s.cfg.Store.Ping(c.Request().Context()); err != nil {
		s.cfg.Logger.Error("readiness: database unreachable", "error", err)
		return problemError(http.StatusServiceUnavailable, "The database does not answer.")
	}
	return c.JSON(http.StatusOK, map[string]string{"status": "ready"})
}

// headAsGet answers HEAD on every GET route (RFC 9110, section 9.3.2):
// routing and the handler see a GET, and the body is dropped.
func headAsGet(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		req := c.Request()
		if req.Method != http.MethodHead {
			return next(c)
		}
		req.Method = http.MethodGet // Echo routes by this very request
		defer func() { req.Method = http.MethodHead }()
		c.Response().Writer = headWriter{c.Response().Writer}
		return next(c)
	}
}

// headWriter drops a response's body.
type headWriter struct{ http.ResponseWriter }

func (w headWriter) Write(b []byte) (int, error) { return len(b), nil }
