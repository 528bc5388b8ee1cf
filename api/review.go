package api

import (
	"context"
	"fmt"
	"net/http"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
	"github.com/pathvet/pathvet/checks/review"
)

// ReviewStore is what the review needs from storage: reviewers' decisions,
// a manuscript's versions, published comments and deletions.
type ReviewStore interface {
	Annotate(ctx context.Context, id string, sc service.Scope, k *service.Key, n service.NewAnnotation) (
		*service.Annotation, error)
	Annotations(ctx context.Context, id string, sc service.Scope) ([]service.Annotation, error)
	ReviewChain(ctx context.Context, sub *service.Submission, sc service.Scope) ([]service.ReviewVersion, error)
	PublishComment(ctx context.Context, id string, sc service.Scope, k *service.Key, letter []byte, indexable bool) (
		*service.Comment, bool, error)
	Comment(ctx context.Context, id string, sc service.Scope) (*service.Comment, error)
	WithdrawComment(ctx context.Context, id string, sc service.Scope) error
	PublishedComment(ctx context.Context, token string) (*service.Comment, error)
	Comments(ctx context.Context, sc service.Scope, limit int) ([]*service.Comment, error)
	Deletion(ctx context.Context, id string, sc service.Scope) (*service.Deletion, error)
	Packages(ctx context.Context, ids []string, sc service.Scope) (map[string]service.PackageBytes, error)
}

// reviewState is a submission's newest report with the decisions in force
// on it, and its manuscript's previous version with a report, if any.
type reviewState struct {
	sub     *service.Submission
	rep     *checks.Report
	eff     map[string]review.Annotation
	decided []review.Decided
	// prev is the manuscript's previous version (nil for a first one);
	// prevRep its newest report (nil when it has none) and prevEff the
	// decisions in force on it.
	prev    *service.Submission
	prevRep *checks.Report
	prevEff map[string]review.Annotation
}

// reviewOf gathers the review state of the submission named in the path.
func (s *Server) reviewOf(c echo.Context) (*reviewState, error) {
	ctx, sc := c.Request().Context(), keyOf(c).Scope()
	sub, err := s.cfg.Store.Submission(ctx, c.Param("id"), sc)
	if err != nil {
		return nil, err
	}
	if s.cfg.Review == nil {
		return nil, service.Errorf(service.ENotFound, "this server keeps no review")
	}
	chain, err := s.cfg.Review.ReviewChain(ctx, sub, sc)
	if err != nil {
		return nil, err
	}
	vs, err := reviewVersions(chain)
	if err != nil {
		return nil, err
	}
	last := vs[len(vs)-1]
	if last.Report == nil {
		return nil, service.Errorf(service.ENotFound, "no report yet: the submission has not been screened")
	}
	st := &reviewState{sub: sub, rep: last.Report, eff: review.Effective(vs)}
	st.decided = review.Decide(st.rep, st.eff)
	if n := len(vs); n > 1 {
		st.prev, st.prevRep, st.prevEff = chain[n-2].Submission, vs[n-2].Report, review.Effective(vs[:n-1])
	}
	return st, nil
}

// reviewVersions decodes a chain's reports and decisions.
func reviewVersions(chain []service.ReviewVersion) ([]review.Version, error) {
	out := make([]review.Version, len(chain))
	for i, v := range chain {
		out[i] = review.Version{ID: v.Submission.ID, Own: map[string]review.Annotation{}}
		if v.Report != nil {
			r, err := decodeReport(v.Report)
			if err != nil {
				return nil, err
			}
			out[i].Report = r
		}
		for _, a := range v.Own {
			out[i].Own[a.Key] = reviewAnnotation(a)
		}
	}
	return out, nil
}

func reviewAnnotation(a service.Annotation) review.Annotation {
	return review.Annotation{Decision: a.Decision, Reason: a.Reason, Question: a.Question, By: a.By, At: a.At}
}

// letter is the state's letter for the authors.
func (st *reviewState) letter() review.Letter { return review.Compose(st.rep, st.decided) }

// FindingView is a finding as GET .../findings lists it.
type FindingView struct {
	Key      string          `json:"key"`
	Check    string          `json:"check"`
	Severity string          `json:"severity"`
	Claim    *string         `json:"claim"`
	Message  string          `json:"message"`
	Question *string         `json:"question"`
	Decision string          `json:"decision"`
	Note     *AnnotationView `json:"annotation"`
}

// AnnotationView is a decision as the API shows it.
type AnnotationView struct {
	Decision    string    `json:"decision"`
	Reason      string    `json:"reason"`
	Question    *string   `json:"question"`
	By          string    `json:"by"`
	At          time.Time `json:"at"`
	CarriedFrom *string   `json:"carried_from"`
}

func annotationView(a review.Annotation) *AnnotationView {
	return &AnnotationView{Decision: a.Decision, Reason: a.Reason, Question: orNull(a.Question), By: a.By,
		At: a.At, CarriedFrom: orNull(a.CarriedFrom)}
}

func orNull(s string) *string {
	if s == "" {
		return nil
	}
	return &s
}

// listFindings is GET /v1/submissions/{id}/findings: the newest report's
// findings, each with its default question and the decision in force.
func (s *Server) listFindings(c echo.Context) error {
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	out := make([]FindingView, len(st.decided))
	for i, d := range st.decided {
		out[i] = FindingView{Key: d.Key, Check: d.Check, Severity: d.Severity, Claim: orNull(d.Claim),
			Message: d.Message, Question: orNull(d.Finding.Question), Decision: d.Decision}
		if d.Annotation != nil {
			out[i].Note = annotationView(*d.Annotation)
		}
	}
	return c.JSON(http.StatusOK, map[string]any{"submission_id": st.sub.ID, "findings": out})
}

// apiLetter is GET /v1/submissions/{id}/letter.md: the letter for the
// authors under the decisions in force, as Markdown.
func (s *Server) apiLetter(c echo.Context) error {
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	return writeLetter(c, st)
}

func writeLetter(c echo.Context, st *reviewState) error {
	var out strings.Builder
	if err := render.WriteLetter(&out, st.letter()); err != nil {
		return err
	}
	h := c.Response().Header()
	h.Set("Content-Disposition", fmt.Sprintf(`inline; filename="letter-%s.md"`, st.sub.ID))
	h.Set("Cache-Control", "no-store")
	return c.Blob(http.StatusOK, "text/markdown; charset=utf-8", []byte(out.String()))
}
