package load_test

import (
	"bytes"
	"encoding/csv"
	"io"
	"testing"

	"github.com/pathvet/pathvet/checks/load"
)

// BenchmarkLoadRows measures loading raw rows: parsing the CSV into
// columns, checking every cell, and the package hash. Figures in the
// README.
func BenchmarkLoadRows(b *testing.B) {
	doc, csv := load.BenchRows(10, 100_000)
	b.SetBytes(int64(len(csv)))
	b.ReportAllocs()
	for b.Loop() {
		if _, err := load.Load(doc, load.Options{CSV: csv}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCSVReader is the yardstick for BenchmarkLoadRows and
// BenchmarkParseCSV (csvbench_test.go): encoding/csv alone reading the
// same bytes into records, parsing no number.
func BenchmarkCSVReader(b *testing.B) {
	_, text := load.BenchRows(10, 100_000)
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
