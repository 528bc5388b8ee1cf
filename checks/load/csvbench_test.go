package load

import (
	"fmt"
	"math/rand/v2"
	"strings"
	"testing"
)

// BenchRows lends benchRows to the benchmarks of package load_test.
var BenchRows = benchRows

// benchRows is a raw-rows package over p continuous variables and n rows
// of random values with 5% empty cells, and its CSV.
func benchRows(p, n int) ([]byte, []byte) {
	rng := rand.New(rand.NewPCG(1, 2))
	var vars, edges, head []string
	for j := range p {
		vars = append(vars, fmt.Sprintf(`{"name": "v%d", "scale": "continuous"}`, j))
		head = append(head, fmt.Sprintf("v%d", j))
		if j > 0 {
			edges = append(edges, fmt.Sprintf(`{"from": "v%d", "to": "v%d"}`, j-1, j))
		}
	}
	doc := fmt.Sprintf(`{"format_version": 1, "title": "bench", "design": "observational",
		"variables": [%s], "graph": {"edges": [%s]},
		"claims": [{"id": "C1", "text": "t", "kind": "direct_effect", "from": "v0", "to": "v1"}],
		"data": {"kind": "rows", "missing_codes": ["-99"]}}`, strings.Join(vars, ","), strings.Join(edges, ","))
	var b strings.Builder
	b.WriteString(strings.Join(head, ",") + "\n")
	for range n {
		for j := range p {
			if j > 0 {
				b.WriteByte(',')
			}
			if rng.Float64() >= 0.05 {
				fmt.Fprintf(&b, "%.4f", rng.NormFloat64()*10+50)
			}
		}
		b.WriteByte('\n')
	}
	return []byte(doc), []byte(b.String())
}

// BenchmarkParseCSV measures the one-pass parser alone: the CSV into the
// columns with every cell checked, the suspect values looked for, no
// package decoding and no hash. Figures in the README.
func BenchmarkParseCSV(b *testing.B) {
	doc, text := benchRows(10, 100_000)
	st, err := Load(doc, Options{CSV: text})
	if err != nil {
		b.Fatal(err)
	}
	s := &study{st}
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		var ps problems
		if s.parseCSV(text, DefaultLimits, &ps) == nil {
			b.Fatal(ps.list)
		}
	}
}
