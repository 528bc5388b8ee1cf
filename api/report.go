package api

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"io"
	"net/http"
	"runtime/debug"
	"strconv"
	"strings"
	"time"

	"github.com/labstack/echo/v4"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/render"
)

// reportView is one way of serving a report: its media type, how it is
// written (nil: the stored JSON as it is), and the suffix of its ETag.
type reportView struct {
	ctype  string
	write  func(io.Writer, *checks.Report) error
	suffix string
}

// reportViews by ?format=. The JSON is the stored bytes, which never
// change under a report's id, so its tag is the id alone; the text and
// HTML views are drawn by this build, so theirs name it too.
var reportViews = map[string]reportView{
	"":     {ctype: echo.MIMEApplicationJSON},
	"json": {ctype: echo.MIMEApplicationJSON},
	"text": {ctype: echo.MIMETextPlainCharsetUTF8, write: render.WriteText, suffix: ".text." + buildTag},
	"html": {ctype: echo.MIMETextHTMLCharsetUTF8, write: writeHTML, suffix: ".html." + buildTag},
}

func (v reportView) etag(id int64) string { return `"r` + strconv.FormatInt(id, 10) + v.suffix + `"` }

// getReport serves the newest report: JSON by default (the stored bytes,
// written as they are), the text view with ?format=text, the HTML view
// with ?format=html. Every answer has an ETag naming the report and the
// view; when If-None-Match names the newest report's, the answer is 304
// and the report's bytes are not even read from the database.
func (s *Server) getReport(c echo.Context) error {
	v, ok := reportViews[c.QueryParam("format")]
	if !ok {
		return problemError(http.StatusBadRequest, "format must be json, text or html.")
	}
	inm := c.Request().Header.Get("If-None-Match")
	r, err := s.cfg.Store.LatestReport(c.Request().Context(), c.Param("id"), keyOf(c).Scope(), heldReport(inm, v))
	if err != nil {
		return err
	}
	tag, h := v.etag(r.ID), c.Response().Header()
	h.Set("ETag", tag)
	h.Set("Cache-Control", "private, no-cache")
	if r.JSON == nil || etagMatches(inm, tag) {
		return c.NoContent(http.StatusNotModified)
	}
	if v.write == nil {
		return c.Blob(http.StatusOK, v.ctype, r.JSON)
	}
	var rep checks.Report
	if err := json.Unmarshal(r.JSON, &rep); err != nil {
		return err
	}
	h.Set(echo.HeaderContentType, v.ctype)
	c.Response().WriteHeader(http.StatusOK)
	return v.write(c.Response(), &rep)
}

// etagTags splits If-None-Match into its entity tags, weak ones made
// strong: If-None-Match compares weakly (RFC 9110, section 13.1.2).
func etagTags(inm string) []string {
	var out []string
	for _, t := range strings.Split(inm, ",") {
		if t = strings.TrimPrefix(strings.TrimSpace(t), "W/"); t != "" {
			out = append(out, t)
		}
	}
	return out
}

func etagMatches(inm, tag string) bool {
	for _, t := range etagTags(inm) {
		if t == tag || t == "*" {
			return true
		}
	}
	return false
}

// heldReport is the id of the report whose tag for this view the client
// sent, 0 when it sent none.
func heldReport(inm string, v reportView) int64 {
	for _, t := range etagTags(inm) {
		body, ok := strings.CutPrefix(t, `"r`)
		if body, ok = strings.CutSuffix(body, v.suffix+`"`); !ok {
			continue
		}
		if id, err := strconv.ParseInt(body, 10, 64); err == nil && id > 0 {
			return id
		}
	}
	return 0
}

// buildTag names this build in the tags of drawn views: the tool version
// and the commit it was built from, or, for a build from a modified tree
// or without version control, the moment this process started (so that
// no client keeps a drawing an unrecorded change has made stale).
var buildTag = func() string {
	rev, modified := "", "true"
	if info, ok := debug.ReadBuildInfo(); ok {
		for _, st := range info.Settings {
			switch st.Key {
			case "vcs.revision":
				rev = st.Value
			case "vcs.modified":
				modified = st.Value
			}
		}
	}
	if rev == "" || modified != "false" {
		rev = strconv.FormatInt(time.Now().UnixNano(), 10)
	}
	sum := sha256.Sum256([]byte(checks.ToolVersion + "/" + rev))
	return hex.EncodeToString(sum[:6])
}()
