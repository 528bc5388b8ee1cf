package service

import (
	"bytes"
	"encoding/json"
)

// Working-memory model of a screening: an upper bound on the maximum
// resident set of one screening job of raw data, `pathvet check` or
// `pathvet work --workers 1`, on a two-core machine (two imputation
// workers) without GOMEMLIMIT (testdata/bench/worker-memory.sh, README
// "Limits"). The costliest case is data whose imputations keep their rows
// (a binary variable with missing values, or a binary claim outcome) with
// a missingness pattern in nearly every row: at 395,000 rows × 30 columns
// the worker peaked at up to 954 MB (cells-binary) and 960 MB (a binary
// outcome), pathvet check at up to 961 MB, and an audit measured 1,020 MB.
// Its live heap is about 39 bytes a cell (the columns, the pattern groups
// and the observed values laid out by pattern, and one completed dataset
// per imputation worker), and the Go collector lets the heap grow to twice
// the live heap between collections (GOGC=100), hence about 80 bytes a
// cell at the peak. The model takes 90 bytes a cell over a base of 64 MiB,
// 11% above the largest of those figures. Each imputation worker past two
// adds a completed dataset: about 16 bytes a cell at the peak.
const (
	memoryBase   = 64 << 20
	bytesPerCell = 90
)

// CSVShape counts the data rows (lines after the header; a last line
// without a newline counts) and the header's fields. It does not parse
// quotes: it is an estimate for a memory bound, not a reader.
func CSVShape(data []byte) (rows, cols int) {
	header, rest, _ := bytes.Cut(data, []byte("\n"))
	if len(bytes.TrimSpace(header)) == 0 {
		return 0, 0
	}
	rows = bytes.Count(rest, []byte("\n"))
	if len(bytes.TrimSpace(rest)) > 0 && !bytes.HasSuffix(rest, []byte("\n")) {
		rows++
	}
	return rows, bytes.Count(header, []byte(",")) + 1
}

// WorkingMemory estimates the bytes a screening of raw data of this shape
// needs.
func WorkingMemory(rows, cols int) int64 { return memoryBase + int64(rows)*int64(cols)*bytesPerCell }

// CheckPackageMemory is CheckMemory for a package document and the CSV
// data sent beside it, or, when none was (nil or empty), the CSV inline in
// the document's data.csv: the API checks it at ingest and a worker again
// before screening, both the same way. A document that is not JSON is left
// to the loader, which says what is wrong with it.
func CheckPackageMemory(doc, csv []byte, budget int64) error {
	if len(csv) == 0 {
		var inline struct {
			Data struct {
				CSV string `json:"csv"`
			} `json:"data"`
		}
		bom := []byte("\xef\xbb\xbf") // the loader reads past one
		if json.Unmarshal(bytes.TrimPrefix(doc, bom), &inline) != nil {
			return nil
		}
		csv = []byte(inline.Data.CSV)
	}
	return CheckMemory(csv, budget)
}

// CheckMemory refuses (invalid, with the figures) CSV data whose screening
// would need more than budget bytes; a budget of 0 checks nothing.
func CheckMemory(csv []byte, budget int64) error {
	rows, cols := CSVShape(csv)
	need := WorkingMemory(rows, cols)
	if budget <= 0 || rows == 0 || need <= budget {
		return nil
	}
	return Errorf(EInvalid, "the data (%d rows × %d columns) need about %d MiB to screen; "+
		"the workers are given %d MiB: send fewer rows or columns, or raise the workers' memory",
		rows, cols, need>>20, budget>>20)
}

// MaxCells is the most CSV cells whose screening fits a budget of bytes
// (the inverse of WorkingMemory), 0 when it holds not even the base.
func MaxCells(budget int64) int64 { return max(budget-memoryBase, 0) / bytesPerCell }
