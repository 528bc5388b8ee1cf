package main

import (
	"bytes"
	"context"
	"encoding/json"
	"mime/multipart"
	"net/http"
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/chromedp"

	"github.com/pathvet/pathvet/api"
	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/store/storetest"
)

// chromiumPath is Debian's Chromium; .ci/run installs it when missing.
const chromiumPath = "/usr/bin/chromium"

// newBrowser starts headless Chromium with a fresh profile; the test
// fails, never skips, when it cannot.
func newBrowser(t *testing.T) context.Context {
	t.Helper()
	opts := append(chromedp.DefaultExecAllocatorOptions[:], chromedp.ExecPath(chromiumPath),
		chromedp.NoSandbox, chromedp.DisableGPU, chromedp.UserDataDir(t.TempDir()),
		chromedp.Flag("disable-quic", true), chromedp.Flag("disable-component-update", true),
		chromedp.Flag("hide-scrollbars", true))
	actx, cancelAlloc := chromedp.NewExecAllocator(context.Background(), opts...)
	ctx, cancel := chromedp.NewContext(actx)
	t.Cleanup(func() { cancel(); cancelAlloc() })
	if err := chromedp.Do(ctx); err != nil {
		t.Fatalf("headless Chromium (%s) does not start: %v", chromiumPath, err)
	}
	tctx, tcancel := context.WithTimeout(ctx, 2*time.Minute)
	t.Cleanup(tcancel)
	return tctx
}

// submitMultipart sends a package with its CSV data file.
func submitMultipart(t *testing.T, c apiClient, dir string) api.SubmissionView {
	t.Helper()
	var body bytes.Buffer
	mw := multipart.NewWriter(&body)
	for part, file := range map[string]string{"package": "package.json", "data": "rows.csv"} {
		w, _ := mw.CreateFormFile(part, file)
		w.Write(readFile(t, filepath.Join(dir, file)))
	}
	mw.Close()
	return mustSubmit(t, c, mw.FormDataContentType(), body.Bytes())
}

func mustSubmit(t *testing.T, c apiClient, ctype string, body []byte) api.SubmissionView {
	t.Helper()
	code, _, b := c.call(http.MethodPost, "/v1/submissions", ctype, body)
	var v api.SubmissionView
	if code != http.StatusAccepted || json.Unmarshal(b, &v) != nil {
		t.Fatalf("submit: %d %.300s", code, b)
	}
	if code, done := c.submission(v.Links.Self + "?wait=30s"); code != http.StatusOK ||
		done.Status != service.StatusDone {
		t.Fatalf("screening: %d %+v", code, done)
	}
	return v
}

// secondVersion is the tutoring demo again under the same manuscript ID,
// now saying that the equivalent graphs were discussed.
func secondVersion(t *testing.T) []byte {
	var pkg map[string]any
	if err := json.Unmarshal(readFile(t, "../../testdata/demo/tutoring-anxiety/package.json"), &pkg); err != nil {
		t.Fatal(err)
	}
	pkg["graph"].(map[string]any)["equivalents_discussed"] = true
	b, _ := json.Marshal(pkg)
	return b
}

type browserFixture struct {
	m                         *Main
	editorToken               string
	tutoring, v2, club, sleep api.SubmissionView
	otherOffice               api.SubmissionView
	tutoringReport            checks.Report
}

// editorLabel is the label of the fixture's editor key, which the
// dashboard shows beside each submission it sent.
const editorLabel = "Demo editor"

func newBrowserFixture(t *testing.T) *browserFixture {
	db, url := storetest.MustOpenDB(t)
	f := &browserFixture{m: startMain(t, url)}
	t.Cleanup(func() { _ = f.m.Close() })
	base := f.m.URL()
	const office = "Office of Invented Studies"
	if _, err := db.CreateOffice(context.Background(), office); err != nil {
		t.Fatal(err)
	}
	token, _, err := db.CreateKey(context.Background(), service.NewKey{Office: office, Role: service.RoleEditor,
		Label: editorLabel})
	if err != nil {
		t.Fatal(err)
	}
	f.editorToken = token
	editor := apiClient{t, &base, f.editorToken}
	other := apiClient{t, &base, mustKeyToken(t, db, "Another office", service.RoleEditor)}
	tutoring := readFile(t, "../../testdata/demo/tutoring-anxiety/package.json")
	f.tutoring = mustSubmit(t, editor, "application/json", tutoring)
	f.club = submitMultipart(t, editor, "../../testdata/demo/coding-club")
	f.v2 = mustSubmit(t, editor, "application/json", secondVersion(t))
	f.sleep = submitMultipart(t, editor, "../../testdata/demo/sleep-attention")
	f.otherOffice = mustSubmit(t, other, "application/json", tutoring)
	_, _, b := editor.call(http.MethodGet, f.v2.Links.Report, "", nil)
	if err := json.Unmarshal(b, &f.tutoringReport); err != nil {
		t.Fatal(err)
	}
	return f
}

// TestBrowser_Workspace drives headless Chromium through the workspace
// against the real server and PostgreSQL.
func TestBrowser_Workspace(t *testing.T) {
	f := newBrowserFixture(t)
	ctx := newBrowser(t)
	base := f.m.URL()
	do(t, ctx, chromedp.EmulateViewport(1280, 1000))
	watchCSP(t, ctx)
	t.Run("NoSession", func(t *testing.T) {
		do(t, ctx, chromedp.Navigate(base+"/submissions/"+f.tutoring.ID))
		mustSignInPage(t, ctx)
		checkCSP(t, ctx, "sign-in page")
	})
	t.Run("WrongKey", func(t *testing.T) {
		signIn(t, ctx, base, "pv_not-a-key")
		mustSignInPage(t, ctx)
		mustContain(t, ctx, "body", "That key was not accepted")
	})
	signIn(t, ctx, base, f.editorToken)
	t.Run("Dashboard", func(t *testing.T) { checkDashboard(t, ctx, f) })
	t.Run("Report", func(t *testing.T) { checkReport(t, ctx, f) })
	t.Run("Letter", func(t *testing.T) { checkLetter(t, ctx, f) })
	t.Run("Mediation", func(t *testing.T) { checkMediation(t, ctx, f) })
	t.Run("Narrow", func(t *testing.T) { checkNarrow(t, ctx, f) })
	t.Run("Print", func(t *testing.T) { checkWorkspacePrint(t, ctx, f) })
	t.Run("OtherOffice", func(t *testing.T) {
		resp := value(t, ctx, chromedp.NavigateResponse(base+"/submissions/"+f.otherOffice.ID))
		if resp.Status != http.StatusNotFound {
			t.Errorf("another office's submission: %d", resp.Status)
		}
		mustContain(t, ctx, "h1", "Not found")
	})
	t.Run("NoCSRF", func(t *testing.T) { checkCSRF(t, ctx, f) })
	t.Run("Review", func(t *testing.T) { checkReview(t, ctx, f) })
	t.Run("Delete", func(t *testing.T) { checkDelete(t, ctx, f) })
	t.Run("SignOut", func(t *testing.T) { checkSignOut(t, ctx, f) })
}

func do(t *testing.T, ctx context.Context, steps ...chromedp.Action[chromedp.Void]) {
	t.Helper()
	if err := chromedp.Do(ctx, steps...); err != nil {
		t.Fatal(err)
	}
}

func value[T any](t *testing.T, ctx context.Context, a chromedp.Action[T]) T {
	t.Helper()
	v, err := chromedp.Run(ctx, a)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func signIn(t *testing.T, ctx context.Context, base, key string) {
	t.Helper()
	do(t, ctx, chromedp.Navigate(base+"/"), chromedp.SendKeys(chromedp.ID("key"), key))
	submitForm(t, ctx, "form.signin")
}

func mustSignInPage(t *testing.T, ctx context.Context) {
	t.Helper()
	n := value(
		t,
		ctx,
		chromedp.Evaluate[int](`document.querySelectorAll('form[action="/session"] input[name=key]').length`),
	)
	if n != 1 {
		t.Fatalf("not the sign-in page: %s", value(t, ctx, chromedp.Location()))
	}
	if value(t, ctx, chromedp.Evaluate[int](`document.querySelectorAll('table.claims, svg.graph').length`)) != 0 {
		t.Fatal("the sign-in page shows a report")
	}
}

func mustContain(t *testing.T, ctx context.Context, sel, want string) {
	t.Helper()
	if got := value(t, ctx, chromedp.Text(chromedp.CSS(sel))); !strings.Contains(got, want) {
		t.Errorf("%s says %.300q, want %q", sel, got, want)
	}
}

// screenshot saves a full-page screenshot as a test artifact and, when
// PATHVET_SCREENSHOTS names a folder, there too (for the README).
func screenshot(t *testing.T, ctx context.Context, name string) {
	t.Helper()
	save(t, name, value(t, ctx, chromedp.FullScreenshot(100)))
}

// viewShot saves what the window shows with the element sel at its top.
func viewShot(t *testing.T, ctx context.Context, sel, name string) {
	t.Helper()
	do(t, ctx, chromedp.Evaluate[chromedp.Void](`window.scrollTo(0, document.querySelector('`+sel+`').offsetTop - 8)`))
	save(t, name, value(t, ctx, chromedp.CaptureScreenshot()))
}

func save(t *testing.T, name string, png []byte) {
	t.Helper()
	for _, dir := range []string{t.ArtifactDir(), os.Getenv("PATHVET_SCREENSHOTS")} {
		if dir == "" {
			continue
		}
		if err := os.WriteFile(filepath.Join(dir, name), png, 0o644); err != nil {
			t.Error(err)
		}
	}
}

// submitForm submits a form and waits for the page it leads to.
func submitForm(t *testing.T, ctx context.Context, sel string) *network.Response {
	t.Helper()
	resp, err := chromedp.RunResponse(ctx, chromedp.Submit(chromedp.CSS(sel)))
	if err != nil {
		t.Fatalf("submit %s: %v", sel, err)
	}
	return resp
}
