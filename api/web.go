package api

import (
	"encoding/json"
	"fmt"
	"net/http"
	"net/url"
	"strconv"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// The web workspace: the dashboard, submission pages and the letter, for
// a browser with a session. Roles and isolation are the API's: the same
// scopes, and another office's submission is not found.

// dashboardPage is how many submissions a dashboard page lists;
// recurringLimit how many recent reports the recurring findings read.
const (
	dashboardPage  = 25
	recurringLimit = 500
)

// periods are the choices of the recurring findings' period.
var periods = map[string]time.Duration{
	"30 days": 30 * 24 * time.Hour, "90 days": 90 * 24 * time.Hour, "365 days": 365 * 24 * time.Hour,
}

var periodOrder = []string{"30 days", "90 days", "365 days"}

const timeFormat = "2 Jan 2006, 15:04 UTC"

// home is GET /: the dashboard with a session, the sign-in form without.
func (s *Server) home(c echo.Context) error {
	if _, ok := c.Get(keyContext).(*service.Key); !ok {
		return s.signInPage(c, http.StatusOK, "")
	}
	d, err := s.dashboard(c)
	if err != nil {
		return err
	}
	return s.page(c, http.StatusOK, func(b *strings.Builder) error { return render.WriteDashboard(b, *d) })
}

func (s *Server) dashboard(c echo.Context) (*render.Dashboard, error) {
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	d := &render.Dashboard{Nav: s.nav(c), Periods: periodOrder, Filter: render.Filter{Band: c.QueryParam("band"),
		Status: c.QueryParam("status"), Manuscript: c.QueryParam("manuscript_id"), Period: c.QueryParam("period")}}
	if _, ok := periods[d.Filter.Period]; !ok {
		d.Filter.Period = periodOrder[0]
	}
	if !validStatus[d.Filter.Status] || !validBand[d.Filter.Band] {
		return nil, problemError(http.StatusBadRequest, "Choose a band and a status from the lists.")
	}
	subs, next, err := s.cfg.Store.Submissions(ctx, service.Filter{Scope: sc, ManuscriptID: d.Filter.Manuscript,
		Status: d.Filter.Status, Band: d.Filter.Band, Cursor: c.QueryParam("cursor"), Limit: dashboardPage})
	if err != nil {
		return nil, err
	}
	if next != "" {
		d.Next = nextURL(c, next)
	}
	if err := s.fillRows(c, d, subs); err != nil {
		return nil, err
	}
	if err := s.fillCounts(c, d); err != nil {
		return nil, err
	}
	if err := s.fillReviewed(c, d); err != nil {
		return nil, err
	}
	return d, s.fillRecurring(c, d, sc)
}

func nextURL(c echo.Context, cursor string) string {
	q := url.Values{}
	for _, k := range []string{"band", "status", "manuscript_id", "period"} {
		if v := c.QueryParam(k); v != "" {
			q.Set(k, v)
		}
	}
	q.Set("cursor", cursor)
	return "/?" + q.Encode()
}

// fillRows lists the submissions, the versions of one manuscript grouped
// where the newest of them stands.
func (s *Server) fillRows(c echo.Context, d *render.Dashboard, subs []*service.Submission) error {
	ids := make([]string, len(subs))
	for i, sub := range subs {
		ids[i] = sub.ID
	}
	vs, err := s.cfg.Web.Versions(c.Request().Context(), ids, keyOf(c).Scope())
	if err != nil {
		return err
	}
	at := map[string]int{}
	for _, sub := range subs {
		row := dashboardRow(sub, vs[sub.ID])
		d.Refresh = d.Refresh || sub.Status == service.StatusQueued || sub.Status == service.StatusRunning
		if i, ok := at[sub.ManuscriptID]; ok && sub.ManuscriptID != "" {
			d.Groups[i].Rows = append(d.Groups[i].Rows, row)
			continue
		}
		at[sub.ManuscriptID] = len(d.Groups)
		d.Groups = append(d.Groups, render.Group{ManuscriptID: sub.ManuscriptID, Rows: []render.Row{row}})
	}
	return nil
}

func dashboardRow(sub *service.Submission, v service.Version) render.Row {
	r := render.Row{ID: sub.ID, Title: sub.Title, ManuscriptID: sub.ManuscriptID, Status: sub.Status,
		Received: sub.CreatedAt.UTC().Format(timeFormat), KeyLabel: keyLabel(sub), Score: sub.Score}
	if sub.Band != nil {
		r.Band = *sub.Band
	}
	if v.Of > 1 {
		r.Version = fmt.Sprintf("version %d of %d", v.N, v.Of)
	}
	r.Running, r.Progress = progressOf(sub), statusNote(sub)
	return r
}

// statusNote says a submission's attempt while it runs or waits to retry,
// and why it failed.
func statusNote(sub *service.Submission) string {
	switch {
	case sub.Status == service.StatusRunning:
		return fmt.Sprintf("attempt %d, since %s", sub.Attempts, sub.UpdatedAt.UTC().Format("15:04 UTC"))
	case sub.Status == service.StatusQueued && sub.Attempts > 0:
		return fmt.Sprintf("waiting to retry after attempt %d", sub.Attempts)
	case sub.Status == service.StatusFailed:
		return explainFailure(sub.Error).Short
	}
	return ""
}

// progressOf is how far a running submission is, for a page; nil when it
// is not running or its worker has not yet written how far it is.
func progressOf(sub *service.Submission) *render.Progress {
	p := sub.Progress
	if p == nil || sub.Status != service.StatusRunning {
		return nil
	}
	return &render.Progress{Stage: p.Stage, Done: p.Done, Total: p.Total,
		AsOf: p.UpdatedAt.UTC().Format("15:04:05 UTC")}
}

// keyLabel names the key a submission was sent with by its label; a key
// without one by its number.
func keyLabel(sub *service.Submission) string {
	if l := strings.TrimSpace(sub.SubmittedBy); l != "" {
		return l
	}
	return "key " + strconv.FormatInt(sub.SubmitterKeyID, 10) + " (no label)"
}

// dashboardComments is how many published comments the dashboard lists.
const dashboardComments = 20

// fillReviewed says what was just deleted (?deleted= names it) and lists
// the office's published comments.
func (s *Server) fillReviewed(c echo.Context, d *render.Dashboard) error {
	if s.cfg.Review == nil {
		return nil
	}
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	if id := c.QueryParam("deleted"); id != "" {
		del, err := s.cfg.Review.Deletion(ctx, id, sc)
		switch {
		case err == nil:
			d.Deleted = &render.Deleted{Title: del.Title, ManuscriptID: del.ManuscriptID, By: byWords(del.By),
				At: webTime(del.At), Reports: del.Reports, Comment: del.Comment}
		case service.ErrorCode(err) != service.ENotFound:
			return err
		}
	}
	cs, err := s.cfg.Review.Comments(ctx, sc, dashboardComments)
	for _, cm := range cs {
		d.Comments = append(d.Comments, render.PublishedRow{SubmissionID: cm.SubmissionID, Title: cm.Title,
			URL: s.commentURL(c, cm.Token), At: webTime(cm.PublishedAt)})
	}
	return err
}

func (s *Server) fillCounts(c echo.Context, d *render.Dashboard) error {
	counts, err := s.cfg.Web.BandCounts(c.Request().Context(), keyOf(c).Scope())
	if err != nil {
		return err
	}
	for _, b := range []string{checks.BandHigh, checks.BandModerate, checks.BandLow} {
		d.Counts = append(d.Counts, render.BandCount{Band: b, Words: render.Words(b), N: counts[b]})
	}
	d.Unscreened, d.Unscreenable = counts[""], counts[service.StatusFailed]
	return nil
}

func (s *Server) fillRecurring(c echo.Context, d *render.Dashboard, sc service.Scope) error {
	since := time.Now().Add(-periods[d.Filter.Period])
	raw, more, err := s.cfg.Web.RecentReports(c.Request().Context(), sc, since, recurringLimit)
	if err != nil {
		return err
	}
	reps := make([]*checks.Report, 0, len(raw))
	for _, b := range raw {
		var r checks.Report
		if err := json.Unmarshal(b, &r); err != nil {
			return fmt.Errorf("api: a stored report does not decode: %w", err)
		}
		reps = append(reps, &r)
	}
	d.Recurring, d.Truncated = render.Tally(reps), more
	return nil
}
