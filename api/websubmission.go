package api

import (
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strconv"
	"strings"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// webSubmission is GET /submissions/{id}: the report (the newest, or the
// earlier one named by ?report=), its history, and what changed since
// the manuscript's previous version.
func (s *Server) webSubmission(c echo.Context) error {
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	sub, err := s.cfg.Store.Submission(ctx, c.Param("id"), sc)
	if err != nil {
		return err
	}
	hist, err := s.cfg.Web.ReportHistory(ctx, sub.ID, sc)
	if err != nil {
		return err
	}
	if len(hist) == 0 {
		return s.pending(c, sub)
	}
	rep, ws, err := s.workspace(c, sub, hist)
	if err != nil {
		return err
	}
	return s.page(c, http.StatusOK, func(b *strings.Builder) error { return render.WriteSubmission(b, rep, ws) })
}

// workspace picks the report to show and gathers what the page adds to it.
func (s *Server) workspace(c echo.Context, sub *service.Submission, hist []service.ReportEntry) (
	*checks.Report, render.Workspace, error) {
	ws := render.Workspace{Nav: s.nav(c), ID: sub.ID, Status: sub.Status, Running: progressOf(sub)}
	switch {
	case sub.Status == service.StatusFailed:
		ws.Error, ws.ErrorDetail = explainFailure(sub.Error).Sentence(), sub.Error
	case sub.Error != "" && !service.Finished(sub.Status):
		ws.Error, ws.ErrorDetail = "An earlier attempt did not finish. "+explainFailure(sub.Error).What+
			" The queue tries it again.", sub.Error
	}
	shown, err := pickReport(hist, c.QueryParam("report"))
	if err != nil {
		return nil, ws, err
	}
	rep, err := decodeReport(hist[shown].Report)
	if err != nil {
		return nil, ws, err
	}
	ws.History = historyEntries(sub.ID, hist, shown)
	if shown > 0 {
		ws.Earlier = fmt.Sprintf("This is an earlier report, number %d of %d.", len(hist)-shown, len(hist))
	}
	switch {
	case shown > 0: // an earlier report: the review and the comparison are the newest report's
		return rep, ws, nil
	case s.cfg.Review != nil && keyOf(c).Role == service.RoleEditor:
		return rep, ws, s.fillReview(c, &ws)
	}
	ws.Since, err = s.plainSince(c, sub, rep)
	return rep, ws, err
}

// pending is the page of a submission without a report: its status and,
// while it runs, how far it is; it reloads itself until the screening ends.
func (s *Server) pending(c echo.Context, sub *service.Submission) error {
	p := render.Pending{Nav: s.nav(c), ID: sub.ID, Title: sub.Title, Status: sub.Status, Running: progressOf(sub),
		Note: statusNote(sub)}
	if sub.Status == service.StatusFailed {
		p.Note, p.Detail = explainFailure(sub.Error).Sentence(), sub.Error
	}
	return s.page(c, http.StatusOK, func(b *strings.Builder) error { return render.WritePending(b, p) })
}

// pickReport finds the report named by ?report= (its id), else the newest.
func pickReport(hist []service.ReportEntry, param string) (int, error) {
	if param == "" {
		return 0, nil
	}
	for i, h := range hist {
		if strconv.FormatInt(h.ID, 10) == param {
			return i, nil
		}
	}
	return 0, service.Errorf(service.ENotFound, "no such report")
}

func decodeReport(b []byte) (*checks.Report, error) {
	var r checks.Report
	if err := json.Unmarshal(b, &r); err != nil {
		return nil, fmt.Errorf("api: a stored report does not decode: %w", err)
	}
	return &r, nil
}

// historyEntries numbers the reports oldest first, as they were made.
func historyEntries(id string, hist []service.ReportEntry, shown int) []render.HistoryEntry {
	out := make([]render.HistoryEntry, len(hist))
	for i, h := range hist {
		out[i] = render.HistoryEntry{N: len(hist) - i, When: h.CreatedAt.UTC().Format(timeFormat), Tool: h.ToolVersion,
			Band: render.Words(h.Band), Score: h.Score, Current: i == shown,
			Link: fmt.Sprintf("/submissions/%s?report=%d", id, h.ID)}
	}
	return out
}

// plainSince is the comparison with the previous version for a page
// without the review (a submitter's session): what the authors changed
// and how the claims moved, without the points asked.
func (s *Server) plainSince(c echo.Context, sub *service.Submission, rep *checks.Report) (*render.Since, error) {
	prev, b, err := s.cfg.Web.PreviousVersion(c.Request().Context(), sub, keyOf(c).Scope())
	if service.ErrorCode(err) == service.ENotFound {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	var old *checks.Report
	if b != nil {
		if old, err = decodeReport(b); err != nil {
			return nil, err
		}
	}
	return s.sinceOf(c, prev, old, sub, rep, nil)
}

// webLetter is GET /submissions/{id}/letter.md: the questions for the
// authors of the newest report, as Markdown.
func (s *Server) webLetter(c echo.Context) error {
	if ok, err := s.editorsOnly(c); !ok {
		return err
	}
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	return writeLetter(c, st)
}

// webRerun is POST /submissions/{id}/rerun from the page's form.
func (s *Server) webRerun(c echo.Context) error {
	sub, err := s.cfg.Store.Rerun(c.Request().Context(), c.Param("id"), keyOf(c).Scope())
	if service.ErrorCode(err) == service.EConflict {
		return s.notice(c, http.StatusConflict, "Already being screened",
			"This submission is queued or running; it can be screened again once it is done.")
	}
	if err != nil {
		return err
	}
	return c.Redirect(http.StatusSeeOther, "/submissions/"+sub.ID)
}

// webDelete is POST /submissions/{id}/delete. Only the form of the page
// that asks first (confirm=yes) deletes; any other post is sent to that
// page. The dashboard then says what was deleted.
func (s *Server) webDelete(c echo.Context) error {
	id := c.Param("id")
	if c.FormValue("confirm") != "yes" {
		return c.Redirect(http.StatusSeeOther, "/submissions/"+url.PathEscape(id)+"/delete")
	}
	if err := s.cfg.Store.DeleteSubmission(c.Request().Context(), id, keyOf(c).Scope()); err != nil {
		return err
	}
	return c.Redirect(http.StatusSeeOther, "/?deleted="+url.QueryEscape(id))
}

// webConfirmDelete is GET /submissions/{id}/delete: what a deletion takes
// with it, and the one form that deletes.
func (s *Server) webConfirmDelete(c echo.Context) error {
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	sub, err := s.cfg.Store.Submission(ctx, c.Param("id"), sc)
	if err != nil {
		return err
	}
	d := render.ConfirmDelete{Nav: s.nav(c), ID: sub.ID, Title: sub.Title, ManuscriptID: sub.ManuscriptID,
		Received: sub.CreatedAt.UTC().Format(timeFormat), Reports: sub.Reports}
	if s.cfg.Review != nil {
		as, err := s.cfg.Review.Annotations(ctx, sub.ID, sc)
		if err != nil {
			return err
		}
		_, err = s.cfg.Review.Comment(ctx, sub.ID, sc)
		if err != nil && service.ErrorCode(err) != service.ENotFound {
			return err
		}
		d.Decisions, d.Comment = len(as), err == nil
	}
	return s.page(c, http.StatusOK, func(b *strings.Builder) error { return render.WriteConfirmDelete(b, d) })
}
