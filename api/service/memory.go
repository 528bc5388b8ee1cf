package service

import "bytes"

// Working-memory model of a screening, measured: max RSS of
// `pathvet check` on a raw-data package of 5 columns (the coding-club
// demo's rows repeated) was 217 MB at 100,000 rows and 809 MB at 400,000,
// about 400 bytes per cell of the CSV (EM, its bootstrap runs and the
// imputations each hold copies of the data) over a base of some 20 MB.
// The base here is rounded up to 64 MiB.
const (
	memoryBase   = 64 << 20
	bytesPerCell = 400
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
