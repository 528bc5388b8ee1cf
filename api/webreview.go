package api

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"net/http"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
	"github.com/pathvet/pathvet/checks/review"
)

// The review in the workspace: the letter under the decisions in force,
// a form per finding, the history, the published comment, and the
// comparison with the previous version, for an editor's session.

// fillReview adds the review to the page of a submission's newest report.
func (s *Server) fillReview(c echo.Context, ws *render.Workspace) error {
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	l := st.letter()
	ws.Letter = &l
	if ws.Review, err = s.reviewPanel(c, st, l); err != nil {
		return err
	}
	if st.prev != nil {
		cmp := review.Compare(st.prevRep, st.prevEff, st.rep, st.eff)
		ws.Since, err = s.sinceOf(c, st.prev, st.prevRep, st.sub, st.rep, &cmp)
	}
	return err
}

func (s *Server) reviewPanel(c echo.Context, st *reviewState, l review.Letter) (*render.ReviewPanel, error) {
	p := &render.ReviewPanel{ID: st.sub.ID, CSRF: csrfToken(c), CanDecide: true, Asked: len(l.Items),
		Notes: render.ItemViews(l.Notes), Findings: render.DecisionRows(st.rep, st.decided, webTime)}
	for _, d := range st.decided {
		if d.Decision == review.Dismiss {
			p.Dismissed++
		}
	}
	hist, err := s.history(c)
	if err != nil {
		return nil, err
	}
	for i := len(hist) - 1; i >= 0; i-- { // newest first
		h := hist[i]
		p.History = append(p.History, render.HistoryRow{When: webTime(h.At), By: byWords(h.By), Key: h.Key,
			Before: beforeWords(h.Before), After: decisionText(h.After)})
	}
	cm, err := s.cfg.Review.Comment(c.Request().Context(), st.sub.ID, keyOf(c).Scope())
	switch {
	case service.ErrorCode(err) == service.ENotFound:
	case err != nil:
		return nil, err
	default:
		v := s.commentView(c, cm)
		p.Comment = &render.CommentInfo{URL: v.URL, PublishedAt: webTime(v.PublishedAt), Indexable: v.Indexable,
			Points: v.Points}
	}
	return p, nil
}

func webTime(t time.Time) string { return t.UTC().Format(timeFormat) }

func byWords(label string) string {
	if strings.TrimSpace(label) == "" {
		return "a key without a label"
	}
	return label
}

func beforeWords(d *DecisionView) string {
	if d == nil {
		return "the default, or a decision carried over"
	}
	return decisionText(*d)
}

// decisionText says a decision in the history: "asked of the authors, in
// the reviewer's words: …", "dismissed: reason".
func decisionText(d DecisionView) string {
	out := render.DecisionWords(d.Decision)
	if d.Question != nil {
		out += ", in the reviewer's words: “" + *d.Question + "”"
	}
	if d.Reason != "" {
		out += "; reason: " + d.Reason
	}
	return out
}

// sinceOf compares a submission with its manuscript's previous version:
// what the authors changed (when the review's store can read the
// packages), then, with cmp (an editor's page), what became of the points
// asked and what is new, then how the claims' estimates moved.
func (s *Server) sinceOf(c echo.Context, prev *service.Submission, prevRep *checks.Report, sub *service.Submission,
	rep *checks.Report, cmp *review.Comparison) (*render.Since, error) {
	var changes []review.PackageChange
	if s.cfg.Review != nil {
		pkgs, err := s.cfg.Review.Packages(c.Request().Context(), []string{prev.ID, sub.ID}, keyOf(c).Scope())
		if err != nil {
			return nil, err
		}
		prevPkg, prevData := packageFacts(pkgs[prev.ID], prevRep)
		curPkg, curData := packageFacts(pkgs[sub.ID], rep)
		changes = review.PackageChanges(prevPkg, curPkg, prevData, curData)
	}
	var sn render.Since
	switch {
	case prevRep == nil:
		sn = render.NewSince(prev.ID, webTime(prev.CreatedAt), changes, review.Comparison{}, nil)
		sn.NoReport = true
	case cmp == nil:
		sn = render.NewSince(prev.ID, webTime(prev.CreatedAt), changes, review.Comparison{},
			render.Changes(prevRep, rep).Moved)
		sn.NoAsked = true
	default:
		sn = render.NewSince(prev.ID, webTime(prev.CreatedAt), changes, *cmp, render.Changes(prevRep, rep).Moved)
	}
	return &sn, nil
}

// packageFacts decodes a stored package (leniently: it was valid when
// stored) and says what its data are: a digest of the data part and of the
// data section without its reading rules, and the rows (or n) its report
// counted, −1 without a report.
func packageFacts(p service.PackageBytes, rep *checks.Report) (*checks.Package, review.DataFacts) {
	var pkg checks.Package
	_ = json.Unmarshal(p.Package, &pkg)
	d := pkg.Data
	d.MissingCodes, d.IgnoreColumns, d.File = nil, nil, ""
	section, _ := json.Marshal(d)
	sum := sha256.Sum256(append([]byte(p.DataSHA256), section...))
	facts := review.DataFacts{Digest: hex.EncodeToString(sum[:]), Rows: -1}
	if rep != nil {
		facts.Rows = max(rep.Data.Rows, rep.Data.N)
	}
	return &pkg, facts
}

// editorsOnly answers a submitter's session with a page that says so.
func (s *Server) editorsOnly(c echo.Context) (bool, error) {
	if keyOf(c).Role == service.RoleEditor {
		return true, nil
	}
	return false, s.notice(c, http.StatusForbidden, "Not for this key",
		"Only an editor's key may decide on findings and publish comments.")
}

// webAnnotate is POST /submissions/{id}/findings/{key}/annotation from a
// finding's form; back to the finding, or a page that says what to fix.
func (s *Server) webAnnotate(c echo.Context) error {
	if ok, err := s.editorsOnly(c); !ok {
		return err
	}
	st, err := s.reviewOf(c)
	if err != nil {
		return err
	}
	req := decisionRequest{Decision: c.FormValue("decision"), Reason: c.FormValue("reason"),
		Question: c.FormValue("question")}
	_, err = s.decide(c, st, c.Param("key"), req)
	var inv *invalidFields
	if errors.As(err, &inv) {
		return s.notice(c, http.StatusUnprocessableEntity, "The decision was not saved", problemsText(inv))
	}
	if err != nil {
		return err
	}
	return c.Redirect(http.StatusSeeOther, "/submissions/"+st.sub.ID+"#f-"+c.Param("key"))
}

// problemsText puts a decision's problems in words for a page.
func problemsText(inv *invalidFields) string {
	names := map[string]string{"/decision": "The decision", "/reason": "The reason", "/question": "The question"}
	parts := make([]string, len(inv.problems))
	for i, p := range inv.problems {
		parts[i] = names[p.Pointer] + ": " + p.Detail + "."
	}
	return strings.Join(parts, " ") + " Go back and try again."
}

// webPublish is POST /submissions/{id}/comment: publish, or publish again.
func (s *Server) webPublish(c echo.Context) error {
	if ok, err := s.editorsOnly(c); !ok {
		return err
	}
	_, _, err := s.publish(c, c.FormValue("indexable") == "yes")
	if service.ErrorCode(err) == service.EConflict {
		return s.notice(c, http.StatusConflict, "Nothing to publish",
			"No point is asked of the authors, so there is nothing to publish.")
	}
	if err != nil {
		return err
	}
	return c.Redirect(http.StatusSeeOther, "/submissions/"+c.Param("id")+"#review")
}

// webWithdraw is POST /submissions/{id}/comment/withdraw.
func (s *Server) webWithdraw(c echo.Context) error {
	if ok, err := s.editorsOnly(c); !ok {
		return err
	}
	if err := s.cfg.Review.WithdrawComment(c.Request().Context(), c.Param("id"), keyOf(c).Scope()); err != nil {
		return err
	}
	return c.Redirect(http.StatusSeeOther, "/submissions/"+c.Param("id")+"#review")
}
