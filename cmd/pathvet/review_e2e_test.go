package main

import (
	"context"
	"encoding/json"
	"net/http"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/store/storetest"
)

const (
	c1Across = "equivalence:C1:across-equivalents"
	c2Across = "equivalence:C2:across-equivalents"
	c3Words  = "causal-language:C3:wording"
	c4Figs   = "effect-reporting:C4:figures"
	c3Across = "equivalence:C3:across-equivalents"
)

// findingsOf reads GET .../findings into a map by key.
func findingsOf(t *testing.T, c apiClient, self string) map[string]api.FindingView {
	t.Helper()
	code, _, b := c.call(http.MethodGet, self+"/findings", "", nil)
	var out struct {
		Findings []api.FindingView `json:"findings"`
	}
	if code != http.StatusOK || json.Unmarshal(b, &out) != nil || len(out.Findings) == 0 {
		t.Fatalf("findings: %d %.300s", code, b)
	}
	m := map[string]api.FindingView{}
	for _, f := range out.Findings {
		m[f.Key] = f
	}
	return m
}

func decide(c apiClient, self, key, body string) (int, []byte) {
	code, _, b := c.call(http.MethodPut, self+"/findings/"+key+"/annotation", "application/json", []byte(body))
	return code, b
}

// submitWait submits a package and waits for its report.
func submitWait(t *testing.T, c apiClient, pkg []byte) api.SubmissionView {
	t.Helper()
	code, _, b := c.call(http.MethodPost, "/v1/submissions", "application/json", pkg)
	var sub api.SubmissionView
	if code != http.StatusAccepted || json.Unmarshal(b, &sub) != nil {
		t.Fatalf("submit: %d %s", code, b)
	}
	if _, v := c.submission(sub.Links.Self + "?wait=30s"); v.Status != service.StatusDone {
		t.Fatalf("not screened: %+v", v)
	}
	return sub
}

// resubmission is the tutoring-anxiety demo as a second version: other
// figures (its correlations weakened by 7 %) and claim C4 withdrawn.
func resubmission(t *testing.T) []byte {
	t.Helper()
	var p map[string]any
	_ = json.Unmarshal(readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"), &p)
	d := p["data"].(map[string]any)
	for i, row := range d["correlations"].([]any) {
		for j := range row.([]any)[:i] {
			row.([]any)[j] = 0.93 * row.([]any)[j].(float64)
		}
	}
	p["claims"] = p["claims"].([]any)[:3]
	b, _ := json.Marshal(p)
	return b
}

// The review over HTTP against the real server and PostgreSQL: findings
// with their default decisions, decisions by an editor only (403 for a
// submitter, 422 for a dismissal without a reason), the history with who,
// when, before and after, the letter under the decisions, and the
// decisions carried over to a resubmission while their findings stay.
func TestReview_EndToEnd(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	defer m.Close()
	base := m.URL()
	editorToken, editorKey := storetest.MustKey(t, db, "Office R", service.RoleEditor)
	editor := apiClient{t, &base, editorToken}
	submitter := apiClient{t, &base, mustKeyToken(t, db, "Office R", service.RoleSubmitter)}
	otherOffice := apiClient{t, &base, mustKeyToken(t, db, "Office S", service.RoleEditor)}
	v1 := submitWait(t, submitter, readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	self := v1.Links.Self

	fs := findingsOf(t, editor, self)
	if f := fs[c1Across]; f.Decision != "ask" || f.Note != nil || f.Question == nil || f.Claim == nil ||
		*f.Claim != "C1" {
		t.Fatalf("C1 across equivalents: %+v", f)
	}
	for k, f := range fs {
		if (f.Severity == "info") != (f.Question == nil) || (f.Severity == "info") != (f.Decision == "note") {
			t.Errorf("%s: %s with question %v and decision %s", k, f.Severity, f.Question, f.Decision)
		}
	}
	t.Run("Refusals", func(t *testing.T) {
		for _, tc := range []struct {
			c          apiClient
			key, body  string
			want       int
			wantDetail string
		}{
			{submitter, c2Across, `{"decision": "note"}`, http.StatusForbidden, "editor"},
			{otherOffice, c2Across, `{"decision": "note"}`, http.StatusNotFound, ""},
			{editor, c2Across, `{"decision": "dismiss"}`, http.StatusUnprocessableEntity, `"/reason"`},
			{editor, c2Across, `{"decision": "dismiss", "reason": "   "}`, http.StatusUnprocessableEntity,
				`"/reason"`},
			{editor, c2Across, `{"decision": "maybe"}`, http.StatusUnprocessableEntity, `"/decision"`},
			{editor, "equivalence:C9:across-equivalents", `{"decision": "note"}`, http.StatusNotFound, "C9"},
			{editor, c2Across, `{"decision": "note", "extra": 1}`, http.StatusBadRequest, ""},
			{editor, c2Across, `not json`, http.StatusBadRequest, ""},
		} {
			if code, b := decide(tc.c, self, tc.key, tc.body); code != tc.want || !strings.Contains(string(b),
				tc.wantDetail) {
				t.Errorf("%s %s: %d %s, want %d with %s", tc.key, tc.body, code, b, tc.want, tc.wantDetail)
			}
		}
		for _, path := range []string{"/findings", "/annotations", "/letter.md", "/comment"} {
			if code, _, _ := submitter.call(http.MethodGet, self+path, "", nil); code != http.StatusForbidden {
				t.Errorf("a submitter reads %s: %d", path, code)
			}
		}
		var info string
		for k, f := range fs {
			if f.Question == nil {
				info = k
				break
			}
		}
		if code, b := decide(editor, self, info, `{"decision": "ask"}`); code != http.StatusUnprocessableEntity ||
			!strings.Contains(string(b), `"/question"`) {
			t.Errorf("asking a note without a question: %d %s", code, b)
		}
	})
	reworded := "What in the design orders tutoring before anxiety?"
	for _, d := range [][2]string{
		{c2Across, `{"decision": "dismiss", "reason": "The authors measured anxiety after tutoring began."}`},
		{c1Across, `{"decision": "ask", "question": "` + reworded + `"}`},
		{c3Words, `{"decision": "note"}`},
		{c1Across, `{"decision": "ask", "question": "` + reworded + ` And when was it measured?"}`},
	} {
		code, b := decide(editor, self, d[0], d[1])
		var got api.StoredView
		if code != http.StatusOK || json.Unmarshal(b, &got) != nil || got.Key != d[0] || got.By != editorKey.Label {
			t.Fatalf("decide %s: %d %s", d[0], code, b)
		}
	}
	t.Run("History", func(t *testing.T) {
		code, _, b := editor.call(http.MethodGet, self+"/annotations", "", nil)
		var h struct {
			Annotations []api.HistoryEvent `json:"annotations"`
		}
		if code != http.StatusOK || json.Unmarshal(b, &h) != nil || len(h.Annotations) != 4 {
			t.Fatalf("history: %d %s", code, b)
		}
		first, last := h.Annotations[1], h.Annotations[3]
		if first.Before != nil || first.By != editorKey.Label || first.At.IsZero() ||
			*first.After.Question != reworded {
			t.Errorf("first decision on C1: %+v", first)
		}
		if last.Before == nil || *last.Before.Question != reworded || !strings.HasSuffix(*last.After.Question,
			"measured?") {
			t.Errorf("the change of C1's question: %+v", last)
		}
	})
	t.Run("Letter", func(t *testing.T) {
		code, hdr, b := editor.call(http.MethodGet, self+"/letter.md", "", nil)
		letter := string(b)
		if code != http.StatusOK || !strings.HasPrefix(hdr.Get("Content-Type"), "text/markdown") ||
			!strings.Contains(letter, reworded+" And when was it measured?") ||
			!strings.HasPrefix(letter, "Dear authors,") {
			t.Fatalf("letter: %d %s", code, letter)
		}
		if strings.Contains(letter, "C2 is −0.37") || strings.Contains(letter, `("raises")`) ||
			regexp.MustCompile(`(?i)\bscore[ds]?\b|concern`).MatchString(strings.ReplaceAll(letter, "scores", "")) {
			t.Errorf("the letter has a dismissed or noted finding, or a score:\n%s", letter)
		}
	})
	t.Run("CarriedOver", func(t *testing.T) {
		v2 := submitWait(t, editor, resubmission(t))
		fs2 := findingsOf(t, editor, v2.Links.Self)
		if a := fs2[c2Across].Note; a == nil || a.Decision != "dismiss" || a.CarriedFrom == nil ||
			*a.CarriedFrom != v1.ID {
			t.Errorf("C2's dismissal, still open, not carried: %+v", a)
		}
		if a := fs2[c1Across].Note; a == nil || a.CarriedFrom == nil || !strings.HasSuffix(*a.Question, "measured?") {
			t.Errorf("C1's reworded question not carried: %+v", a)
		}
		if _, ok := fs2[c4Figs]; ok {
			t.Error("C4 was withdrawn, yet its finding is listed")
		}
		if fs2[c1Across].Message == fs[c1Across].Message {
			t.Error("the resubmission's figures did not change the finding's sentence: the test tests nothing")
		}
		code, _, b := editor.call(http.MethodGet, v2.Links.Self+"/letter.md", "", nil)
		if code != http.StatusOK || !strings.Contains(string(b), "measured?") || strings.Contains(string(b),
			"C2 is −") {
			t.Errorf("v2's letter: %d %s", code, b)
		}
	})
	checkOpenAPI(t, m)
}

// The published comment: an editor publishes it (a submitter may not); it
// answers anyone with its address, uncached and unindexed unless the office
// chooses, with the asked points in the reviewer's words and the caution,
// and nothing else of the office: no score or band, no office or key
// label, no manuscript or submission id, no link, form or cookie, and its
// address opens nothing else. Withdrawn, it is gone; with nothing asked,
// there is nothing to publish.
func TestComment_EndToEnd(t *testing.T) {
	db, url := storetest.MustOpenDB(t)
	m := startMain(t, url)
	defer m.Close()
	base := m.URL()
	editorToken, editorKey := storetest.MustKey(t, db, "Office of Invented Studies", service.RoleEditor)
	editor, anonymous := apiClient{t, &base, editorToken}, apiClient{t, &base, ""}
	submitter := apiClient{t, &base, mustKeyToken(t, db, "Office of Invented Studies", service.RoleSubmitter)}
	sub := submitWait(t, submitter, readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"))
	self := sub.Links.Self
	reworded := "Which measurement came first, tutoring or anxiety?"
	if code, b := decide(editor, self, c1Across, `{"decision": "ask", "question": "`+reworded+`"}`); code != 200 {
		t.Fatalf("decide: %d %s", code, b)
	}
	if code, _, _ := submitter.call(http.MethodPost, self+"/comment", "", nil); code != http.StatusForbidden {
		t.Fatalf("a submitter publishes: %d", code)
	}
	code, _, b := editor.call(http.MethodPost, self+"/comment", "", nil)
	var cm api.CommentView
	if code != http.StatusCreated || json.Unmarshal(b, &cm) != nil || !strings.HasPrefix(cm.URL, base+"/comments/") ||
		len(strings.TrimPrefix(cm.URL, base+"/comments/")) < 43 || cm.Points == 0 {
		t.Fatalf("publish: %d %s", code, b)
	}
	path := strings.TrimPrefix(cm.URL, base)
	code, hdr, page := anonymous.call(http.MethodGet, path, "", nil)
	if code != http.StatusOK || hdr.Get("Cache-Control") != "no-store" ||
		!strings.Contains(hdr.Get("X-Robots-Tag"), "noindex") || hdr.Get("Set-Cookie") != "" ||
		!strings.Contains(string(page), `<meta name="robots" content="noindex, nofollow">`) {
		t.Fatalf("the page: %d %v", code, hdr)
	}
	html := string(page)
	for _, want := range []string{reworded, "not a verdict", "Statistical comment", "“Attending more peer-tutoring"} {
		if !strings.Contains(html, want) {
			t.Errorf("the page lacks %q", want)
		}
	}
	text := regexp.MustCompile(`(?s)<style>.*</style>`).ReplaceAllString(html, "")
	if regexp.MustCompile(`(?i)\bscor(e|es|ed)\b|\bbands?\b`).MatchString(strings.ReplaceAll(text, "maths scores",
		"")) {
		t.Error("the published page speaks of a score or band")
	}
	for _, claim := range []string{"Maths anxiety lowers end-of-year maths scores",
		"Tutoring raises maths scores overall"} {
		text = strings.ReplaceAll(text, claim, "")
	}
	for _, leak := range []string{"Office of Invented Studies", editorKey.Label, sub.ID, "DEMO-2026-0141", "href=",
		"action=",
		"src=", "<form", "<script", "of 100", "concern", "points off", "dismiss", "pathvet workspace"} {
		if strings.Contains(text, leak) {
			t.Errorf("the published page shows %q", leak)
		}
	}
	var stored string
	if err := db.Pool.QueryRow(context.Background(),
		`SELECT letter::text FROM published_comments`).Scan(&stored); err != nil ||
		strings.Contains(stored, "DEMO-2026-0141") || strings.Contains(stored, "E-value for C1") {
		t.Errorf("the comment keeps the manuscript ID or a noted finding (%v): %.300s", err, stored)
	}
	for _, tc := range []struct {
		method, path string
		headers      []string
		want         int
	}{
		{http.MethodGet, "/v1/submissions", []string{"Authorization", "Bearer " + strings.TrimPrefix(path,
			"/comments/")}, 401},
		{http.MethodGet, self, []string{"Authorization", "Bearer " + strings.TrimPrefix(path, "/comments/")}, 401},
		{http.MethodGet, path + "x", nil, 404},
		{http.MethodGet, "/comments/", nil, 404},
	} {
		if code, _, _ := anonymous.call(tc.method, tc.path, "", nil, tc.headers...); code != tc.want {
			t.Errorf("%s %s with the address: %d, want %d", tc.method, tc.path, code, tc.want)
		}
	}
	code, _, b = editor.call(http.MethodPost, self+"/comment", "application/json", []byte(`{"indexable": true}`))
	var again api.CommentView
	if code != http.StatusOK || json.Unmarshal(b, &again) != nil || again.URL != cm.URL || !again.Indexable {
		t.Fatalf("publish again: %d %s", code, b)
	}
	if _, hdr, page := anonymous.call(http.MethodGet, path, "", nil); hdr.Get("X-Robots-Tag") != "" ||
		strings.Contains(string(page), `name="robots"`) {
		t.Errorf("indexable, yet marked noindex: %v", hdr)
	}
	if code, _, _ := editor.call(http.MethodGet, self+"/comment", "", nil); code != http.StatusOK {
		t.Errorf("get comment: %d", code)
	}
	if code, _, _ := editor.call(http.MethodDelete, self+"/comment", "", nil); code != http.StatusNoContent {
		t.Fatalf("withdraw: %d", code)
	}
	if code, hdr, _ := anonymous.call(http.MethodGet, path, "", nil); code != http.StatusNotFound ||
		hdr.Get("Cache-Control") != "no-store" {
		t.Errorf("withdrawn: %d %v", code, hdr)
	}
	for _, method := range []string{http.MethodGet, http.MethodDelete} {
		if code, _, _ := editor.call(method, self+"/comment", "", nil); code != http.StatusNotFound {
			t.Errorf("%s a withdrawn comment: %d", method, code)
		}
	}
	for k, f := range findingsOf(t, editor, self) {
		if f.Decision == "ask" {
			decide(editor, self, k, `{"decision": "dismiss", "reason": "answered in the cover letter"}`)
		}
	}
	if code, _, b := editor.call(http.MethodPost, self+"/comment", "", nil); code != http.StatusConflict {
		t.Errorf("nothing asked, yet published: %d %s", code, b)
	}
	checkOpenAPI(t, m)
}
