package api

import (
	"encoding/json"
	"errors"
	"fmt"
	"net/http"
	"strconv"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// SubmissionView is a submission as the API shows it.
type SubmissionView struct {
	ID            string    `json:"id"`
	Status        string    `json:"status"`
	Title         string    `json:"title"`
	ManuscriptID  string    `json:"manuscript_id,omitempty"`
	SubmittedBy   string    `json:"submitted_by"`
	PackageSHA256 string    `json:"package_sha256"`
	Score         *int      `json:"score"`
	Band          *string   `json:"band"`
	Error         string    `json:"error,omitempty"`
	Attempts      int       `json:"attempts"`
	Reports       int       `json:"reports"`
	CreatedAt     time.Time `json:"created_at"`
	UpdatedAt     time.Time `json:"updated_at"`
	// Progress is shown while the submission runs and its worker has
	// written how far it is.
	Progress *ProgressView `json:"progress,omitempty"`
	Links    Links         `json:"links"`
}

// ProgressView is how far a running screening is: its stage (the check
// about to run, or a long step inside one), the units of that stage done
// and in all, and when the worker last wrote it.
type ProgressView struct {
	Stage     string    `json:"stage"`
	Done      int       `json:"done"`
	Total     int       `json:"total"`
	UpdatedAt time.Time `json:"updated_at"`
}

// Links point to a submission and its report.
type Links struct {
	Self   string `json:"self"`
	Report string `json:"report"`
}

func view(s *service.Submission) SubmissionView {
	self := "/v1/submissions/" + s.ID
	return SubmissionView{ID: s.ID, Status: s.Status, Title: s.Title, ManuscriptID: s.ManuscriptID,
		SubmittedBy:   s.SubmittedBy,
		PackageSHA256: s.PackageSHA256, Score: s.Score, Band: s.Band, Error: s.Error, Attempts: s.Attempts,
		Reports: s.Reports, CreatedAt: s.CreatedAt, UpdatedAt: s.UpdatedAt,
		Progress: progressView(s), Links: Links{Self: self, Report: self + "/report"}}
}

func progressView(s *service.Submission) *ProgressView {
	p := s.Progress
	if p == nil || s.Status != service.StatusRunning {
		return nil
	}
	return &ProgressView{Stage: p.Stage, Done: p.Done, Total: p.Total, UpdatedAt: p.UpdatedAt}
}

// cells counts a study's raw data cells, rows × columns (0 for summary
// statistics), which scale its job's deadline.
func cells(s *checks.Study) int64 {
	if s.Data == nil || s.Data.Kind != checks.DataRows {
		return 0
	}
	return int64(s.Data.N) * int64(len(s.Data.Columns))
}

func mustJSON(v any) []byte {
	b, err := json.Marshal(v)
	if err != nil {
		panic(err)
	}
	return b
}

// createSubmission takes a package as JSON (data inline or as summary
// statistics) or as multipart parts "package" and "data", checks it, and
// stores and queues it: 202 with the new submission. The body is read
// first (a data part spooled to a file) under the upload rules; then a
// large upload takes its slot, and is parsed and streamed from the file
// into the store.
func (s *Server) createSubmission(c echo.Context) error {
	doc, data, err := s.readPackage(c)
	if data != nil {
		defer data.Close()
	}
	if errors.Is(err, errTooSlow) {
		return s.tooSlow(c)
	}
	if err != nil {
		return err
	}
	bodyRead(c)
	size := int64(len(doc))
	if data != nil {
		size += data.size
	}
	release, err := s.largeSlot(c.Request().Context(), size)
	if err != nil {
		return err
	}
	defer release()
	n, err := s.checkPackage(doc, data)
	if err != nil {
		return err
	}
	if n.IdempotencyKey, err = idempotencyKey(c); err != nil {
		return err
	}
	n.Key = keyOf(c)
	sub, replayed, err := s.cfg.Store.CreateSubmission(c.Request().Context(), n)
	if err != nil {
		return err
	}
	v := view(sub)
	c.Response().Header().Set(echo.HeaderLocation, v.Links.Self)
	if replayed {
		c.Response().Header().Set("Idempotent-Replayed", "true")
	}
	return c.JSON(http.StatusAccepted, v)
}

// checkPackage loads the package and its data part, and returns what the
// store needs: the package, the data as a stream from the spool, and the
// fields from the study. The data bytes and the study are let go here,
// before the store is called.
func (s *Server) checkPackage(doc []byte, data *spool) (service.NewSubmission, error) {
	var csv []byte
	if data != nil {
		var err error
		if csv, err = data.bytes(); err != nil {
			return service.NewSubmission{}, err
		}
	}
	if err := s.checkMemory(doc, csv); err != nil {
		return service.NewSubmission{}, err
	}
	study, err := load.Load(doc, load.Options{Limits: s.cfg.Limits, CSV: csv})
	if err != nil {
		return service.NewSubmission{}, err
	}
	n := service.NewSubmission{Package: doc, Title: study.Package.Title,
		ManuscriptID: study.Package.ManuscriptID, PackageSHA256: study.SHA256, Cells: cells(study)}
	if data != nil {
		n.DataReader, n.DataSize = data.reader(), data.size
	}
	return n, nil
}

func (s *Server) getSubmission(c echo.Context) error {
	ctx := c.Request().Context()
	wait, err := s.waitParam(c)
	if err != nil {
		return err
	}
	deadline := time.Now().Add(wait)
	for {
		sub, err := s.cfg.Store.Submission(ctx, c.Param("id"), keyOf(c).Scope())
		if err != nil {
			return err
		}
		if service.Finished(sub.Status) || !time.Now().Add(s.cfg.PollInterval).Before(deadline) {
			return c.JSON(http.StatusOK, view(sub))
		}
		select {
		case <-ctx.Done():
			return c.JSON(http.StatusOK, view(sub))
		case <-s.draining:
			return c.JSON(http.StatusOK, view(sub))
		case <-time.After(s.cfg.PollInterval):
		}
	}
}

// waitParam reads ?wait= (a Go duration or seconds), capped at MaxWait.
func (s *Server) waitParam(c echo.Context) (time.Duration, error) {
	raw := c.QueryParam("wait")
	if raw == "" {
		return 0, nil
	}
	d, err := time.ParseDuration(raw)
	if err != nil {
		n, nerr := strconv.Atoi(raw)
		if nerr != nil {
			return 0, problemError(http.StatusBadRequest, "wait must be a duration such as 20s.")
		}
		d = time.Duration(n) * time.Second
	}
	if d < 0 {
		return 0, problemError(http.StatusBadRequest, "wait must not be negative.")
	}
	return min(d, s.cfg.MaxWait), nil
}

// SubmissionList is a page of submissions.
type SubmissionList struct {
	Submissions []SubmissionView `json:"submissions"`
	NextCursor  string           `json:"next_cursor,omitempty"`
}

var validStatus = map[string]bool{"": true, service.StatusQueued: true, service.StatusRunning: true,
	service.StatusDone: true, service.StatusFailed: true}
var validBand = map[string]bool{"": true, checks.BandLow: true, checks.BandModerate: true, checks.BandHigh: true}

func (s *Server) listSubmissions(c echo.Context) error {
	f := service.Filter{Scope: keyOf(c).Scope(), ManuscriptID: c.QueryParam("manuscript_id"),
		Status: c.QueryParam("status"), Band: c.QueryParam("band"), Cursor: c.QueryParam("cursor")}
	switch {
	case !validStatus[f.Status]:
		return problemError(http.StatusBadRequest, "status must be queued, running, done or failed.")
	case !validBand[f.Band]:
		return problemError(http.StatusBadRequest, "band must be low-concern, moderate-concern or high-concern.")
	}
	if l := c.QueryParam("limit"); l != "" {
		n, err := strconv.Atoi(l)
		if err != nil || n < 1 || n > service.MaxPage {
			return problemError(http.StatusBadRequest,
				fmt.Sprintf("limit must be a whole number from 1 to %d.", service.MaxPage))
		}
		f.Limit = n
	}
	subs, next, err := s.cfg.Store.Submissions(c.Request().Context(), f)
	if err != nil {
		return err
	}
	out := SubmissionList{Submissions: make([]SubmissionView, len(subs)), NextCursor: next}
	for i, sub := range subs {
		out.Submissions[i] = view(sub)
	}
	return c.JSON(http.StatusOK, out)
}

func (s *Server) deleteSubmission(c echo.Context) error {
	if err := s.cfg.Store.DeleteSubmission(c.Request().Context(), c.Param("id"), keyOf(c).Scope()); err != nil {
		return err
	}
	return c.NoContent(http.StatusNoContent)
}

func (s *Server) rerunSubmission(c echo.Context) error {
	sub, err := s.cfg.Store.Rerun(c.Request().Context(), c.Param("id"), keyOf(c).Scope())
	if err != nil {
		return err
	}
	return c.JSON(http.StatusAccepted, view(sub))
}
