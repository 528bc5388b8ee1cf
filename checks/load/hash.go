package load

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"io"

	"github.com/pathvet/pathvet/checks"
)

// csvMarker stands for the CSV text while the package is encoded. It holds
// NUL characters, which no string of a loaded package may hold, so it
// cannot occur anywhere else in the encoding.
const csvMarker = "\x00csv\x00"

// canonicalHash hashes the package as this program re-encodes it
// (encoding/json) with its CSV inline in data.csv and data.file cleared,
// so the same study hashes alike from the CLI and the API. The CSV is
// streamed into the hash where the marker stands, rather than copied into
// one large document.
func canonicalHash(pkg *checks.Package, csvText []byte) string {
	c := *pkg
	c.Data.File, c.Data.CSV = "", ""
	if len(csvText) > 0 {
		c.Data.CSV = csvMarker
	}
	b, err := json.Marshal(&c)
	if err != nil {
		panic(err) // a decoded package always encodes
	}
	h := sha256.New()
	mark, _ := json.Marshal(csvMarker)
	if i := bytes.Index(b, mark); i >= 0 {
		h.Write(b[:i])
		writeJSONString(h, csvText)
		h.Write(b[i+len(mark):])
	} else {
		h.Write(b)
	}
	return hex.EncodeToString(h.Sum(nil))
}

var escNewline, escReturn, escTab = []byte(`\n`), []byte(`\r`), []byte(`\t`)

// writeJSONString writes text as encoding/json encodes a string. Text of
// printable ASCII, newlines, carriage returns and tabs, without the
// characters encoding/json escapes (" \ < > &), is written directly with
// its three short escapes; any other text goes through encoding/json.
func writeJSONString(w io.Writer, text []byte) {
	if !plainText(text) {
		b, _ := json.Marshal(string(text))
		w.Write(b)
		return
	}
	w.Write([]byte{'"'})
	start := 0
	for i, c := range text {
		var esc []byte
		switch c {
		case '\n':
			esc = escNewline
		case '\r':
			esc = escReturn
		case '\t':
			esc = escTab
		default:
			continue
		}
		w.Write(text[start:i])
		w.Write(esc)
		start = i + 1
	}
	w.Write(text[start:])
	w.Write([]byte{'"'})
}

// plainText reports whether every byte of text is one that encoding/json
// writes unchanged, or a newline, carriage return or tab.
func plainText(text []byte) bool {
	for _, c := range text {
		if !plainByte[c] {
			return false
		}
	}
	return true
}

// plainByte tells the bytes plainText accepts: printable ASCII but " \ < >
// &, and newline, carriage return and tab.
var plainByte = func() (t [256]bool) {
	for c := 0x20; c <= 0x7e; c++ {
		t[c] = true
	}
	for _, c := range []byte("\"\\<>&") {
		t[c] = false
	}
	t['\n'], t['\r'], t['\t'] = true, true, true
	return t
}()
