package api

import (
	"context"
	"fmt"
	"net/http"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks/render"
)

// WebStore is what the web workspace needs from storage beyond Store.
type WebStore interface {
	OpenSession(ctx context.Context, k *service.Key, ttl time.Duration) (string, error)
	SessionKey(ctx context.Context, id string) (*service.Key, error)
	EndSession(ctx context.Context, id string) error
	SignInWait(ctx context.Context, address string) (time.Duration, error)
	NoteSignInFailure(ctx context.Context, address string) error
	ReportHistory(ctx context.Context, id string, sc service.Scope) ([]service.ReportEntry, error)
	PreviousVersion(ctx context.Context, sub *service.Submission, sc service.Scope) (*service.Submission, []byte, error)
	Versions(ctx context.Context, ids []string, sc service.Scope) (map[string]service.Version, error)
	BandCounts(ctx context.Context, sc service.Scope) (map[string]int, error)
	RecentReports(ctx context.Context, sc service.Scope, since time.Time, limit int) ([][]byte, bool, error)
	// SubmissionPackage is the package a submission was sent with and its
	// data part (nil when none).
	SubmissionPackage(ctx context.Context, id string, sc service.Scope) ([]byte, []byte, error)
}

// Names of the workspace's cookies, the form field and header of the CSRF
// token, and the context keys.
const (
	sessionCookie = "pathvet_session"
	csrfCookie    = "pathvet_csrf"
	csrfField     = "_csrf"
	csrfHeader    = "X-CSRF-Token"
	csrfContext   = "csrf"
	sessionCtx    = "pathvet.session"
)

// webPage turns a workspace handler's error into a page for people, with
// the status the API would answer.
func (s *Server) webPage(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		err := next(c)
		if err == nil || c.Response().Committed {
			return err
		}
		p, internal := problemFor(err)
		title, msg := http.StatusText(p.Status), p.Detail
		switch {
		case internal:
			s.cfg.Logger.Error("internal error", "error", err, "path", c.Path())
		case p.Status == http.StatusNotFound:
			title, msg = "Not found", "There is no such submission among those this key may see."
		case p.Status == http.StatusForbidden, strings.Contains(msg, "csrf"):
			title, msg = "Form refused", "The form was refused because it lacked its security token. "+
				"Go back, reload the page and try again."
		}
		return s.notice(c, p.Status, title, msg)
	}
}

func (s *Server) notice(c echo.Context, status int, title, msg string) error {
	var nav *render.Nav
	if _, ok := c.Get(keyContext).(*service.Key); ok {
		n := s.nav(c)
		nav = &n
	}
	return s.page(c, status, func(b *strings.Builder) error { return render.WriteNotice(b, nav, title, msg) })
}

// page writes an HTML page made by write.
func (s *Server) page(c echo.Context, status int, write func(*strings.Builder) error) error {
	var b strings.Builder
	if err := write(&b); err != nil {
		return err
	}
	c.Response().Header().Set("Cache-Control", "no-store")
	return c.HTML(status, b.String())
}

func (s *Server) nav(c echo.Context) render.Nav {
	k := keyOf(c)
	return render.Nav{Office: k.OfficeName, Role: k.Role, Label: k.Label, CSRF: csrfToken(c)}
}

// withSession looks up the session cookie and, for a live session, puts
// its key where the API's handlers find it.
func (s *Server) withSession(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		ck, err := c.Cookie(sessionCookie)
		if err != nil || ck.Value == "" {
			return next(c)
		}
		k, err := s.cfg.Web.SessionKey(c.Request().Context(), ck.Value)
		switch {
		case service.ErrorCode(err) == service.ENotFound:
			return next(c)
		case err != nil:
			return err
		}
		c.Set(keyContext, k)
		c.Set(sessionCtx, ck.Value)
		return next(c)
	}
}

// requireSession sends a browser without a live session to the sign-in
// page; it never shows a report.
func requireSession(next echo.HandlerFunc) echo.HandlerFunc {
	return func(c echo.Context) error {
		if _, ok := c.Get(keyContext).(*service.Key); !ok {
			return c.Redirect(http.StatusSeeOther, "/")
		}
		return next(c)
	}
}

func (s *Server) setSessionCookie(c echo.Context, id string, maxAge int) {
	c.SetCookie(&http.Cookie{Name: sessionCookie, Value: id, Path: "/", MaxAge: maxAge,
		HttpOnly: true, SameSite: http.SameSiteLaxMode, Secure: s.cfg.TLSProxy})
}

// signIn is POST /session: an office key in, a session out.
func (s *Server) signIn(c echo.Context) error {
	ctx, addr := c.Request().Context(), clientAddress(c.Request(), s.cfg.TrustedProxies)
	wait, err := s.cfg.Web.SignInWait(ctx, addr)
	if err != nil {
		return err
	}
	if wait > 0 {
		secs := int(wait.Round(time.Second).Seconds())
		c.Response().Header().Set("Retry-After", fmt.Sprint(secs))
		return s.signInPage(c, http.StatusTooManyRequests,
			fmt.Sprintf("Too many failed sign-ins from this address. Wait %d seconds and try again.", max(secs, 1)))
	}
	k, err := s.cfg.Store.KeyByToken(ctx, strings.TrimSpace(c.FormValue("key")))
	if service.ErrorCode(err) == service.ENotFound {
		if err := s.cfg.Web.NoteSignInFailure(ctx, addr); err != nil {
			return err
		}
		return s.signInPage(c, http.StatusUnprocessableEntity, "That key was not accepted. Check it and try again.")
	}
	if err != nil {
		return err
	}
	return s.openSession(c, k)
}

// openSession opens a session for the key. The address's failures stay
// counted: a success with one key says nothing about the guesses made
// before it (else guesses alternated with a key of one's own would never
// wait).
func (s *Server) openSession(c echo.Context, k *service.Key) error {
	id, err := s.cfg.Web.OpenSession(c.Request().Context(), k, s.cfg.SessionTTL)
	if err != nil {
		return err
	}
	s.setSessionCookie(c, id, int(s.cfg.SessionTTL.Seconds()))
	return c.Redirect(http.StatusSeeOther, "/")
}

func (s *Server) signInPage(c echo.Context, status int, msg string) error {
	return s.page(c, status, func(b *strings.Builder) error {
		return render.WriteSignIn(b, render.SignIn{CSRF: csrfToken(c), Message: msg})
	})
}

// signOut is POST /session/end: the session ends and its cookie goes.
func (s *Server) signOut(c echo.Context) error {
	if id, ok := c.Get(sessionCtx).(string); ok {
		if err := s.cfg.Web.EndSession(c.Request().Context(), id); err != nil {
			return err
		}
	}
	s.setSessionCookie(c, "", -1)
	return c.Redirect(http.StatusSeeOther, "/")
}
