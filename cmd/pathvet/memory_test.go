package main

import (
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/store"
)

// A worker refuses, before screening, data past its job memory whether
// the CSV was stored beside the package or inline in it (the API checks
// both at ingest; a worker given less memory must not screen either), and
// the refusal is permanent: no retry can fit it.
func TestScreenFunc_RefusesDataPastJobMemory(t *testing.T) {
	cfg := defaultConfig(func(string) string { return "" })
	cfg.JobMemoryMiB = 1 // below the model's base: any raw data is refused
	doc := readFile(t, "../../testdata/demo/coding-club/package.json")
	csv := readFile(t, "../../testdata/demo/coding-club/rows.csv")
	quoted, _ := json.Marshal(string(csv))
	inline := strings.Replace(string(doc), `"file": "rows.csv"`, `"csv": `+string(quoted), 1)
	if inline == string(doc) {
		t.Fatal("the demo package names no data file to inline")
	}
	for name, tc := range map[string]struct{ pkg, data []byte }{
		"beside": {doc, csv},
		"inline": {[]byte(inline), nil},
	} {
		_, err := screenFunc(cfg)(context.Background(), tc.pkg, tc.data, func(string, int, int) {})
		if !errors.Is(err, store.ErrPermanent) || !strings.Contains(fmt.Sprint(err), "need about") {
			t.Errorf("%s: %v", name, err)
		}
	}
}
