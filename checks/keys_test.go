package checks_test

import (
	"encoding/json"
	"os"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// keyCorpus is every package the key tests screen: the demos, the
// calibration packages and variants of the demos that reach findings the
// demos do not (no graph, no missing-data method, no target trial, a
// p-value at odds with its figures, an association worded causally).
func keyCorpus(t *testing.T) map[string]*checks.Report {
	t.Helper()
	paths, _ := filepath.Glob("../testdata/calibration/*/package.json")
	out := map[string]*checks.Report{}
	for _, path := range append(demoPackages(t), paths...) {
		out[path] = mustRun(t, MustLoad(t, path))
	}
	for name, edit := range keyVariants {
		for _, demo := range demoPackages(t) {
			out[demo+" "+name] = mustRun(t, loadChanged(t, demo, edit))
		}
	}
	return out
}

var keyVariants = map[string]func(p map[string]any){
	"no graph": func(p map[string]any) { delete(p, "graph"); delete(p, "alternatives") },
	"no method or trial": func(p map[string]any) {
		delete(p, "missing_data")
		delete(p, "target_trial")
	},
	"p at odds, causal association": func(p map[string]any) {
		for _, c := range p["claims"].([]any) {
			c := c.(map[string]any)
			c["p_value"], c["p_relation"] = 0.5, "="
			if c["kind"] == "association" {
				c["text"] = "Long commutes cause fewer sessions"
			}
		}
	},
}

// loadChanged loads a package after edit has changed its JSON; a data file
// beside it is inlined.
func loadChanged(t *testing.T, path string, edit func(map[string]any)) *checks.Study {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	var p map[string]any
	if err := json.Unmarshal(b, &p); err != nil {
		t.Fatal(err)
	}
	if d := p["data"].(map[string]any); d["file"] != nil {
		csv, err := os.ReadFile(filepath.Join(filepath.Dir(path), d["file"].(string)))
		if err != nil {
			t.Fatal(err)
		}
		delete(d, "file")
		d["csv"] = string(csv)
	}
	edit(p)
	doc, _ := json.Marshal(p)
	s, err := checks.LoadForTest(doc)
	if err != nil {
		t.Fatalf("%s edited: %v", path, err)
	}
	return s
}

// keyShape is a key as keys.go composes it, without the count a second
// finding with the same key would get.
var keyShape = regexp.MustCompile(`^[a-z-]+(:[A-Za-z0-9_.-]{1,32})?:[a-z-]+(\.[A-Za-z0-9_.,+-]+)?$`)

// Every finding has a topic and a key of its own; every fail and warn
// finding has a question of its kind from the table (never the fallback),
// and no info finding has one.
func TestFindingKeys_EveryFindingKeyedAndAsked(t *testing.T) {
	for name, r := range keyCorpus(t) {
		seen := map[string]bool{}
		for _, c := range r.Checks {
			for _, f := range c.Findings {
				switch {
				case f.Topic == "" || !keyShape.MatchString(f.Key) || strings.Contains(f.Key, "unkeyed"):
					t.Errorf("%s: %s finding without a topic or a well-formed key: %+v", name, c.ID, f)
				case seen[f.Key]:
					t.Errorf("%s: two findings share the key %s", name, f.Key)
				case f.Key != checks.FindingKey(c.ID, f):
					t.Errorf("%s: key %s is not check, claim and topic (%s)", name, f.Key, checks.FindingKey(c.ID, f))
				}
				seen[f.Key] = true
				asked := f.Severity == checks.StatusFail || f.Severity == checks.StatusWarn
				if asked != (f.Question != "") || f.Question == checks.FallbackQuestion {
					t.Errorf("%s: %s %s has the question %q", name, f.Severity, f.Key, f.Question)
				}
			}
		}
	}
}

// A resubmission with other figures (the correlations and the reported
// estimates changed) keeps every finding's key, though the findings'
// sentences change; findings about different claims have different keys.
func TestFindingKeys_StableAcrossResubmission(t *testing.T) {
	const path = "../testdata/demo/tutoring-anxiety/package.json"
	v1 := mustRun(t, MustLoad(t, path))
	v2 := mustRun(t, loadChanged(t, path, func(p map[string]any) {
		d := p["data"].(map[string]any)
		d["n"] = 702.0
		for i, row := range d["correlations"].([]any) {
			for j := range row.([]any)[:i] {
				row.([]any)[j] = 0.93 * row.([]any)[j].(float64)
			}
		}
		for _, c := range p["claims"].([]any) {
			if e, ok := c.(map[string]any)["estimate"].(float64); ok {
				c.(map[string]any)["estimate"] = 0.9 * e
			}
		}
	}))
	k1, m1 := keysOf(v1)
	k2, m2 := keysOf(v2)
	if strings.Join(k1, " ") != strings.Join(k2, " ") {
		t.Fatalf("keys changed with the figures:\n%v\n%v", k1, k2)
	}
	reworded := 0
	for i := range k1 {
		if m1[i] != m2[i] {
			reworded++
		}
	}
	if reworded < 5 {
		t.Errorf("only %d findings changed their sentence: the variant does not test the keys", reworded)
	}
	byClaim := map[string]string{}
	for _, c := range v1.Checks {
		for _, f := range c.Findings {
			if f.Claim == "" {
				continue
			}
			same := c.ID + "/" + f.Topic
			if other, ok := byClaim[same]; ok && other == f.Key {
				t.Errorf("%s: two claims share the key %s", same, f.Key)
			}
			byClaim[same] = f.Key
		}
	}
	if v1.Checks[2].Findings[0].Key != "equivalence:C1:across-equivalents" {
		t.Errorf("first equivalence finding %s, want equivalence:C1:across-equivalents (report-format.md's example)",
			v1.Checks[2].Findings[0].Key)
	}
}

func keysOf(r *checks.Report) (keys, messages []string) {
	for _, c := range r.Checks {
		for _, f := range c.Findings {
			keys, messages = append(keys, f.Key), append(messages, f.Message)
		}
	}
	return keys, messages
}
