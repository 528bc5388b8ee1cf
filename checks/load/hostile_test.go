package load_test

import (
	"bytes"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"os"
	"path/filepath"
	"runtime"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
)

// hostileBytes is the size the hostile packages are filled to: just under
// the package limit of 5 MiB, which the API would take.
const hostileBytes = 5<<20 - 4<<10

// allocBudget is the most a Load of any hostile package may allocate in
// all (a bound on its peak heap): the 64 MB goal per request.
const allocBudget = 64 << 20

// hostile is a package built to make the loader do much work: its name,
// the document, and text its answer must hold.
type hostile struct {
	name, want string
	doc        []byte
}

// demoDoc is the tutoring-anxiety demo, a valid summary package.
func demoDoc(tb testing.TB) string {
	b, err := os.ReadFile("../../testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		tb.Fatal(err)
	}
	return string(b)
}

// fill repeats unit between head and tail up to hostileBytes.
func fill(head, unit, sep, tail string) []byte {
	n := (hostileBytes - len(head) - len(tail)) / (len(unit) + len(sep))
	var b bytes.Buffer
	b.WriteString(head)
	for i := range n {
		if i > 0 {
			b.WriteString(sep)
		}
		b.WriteString(unit)
	}
	b.WriteString(tail)
	return b.Bytes()
}

// around splits the demo at the first occurrence of marker, keeping the
// marker in the head.
func around(doc, marker string) (string, string) {
	i := strings.Index(doc, marker) + len(marker)
	return doc[:i], doc[i:]
}

// hostilePackages are the amplification attempts: many empty objects,
// deep nesting, long strings, long lists of numbers, repeated and unknown
// keys, names that exist nowhere, and data with rows of a million fields.
func hostilePackages(tb testing.TB) []hostile {
	d := demoDoc(tb)
	h, t := around(d, `"claims": [`)
	hs := []hostile{{"empty claims", "has ", fill(h, "{}", ",", "],"+t[strings.Index(t, `"missing_data"`):])},
		{"empty claims, given twice", `the key "claims" appears more than once`,
			fill(h+`], "claims": [`, "{}", ",", "],"+t[strings.Index(t, `"missing_data"`):])}}
	h, t = around(d, `"variables": [`)
	hs = append(hs, hostile{"empty variables", "variables; the limit is 500",
		fill(h, "{}", ",", t[strings.Index(t, "],"):])})
	h, t = around(d, `"edges": [`)
	hs = append(hs, hostile{"null edges", "edges; the limit is 5000", fill(h, "null", ",", ","+t)},
		hostile{"nested in a field", "nest more than", fill(`{"title": `, "[", "", "")},
		hostile{"nested at the top", "nest more than", fill("", "[", "", "")},
		hostile{"deep in an unknown field", `unknown field "x"`,
			[]byte(strings.Replace(d, `"title":`, `"x": `+strings.Repeat("[", 9000)+strings.Repeat("]", 9000)+`, "title":`, 1))})
	h, t = around(d, `"title": "`)
	hs = append(hs, hostile{"long title", "at most 1000 characters", fill(h, "x", "", t)})
	h, t = around(d, `"from": "`)
	hs = append(hs, hostile{"long name", "names no declared variable", fill(h, "q", "", t)},
		hostile{"long key", "has a key", fill(`{"`, "k", "", `": 1}`)})
	h, t = around(d, `"sds": [`)
	hs = append(hs, hostile{"numbers in sds", "the limit on variables", fill(h, "1", ",", ","+t)})
	h, t = around(d, `"ci": [`)
	hs = append(hs, hostile{"numbers in ci", "has ", fill(h, "1", ",", ","+t)})
	h, t = around(d, `"correlations": [`)
	hs = append(hs, hostile{"empty rows", "the limit on variables", fill(h, "[]", ",", ","+t)})
	h, t = around(d, `{`)
	hs = append(hs, hostile{"numbers in an unknown field", "unknown field", fill(h+`"x": [`, "1", ",", "],"+t)},
		hostile{"repeated key", "appears more than once", fill(h, `"design": "x"`, ",", ","+t)},
		hostile{"unknown keys", "the list stops at 500 problems", unknownKeys(h, t)})
	return append(hs, namesPackages(tb)...)
}

// unknownKeys fills an object with distinct unknown keys.
func unknownKeys(h, t string) []byte {
	var b bytes.Buffer
	b.WriteString(h)
	for i := 0; b.Len() < hostileBytes-len(t)-20; i++ {
		fmt.Fprintf(&b, `"k%d": 0, `, i)
	}
	b.WriteString(t)
	return b.Bytes()
}

// namesPackages stay within every count limit: 500 variables with long
// names, graphs of edges that name none of them (each a suggestion to
// look for), edges that are empty objects (each a field error), and data
// whose header or row is a million fields.
func namesPackages(tb testing.TB) []hostile {
	var pkg map[string]any
	if err := json.Unmarshal([]byte(demoDoc(tb)), &pkg); err != nil {
		tb.Fatal(err)
	}
	vars := make([]any, 500)
	for i := range vars {
		vars[i] = map[string]any{"name": fmt.Sprintf("v%063d", i), "scale": "continuous"}
	}
	edges := func(prefix string, n int) []any {
		es := make([]any, n)
		for i := range es {
			es[i] = map[string]any{"from": fmt.Sprintf("%s%063d", prefix, i), "to": fmt.Sprintf("%s%063d", prefix, i+1)}
		}
		return es
	}
	alts := make([]any, 50)
	for k := range alts {
		alts[k] = map[string]any{"name": fmt.Sprintf("a%d", k), "edges": edges("u", 400)}
	}
	unknown := clone(pkg, map[string]any{"variables": vars, "graph": map[string]any{"edges": edges("w", 5000)},
		"alternatives": alts})
	empty := make([]any, 5000)
	for i := range empty {
		empty[i] = map[string]any{}
	}
	emptyAlts := make([]any, 50)
	for k := range emptyAlts {
		emptyAlts[k] = map[string]any{"name": fmt.Sprintf("a%d", k), "edges": empty}
	}
	emptyEdges := clone(pkg, map[string]any{"alternatives": emptyAlts})
	header := strings.Repeat("a,", hostileBytes/2-4000)
	wide := clone(pkg, map[string]any{"data": map[string]any{"kind": "rows", "csv": header + "b\n"}})
	row := "long_commute,tutor_sessions,maths_anxiety,maths_score\n" + strings.Repeat(",", hostileBytes-8000) + "\n"
	long := clone(pkg, map[string]any{"data": map[string]any{"kind": "rows", "csv": row}})
	return []hostile{{"names declared nowhere", "names no declared variable", mustJSON(tb, unknown)},
		{"empty edges", "is required", mustJSON(tb, emptyEdges)},
		{"wide header", "the header has", mustJSON(tb, wide)},
		{"wide row", "the row has", mustJSON(tb, long)}}
}

func clone(pkg, set map[string]any) map[string]any {
	out := map[string]any{}
	for k, v := range pkg {
		out[k] = v
	}
	for k, v := range set {
		out[k] = v
	}
	return out
}

func mustJSON(tb testing.TB, v any) []byte {
	b, err := json.Marshal(v)
	if err != nil {
		tb.Fatal(err)
	}
	if len(b) > hostileBytes {
		tb.Fatalf("a hostile package is %d bytes", len(b))
	}
	return b
}

// hostileOut names a folder to write the hostile packages to, for
// testdata/bench/hostile.sh to send them to the CLI and the API.
var hostileOut = flag.String("hostile-out", "", "write the hostile packages to this folder")

func writeHostile(t *testing.T, h hostile) {
	name := filepath.Join(*hostileOut, strings.ReplaceAll(h.name, " ", "-")+".json")
	if err := os.WriteFile(name, h.doc, 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestLoad_HostilePackagesAreCheap: each hostile package under the
// package limit is refused with the problem it was built for, in a list
// of at most 500 problems, and its Load allocates less than 64 MiB in all
// (before the walker, an object of empty claims took gigabytes).
func TestLoad_HostilePackagesAreCheap(t *testing.T) {
	for _, h := range hostilePackages(t) {
		t.Run(h.name, func(t *testing.T) {
			if len(h.doc) > hostileBytes {
				t.Fatalf("%d bytes", len(h.doc))
			}
			if *hostileOut != "" {
				writeHostile(t, h)
			}
			var invalid *checks.InvalidPackageError
			alloc := allocated(func() {
				_, err := load.Load(h.doc, load.Options{})
				if !errors.As(err, &invalid) {
					t.Fatalf("want an invalid-package error, got %v", err)
				}
			})
			if !strings.Contains(invalid.Error(), h.want) {
				t.Errorf("the problems do not say %q:\n%.2000s", h.want, invalid.Error())
			}
			if n := len(invalid.Problems); n > 510 {
				t.Errorf("%d problems listed", n)
			}
			if alloc > allocBudget {
				t.Errorf("Load allocated %d MiB; the budget is %d MiB", alloc>>20, allocBudget>>20)
			}
		})
	}
}

// allocated is the heap f allocates, in bytes.
func allocated(f func()) uint64 {
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	f()
	runtime.ReadMemStats(&after)
	return after.TotalAlloc - before.TotalAlloc
}

// BenchmarkLoadHostile loads each hostile package; bytes/op bound its
// peak heap (figures in the README).
func BenchmarkLoadHostile(b *testing.B) {
	for _, h := range hostilePackages(b) {
		b.Run(strings.ReplaceAll(h.name, " ", "_"), func(b *testing.B) {
			b.SetBytes(int64(len(h.doc)))
			b.ReportAllocs()
			for b.Loop() {
				if _, err := load.Load(h.doc, load.Options{}); err == nil {
					b.Fatal("accepted")
				}
			}
		})
	}
}
