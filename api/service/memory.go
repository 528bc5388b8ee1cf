package service

import (
	"bytes"
	"encoding/json"
)

// Working-memory model of a screening, measured on a two-core machine
// (two imputation workers): max RSS of `pathvet check` on raw data whose
// imputations must keep their rows (a binary variable with missing values;
// the costlier of the two ways the missing-data check imputes) was 203 MB
// at 400,000 rows × 5 columns and 878 MB at 390,000 rows × 30 (a 100 MB
// CSV), about 70 bytes per cell: the CSV bytes, the columns, the values laid
// out by pattern, and one completed dataset per imputation worker (8 bytes
// a cell each, so a machine with more cores needs more). Without binary
// variables to round or outcomes to fit by logistic regression, the same
// 390,000 × 30 took 475 MB. The model takes 72 bytes a cell over a base
// of 64 MiB.
const (
	memoryBase   = 64 << 20
	bytesPerCell = 72
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
		if json.Unmarshal(doc, &inline) != nil {
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
