package main

import (
	"context"
	"io"
	"net/http"
	"testing"

	"github.com/chromedp/cdproto/network"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// cspWatcher runs in every document before the page's own content (the
// browser's tooling injects it, so the page's policy does not stop it)
// and keeps each Content-Security-Policy violation the page raises.
const cspWatcher = `window.__csp = [];
document.addEventListener('securitypolicyviolation', e =>
	window.__csp.push(e.effectiveDirective + ' refused ' + (e.blockedURI || 'inline') + ': ' + (e.sample || '')));`

// watchCSP installs cspWatcher for every page the browser opens.
func watchCSP(t *testing.T, ctx context.Context) {
	t.Helper()
	if _, err := chromedp.Call(ctx, page.AddScriptToEvaluateOnNewDocument,
		page.AddScriptToEvaluateOnNewDocumentParams{Source: cspWatcher}); err != nil {
		t.Fatal(err)
	}
}

// checkCSP: the page the browser shows raised no policy violation, its
// stylesheet applies (the page's paper colour, #fbfaf6, from style.css),
// and every style attribute it carries took effect.
func checkCSP(t *testing.T, ctx context.Context, what string) {
	t.Helper()
	got := value(t, ctx, chromedp.Evaluate[[]string](`window.__csp || ['the watcher did not run']`))
	for _, v := range got {
		t.Errorf("%s: %s", what, v)
	}
	if bg := value(t, ctx, chromedp.Evaluate[string](`getComputedStyle(document.body).backgroundColor`)); bg !=
		"rgb(251, 250, 246)" {
		t.Errorf("%s: the body's background is %s: the stylesheet did not apply", what, bg)
	}
	if n := value(t, ctx, chromedp.Evaluate[int](
		`[...document.querySelectorAll('[style]')].filter(e => e.style.length === 0).length`)); n > 0 {
		t.Errorf("%s: %d style attributes did not apply", what, n)
	}
}

// fetchAsBrowser GETs a path with the browser's cookies (the page's
// policy forbids the page itself to fetch anything).
func fetchAsBrowser(t *testing.T, ctx context.Context, url string) (string, []byte) {
	t.Helper()
	cookies, err := chromedp.Call(ctx, network.GetCookies, network.GetCookiesParams{})
	if err != nil {
		t.Fatal(err)
	}
	req, _ := http.NewRequest(http.MethodGet, url, nil)
	for _, c := range cookies.Cookies {
		req.AddCookie(&http.Cookie{Name: c.Name, Value: c.Value})
	}
	resp, err := http.DefaultClient.Do(req)
	if err != nil {
		t.Fatal(err)
	}
	defer resp.Body.Close()
	b, _ := io.ReadAll(resp.Body)
	if resp.StatusCode != http.StatusOK {
		t.Fatalf("%s: %d", url, resp.StatusCode)
	}
	return resp.Header.Get("Content-Type"), b
}
