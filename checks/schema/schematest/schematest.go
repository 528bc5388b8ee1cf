// Package schematest compiles pathvet's embedded JSON Schemas for tests.
package schematest

import (
	"bytes"
	"testing"

	"github.com/santhosh-tekuri/jsonschema/v6"

	"github.com/pathvet/pathvet/checks/schema"
)

// Package is the compiled package schema; a compile error fails tb.
func Package(tb testing.TB) *jsonschema.Schema {
	tb.Helper()
	return compile(tb, schema.Package, "package-v1.schema.json")
}

// Report is the compiled report schema; a compile error fails tb.
func Report(tb testing.TB) *jsonschema.Schema {
	tb.Helper()
	return compile(tb, schema.Report, "report-v1.schema.json")
}

func compile(tb testing.TB, src []byte, name string) *jsonschema.Schema {
	tb.Helper()
	doc, err := jsonschema.UnmarshalJSON(bytes.NewReader(src))
	if err != nil {
		tb.Fatal(err)
	}
	c := jsonschema.NewCompiler()
	if err := c.AddResource(name, doc); err != nil {
		tb.Fatal(err)
	}
	sch, err := c.Compile(name)
	if err != nil {
		tb.Fatal(err)
	}
	return sch
}
