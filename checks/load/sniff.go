package load

import "bytes"

// utf8BOM is the byte-order mark some editors write at the start of UTF-8
// text; the loader reads past it.
var utf8BOM = []byte("\xef\xbb\xbf")

// signatures are the first bytes of the files most often sent in place of
// a package or its data, and what to call them.
var signatures = []struct {
	magic, what string
}{
	{"%PDF-", "a PDF document"},
	{"PK\x03\x04", "a ZIP archive (an .xlsx spreadsheet or a .docx document is one)"},
	{"\xd0\xcf\x11\xe0", "an old Office file (.xls or .doc)"},
	{"\x1f\x8b", "gzip-compressed data"},
	{"\x89PNG", "a PNG image"},
	{"\xff\xd8\xff", "a JPEG image"},
	{"{\\rtf", "an RTF document"},
	{"\x00\x00\xfe\xff", "UTF-32 text"},
	{"\xff\xfe\x00\x00", "UTF-32 text"},
	{"\xfe\xff", "UTF-16 text (big-endian)"},
	{"\xff\xfe", "UTF-16 text (little-endian)"},
}

// sniffBytes is how much of the start of a file notText looks at.
const sniffBytes = 512

// notText names what b is when it is plainly not UTF-8 text, "" otherwise:
// a known kind of file by its first bytes, UTF-16 without a byte-order
// mark (every other byte NUL), or binary data (any NUL byte in its
// start). Text with a stray invalid byte is left to the reader, which
// names the place.
func notText(b []byte) string {
	for _, s := range signatures {
		if bytes.HasPrefix(b, []byte(s.magic)) {
			return s.what
		}
	}
	head := b[:min(len(b), sniffBytes)]
	switch {
	case len(head) >= 4 && head[0] != 0 && head[1] == 0 && head[2] != 0 && head[3] == 0:
		return "UTF-16 text (little-endian)"
	case len(head) >= 4 && head[0] == 0 && head[1] != 0 && head[2] == 0 && head[3] != 0:
		return "UTF-16 text (big-endian)"
	case bytes.IndexByte(head, 0) >= 0:
		return "binary data, not text (it holds NUL bytes)"
	}
	return ""
}
