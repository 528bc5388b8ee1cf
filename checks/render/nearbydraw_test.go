package render

import (
	"context"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"
	"time"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// runPackage screens a package of testdata, as pathvet check does.
func runPackage(t *testing.T, dir string) *checks.Report {
	t.Helper()
	path := filepath.Join("..", "..", "testdata", dir, "package.json")
	doc, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	s, err := load.Load(doc, load.Options{ReadFile: func(name string) ([]byte, error) {
		return os.ReadFile(filepath.Join(filepath.Dir(path), name))
	}})
	if err != nil {
		t.Fatal(err)
	}
	now := func() time.Time { return time.Date(2026, 1, 2, 3, 4, 5, 0, time.UTC) }
	r, err := checks.Run(context.Background(), s, checks.Options{Now: now})
	if err != nil {
		t.Fatal(err)
	}
	return r
}

// arcOf finds the drawn arc from → to in an SVG, with the head drawn
// right after it if it has one; "" when it is not drawn.
func arcOf(svg, from, to string) string {
	re := regexp.MustCompile(`<path class="arc ([a-z ]+)" data-from="` + regexp.QuoteMeta(from) +
		`" data-to="` + regexp.QuoteMeta(to) + `"[^>]*>(<path class="rail"[^>]*>)?(<path class="head[^>]*>)?`)
	return re.FindString(svg)
}

// TestNearbyHeadlineDrawing: the calibration package whose headline arrow
// offered → wellbeing can go at ΔBIC +0.72 is drawn without it: that arc
// struck and headless, the others kept with their heads, and the caption
// names the edit, ΔBIC, its band and the claim that changes.
func TestNearbyHeadlineDrawing(t *testing.T) {
	r := runPackage(t, "calibration/nearby-headline")
	v, err := graphView(r)
	if err != nil {
		t.Fatal(err)
	}
	if len(v.Nearby) != 1 || v.Nearby[0].Search {
		t.Fatalf("want one near-equivalent drawing and no search end point, got %d", len(v.Nearby))
	}
	d := v.Nearby[0]
	svg := string(d.SVG)
	removed := arcOf(svg, "offered", "wellbeing")
	if !strings.Contains(removed, "arc removed") || strings.Contains(removed, `class="head`) {
		t.Errorf("the removed arrow is not drawn as removed: %q", removed)
	}
	if strings.Count(svg, `class="strike"`) != 1 || !strings.Contains(svg, ">removed (N1)</text>") {
		t.Errorf("the removed arrow lacks its strike or its word")
	}
	for _, a := range [][2]string{{"offered", "volunteer_hours"}, {"volunteer_hours", "wellbeing"}} {
		arc := arcOf(svg, a[0], a[1])
		if !strings.Contains(arc, "arc kept") || !strings.Contains(arc, `class="head filled kept"`) {
			t.Errorf("%s → %s: want a kept arrow with a head, got %q", a[0], a[1], arc)
		}
	}
	for _, want := range []string{"without the arrow offered → wellbeing", "ΔBIC +0.72",
		"the data do not tell the two graphs apart", "changes in some plausible graph: N1."} {
		if !strings.Contains(d.Caption, want) {
			t.Errorf("caption %q lacks %q", d.Caption, want)
		}
	}
}

// TestEditedArcs: an added arrow joins in its own class with its word, a
// reversed one points its new way, a removed one stays struck, and an
// edit on an added arrow acts on it (the search's edits are in order);
// adding the reverse of a removed arrow reverses it.
func TestEditedArcs(t *testing.T) {
	r := loadGolden(t, "tutoring-anxiety")
	base := declaredArcs(r.Graph, r.Claims)
	edits := []checks.GraphEdit{{Op: "add", From: "maths_score", To: "tutor_sessions"},
		{Op: "reverse", From: "tutor_sessions", To: "maths_anxiety"},
		{Op: "remove", From: "maths_anxiety", To: "maths_score"},
		{Op: "add", From: "long_commute", To: "nowhere"}}
	arcs := editedArcs(base, edits, r.Graph.Nodes)
	l, err := LayOut(LayoutInput{Nodes: r.Graph.Nodes, Arcs: layoutArcs(base, arcs)})
	if err != nil {
		t.Fatal(err)
	}
	svg := string(drawing{l: l, arcs: arcs, id: "t", title: "t", description: "t"}.svg())
	added := arcOf(svg, "maths_score", "tutor_sessions")
	if !strings.Contains(added, "arc added") || !strings.Contains(added, "head filled added") ||
		!strings.Contains(svg, ">added</text>") {
		t.Errorf("added arrow: %q", added)
	}
	rev := arcOf(svg, "maths_anxiety", "tutor_sessions")
	if !strings.Contains(rev, "arc reversed") || arcOf(svg, "tutor_sessions", "maths_anxiety") != "" {
		t.Errorf("reversed arrow not drawn its new way: %q", rev)
	}
	for _, a := range parseDrawing(t, svg).arcs {
		if a.kind == arcReversed && a.pts[0].Y <= a.pts[len(a.pts)-1].Y {
			t.Errorf("the reversed arrow should run upwards (from the lower variable)")
		}
	}
	if !strings.Contains(svg, ">reversed (C1)</text>") || !strings.Contains(svg, ">removed (C2)</text>") {
		t.Errorf("edit words with the claims missing")
	}
	if !strings.Contains(arcOf(svg, "maths_anxiety", "maths_score"), "arc removed") {
		t.Errorf("removed arrow not struck")
	}
	if strings.Contains(svg, "nowhere") {
		t.Errorf("an arc to a variable not laid out was drawn")
	}
	undo := editedArcs(base, []checks.GraphEdit{edits[0], {Op: "remove", From: "maths_score", To: "tutor_sessions"}},
		r.Graph.Nodes)
	if len(undo) != len(base) {
		t.Errorf("removing an added arrow: %d arcs, want %d", len(undo), len(base))
	}
	turned := editedArcs(base, []checks.GraphEdit{{Op: "remove", From: "maths_anxiety", To: "maths_score"},
		{Op: "add", From: "maths_score", To: "maths_anxiety"}}, r.Graph.Nodes)
	if i := findArc(turned, "maths_score", "maths_anxiety"); len(turned) != len(base) || i < 0 ||
		turned[i].Kind != arcReversed || turned[i].Tag != "reversed (C2)" {
		t.Errorf("removing an arrow and adding its reverse: %+v", turned)
	}
}

// TestNearbyPage: the offline page of nearby-headline carries the edited
// drawing with its caption and the legend of edits in words; a demo with
// no near-equivalent class and no search end point has no such section.
func TestNearbyPage(t *testing.T) {
	var b strings.Builder
	if err := WritePage(&b, runPackage(t, "calibration/nearby-headline"), PageOptions{}); err != nil {
		t.Fatal(err)
	}
	page := b.String()
	for _, want := range []string{`<svg class="graph" id="nearby-1"`, "The edits that fit about as well, drawn",
		"dotted line, no head, a cross, tag “removed”",
		"The declared graph without the arrow offered → wellbeing: ΔBIC +0.72"} {
		if !strings.Contains(page, want) {
			t.Errorf("page lacks %q", want)
		}
	}
	for _, demo := range []string{"tutoring-anxiety", "coding-club", "sleep-attention"} {
		r := loadGolden(t, demo)
		cs, _ := drawnClasses(r.Graph)
		b.Reset()
		if err := WritePage(&b, r, PageOptions{}); err != nil {
			t.Fatal(err)
		}
		if got := strings.Count(b.String(), `<svg class="graph" id="nearby-`); got != len(cs) {
			t.Errorf("%s: %d edited drawings, want %d", demo, got, len(cs))
		}
	}
}
