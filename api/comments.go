package api

import (
	"encoding/json"
	"io"
	"net/http"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks/render"
	"github.com/pathvet/pathvet/checks/review"
)

// A published comment: the points an office asks of the authors, in the
// reviewer's wording, with the caution, as a read-only page at an
// unguessable address that anyone with it may read (no key, no session).
// It shows no score or band, no key label, no manuscript ID and no noted
// or dismissed finding; withdrawn, its address answers 404.

// commentPath is where published comments are served; the token follows.
const commentPath = "/comments/"

// CommentView is a published comment as the API shows it to its office.
type CommentView struct {
	URL         string    `json:"url"`
	PublishedAt time.Time `json:"published_at"`
	Indexable   bool      `json:"indexable"`
	Points      int       `json:"points"`
	By          string    `json:"by"`
}

// commentURL is the comment's address on this server, as the request
// reached it (https behind a TLS-terminating proxy).
func (s *Server) commentURL(c echo.Context, token string) string {
	scheme := "http"
	if s.cfg.TLSProxy || c.Request().TLS != nil {
		scheme = "https"
	}
	return scheme + "://" + c.Request().Host + commentPath + token
}

func (s *Server) commentView(c echo.Context, cm *service.Comment) CommentView {
	var l review.Letter
	_ = json.Unmarshal(cm.Letter, &l)
	return CommentView{URL: s.commentURL(c, cm.Token), PublishedAt: cm.PublishedAt, Indexable: cm.Indexable,
		Points: len(l.Items), By: cm.By}
}

// publishComment is POST /v1/submissions/{id}/comment (optionally with
// {"indexable": true}): publishes the asked points as they now stand, 201
// with the address; published again, the page shows the points as they
// now stand at the same address (200). Nothing asked: 409.
func (s *Server) publishComment(c echo.Context) error {
	body, err := io.ReadAll(io.LimitReader(c.Request().Body, 8<<10))
	if err != nil {
		return bodyError(err)
	}
	var in struct {
		Indexable bool `json:"indexable"`
	}
	if strings.TrimSpace(string(body)) != "" && json.Unmarshal(body, &in) != nil {
		return problemError(http.StatusBadRequest, `Send {"indexable": true} or false as JSON, or no body.`)
	}
	cm, created, err := s.publish(c, in.Indexable)
	if err != nil {
		return err
	}
	status := http.StatusOK
	if created {
		status = http.StatusCreated
	}
	return c.JSON(status, s.commentView(c, cm))
}

// publish keeps the comment of the submission in the path: its asked
// points only, without the manuscript ID.
func (s *Server) publish(c echo.Context, indexable bool) (*service.Comment, bool, error) {
	st, err := s.reviewOf(c)
	if err != nil {
		return nil, false, err
	}
	l := st.letter()
	if len(l.Items) == 0 {
		return nil, false, service.Errorf(service.EConflict,
			"no point is asked of the authors, so there is nothing to publish")
	}
	l.Notes, l.ManuscriptID = nil, ""
	b, err := json.Marshal(l)
	if err != nil {
		return nil, false, err
	}
	return s.cfg.Review.PublishComment(c.Request().Context(), st.sub.ID, keyOf(c).Scope(), keyOf(c), b, indexable)
}

// getComment is GET /v1/submissions/{id}/comment.
func (s *Server) getComment(c echo.Context) error {
	cm, err := s.cfg.Review.Comment(c.Request().Context(), c.Param("id"), keyOf(c).Scope())
	if err != nil {
		return err
	}
	return c.JSON(http.StatusOK, s.commentView(c, cm))
}

// withdrawComment is DELETE /v1/submissions/{id}/comment.
func (s *Server) withdrawComment(c echo.Context) error {
	if err := s.cfg.Review.WithdrawComment(c.Request().Context(), c.Param("id"), keyOf(c).Scope()); err != nil {
		return err
	}
	return c.NoContent(http.StatusNoContent)
}

// publishedComment is GET /comments/{token}: the page, for anyone with
// the address; never stored by a cache, and not indexed unless the office
// chose so. It sets no cookie and links nowhere.
func (s *Server) publishedComment(c echo.Context) error {
	h := c.Response().Header() // s.page sets Cache-Control: no-store
	cm, err := s.cfg.Review.PublishedComment(c.Request().Context(), c.Param("token"))
	if service.ErrorCode(err) == service.ENotFound {
		h.Set("X-Robots-Tag", "noindex, nofollow")
		return s.page(c, http.StatusNotFound, func(b *strings.Builder) error {
			return render.WriteNotice(b, nil, "Not found", "No comment is published at this address; it may "+
				"have been withdrawn.")
		})
	}
	if err != nil {
		return err
	}
	var l review.Letter
	if err := json.Unmarshal(cm.Letter, &l); err != nil {
		return err
	}
	if !cm.Indexable {
		h.Set("X-Robots-Tag", "noindex, nofollow")
	}
	return s.page(c, http.StatusOK, func(b *strings.Builder) error {
		return render.WritePublished(b, render.Published{Letter: l, PublishedAt: cm.PublishedAt,
			Indexable: cm.Indexable})
	})
}
