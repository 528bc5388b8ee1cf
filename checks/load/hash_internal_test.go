package load

import (
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/checks"
)

// fullHash is the definition canonicalHash streams: the whole document
// encoded at once with the CSV inline.
func fullHash(pkg *checks.Package, csvText []byte) string {
	c := *pkg
	c.Data.File, c.Data.CSV = "", string(csvText)
	b, _ := json.Marshal(&c)
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}

func TestCanonicalHash_StreamsTheSameBytes(t *testing.T) {
	pkg := &checks.Package{FormatVersion: 1, Title: "t <&> \"q\"", Data: checks.Data{Kind: "rows", File: "x.csv",
		MissingCodes: []string{"-99"}, IgnoreColumns: []string{"id"}}}
	for _, csv := range []string{
		"", "a,b\n1,2\n", "a,b\r\n1,\t2\r\n", "a,b\n\"1,5\",2\n", "a,b\n<1>,&\n", "a\\b\n1\n",
		"a,b\n1,\x01\n", "a,b\nü,2\n", "a,b\n\xff,2\n", "a,b\n\u2028,2\n", "a\x7f\n1\n",
	} {
		if got, want := canonicalHash(pkg, []byte(csv)), fullHash(pkg, []byte(csv)); got != want {
			t.Errorf("%q: streamed %s, whole %s", csv, got, want)
		}
	}
}

// TestPlainText checks the byte table against the rule it stands for.
func TestPlainText(t *testing.T) {
	for c := range 256 {
		printable := c >= 0x20 && c <= 0x7e && !strings.ContainsRune(`"\<>&`, rune(c))
		want := c == '\n' || c == '\r' || c == '\t' || printable
		if got := plainText([]byte{'a', byte(c)}); got != want {
			t.Errorf("plainText(%q) = %v, want %v", []byte{'a', byte(c)}, got, want)
		}
	}
}
