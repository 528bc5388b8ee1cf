package api

import (
	"bytes"
	"encoding/json"
	"io"
	"net/http"
	"slices"
	"strings"
	"time"
	"unicode/utf8"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/review"
)

// decisionRequest is a reviewer's decision on one finding.
type decisionRequest struct {
	Decision string `json:"decision"`
	Reason   string `json:"reason"`
	Question string `json:"question"`
}

// putAnnotation is PUT /v1/submissions/{id}/findings/{key}/annotation: an
// editor's decision on a finding of the newest report, kept beside every
// earlier one; 200 with the decision as kept.
func (s *Server) putAnnotation(c echo.Context) error {
	body, err := io.ReadAll(io.LimitReader(c.Request().Body, 32<<10))
	if err != nil {
		return bodyError(err)
	}
	var req decisionRequest
	dec := json.NewDecoder(bytes.NewReader(body))
	dec.DisallowUnknownFields()
	if err := dec.Decode(&req); err != nil {
		return problemError(http.StatusBadRequest,
			`Send {"decision": "ask" | "note" | "dismiss", "reason": "...", "question": "..."} as JSON.`)
	}
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	a, err := s.decide(c, st, c.Param("key"), req)
	if err != nil {
		return err
	}
	return c.JSON(http.StatusOK, storedView(*a))
}

// decide checks a decision on finding key and keeps it.
func (s *Server) decide(c echo.Context, st *reviewState, key string, req decisionRequest) (
	*service.Annotation, error) {
	n, err := checkDecision(st, key, req)
	if err != nil {
		return nil, err
	}
	return s.cfg.Review.Annotate(c.Request().Context(), st.sub.ID, keyOf(c).Scope(), keyOf(c), n)
}

// checkDecision holds a decision to the rules: a finding of the newest
// report (else not found), a known decision, a reason to dismiss, a
// question to ask of a finding without a default one, texts of at most
// their limits. A question equal to the default is kept as no rewording.
func checkDecision(st *reviewState, key string, req decisionRequest) (service.NewAnnotation, error) {
	i := slices.IndexFunc(st.decided, func(d review.Decided) bool { return d.Key == key })
	if i < 0 {
		return service.NewAnnotation{}, service.Errorf(service.ENotFound,
			"the newest report has no finding with the key %q", key)
	}
	d := st.decided[i]
	n := service.NewAnnotation{Key: key, Decision: req.Decision, Reason: oneLine(req.Reason),
		Question: oneLine(req.Question)}
	if n.Question == oneLine(d.Finding.Question) {
		n.Question = ""
	}
	var ps []checks.Problem
	add := func(ptr, detail string) { ps = append(ps, checks.Problem{Pointer: ptr, Detail: detail}) }
	if !slices.Contains(review.Decisions, n.Decision) {
		add("/decision", `must be "ask", "note" or "dismiss"`)
	}
	if n.Decision == review.Dismiss && n.Reason == "" {
		add("/reason", "a dismissal needs a reason: say why the authors need not answer this finding")
	}
	if n.Decision == review.Ask && n.Question == "" && d.Finding.Question == "" {
		add("/question", "this finding has no default question; write the question to ask the authors")
	}
	for ptr, v := range map[string]string{"/reason": req.Reason, "/question": req.Question} {
		if !validText(v) || utf8.RuneCountInString(v) > service.MaxQuestion {
			add(ptr, "must be UTF-8 text without NUL, of at most 2000 characters")
		}
	}
	if len(ps) > 0 {
		slices.SortFunc(ps, func(a, b checks.Problem) int { return strings.Compare(a.Pointer, b.Pointer) })
		return n, &invalidFields{problems: ps}
	}
	return n, nil
}

// oneLine trims a text and makes each run of white space one space.
func oneLine(s string) string { return strings.Join(strings.Fields(s), " ") }

// StoredView is a decision as kept.
type StoredView struct {
	Key      string    `json:"key"`
	Decision string    `json:"decision"`
	Reason   string    `json:"reason"`
	Question *string   `json:"question"`
	By       string    `json:"by"`
	At       time.Time `json:"at"`
}

func storedView(a service.Annotation) StoredView {
	return StoredView{Key: a.Key, Decision: a.Decision, Reason: a.Reason, Question: orNull(a.Question), By: a.By,
		At: a.At}
}

// DecisionView is a decision in the history: before or after a change.
type DecisionView struct {
	Decision string  `json:"decision"`
	Reason   string  `json:"reason"`
	Question *string `json:"question"`
}

// HistoryEvent is one change of a decision: who made it, when, and the
// decision before (null: the default, or one carried over from the
// earlier version) and after it.
type HistoryEvent struct {
	Key    string        `json:"key"`
	By     string        `json:"by"`
	At     time.Time     `json:"at"`
	Before *DecisionView `json:"before"`
	After  DecisionView  `json:"after"`
}

// listAnnotations is GET /v1/submissions/{id}/annotations: every decision
// made on the submission, oldest first, each with the one it replaced.
func (s *Server) listAnnotations(c echo.Context) error {
	hist, err := s.history(c)
	if err != nil {
		return err
	}
	return c.JSON(http.StatusOK, map[string]any{"annotations": hist})
}

func (s *Server) history(c echo.Context) ([]HistoryEvent, error) {
	as, err := s.cfg.Review.Annotations(c.Request().Context(), c.Param("id"), keyOf(c).Scope())
	if err != nil {
		return nil, err
	}
	last := map[string]*DecisionView{}
	out := make([]HistoryEvent, len(as))
	for i, a := range as {
		after := DecisionView{Decision: a.Decision, Reason: a.Reason, Question: orNull(a.Question)}
		out[i] = HistoryEvent{Key: a.Key, By: a.By, At: a.At, Before: last[a.Key], After: after}
		last[a.Key] = &after
	}
	return out, nil
}
