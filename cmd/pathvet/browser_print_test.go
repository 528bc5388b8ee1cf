package main

import (
	"context"
	"fmt"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/chromedp/cdproto/emulation"
	"github.com/chromedp/cdproto/page"
	"github.com/chromedp/chromedp"
)

// maxPrintPages is the most A4 pages a demo's report may print on (issue
// 22.3).
const maxPrintPages = 6

// A4 in inches, the paper Chromium is given; the page's @page rules then
// turn the pages it names landscape.
const a4Width, a4Height = 8.27, 11.69

// nearlyEmpty is how far down a page its text must reach for the page not
// to count as nearly empty: a sixth of its height.
const nearlyEmpty = 1.0 / 6

// printPDF prints the page the browser shows, as its print dialogue would
// on A4 with the page's own page sizes.
func printPDF(t *testing.T, ctx context.Context, name string) []pdfPage {
	t.Helper()
	yes := true
	res, err := chromedp.Call(ctx, page.PrintToPDF, page.PrintToPDFParams{PaperWidth: a4Width,
		PaperHeight: a4Height, PreferCSSPageSize: &yes, PrintBackground: &yes})
	if err != nil {
		t.Fatalf("printing %s: %v", name, err)
	}
	if err := os.WriteFile(filepath.Join(t.ArtifactDir(), name), res.Data, 0o644); err != nil {
		t.Error(err)
	}
	pages, err := readPDF(res.Data)
	if err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	return pages
}

// checkPrint prints the page shown and holds the PDF to the print rules:
// at most maxPrintPages pages, the first portrait and the wide part (the
// claims table) landscape, no page nearly empty, and no heading left at
// the foot of its column (a run of the serif headings' font with no other
// text below it in its column).
func checkPrint(t *testing.T, ctx context.Context, what, name string) {
	t.Helper()
	pages := printPDF(t, ctx, name)
	if len(pages) == 0 || len(pages) > maxPrintPages {
		t.Errorf("%s prints on %d pages, want 1 to %d", what, len(pages), maxPrintPages)
	}
	landscape := 0
	for i, p := range pages {
		if p.W > p.H {
			landscape++
		}
		if reach := textReach(p); reach < nearlyEmpty {
			t.Errorf("%s: page %d is nearly empty: its text reaches %.0f%% down", what, i+1, 100*reach)
		}
		for _, h := range orphanHeadings(p) {
			t.Errorf("%s: page %d ends a column with a heading at (%.0f, %.0f) pt", what, i+1, h.X, h.Y)
		}
	}
	if len(pages) > 0 && (pages[0].W > pages[0].H || landscape == 0) {
		t.Errorf("%s: %d landscape pages of %d, the first %.0f × %.0f pt: want a portrait first page and "+
			"the claims on landscape ones", what, landscape, len(pages), pages[0].W, pages[0].H)
	}
	t.Logf("%s: %d pages, %d of them landscape", what, len(pages), landscape)
}

// textReach is how far down the page, as a share of its height, its
// lowest text stands.
func textReach(p pdfPage) float64 {
	lowest := p.H
	for _, r := range p.Runs {
		lowest = min(lowest, r.Y)
	}
	return (p.H - lowest) / p.H
}

// keptWith is how far below a heading's baseline, in points, the text
// that follows it in its column must reach on the same page: more than two
// lines of 8.6-point text (style.css's print size, line height 1.35), so
// that a heading with only a line or two of a hint under it counts as
// left behind.
const keptWith = 30

// orphanHeadings are the lines in a serif font (the pages' headings:
// style.css sets h1 to h3 in Georgia, body text in a sans-serif) whose
// column has less than keptWith points of other text below them on the
// page; one run for each such line.
func orphanHeadings(p pdfPage) []textRun {
	var out []textRun
	seen := map[[2]int]bool{}
	for _, h := range p.Runs {
		if !isSerif(h.Font) {
			continue
		}
		lowest := h.Y
		for _, r := range p.Runs {
			if !isSerif(r.Font) && r.X > h.X-20 && r.X < h.X+250 {
				lowest = min(lowest, r.Y)
			}
		}
		line := [2]int{int(h.Y), int(h.X) / 250}
		if h.Y-lowest < keptWith && !seen[line] {
			seen[line] = true
			out = append(out, h)
		}
	}
	return out
}

func isSerif(font string) bool {
	return strings.Contains(font, "Serif") && !strings.Contains(font, "Sans")
}

// claimsStayATable: in print, even from a narrow window, the claims
// table's rows stay table rows (the narrow screen's cards are for screens
// only).
func claimsStayATable(t *testing.T, ctx context.Context, what string) {
	t.Helper()
	do(t, ctx, chromedp.EmulateViewport(600, 900))
	defer do(t, ctx, chromedp.EmulateViewport(1280, 1000))
	if _, err := chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: "print"}); err != nil {
		t.Fatal(err)
	}
	defer chromedp.Call(ctx, emulation.SetEmulatedMedia, emulation.SetEmulatedMediaParams{Media: ""})
	if d := value(t, ctx, chromedp.Evaluate[string](
		`getComputedStyle(document.querySelector('table.claims tbody tr')).display`)); d != "table-row" {
		t.Errorf("%s: in print a claims row is displayed as %q, not as a table row", what, d)
	}
}

// TestBrowser_PrintOffline prints each demo's offline page (pathvet check
// --format html) in headless Chromium, and shows the calibration package
// whose headline arrow a graph one edit away removes (the README's
// picture of a drawn edit).
func TestBrowser_PrintOffline(t *testing.T) {
	ctx := newBrowser(t)
	dir := t.TempDir()
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		openOffline(t, ctx, dir, "../../testdata/demo/"+demo+"/package.json")
		claimsStayATable(t, ctx, demo)
		checkPrint(t, ctx, demo+" (offline page)", fmt.Sprintf("offline-%s.pdf", demo))
	}
	openOffline(t, ctx, dir, "../../testdata/calibration/nearby-headline/package.json")
	viewShot(t, ctx, ".nearbygraphs", "nearby-1280.png")
}

// openOffline writes a package's offline page and opens it at 1280 px.
func openOffline(t *testing.T, ctx context.Context, dir, pkg string) {
	t.Helper()
	out := filepath.Join(dir, filepath.Base(filepath.Dir(pkg))+".html")
	if code, _, errOut := runCLI("check", "--format", "html", "--out", out, pkg); code != exitOK {
		t.Fatalf("%s: exit %d: %s", pkg, code, errOut)
	}
	do(t, ctx, chromedp.EmulateViewport(1280, 1000), chromedp.Navigate("file://"+out))
}

// checkWorkspacePrint prints each demo's workspace page, the tutoring
// demo's second version with its history.
func checkWorkspacePrint(t *testing.T, ctx context.Context, f *browserFixture) {
	for name, id := range map[string]string{"tutoring-anxiety": f.v2.ID, "coding-club": f.club.ID,
		"sleep-attention": f.sleep.ID} {
		do(t, ctx, chromedp.Navigate(f.m.URL()+"/submissions/"+id))
		claimsStayATable(t, ctx, name)
		checkPrint(t, ctx, name+" (workspace page)", "workspace-"+name+".pdf")
	}
}
