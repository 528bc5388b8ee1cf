package api_test

import (
	"bytes"
	"encoding/json"
	"net/http/httptest"
	"os"
	"testing"

	"github.com/pathvet/pathvet/api"
)

// Bytes the database could not store as text, and keys a generic decoder
// would resolve silently, are refused as 422 with the field's pointer,
// never a 500 (issue 14.4's probe).
func TestSubmit_BadTextIs422(t *testing.T) {
	demo, err := os.ReadFile("../testdata/demo/tutoring-anxiety/package.json")
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ old, new, pointer string }{
		{`"design": "observational"`, `"design": "obs\u0000ervational"`, "/design"},
		{`"design": "observational"`, "\"design\": \"obs\xff\"", "/design"},
		{`"design": "observational"`, `"design": "observational", "design": "randomized"`, "/design"},
		{`"n": 640`, `"n": 1000000000000`, "/data/n"},
	} {
		body := bytes.Replace(demo, []byte(tc.old), []byte(tc.new), 1)
		srv := api.New(api.Config{Store: &fakeStore{}})
		req := httptest.NewRequest("POST", "/v1/submissions", bytes.NewReader(body))
		req.Header.Set("Authorization", "Bearer good")
		req.Header.Set("Content-Type", "application/json")
		rr := httptest.NewRecorder()
		srv.Echo().ServeHTTP(rr, req)
		var p api.Problem
		_ = json.Unmarshal(rr.Body.Bytes(), &p)
		found := false
		for _, e := range p.Errors {
			found = found || e.Pointer == tc.pointer
		}
		if rr.Code != 422 || !found {
			t.Errorf("%s: %d %s", tc.new, rr.Code, rr.Body.String())
		}
	}
}
