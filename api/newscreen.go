package api

import (
	"crypto/rand"
	"crypto/sha256"
	"encoding/base64"
	"net/http"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// The "new screening" page, /submissions/new: a form that builds a
// package from a paper's printed Table 1 or raw rows, its arrows and its
// claims (newscreen_build.go), previews it, and screens it through the
// API's own path: the same checks (checkPackage), the same store call
// (the row and its job in one transaction), idempotent by a key the form
// carries.

// maxFormClaims is how many claim rows the form takes: each row is eleven
// form fields, and Go's multipart reader takes 1,000 parts by default.
const maxFormClaims = 60

// formStyleHash is the CSP source of the page's own stylesheet, in a
// second <style> element.
var formStyleHash = "'sha256-" + func() string {
	sum := sha256.Sum256([]byte(render.NewScreeningCSS()))
	return base64.StdEncoding.EncodeToString(sum[:])
}() + "'"

// screeningPolicy is the page's Content-Security-Policy: the workspace's
// policy with the page's second stylesheet, and script from this server
// only (the one file at render.ScreeningScriptPath; no inline script, no
// style attributes).
var screeningPolicy = "default-src 'none'; script-src 'self'; style-src " + styleHash + " " + formStyleHash +
	"; style-src-elem " + styleHash + " " + formStyleHash +
	"; form-action 'self'; frame-ancestors 'none'; base-uri 'none'"

// newScreening is GET /submissions/new: an empty form, or with ?from= the
// form filled from an earlier version.
func (s *Server) newScreening(c echo.Context) error {
	c.Response().Header().Set("Content-Security-Policy", screeningPolicy)
	f := &screenForm{Key: newFormKey(), Claims: make([]claimRow, 1)}
	var earlier *earlierVersion
	if id := c.QueryParam("from"); id != "" {
		e, err := s.earlier(c, id)
		if err != nil {
			return err
		}
		f, earlier = formFromPackage(e), e
		f.useEarlier(e)
	}
	return s.screeningPage(c, http.StatusOK, f, &built{errs: newFieldErrors()}, earlier, "")
}

// postScreening is POST /submissions/new: the form's three buttons.
func (s *Server) postScreening(c echo.Context) error {
	c.Response().Header().Set("Content-Security-Policy", screeningPolicy)
	f, err := s.readScreenForm(c)
	if err != nil {
		return err
	}
	var earlier *earlierVersion
	if f.From != "" {
		earlier, err = s.earlier(c, f.From)
		switch {
		case service.ErrorCode(err) == service.ENotFound:
			f.From = ""
			return s.screeningPage(c, http.StatusNotFound, f, &built{errs: newFieldErrors()}, nil, msgEarlierGone)
		case err != nil:
			return s.keepForm(c, f, err)
		}
	}
	switch c.FormValue("action") {
	case "add_claim":
		return s.addClaim(c, f, earlier)
	case "screen":
		return s.screen(c, f, earlier)
	}
	b := s.build(f, earlier)
	defer b.close()
	b.preview = true
	return s.screeningPage(c, http.StatusOK, f, b, earlier, "")
}

// addClaim sends the form back with one more claim row, every input kept.
func (s *Server) addClaim(c echo.Context, f *screenForm, earlier *earlierVersion) error {
	b := &built{errs: newFieldErrors()}
	if len(f.Claims) >= maxFormClaims {
		return s.screeningPage(c, http.StatusOK, f, b, earlier,
			"The form takes at most 60 claims; send a package with more through the API.")
	}
	f.Claims = append(f.Claims, claimRow{Kind: checks.KindDirect})
	f.focus = len(f.Claims)
	return s.screeningPage(c, http.StatusOK, f, b, earlier, "")
}

// screen checks the package built from the form as the API checks one,
// and stores and queues it: 303 to the submission's page. A problem
// sends the form back with every problem beside its field (422).
func (s *Server) screen(c echo.Context, f *screenForm, earlier *earlierVersion) error {
	release, err := s.largeSlot(c.Request().Context(), f.size())
	if err != nil {
		return s.keepForm(c, f, err)
	}
	defer release()
	b := s.build(f, earlier)
	defer b.close()
	if b.errs.any() || b.n == nil {
		return s.screeningPage(c, http.StatusUnprocessableEntity, f, b, earlier, "")
	}
	n := *b.n
	n.Key, n.IdempotencyKey = keyOf(c), f.idempotencyKey()
	sub, _, err := s.cfg.Store.CreateSubmission(c.Request().Context(), n)
	switch {
	case service.ErrorCode(err) == service.EConflict:
		f.Key = newFormKey()
		return s.screeningPage(c, http.StatusConflict, f, b, earlier, msgScreenedBefore)
	case err != nil:
		return s.keepForm(c, f, err)
	}
	return c.Redirect(http.StatusSeeOther, "/submissions/"+sub.ID)
}

const msgEarlierGone = "The earlier version this form was filled from is no longer there, so nothing can be " +
	"carried over from it; the form is kept as it was, and screening it makes a submission of its own."

const msgScreenedBefore = "This form was screened before, with other figures; the changed package was not " +
	"screened. Press Screen again to screen it as a new submission."

// keepForm answers an error with the form as it was sent and the
// problem above it (503, the database not answering or the server busy
// with large uploads, with Retry-After: nothing was stored, and the
// button may be pressed again); an internal error is the workspace's
// error page.
func (s *Server) keepForm(c echo.Context, f *screenForm, err error) error {
	p, internal := problemFor(err)
	if internal {
		return err
	}
	if p.Status == http.StatusServiceUnavailable {
		c.Response().Header().Set("Retry-After", retryAfter)
		p.Detail = strings.TrimSuffix(p.Detail, ".") + ". Nothing was stored."
	}
	return s.screeningPage(c, p.Status, f, &built{errs: newFieldErrors()}, nil, p.Detail)
}

// screeningPage writes the form with its problems and, after Preview,
// what was read and the package.
func (s *Server) screeningPage(c echo.Context, status int, f *screenForm, b *built, e *earlierVersion,
	notice string) error {
	p := render.NewScreening{Nav: s.nav(c), Form: f.view(csrfToken(c), b), Problems: b.errs.summary(),
		Notice: notice, MaxClaims: maxFormClaims}
	if b.preview {
		p.Preview = b.previewView()
	}
	if e != nil {
		p.Earlier = e.view()
	}
	return s.page(c, status, func(w *strings.Builder) error { return render.WriteNewScreening(w, p) })
}

// newFormKey is a new form's idempotency key: 128 random bits, in base32
// (crypto/rand.Text).
func newFormKey() string { return rand.Text() }

// screeningScript serves the page's script.
func (s *Server) screeningScript(c echo.Context) error {
	c.Response().Header().Set("Cache-Control", "no-cache")
	return c.Blob(http.StatusOK, "text/javascript; charset=utf-8", render.NewScreeningScript())
}
