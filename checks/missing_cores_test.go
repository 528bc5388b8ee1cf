package checks_test

import (
	"encoding/json"
	"runtime"
	"testing"
)

// The multiple-imputation figures do not depend on how many cores draw the
// imputations: each has its own seeded stream.
func TestMissingData_SameOnOneAndTwoCores(t *testing.T) {
	run := func(procs int) string {
		defer runtime.GOMAXPROCS(runtime.GOMAXPROCS(procs))
		r := mustRun(t, MustLoad(t, "../testdata/demo/sleep-attention/package.json"))
		b, err := json.Marshal(r.Claims[0].MissingData["multiple_imputation"])
		if err != nil {
			t.Fatal(err)
		}
		return string(b)
	}
	one, two := run(1), run(2)
	if one == "null" {
		t.Fatal("no multiple-imputation estimate")
	}
	if one != two {
		t.Errorf("one core:\n%s\ntwo cores:\n%s", one, two)
	}
}
