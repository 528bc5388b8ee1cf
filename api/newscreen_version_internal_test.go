package api

import (
	"encoding/json"
	"os"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/pathvet/pathvet/api/service"
	"github.com/pathvet/pathvet/checks"
	"github.com/pathvet/pathvet/checks/load"
	"github.com/pathvet/pathvet/checks/load/table"
)

// A new version filled from an earlier one and screened unchanged is the
// earlier package again: the table printed from its figures reads back
// to them, and what the form has no field for is carried over.
func TestNewVersion_Unchanged(t *testing.T) {
	for _, dir := range []string{"tutoring-anxiety", "sleep-attention", "coding-club", "tutoring-anxiety reordered"} {
		t.Run(dir, func(t *testing.T) {
			dir, reordered := strings.CutSuffix(dir, " reordered")
			e := demoEarlier(t, dir)
			doc := demoDoc(t, dir)
			if reordered { // the variables listed in another order than the matrix's
				slices.Reverse(e.pkg.Variables)
				doc, _ = json.Marshal(e.pkg)
			}
			f := formFromPackage(e)
			b := formServer().build(f, e)
			defer b.close()
			if b.errs.any() || b.n == nil {
				t.Fatalf("problems: %v", b.errs.summary())
			}
			want, err := load.Load(doc, load.Options{CSV: e.rows})
			if err != nil {
				t.Fatal(err)
			}
			if b.n.PackageSHA256 != want.SHA256 {
				got, _ := json.MarshalIndent(b.pkg, "", " ")
				t.Errorf("hash %s, want the demo's %s; package:\n%s\nform table:\n%s", b.n.PackageSHA256,
					want.SHA256, got, f.Table)
			}
		})
	}
}

func demoDoc(t *testing.T, dir string) []byte {
	b, err := os.ReadFile("../testdata/demo/" + dir + "/package.json")
	if err != nil {
		t.Fatal(err)
	}
	return b
}

// demoEarlier is a demo as an earlier version: its rows, when it has
// them, as the data part the API stored.
func demoEarlier(t *testing.T, dir string) *earlierVersion {
	var p checks.Package
	if err := json.Unmarshal(demoDoc(t, dir), &p); err != nil {
		t.Fatal(err)
	}
	e := &earlierVersion{sub: &service.Submission{ID: "00000000-0000-0000-0000-000000000001"}, pkg: &p}
	if p.Data.File != "" {
		rows, err := os.ReadFile("../testdata/demo/" + dir + "/" + p.Data.File)
		if err != nil {
			t.Fatal(err)
		}
		e.rows, p.Data.File = rows, ""
	}
	return e
}

// The table printed from a package's summary statistics reads back to
// them, reliabilities on its diagonal included.
func TestPrintedTable_ReadsBack(t *testing.T) {
	p := demoEarlier(t, "tutoring-anxiety").pkg
	text := printedTable(p)
	tb, err := table.Read(text)
	if err != nil {
		t.Fatalf("%v\n%s", err, text)
	}
	if got := tb.Data(); !reflect.DeepEqual(got, p.Data) {
		t.Errorf("read back %+v, want %+v\n%s", got, p.Data, text)
	}
	for i, v := range tb.PackageVariables() {
		if !reflect.DeepEqual(v.Reliability, p.Variables[i].Reliability) {
			t.Errorf("%s: reliability %v, want %v", v.Name, v.Reliability, p.Variables[i].Reliability)
		}
	}
}
