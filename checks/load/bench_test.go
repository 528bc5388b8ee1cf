package load_test

import (
	"bytes"
	"encoding/csv"
	"fmt"
	"io"
	"math/rand/v2"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks/load"
)

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

// BenchmarkLoadRows measures loading raw rows: parsing the CSV into
// columns, checking every cell, and the package hash. Figures in the
// README.
func BenchmarkLoadRows(b *testing.B) {
	doc, csv := benchRows(10, 100_000)
	b.SetBytes(int64(len(csv)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := load.Load(doc, load.Options{CSV: csv}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCSVReader is the floor for BenchmarkLoadRows: encoding/csv
// alone reading the same bytes into records, parsing nothing.
func BenchmarkCSVReader(b *testing.B) {
	_, text := benchRows(10, 100_000)
	b.SetBytes(int64(len(text)))
	b.ReportAllocs()
	for b.Loop() {
		r := csv.NewReader(bytes.NewReader(text))
		r.ReuseRecord = true
		for {
			if _, err := r.Read(); err == io.EOF {
				break
			} else if err != nil {
				b.Fatal(err)
			}
		}
	}
}
